//! `hotspots.geojson` and `hotspots.csv`: crossings and sides ranked by children x risk.
//! Edges, not homes: safe to share.

use super::csv_safe::{csv_text, SafeRow};
use super::geometry::step_line;
use super::round2;
use crate::pipeline::AuditOutput;
use crate::route::RouteStep;
use serde_json::{json, Value};

/// Hotspots as LineStrings (the crossing or the side) with their figures.
pub fn hotspots_geojson(out: &AuditOutput) -> Value {
    let g = &out.network.graph;
    let features: Vec<Value> = out
        .scores
        .hotspots
        .iter()
        .filter(|h| (h.edge as usize) < g.edges.len())
        .map(|h| {
            let line = step_line(
                g,
                &RouteStep {
                    edge: h.edge,
                    from_frac: 0.0,
                    to_frac: 1.0,
                },
            );
            json!({
                "type": "Feature",
                "geometry": { "type": "LineString", "coordinates": line },
                "properties": {
                    "rank": h.rank, "edge": h.edge, "kind": h.kind, "street_id": h.street_id,
                    "street": h.street, "class": h.class, "control": h.control,
                    "speed_kmh": h.speed_kmh, "lanes": h.lanes, "children": h.children,
                    "risk": (h.risk * 1e4).round() / 1e4,
                    "product": (h.product * 1e4).round() / 1e4,
                    "wait_s": h.wait_s.map(round2), "los": h.los.map(|l| l.as_str()),
                    "crashes": h.crashes, "crashes_pedestrian": h.crashes_pedestrian,
                    "crashes_ksi": h.crashes_ksi,
                },
            })
        })
        .collect();
    json!({ "type": "FeatureCollection", "caution": crate::CAUTION, "features": features })
}

/// Hotspots as CSV, ranked.
pub fn hotspots_csv(out: &AuditOutput) -> String {
    let mut w = csv::Writer::from_writer(Vec::new());
    w.safe_row([
        "rank",
        "edge",
        "kind",
        "street_id",
        "street",
        "class",
        "control",
        "speed_kmh",
        "lanes",
        "children",
        "risk",
        "product",
        "wait_s",
        "los",
        "crashes",
        "crashes_pedestrian",
        "crashes_ksi",
    ]);
    for h in &out.scores.hotspots {
        w.safe_row([
            h.rank.to_string(),
            h.edge.to_string(),
            h.kind.to_string(),
            h.street_id.clone(),
            h.street.clone(),
            h.class.to_string(),
            h.control.clone(),
            h.speed_kmh.to_string(),
            h.lanes.to_string(),
            h.children.to_string(),
            format!("{:.4}", h.risk),
            format!("{:.4}", h.product),
            h.wait_s.map(|x| round2(x).to_string()).unwrap_or_default(),
            h.los.map(|l| l.as_str().to_string()).unwrap_or_default(),
            h.crashes.to_string(),
            h.crashes_pedestrian.to_string(),
            h.crashes_ksi.to_string(),
        ]);
    }
    csv_text(w)
}
