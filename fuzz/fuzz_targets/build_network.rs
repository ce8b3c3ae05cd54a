//! Network building (noding, corners, crossings, attachment, QA) on whatever layers read.
#![no_main]
use libfuzzer_sys::fuzz_target;

#[path = "common.rs"]
mod common;

fuzz_target!(|data: &[u8]| {
    let Some(raw) = common::layers(data) else { return };
    if let Ok((layers, _)) = catchwalk::input::read_layers(&raw) {
        let config = catchwalk::config::Config::default();
        let _ = catchwalk::pipeline::prepare_network(&layers, &config);
    }
});
