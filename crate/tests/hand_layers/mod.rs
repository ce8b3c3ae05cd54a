//! GeoJSON text builders and the three points of the hand-worked cases (a west-east main
//! street through a junction at MID), shared by the whole-audit tests.
#![allow(dead_code)]

pub const WEST: [f64; 2] = [-35.0, 42.0];
pub const MID: [f64; 2] = [-34.998, 42.0];
pub const EAST: [f64; 2] = [-34.996, 42.0];

pub fn fc(features: &[String]) -> String {
    format!(
        r#"{{"type":"FeatureCollection","features":[{}]}}"#,
        features.join(",")
    )
}

pub fn line(id: &str, props: &str, coords: &[[f64; 2]]) -> String {
    let c: Vec<String> = coords
        .iter()
        .map(|p| format!("[{},{}]", p[0], p[1]))
        .collect();
    format!(
        r#"{{"type":"Feature","properties":{{"id":"{id}",{props}}},"geometry":{{"type":"LineString","coordinates":[{}]}}}}"#,
        c.join(",")
    )
}

pub fn point(props: &str, p: [f64; 2]) -> String {
    format!(
        r#"{{"type":"Feature","properties":{{{props}}},"geometry":{{"type":"Point","coordinates":[{},{}]}}}}"#,
        p[0], p[1]
    )
}
