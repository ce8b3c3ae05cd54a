//! Fixtures shared by the whole-audit tests.

use catchwalk::input::{Layers, RawLayers};

/// The demo town (`sample-maps/demo-town`, plain preset), read as a user's files would be.
pub fn demo_town() -> Layers {
    let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/../sample-maps/demo-town/");
    let read = |f: &str| std::fs::read_to_string(format!("{dir}{f}")).unwrap_or_default();
    let raw = RawLayers {
        streets: read("streets.geojson"),
        crossings: Some(read("crossings.geojson")),
        schools: read("schools.geojson"),
        homes: read("homes.geojson"),
        catchments: Some(read("catchments.geojson")),
        ..RawLayers::default()
    };
    match catchwalk::input::read_layers(&raw) {
        Ok((layers, _)) => layers,
        Err(e) => panic!("demo town: {e}"),
    }
}
