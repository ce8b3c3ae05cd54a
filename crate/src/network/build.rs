//! Builds the pedestrian graph from validated layers: noding, crossing points, corners,
//! edges, the spatial index and QA, each in its own module.

use super::attach::{frame_over, SideIndex};
use super::components::component_qa;
use super::corners::build_corners;
use super::crossings::place_crossings;
use super::dangling::end_qa;
use super::doorstep::add_doorstep_crossings;
use super::edges::{build_edges, EdgeInput};
use super::noding::node_streets;
use super::{qa::Qa, PedGraph};
use crate::config::NetworkConfig;
use crate::geodesy::LocalFrame;
use crate::input::Layers;

/// The network stage's output: graph, spatial index of walkable edges, QA.
#[derive(Debug, Clone, Default)]
pub struct Network {
    pub graph: PedGraph,
    pub index: SideIndex,
    pub qa: Qa,
    /// Junctions made by a crossing point splitting a segment (indexed like
    /// `graph.junctions`).
    pub midblock: Vec<bool>,
}

fn finite_or(v: f64, default: f64) -> f64 {
    if v.is_finite() && v >= 0.0 {
        v
    } else {
        default
    }
}

/// Nodes the centrelines, builds corners, side edges and crossing edges, indexes them.
///
/// ```
/// use catchwalk::config::NetworkConfig;
/// use catchwalk::input::Layers;
/// let net = catchwalk::network::build_network(&Layers::default(), &NetworkConfig::default());
/// assert!(net.graph.edges.is_empty());
/// ```
pub fn build_network(layers: &Layers, cfg: &NetworkConfig) -> Network {
    let streets = &layers.streets;
    let frame = frame_over(streets.iter().flat_map(|s| s.line.iter().copied()))
        .unwrap_or_else(|| LocalFrame::new([0.0, 0.0]));
    let tol_m = finite_or(cfg.snap_tolerance_m, 0.0);
    let mut items = Vec::new();
    let noded = node_streets(streets, tol_m, &frame);
    let placed = place_crossings(
        noded,
        streets,
        &layers.crossings,
        finite_or(cfg.crossing_attach_m, 0.0),
        finite_or(cfg.max_attach_m, 0.0),
        &frame,
        &mut items,
    );
    let foot: Vec<bool> = placed
        .segments
        .iter()
        .map(|s| {
            streets
                .get(s.street)
                .map(|st| st.class.is_foot_only())
                .unwrap_or(false)
        })
        .collect();
    let corners = build_corners(&placed.junctions, &placed.segments, &foot);
    let edges = build_edges(&EdgeInput {
        segments: &placed.segments,
        streets,
        corners: &corners,
        controls: &placed.controls,
        midblock: &placed.midblock,
        lane_width_m: finite_or(cfg.lane_width_m, 0.0),
    });
    let (components, largest_component_share) = component_qa(
        &placed.junctions,
        &placed.segments,
        streets,
        cfg.tiny_component_segments,
        &mut items,
    );
    let mut graph = PedGraph {
        junctions: placed.junctions,
        segments: placed.segments,
        corners: corners.corners,
        edges,
        topology: Default::default(),
        sides: Vec::new(),
        doorstep: Vec::new(),
    };
    graph.index_topology();
    add_doorstep_crossings(&mut graph, streets, finite_or(cfg.lane_width_m, 0.0));
    let index = SideIndex::new(&graph);
    end_qa(
        &graph.junctions,
        &graph.segments,
        streets,
        &placed.midblock,
        finite_or(cfg.near_miss_m, 0.0),
        index.pieces(),
        &mut items,
    );
    Network {
        graph,
        index,
        qa: Qa {
            items,
            components,
            largest_component_share,
        },
        midblock: placed.midblock,
    }
}
