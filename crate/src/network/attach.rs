//! Attaching homes and schools to the nearest walkable edge (R-tree over side and path edges).

use super::{Attachment, PedGraph};
use crate::input::LonLat;

/// Spatial index of side and path edges.
#[derive(Debug, Clone, Default)]
pub struct SideIndex {}

impl SideIndex {
    /// Indexes every walkable (side or path) edge of the graph.
    pub fn new(graph: &PedGraph) -> Self {
        let _ = graph;
        SideIndex {}
    }
    /// The nearest walkable edge to `at` within `max_m`, at the projected point.
    pub fn attach(&self, graph: &PedGraph, at: LonLat, max_m: f64) -> Option<Attachment> {
        let _ = (graph, at, max_m);
        None
    }
}
