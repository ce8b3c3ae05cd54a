//! The zipped-Shapefile reader: any bytes give a GeoJSON layer or an error, never a panic.
#![no_main]
use catchwalk::error::LayerName;
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    if let Ok(text) = catchwalk::input::shapefile::read_zip(data, None, LayerName::Streets) {
        // What the reader gives must itself read as a layer without a panic.
        let _ = serde_json::from_str::<serde_json::Value>(&text);
    }
});
