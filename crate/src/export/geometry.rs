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

#[cfg(test)]
mod tests {
    use super::*;

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
