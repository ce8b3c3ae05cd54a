//! `flows.geojson`: children per street side, path and crossing, on their shortest and their
//! recommended routes. The default routes output: it aggregates homes (no single home can be
//! read from it), so it may be shared, and it grows with the network, not with the homes.

use super::edge_side;
use super::feature_lines::write_feature_lines;
use super::geometry::edge_line;
use crate::network::PedGraph;
use crate::pipeline::AuditOutput;
use crate::risk::street_of;
use serde::Serialize;
use std::io::{self, Write};

/// Children routed over one edge.
#[derive(Debug, Clone, Copy, Default, PartialEq, Serialize)]
pub struct EdgeFlow {
    pub shortest: u32,
    pub recommended: u32,
}

/// Children per edge (indexed like `graph.edges`) on shortest and recommended routes; an edge
/// walked twice by one route counts its children once.
///
/// ```
/// let out = catchwalk::pipeline::audit_layers(
///     Default::default(), &Default::default(), &mut catchwalk::pipeline::Silent).unwrap();
/// assert!(catchwalk::export::flows::edge_flows(&out).is_empty());
/// ```
pub fn edge_flows(out: &AuditOutput) -> Vec<EdgeFlow> {
    let n = out.network.graph.edges.len();
    let mut flows = vec![EdgeFlow::default(); n];
    let mut last_seen = vec![(usize::MAX, 0u8); n];
    for (i, h) in out.homes.iter().enumerate() {
        let children = out.layers.homes.get(i).map_or(0, |x| x.children);
        for (k, r) in [(0u8, &h.shortest), (1u8, &h.recommended)] {
            let Some(r) = r else { continue };
            for s in &r.route.steps {
                let e = s.edge as usize;
                let (Some(f), Some(seen)) = (flows.get_mut(e), last_seen.get_mut(e)) else {
                    continue;
                };
                if *seen == (i, k) {
                    continue;
                }
                *seen = (i, k);
                match k {
                    0 => f.shortest += children,
                    _ => f.recommended += children,
                }
            }
        }
    }
    flows
}

#[derive(Serialize)]
struct FlowProps<'a> {
    edge: u32,
    kind: &'static str,
    street_id: &'a str,
    children_shortest: u32,
    children_recommended: u32,
}

#[derive(Serialize)]
struct FlowFeature<'a> {
    #[serde(rename = "type")]
    kind: &'static str,
    geometry: FlowLine,
    properties: FlowProps<'a>,
}

/// A LineString, keys in the order a `json!` map wrote them (alphabetical).
#[derive(Serialize)]
struct FlowLine {
    coordinates: Vec<[f64; 2]>,
    #[serde(rename = "type")]
    kind: &'static str,
}

fn line(graph: &PedGraph, edge: u32) -> Vec<[f64; 2]> {
    // 7 decimals (about 1 cm): the precision the layers carry.
    let r = |x: f64| (x * 1e7).round() / 1e7;
    edge_line(graph, edge)
        .into_iter()
        .map(|p| [r(p[0]), r(p[1])])
        .collect()
}

/// Writes the flows as a GeoJSON FeatureCollection, one feature per line
/// ([`write_feature_lines`]): only edges that some child walks, in edge order.
pub fn write_flows_geojson(out: &AuditOutput, w: &mut dyn Write) -> io::Result<()> {
    let g = &out.network.graph;
    let flows = edge_flows(out);
    let walked: Vec<u32> = (0..flows.len() as u32)
        .filter(|&e| {
            flows
                .get(e as usize)
                .is_some_and(|f| f.shortest > 0 || f.recommended > 0)
        })
        .collect();
    write_feature_lines(w, walked.len(), |k| {
        let e = *walked.get(k)?;
        let (edge, f) = (g.edges.get(e as usize)?, flows.get(e as usize)?);
        Some(FlowFeature {
            kind: "Feature",
            geometry: FlowLine {
                coordinates: line(g, e),
                kind: "LineString",
            },
            properties: FlowProps {
                edge: e,
                kind: edge_side(&edge.kind),
                street_id: street_of(g, edge, &out.layers.streets).map_or("", |s| s.id.as_str()),
                children_shortest: f.shortest,
                children_recommended: f.recommended,
            },
        })
    })
}
