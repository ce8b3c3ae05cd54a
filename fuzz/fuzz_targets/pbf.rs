//! The OpenStreetMap `.osm.pbf` reader: any bytes give a GeoJSON layer or an error, never a
//! panic.
#![no_main]
use catchwalk::error::LayerName;
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    if let Ok(text) = catchwalk::input::pbf::read_pbf(data, LayerName::Streets) {
        let _ = serde_json::from_str::<serde_json::Value>(&text);
    }
});
