//! What the page reads from the worker instead of one big document: one segment at a time, the
//! bounds and the street names, each checked against the full `centrelines.geojson`, the
//! streets file as written, or the `geo` crate (the map tiles: `tests/wasm/tiles.test.mjs`).

use catchwalk::config::Config;
use catchwalk::export::centrelines_geojson;
use catchwalk::export::layers_geojson::{
    centreline_feature, centrelines_bounds, street_names_geojson,
};
use catchwalk::pipeline::{audit_layers, AuditOutput, Silent};
use geo::BoundingRect;
use serde_json::Value;

mod common;

fn demo(file: &str) -> String {
    std::fs::read_to_string(format!("../sample-maps/demo-town/{file}")).unwrap_or_default()
}

fn demo_audit() -> AuditOutput {
    match audit_layers(common::demo_town(), &Config::default(), &mut Silent) {
        Ok(o) => o,
        Err(e) => panic!("demo town audit: {e}"),
    }
}

fn to_value<T: serde::Serialize>(x: &T) -> Value {
    serde_json::to_value(x).unwrap_or(Value::Null)
}

#[test]
fn single_segments_are_those_of_the_full_centrelines() {
    let out = demo_audit();
    let full = to_value(&centrelines_geojson(&out));
    let full = full["features"].as_array().cloned().unwrap_or_default();
    assert!(full.len() > 100, "{} segments", full.len());
    for (i, f) in full.iter().enumerate() {
        // What the page asks of the worker for a clicked segment is that segment's feature.
        let one = to_value(&centreline_feature(&out, i));
        assert_eq!(&one, f, "segment {i}");
    }
    assert!(centreline_feature(&out, full.len()).is_none());
}

#[test]
fn bounds_are_those_geo_finds_for_every_segment() {
    let out = demo_audit();
    let lines: Vec<geo::LineString<f64>> = out
        .network
        .graph
        .segments
        .iter()
        .map(|s| s.line.iter().map(|p| (p[0], p[1])).collect())
        .collect();
    let rect = match geo::MultiLineString::new(lines).bounding_rect() {
        Some(r) => r,
        None => panic!("the demo town has segments"),
    };
    let b = centrelines_bounds(&out);
    assert_eq!(
        b,
        Some([rect.min().x, rect.min().y, rect.max().x, rect.max().y])
    );
}

#[test]
fn street_names_are_the_named_streets_of_the_file_as_drawn() {
    let out = demo_audit();
    let file: Value = serde_json::from_str(&demo("streets.geojson")).unwrap_or(Value::Null);
    let expected: Vec<(String, Value)> = file["features"]
        .as_array()
        .cloned()
        .unwrap_or_default()
        .iter()
        .filter_map(|f| {
            let name = f["properties"]["name"].as_str()?.trim().to_string();
            (!name.is_empty() && f["geometry"]["type"] == "LineString")
                .then(|| (name, f["geometry"]["coordinates"].clone()))
        })
        .collect();
    assert!(expected.len() > 20, "{} named streets", expected.len());
    let names = to_value(&street_names_geojson(&out));
    let got: Vec<(String, Value)> = names["features"]
        .as_array()
        .cloned()
        .unwrap_or_default()
        .iter()
        .map(|f| {
            (
                f["properties"]["name"].as_str().unwrap_or("").to_string(),
                f["geometry"]["coordinates"].clone(),
            )
        })
        .collect();
    assert_eq!(got, expected);
}
