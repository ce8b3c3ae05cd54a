//! Layer reading with presets and mappings: any bytes give layers or an error, never a panic.
#![no_main]
use libfuzzer_sys::fuzz_target;

#[path = "common.rs"]
mod common;

fuzz_target!(|data: &[u8]| {
    if let Some(raw) = common::layers(data) {
        let _ = catchwalk::input::read_layers(&raw);
    }
});
