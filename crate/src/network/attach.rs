//! Attaching homes and schools to the nearest walkable edge (R-tree over side and path edges).

use super::pieces::{nearest_on, piece_tree, Piece};
use super::{Attachment, PedEdgeKind, PedGraph, Side};
use crate::geodesy::LocalFrame;
use crate::input::LonLat;
use rstar::RTree;

/// The walkable edges of one segment.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
struct Walkable {
    left: Option<u32>,
    right: Option<u32>,
    path: Option<u32>,
}

/// Spatial index of side and path edges: the centreline pieces of every segment in a local
/// metric frame; a query skips segments without a walkable edge (a road whose sidewalks are
/// drawn separately). The same tree serves the near-miss QA.
#[derive(Debug, Clone, Default)]
pub struct SideIndex {
    frame: Option<LocalFrame>,
    tree: RTree<Piece>,
    walkable: Vec<Walkable>,
}

/// A frame centred on the middle of the junctions' bounding box.
pub(crate) fn frame_over(points: impl Iterator<Item = LonLat>) -> Option<LocalFrame> {
    let mut lo = [f64::INFINITY; 2];
    let mut hi = [f64::NEG_INFINITY; 2];
    for p in points.filter(|p| p[0].is_finite() && p[1].is_finite()) {
        for i in 0..2 {
            lo[i] = lo[i].min(p[i]);
            hi[i] = hi[i].max(p[i]);
        }
    }
    if lo[0].is_finite() {
        Some(LocalFrame::new([
            (lo[0] + hi[0]) / 2.0,
            (lo[1] + hi[1]) / 2.0,
        ]))
    } else {
        None
    }
}

impl SideIndex {
    /// Indexes every walkable (side or path) edge of the graph.
    ///
    /// ```
    /// use catchwalk::network::{attach::SideIndex, PedGraph};
    /// let g = PedGraph::toy_path(&[10.0]);
    /// let idx = SideIndex::new(&g);
    /// let att = idx.attach(&g, [0.00005, 0.00001], 50.0).unwrap();
    /// assert_eq!(att.edge, 0);
    /// assert!((att.snap_m - 1.1).abs() < 0.1);
    /// ```
    pub fn new(graph: &PedGraph) -> Self {
        let mut walkable = vec![Walkable::default(); graph.segments.len()];
        for (i, e) in graph.edges.iter().enumerate() {
            let i = i as u32;
            match e.kind {
                PedEdgeKind::Side { segment, side, .. } => {
                    if let Some(w) = walkable.get_mut(segment as usize) {
                        match side {
                            Side::Left => w.left = Some(i),
                            Side::Right => w.right = Some(i),
                        }
                    }
                }
                PedEdgeKind::Path { segment } => {
                    if let Some(w) = walkable.get_mut(segment as usize) {
                        w.path = Some(i);
                    }
                }
                PedEdgeKind::Crossing { .. } => {}
            }
        }
        let Some(frame) = frame_over(graph.junctions.iter().map(|j| j.at)) else {
            return SideIndex::default();
        };
        let tree = piece_tree(&graph.segments, &frame, |s, _| {
            walkable
                .get(s)
                .map(|w| *w != Walkable::default())
                .unwrap_or(false)
        });
        SideIndex {
            frame: Some(frame),
            tree,
            walkable,
        }
    }

    /// The metric frame and the tree of every segment's pieces (empty for an empty graph).
    pub(crate) fn pieces(&self) -> Option<(&LocalFrame, &RTree<Piece>)> {
        self.frame.as_ref().map(|f| (f, &self.tree))
    }

    /// The nearest walkable edge to `at` within `max_m`, at the projected point, on the side
    /// of the street where `at` lies (the other side, or the path, if that side has no edge).
    pub fn attach(&self, graph: &PedGraph, at: LonLat, max_m: f64) -> Option<Attachment> {
        let frame = self.frame.as_ref()?;
        let walkable = |s: u32| {
            self.walkable
                .get(s as usize)
                .map(|w| *w != Walkable::default())
                .unwrap_or(false)
        };
        let hit = nearest_on(&self.tree, &graph.segments, frame, at, walkable)?;
        if hit.snap_m.is_nan() || hit.snap_m > max_m || max_m.is_nan() {
            return None;
        }
        let w = self.walkable.get(hit.segment as usize)?;
        let (near, far) = if hit.cross > 0.0 {
            (w.left, w.right)
        } else {
            (w.right, w.left)
        };
        let edge = near.or(far).or(w.path)?;
        Some(Attachment {
            edge,
            offset_m: hit.offset_m,
            at: hit.at,
            snap_m: hit.snap_m,
        })
    }
}
