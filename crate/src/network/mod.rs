//! The pedestrian graph: noded centrelines, corners, side edges and crossing edges.
//!
//! Built once from the [`Layers`](crate::input::Layers); routing reads it through
//! [`PedGraph::neighbours`] and the edge list, never through the builder's internals.
//!
//! The build, one concern per module, in order ([`build::build_network`]):
//! - `noding`: junctions at line ends and at shared or repeated vertices (exact coordinates),
//!   `snap`: near-coincident vertices merge within one vertical layer (grid, no pairs loop);
//! - `crossings`: crossing points attach to the nearest road segment; near a junction their
//!   control goes to it (every leg, or the leg the point is on), farther they split the
//!   segment into a mid-block junction;
//! - `corners`: legs sorted clockwise by bearing, a corner between consecutive road legs;
//!   foot-only legs lie inside a corner, so crossing them is free and adds no crossing edge;
//! - `edges`: side edges (none where the sidewalk is drawn separately), path edges, crossings;
//! - [`attach`]: the R-tree that attaches homes and schools to the side they are on;
//! - `components`, `dangling`: network QA ([`qa::Qa`]).

use crate::input::{Control, LonLat, RoadClass, SideWalk};
use petgraph::graph::{NodeIndex, UnGraph};
use petgraph::visit::EdgeRef;
use serde::Serialize;

/// A node of the noded centreline graph (a junction, a dead end, a mid-block crossing point).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Junction {
    pub at: LonLat,
    pub layer: i32,
}

/// A piece of one street between two junctions.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Segment {
    /// Index into `Layers::streets`.
    pub street: usize,
    pub from: u32,
    pub to: u32,
    /// Polyline from `from` to `to`, in the street's digitised direction.
    pub line: Vec<LonLat>,
    /// Geodesic length on WGS84.
    pub length_m: f64,
}

/// Which side of a segment, looking from `from` to `to`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Side {
    Left,
    Right,
}

/// A corner: the walkable space between two consecutive legs at a junction.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Corner {
    pub junction: u32,
    /// A point a few metres into the corner, for drawing.
    pub at: LonLat,
}

/// What a pedestrian edge is.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum PedEdgeKind {
    /// One side of a street segment. `a` is the corner at `Segment::from`.
    Side {
        segment: u32,
        side: Side,
        sidewalk: SideWalk,
    },
    /// A foot-only path segment (one edge, no traffic beside it).
    Path { segment: u32 },
    /// Crossing the leg `segment` at `junction`.
    Crossing {
        junction: u32,
        segment: u32,
        control: Control,
        /// True where a crossing point split the segment (a mid-block crossing).
        midblock: bool,
    },
}

/// One edge of the pedestrian graph between corners `a` and `b`.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PedEdge {
    pub a: u32,
    pub b: u32,
    pub kind: PedEdgeKind,
    /// Side and path edges: the centreline length. Crossings: the crossed width (walked,
    /// not counted in network length).
    pub length_m: f64,
}

impl PedEdge {
    /// Metres that count towards a route's network length (crossings add nothing).
    pub fn network_m(&self) -> f64 {
        match self.kind {
            PedEdgeKind::Crossing { .. } => 0.0,
            _ => self.length_m,
        }
    }
    pub fn is_crossing(&self) -> bool {
        matches!(self.kind, PedEdgeKind::Crossing { .. })
    }
    /// The segment the edge runs along or crosses.
    pub fn segment(&self) -> u32 {
        match self.kind {
            PedEdgeKind::Side { segment, .. }
            | PedEdgeKind::Path { segment }
            | PedEdgeKind::Crossing { segment, .. } => segment,
        }
    }
}

/// The whole pedestrian graph: plain arrays for the data, `petgraph` for the topology.
///
/// Corner `c` is petgraph node `c`; petgraph edge weights are indices into `edges`.
#[derive(Debug, Clone, Default, Serialize)]
pub struct PedGraph {
    pub junctions: Vec<Junction>,
    pub segments: Vec<Segment>,
    pub corners: Vec<Corner>,
    pub edges: Vec<PedEdge>,
    #[serde(skip)]
    pub topology: UnGraph<(), u32, u32>,
    /// Per segment: its left and right side edges (`NO_CORNER` where a side has none).
    pub sides: Vec<[u32; 2]>,
    /// Per segment: its doorstep crossing edge (`NO_CORNER` if none); see `doorstep.rs`.
    pub doorstep: Vec<u32>,
}

/// Marks "no corner" (and "no edge" in `PedGraph::sides`/`doorstep`).
pub const NO_CORNER: u32 = u32::MAX;

impl PedGraph {
    /// Incident edges of a corner as `(edge index, corner at the other end)`.
    pub fn neighbours(&self, corner: u32) -> impl Iterator<Item = (u32, u32)> + '_ {
        let node = NodeIndex::new(corner as usize);
        self.topology.edges(node).map(move |er| {
            let other = if er.source() == node {
                er.target()
            } else {
                er.source()
            };
            (*er.weight(), other.index() as u32)
        })
    }
    /// True for a doorstep crossing (used only at a route's ends, outside the topology).
    pub fn is_doorstep(edge: &PedEdge) -> bool {
        edge.a == NO_CORNER || edge.b == NO_CORNER
    }
    /// The edges between corners: every edge but the doorstep crossings.
    pub fn corner_edges(&self) -> impl Iterator<Item = &PedEdge> + '_ {
        self.edges.iter().filter(|e| !Self::is_doorstep(e))
    }
    pub fn corner_count(&self) -> usize {
        self.corners.len()
    }
    /// Road class of the street an edge belongs to.
    pub fn class_of(&self, edge: &PedEdge, streets: &[crate::input::Street]) -> RoadClass {
        streets[self.segments[edge.segment() as usize].street].class
    }
    /// Builds the petgraph topology from `corners` and `edges`; call once when they are final.
    pub fn index_topology(&mut self) {
        let mut g = UnGraph::with_capacity(self.corners.len(), self.edges.len());
        for _ in 0..self.corners.len() {
            g.add_node(());
        }
        for (i, e) in self.edges.iter().enumerate() {
            if Self::is_doorstep(e) {
                continue; // doorstep crossings are used only at a route's ends
            }
            g.add_edge(
                NodeIndex::new(e.a as usize),
                NodeIndex::new(e.b as usize),
                i as u32,
            );
        }
        self.topology = g;
    }
}

/// Where a home or school meets the graph: a point on a side or path edge.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Attachment {
    pub edge: u32,
    /// Metres along the edge from corner `a` (along the segment from `from`).
    pub offset_m: f64,
    /// The projected point on the centreline.
    pub at: LonLat,
    /// Distance from the feature to the projected point.
    pub snap_m: f64,
}

pub mod attach;
pub mod build;
mod components;
mod corners;
mod crossings;
mod dangling;
mod doorstep;
mod edges;
pub(crate) mod noding;
mod pieces;
pub mod qa;
mod snap;
#[cfg(test)]
mod test_util;
mod unionfind;

pub use build::{build_network, Network};

impl PedGraph {
    /// A chain of foot-path edges `0-1-2-...` with the given lengths, for examples and tests.
    #[doc(hidden)]
    pub fn toy_path(lengths_m: &[f64]) -> PedGraph {
        let mut g = PedGraph::default();
        for i in 0..=lengths_m.len() {
            g.junctions.push(Junction {
                at: [i as f64 * 1e-4, 0.0],
                layer: 0,
            });
            g.corners.push(Corner {
                junction: i as u32,
                at: [i as f64 * 1e-4, 0.0],
            });
        }
        for (i, &len) in lengths_m.iter().enumerate() {
            g.segments.push(Segment {
                street: 0,
                from: i as u32,
                to: i as u32 + 1,
                line: vec![g.junctions[i].at, g.junctions[i + 1].at],
                length_m: len,
            });
            g.edges.push(PedEdge {
                a: i as u32,
                b: i as u32 + 1,
                kind: PedEdgeKind::Path { segment: i as u32 },
                length_m: len,
            });
        }
        g.index_topology();
        g
    }
}

/// Width walked when crossing a street: its `width_m`, else lanes x the configured lane width;
/// foot-only ways are free to cross.
pub fn crossing_width_m(cfg: &crate::config::NetworkConfig, street: &crate::input::Street) -> f64 {
    edges::crossing_width_m(street, cfg.lane_width_m)
}
