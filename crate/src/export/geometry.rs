//! Drawing routes: the piece of a segment's polyline that a route step walks.

use crate::geodesy::distance_m;
use crate::input::LonLat;
use crate::network::{PedEdgeKind, PedGraph, NO_CORNER};
use crate::route::RouteStep;

/// The sub-polyline of `line` between fractions `f0` and `f1` of its length (in that order;
/// `f0 > f1` walks it backwards).
pub fn slice_line(line: &[LonLat], f0: f64, f1: f64) -> Vec<LonLat> {
    if line.len() < 2 {
        return line.to_vec();
    }
    // Whole edges (every step but a route's first and last) need no measuring.
    if f0 <= 0.0 && f1 >= 1.0 {
        return line.to_vec();
    }
    if f0 >= 1.0 && f1 <= 0.0 {
        return line.iter().rev().copied().collect();
    }
    let mut cum = Vec::with_capacity(line.len());
    cum.push(0.0);
    for w in line.windows(2) {
        let last = *cum.last().unwrap_or(&0.0);
        cum.push(last + distance_m(w[0], w[1]));
    }
    let total = *cum.last().unwrap_or(&0.0);
    let at = |f: f64| -> (usize, LonLat) {
        let d = f.clamp(0.0, 1.0) * total;
        let i = cum.partition_point(|&c| c < d).clamp(1, line.len() - 1);
        let seg = cum[i] - cum[i - 1];
        let t = if seg > 0.0 {
            (d - cum[i - 1]) / seg
        } else {
            0.0
        };
        let (a, b) = (line[i - 1], line[i]);
        (i, [a[0] + (b[0] - a[0]) * t, a[1] + (b[1] - a[1]) * t])
    };
    let (lo, hi, reverse) = if f0 <= f1 {
        (f0, f1, false)
    } else {
        (f1, f0, true)
    };
    let (i0, p0) = at(lo);
    let (i1, p1) = at(hi);
    let mut out = vec![p0];
    out.extend_from_slice(&line[i0..i1]);
    out.push(p1);
    out.dedup();
    if reverse {
        out.reverse();
    }
    out
}

/// The polyline one route step walks: part of its segment, or the crossing between corners.
pub fn step_line(graph: &PedGraph, step: &RouteStep) -> Vec<LonLat> {
    let edge = &graph.edges[step.edge as usize];
    match edge.kind {
        PedEdgeKind::Crossing { .. } if edge.a == NO_CORNER => {
            // A doorstep crossing: the point on the centreline where it crosses.
            let line = &graph.segments[edge.segment() as usize].line;
            slice_line(line, step.from_frac, step.from_frac)
        }
        PedEdgeKind::Crossing { .. } => {
            let (a, b) = (
                graph.corners[edge.a as usize].at,
                graph.corners[edge.b as usize].at,
            );
            if step.from_frac <= step.to_frac {
                vec![a, b]
            } else {
                vec![b, a]
            }
        }
        _ => slice_line(
            &graph.segments[edge.segment() as usize].line,
            step.from_frac,
            step.to_frac,
        ),
    }
}

/// A whole edge drawn as a map feature (flows, hotspots). A doorstep crossing (mid-block,
/// from one side to the other, wherever a home stands) is drawn across the street at the
/// middle of its segment, its crossed width long: a point would make a LineString of one
/// position, which GeoJSON does not allow (RFC 7946 section 3.1.4: two or more).
///
/// ```
/// let g = catchwalk::network::PedGraph::toy_path(&[10.0]);
/// assert_eq!(catchwalk::export::geometry::edge_line(&g, 0).len(), 2);
/// ```
pub fn edge_line(graph: &PedGraph, edge: u32) -> Vec<LonLat> {
    let whole = RouteStep {
        edge,
        from_frac: 0.0,
        to_frac: 1.0,
    };
    let Some(e) = graph.edges.get(edge as usize) else {
        return Vec::new();
    };
    let doorstep = matches!(e.kind, PedEdgeKind::Crossing { .. }) && e.a == NO_CORNER;
    let Some(seg) = graph
        .segments
        .get(e.segment() as usize)
        .filter(|_| doorstep)
    else {
        return step_line(graph, &whole);
    };
    // The street's direction at its middle, from a piece a tenth of its length around it.
    let piece = slice_line(&seg.line, 0.45, 0.55);
    let (Some(&a), Some(&b)) = (piece.first(), piece.last()) else {
        return step_line(graph, &whole);
    };
    let mid = slice_line(&seg.line, 0.5, 0.5)
        .first()
        .copied()
        .unwrap_or(a);
    let frame = crate::geodesy::LocalFrame::new(mid);
    let (pa, pb) = (frame.to_xy(a), frame.to_xy(b));
    let (dx, dy) = (pb[0] - pa[0], pb[1] - pa[1]);
    let len = dx.hypot(dy);
    let usable = |x: f64| x.is_finite() && x > 0.0;
    if !usable(len) || !usable(e.length_m) {
        return vec![mid, mid];
    }
    // Half the crossed width to the left and to the right of the centreline.
    let h = e.length_m / 2.0 / len;
    let (nx, ny) = (-dy * h, dx * h);
    vec![frame.to_lonlat([nx, ny]), frame.to_lonlat([-nx, -ny])]
}

/// A whole route's polyline.
pub fn route_line(graph: &PedGraph, steps: &[RouteStep]) -> Vec<LonLat> {
    let mut out: Vec<LonLat> = Vec::new();
    for s in steps {
        let piece = step_line(graph, s);
        for p in piece {
            if out.last() != Some(&p) {
                out.push(p);
            }
        }
    }
    out
}

/// The south-west and north-east corners of a line's finite points (`None` for none).
pub(crate) fn line_bounds(line: &[LonLat]) -> Option<([f64; 2], [f64; 2])> {
    let mut pts = line.iter().filter(|p| p[0].is_finite() && p[1].is_finite());
    let first = *pts.next()?;
    Some(pts.fold((first, first), |(lo, hi), p| {
        (
            [lo[0].min(p[0]), lo[1].min(p[1])],
            [hi[0].max(p[0]), hi[1].max(p[1])],
        )
    }))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Every doorstep crossing of the demo town is drawn as two positions, its crossed width
    /// apart, centred on its segment's middle and square to the street there.
    #[test]
    fn doorstep_crossings_are_drawn_across_the_street() {
        let layers = crate::input::demo_town_layers();
        let config = crate::config::Config::default();
        let g = crate::network::build_network(&layers, &config.network).graph;
        let mut seen = 0;
        for (k, e) in g.edges.iter().enumerate() {
            if !(e.is_crossing() && e.a == NO_CORNER) {
                continue;
            }
            seen += 1;
            let line = edge_line(&g, k as u32);
            assert_eq!(line.len(), 2, "edge {k}");
            let width = distance_m(line[0], line[1]);
            assert!(
                (width - e.length_m).abs() < 0.01 * e.length_m,
                "edge {k}: {width}"
            );
            let seg = &g.segments[e.segment() as usize].line;
            let mid = slice_line(seg, 0.5, 0.5)[0];
            let centre = [
                (line[0][0] + line[1][0]) / 2.0,
                (line[0][1] + line[1][1]) / 2.0,
            ];
            assert!(distance_m(mid, centre) < 0.01, "edge {k}");
            // Square to the street's chord around its middle.
            let ahead = slice_line(seg, 0.45, 0.55);
            let f = crate::geodesy::LocalFrame::new(mid);
            let (a, b) = (f.to_xy(ahead[0]), f.to_xy(ahead[ahead.len() - 1]));
            let (c, d) = (f.to_xy(line[0]), f.to_xy(line[1]));
            let (u, v) = ([b[0] - a[0], b[1] - a[1]], [d[0] - c[0], d[1] - c[1]]);
            let cos = (u[0] * v[0] + u[1] * v[1]) / (u[0].hypot(u[1]) * v[0].hypot(v[1]));
            assert!(cos.abs() < 1e-6, "edge {k}: cos {cos}");
        }
        assert!(seen > 10, "the demo town has doorstep crossings ({seen})");
    }

    #[test]
    fn slicing_takes_the_middle_and_reverses() {
        let line = [[0.0, 0.0], [0.001, 0.0], [0.002, 0.0]];
        let mid = slice_line(&line, 0.25, 0.75);
        assert_eq!(mid.len(), 3);
        assert!((mid[0][0] - 0.0005).abs() < 1e-9 && (mid[2][0] - 0.0015).abs() < 1e-9);
        let back = slice_line(&line, 0.75, 0.25);
        assert!((back[0][0] - 0.0015).abs() < 1e-9);
    }
}
