//! Straight pieces of segment centrelines in a metric frame, in an R-tree, with projection.
//! Shared by crossing attachment, near-miss QA and the [`SideIndex`](super::attach::SideIndex).

use super::Segment;
use crate::geodesy::{distance_m, LocalFrame};
use crate::input::LonLat;
use rstar::primitives::{GeomWithData, Line};
use rstar::RTree;

/// Which piece: segment index and the index of the piece's first vertex in `Segment::line`.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct PieceRef {
    pub segment: u32,
    pub piece: u32,
}

/// One straight piece in the frame's metres.
pub type Piece = GeomWithData<Line<[f64; 2]>, PieceRef>;

/// An R-tree over the pieces of the segments `keep` accepts.
pub(crate) fn piece_tree(
    segments: &[Segment],
    frame: &LocalFrame,
    keep: impl Fn(usize, &Segment) -> bool,
) -> RTree<Piece> {
    let mut items = Vec::new();
    for (s, seg) in segments.iter().enumerate() {
        if !keep(s, seg) {
            continue;
        }
        for (i, w) in seg.line.windows(2).enumerate() {
            let a = frame.to_xy(w[0]);
            let b = frame.to_xy(w[1]);
            if a.iter().chain(b.iter()).all(|v| v.is_finite()) {
                items.push(Piece::new(
                    Line::new(a, b),
                    PieceRef {
                        segment: s as u32,
                        piece: i as u32,
                    },
                ));
            }
        }
    }
    RTree::bulk_load(items)
}

/// Where `q` projects onto a piece: the fraction along it (0..=1) and the point.
pub(crate) fn project(line: &Line<[f64; 2]>, q: [f64; 2]) -> (f64, [f64; 2]) {
    let (a, b) = (line.from, line.to);
    let d = [b[0] - a[0], b[1] - a[1]];
    let len2 = d[0] * d[0] + d[1] * d[1];
    let t = if len2 > 0.0 {
        (((q[0] - a[0]) * d[0] + (q[1] - a[1]) * d[1]) / len2).clamp(0.0, 1.0)
    } else {
        0.0
    };
    (t, [a[0] + t * d[0], a[1] + t * d[1]])
}

/// Positive when `q` lies to the left of the piece's direction, negative to the right.
pub(crate) fn cross(line: &Line<[f64; 2]>, q: [f64; 2]) -> f64 {
    let (a, b) = (line.from, line.to);
    (b[0] - a[0]) * (q[1] - a[1]) - (b[1] - a[1]) * (q[0] - a[0])
}

/// A projected point on a segment: geodesic metres from `from`, and the point itself.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct OnSegment {
    pub segment: u32,
    pub piece: u32,
    pub offset_m: f64,
    pub at: LonLat,
    /// Geodesic distance from the query point.
    pub snap_m: f64,
    /// Positive on the left of the segment's direction.
    pub cross: f64,
}

/// Projects `at` onto the nearest piece of `tree` whose segment `keep` accepts.
pub(crate) fn nearest_on(
    tree: &RTree<Piece>,
    segments: &[Segment],
    frame: &LocalFrame,
    at: LonLat,
    keep: impl Fn(u32) -> bool,
) -> Option<OnSegment> {
    if !(at[0].is_finite() && at[1].is_finite()) {
        return None;
    }
    let q = frame.to_xy(at);
    let hit = tree
        .nearest_neighbor_iter(&q)
        .find(|p| keep(p.data.segment))?;
    let seg = segments.get(hit.data.segment as usize)?;
    let (_, xy) = project(hit.geom(), q);
    let p = frame.to_lonlat(xy);
    let i = hit.data.piece as usize;
    let before: f64 = seg
        .line
        .windows(2)
        .take(i)
        .map(|w| distance_m(w[0], w[1]))
        .sum();
    let start = seg.line.get(i).copied().unwrap_or(p);
    let offset_m = (before + distance_m(start, p)).clamp(0.0, seg.length_m.max(0.0));
    Some(OnSegment {
        segment: hit.data.segment,
        piece: hit.data.piece,
        offset_m,
        at: p,
        snap_m: distance_m(at, p),
        cross: cross(hit.geom(), q),
    })
}
