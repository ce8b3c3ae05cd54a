//! A whole audit, with every export, on small inputs (routing, scoring, CSV and GeoJSON).
#![no_main]
use libfuzzer_sys::fuzz_target;

#[path = "common.rs"]
mod common;

fuzz_target!(|data: &[u8]| {
    if data.len() > 64 * 1024 {
        return;
    }
    let Some(raw) = common::layers(data) else { return };
    let config = catchwalk::config::Config::default();
    if let Ok(out) = catchwalk::pipeline::run_audit(&raw, &config, &mut catchwalk::pipeline::Silent) {
        let _ = catchwalk::export::homes_csv(&out);
        let _ = catchwalk::export::catchments_csv(&out);
        let _ = catchwalk::export::hotspots_csv(&out);
        let _ = catchwalk::export::summary_json(&out);
        let _ = catchwalk::export::routes_geojson(&out);
        let _ = catchwalk::export::qa_geojson(&out.network.qa);
        let plan = catchwalk::score::plan::plan_upgrades(&out, &out.scores.homes, 1);
        let _ = catchwalk::export::plan_csv(&plan);
    }
});
