//! GeoJSON exports: routes, network QA, and the noded centrelines (for checks and the map).

use super::geometry::route_line;
use super::round2;
use crate::input::LonLat;
use crate::network::crossing_width_m;
use crate::network::qa::Qa;
use crate::pipeline::{AuditOutput, AuditedRoute};
use serde_json::{json, Map, Value};

fn collection(features: Vec<Value>) -> Value {
    json!({ "type": "FeatureCollection", "caution": crate::CAUTION, "features": features })
}

fn line(coords: &[LonLat]) -> Value {
    json!({ "type": "LineString", "coordinates": coords })
}

/// A LineString with coordinates rounded to 7 decimals (about 1 cm): routes are drawings,
/// and full precision would double the size of a district's routes file.
fn drawn_line(coords: &[LonLat]) -> Value {
    let r = |x: f64| (x * 1e7).round() / 1e7;
    let c: Vec<LonLat> = coords.iter().map(|p| [r(p[0]), r(p[1])]).collect();
    line(&c)
}

fn route_feature(out: &AuditOutput, home: usize, r: &AuditedRoute, over_cap: bool) -> Value {
    let h = &out.homes[home];
    let a = &r.audit;
    let mut props = Map::new();
    props.insert("home_id".into(), json!(out.layers.homes[home].id));
    props.insert(
        "school_id".into(),
        json!(h
            .assignment
            .school
            .map(|s| out.layers.schools[s].id.clone())),
    );
    props.insert("children".into(), json!(out.layers.homes[home].children));
    props.insert("kind".into(), json!(r.kind.as_str()));
    props.insert("network_m".into(), json!(round2(a.network_m)));
    props.insert("walked_m".into(), json!(round2(a.walked_m)));
    props.insert(
        "walking_time_min".into(),
        json!(round2(
            a.walked_m / out.config.benefit.walking_speed_mps / 60.0
        )),
    );
    props.insert("crossings".into(), json!(a.crossings.len()));
    props.insert("crossings_by_device".into(), json!(a.crossings_by_device()));
    props.insert(
        "uncontrolled_crossings".into(),
        json!(a.uncontrolled_crossings),
    );
    props.insert("arterial_crossings".into(), json!(a.arterial_crossings));
    props.insert(
        "arterial_exposure_m".into(),
        json!(round2(a.arterial_exposure_m)),
    );
    props.insert("along_le30_m".into(), json!(round2(a.along_le30_m)));
    props.insert("along_31_50_m".into(), json!(round2(a.along_31_50_m)));
    props.insert("along_gt50_m".into(), json!(round2(a.along_gt50_m)));
    props.insert("no_sidewalk_m".into(), json!(round2(a.no_sidewalk_m)));
    props.insert("risk".into(), json!((r.risk * 1e4).round() / 1e4));
    props.insert("over_detour_cap".into(), json!(over_cap));
    if let (crate::route::RouteKind::Recommended, Some(sc)) = (r.kind, out.scores.homes.get(home)) {
        props.insert("safe_route".into(), json!(sc.safe_route));
        props.insert(
            "safe_network_m".into(),
            json!(sc.safe_network_m.map(round2)),
        );
        props.insert("unsafe_reason".into(), json!(sc.unsafe_reason));
        props.insert("hazardous".into(), json!(sc.hazardous));
        props.insert("hazard_reason".into(), json!(sc.hazard_reason));
    }
    json!({
        "type": "Feature",
        "geometry": drawn_line(&route_line(&out.network.graph, &r.route.steps)),
        "properties": props,
    })
}

/// One LineString per home and route kind (shortest, recommended, and the safe route where
/// one exists), with the route's figures. Personal data: homes
/// are individual here, so this export stays on the planner's machine.
pub fn routes_geojson(out: &AuditOutput) -> Value {
    let mut features = Vec::new();
    for (i, h) in out.homes.iter().enumerate() {
        if let Some(r) = &h.shortest {
            features.push(route_feature(out, i, r, false));
        }
        if let Some(r) = &h.recommended {
            features.push(route_feature(out, i, r, h.over_detour_cap));
        }
        if let Some(r) = &h.safe {
            features.push(route_feature(out, i, r, false));
        }
    }
    collection(features)
}

/// Network QA findings as points.
pub fn qa_geojson(qa: &Qa) -> Value {
    let features = qa
        .items
        .iter()
        .map(|q| {
            json!({
                "type": "Feature",
                "geometry": { "type": "Point", "coordinates": q.at },
                "properties": { "kind": q.kind, "feature": q.feature, "message": q.message },
            })
        })
        .collect();
    collection(features)
}

/// The noded centreline graph: one LineString per segment with its end junctions and
/// geodesic length, so an outside graph library can recompute shortest paths.
pub fn centrelines_geojson(out: &AuditOutput) -> Value {
    let g = &out.network.graph;
    let features = g
        .segments
        .iter()
        .enumerate()
        .map(|(i, s)| {
            let st = &out.layers.streets[s.street];
            json!({
                "type": "Feature",
                "geometry": line(&s.line),
                "properties": {
                    "segment": i, "from": s.from, "to": s.to, "length_m": s.length_m,
                    "street_id": st.id, "class": st.class.as_str(), "speed_kmh": st.speed_kmh,
                    "lanes": st.lanes, "layer": st.layer,
                    "crossing_width_m": crossing_width_m(&out.config.network, st),
                },
            })
        })
        .collect();
    collection(features)
}
