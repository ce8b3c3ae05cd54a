//! Optimisations must not change results: the demo town's homes.csv and summary figures are
//! pinned to committed digests, and routing on one thread or several gives identical output.
//!
//! The digests change only deliberately: when a change of method alters results, rerun with
//! `PRINT_DIGESTS=1 cargo test --test output_pins -- --nocapture` and commit the new values
//! with the reason.

mod common;

#[path = "../examples/support/synthetic_city.rs"]
mod synthetic_city;

use catchwalk::config::Config;
use catchwalk::export::{homes_csv, summary_json};
use catchwalk::input::{HomesFormat, RawLayers};
use catchwalk::pipeline::{audit_layers, run_audit, AuditOutput, Silent};

/// FNV-1a, 64 bit: a fixed, dependency-free fingerprint of an output file.
fn fnv1a(bytes: &[u8]) -> u64 {
    bytes.iter().fold(0xcbf2_9ce4_8422_2325, |h, &b| {
        (h ^ u64::from(b)).wrapping_mul(0x0000_0100_0000_01b3)
    })
}

/// summary.json without its wall-clock timings.
fn summary_figures(out: &AuditOutput) -> String {
    let mut s = summary_json(out);
    if let Some(m) = s.as_object_mut() {
        m.remove("timings_ms");
    }
    serde_json::to_string_pretty(&s).unwrap_or_default()
}

fn demo_audit() -> AuditOutput {
    match audit_layers(common::demo_town(), &Config::default(), &mut Silent) {
        Ok(o) => o,
        Err(e) => panic!("demo town audit: {e}"),
    }
}

/// Pinned on the demo town when the edge facts table and parallel routing came in (outputs
/// checked byte-identical to the previous commit's CLI run), re-pinned at the merge that
/// brought in the methods of issue 9 (walking time at 1.22 m/s, site checks, walk zones by
/// pupil), the CSV hardening (neutralised cells, no caution line) and the interventions
/// (homes.csv checked byte-identical to the CLI of the commit before the merge).
const HOMES_CSV_DIGEST: u64 = 0x0234_394f_3766_fb7d;
const SUMMARY_DIGEST: u64 = 0xe366_bbee_b4a1_8d94;

#[test]
fn demo_town_outputs_match_their_pinned_digests() {
    let out = demo_audit();
    let homes = fnv1a(homes_csv(&out).as_bytes());
    let summary = fnv1a(summary_figures(&out).as_bytes());
    if std::env::var_os("PRINT_DIGESTS").is_some() {
        println!("HOMES_CSV_DIGEST: {homes:#018x}\nSUMMARY_DIGEST: {summary:#018x}");
    }
    assert_eq!(
        homes, HOMES_CSV_DIGEST,
        "homes.csv of the demo town changed"
    );
    assert_eq!(
        summary, SUMMARY_DIGEST,
        "summary figures of the demo town changed"
    );
}

fn audit_on_threads(raw: &RawLayers, threads: usize) -> AuditOutput {
    let pool = match rayon::ThreadPoolBuilder::new().num_threads(threads).build() {
        Ok(p) => p,
        Err(e) => panic!("thread pool: {e}"),
    };
    match pool.install(|| run_audit(raw, &Config::default(), &mut Silent)) {
        Ok(o) => o,
        Err(e) => panic!("audit: {e}"),
    }
}

/// The synthetic city of 4 000 segments, 1 500 homes and 20 schools (elementary and secondary:
/// both safe-route cost tables; more schools than one routing batch).
fn synthetic_layers() -> RawLayers {
    let city = synthetic_city::city(4_000, 1_500, 20);
    let file = |n: &str| {
        city.files
            .iter()
            .find(|(name, _)| *name == n)
            .map(|(_, t)| t.clone())
            .unwrap_or_default()
    };
    RawLayers {
        streets: file("streets.geojson"),
        crossings: Some(file("crossings.geojson")),
        schools: file("schools.geojson"),
        homes: file("homes.csv"),
        homes_format: HomesFormat::Csv,
        ..RawLayers::default()
    }
}

#[test]
fn one_thread_and_several_give_identical_output() {
    // A synthetic city with elementary and secondary schools (both safe-route cost tables),
    // more schools than one routing batch.
    let raw = synthetic_layers();
    let one = audit_on_threads(&raw, 1);
    let four = audit_on_threads(&raw, 4);
    assert!(one.homes.iter().filter(|h| h.shortest.is_some()).count() > 1_000);
    assert!(one.homes.iter().any(|h| h.safe.is_some()));
    assert_eq!(one.homes, four.homes);
    assert_eq!(homes_csv(&one), homes_csv(&four));
    assert_eq!(summary_figures(&one), summary_figures(&four));
    let hot = catchwalk::export::hotspots_csv;
    assert!(one.scores.hotspots.len() > 2048);
    assert_eq!(hot(&one), hot(&four));
}

#[test]
fn flows_count_each_routed_child_on_every_edge_of_its_route() {
    let out = demo_audit();
    let flows = catchwalk::export::flows::edge_flows(&out);
    let mut expected = 0u64;
    for (i, h) in out.homes.iter().enumerate() {
        let Some(r) = &h.shortest else { continue };
        let children = out.layers.homes[i].children;
        let mut edges: Vec<u32> = r.route.steps.iter().map(|s| s.edge).collect();
        edges.sort_unstable();
        edges.dedup();
        for e in &edges {
            assert!(flows[*e as usize].shortest >= children);
        }
        expected += u64::from(children) * edges.len() as u64;
    }
    let total: u64 = flows.iter().map(|f| u64::from(f.shortest)).sum();
    assert!(
        expected > 1_000,
        "the demo town routes children over many edges"
    );
    assert_eq!(total, expected);
}

#[test]
fn flows_file_lists_every_walked_edge_once_in_edge_order() {
    // Enough walked edges for several of the blocks the file is written in (2 048 each).
    let raw = synthetic_layers();
    let out = audit_on_threads(&raw, 2);
    let flows = catchwalk::export::flows::edge_flows(&out);
    let mut text = Vec::new();
    if let Err(e) = catchwalk::export::flows::write_flows_geojson(&out, &mut text) {
        panic!("flows: {e}");
    }
    let doc: serde_json::Value = match serde_json::from_slice(&text) {
        Ok(v) => v,
        Err(e) => panic!("flows.geojson is not JSON: {e}"),
    };
    let features = doc["features"].as_array().cloned().unwrap_or_default();
    let expected: Vec<(u64, u64, u64)> = flows
        .iter()
        .enumerate()
        .filter(|(_, f)| f.shortest > 0 || f.recommended > 0)
        .map(|(e, f)| (e as u64, u64::from(f.shortest), u64::from(f.recommended)))
        .collect();
    assert!(expected.len() > 2 * 2048, "{} walked edges", expected.len());
    let got: Vec<(u64, u64, u64)> = features
        .iter()
        .map(|f| {
            let p = &f["properties"];
            let n = |k: &str| p[k].as_u64().unwrap_or(u64::MAX);
            (n("edge"), n("children_shortest"), n("children_recommended"))
        })
        .collect();
    assert_eq!(got, expected);
    assert!(features.iter().all(|f| f["geometry"]["coordinates"]
        .as_array()
        .is_some_and(|c| c.len() >= 2)));
}

#[test]
fn streamed_layers_are_their_collections_one_feature_per_line() {
    // The files are written in blocks on every core; as JSON they are the collections built
    // whole (the form the page and `routes_geojson_of` use), feature for feature.
    use catchwalk::export::{
        centrelines_geojson, hotspots_geojson, routes_geojson, write_centrelines_geojson,
        write_hotspots_geojson, write_routes_geojson,
    };
    let raw = synthetic_layers();
    let out = audit_on_threads(&raw, 2);
    type Writer = fn(&AuditOutput, &mut dyn std::io::Write) -> std::io::Result<()>;
    let written = |f: Writer| {
        let mut text = Vec::new();
        if let Err(e) = f(&out, &mut text) {
            panic!("writing: {e}");
        }
        let text = String::from_utf8(text).unwrap_or_default();
        let value: serde_json::Value = match serde_json::from_str(&text) {
            Ok(v) => v,
            Err(e) => panic!("not JSON: {e}"),
        };
        let n = value["features"].as_array().map_or(0, Vec::len);
        // The opening line, one line per feature, the closing line.
        assert_eq!(text.lines().count(), n + 2);
        (value, n)
    };
    // Both read back by the same parser (serde_json's reading of a float may differ from the
    // value written by one unit in the last place).
    let whole = |text: serde_json::Result<String>| -> serde_json::Value {
        serde_json::from_str(&text.unwrap_or_default()).unwrap_or_default()
    };
    let first_difference = |a: &serde_json::Value, b: &serde_json::Value| {
        let (fa, fb) = (a["features"].as_array(), b["features"].as_array());
        fa.zip(fb)
            .and_then(|(x, y)| x.iter().zip(y).find(|(p, q)| p != q))
            .map(|(p, q)| format!("{p}\n{q}"))
    };
    let (routes, n_routes) = written(write_routes_geojson);
    let r2 = whole(serde_json::to_string(&routes_geojson(&out)));
    assert_eq!(first_difference(&routes, &r2), None);
    assert_eq!(routes, r2);
    let (centrelines, n_segments) = written(write_centrelines_geojson);
    let c2 = whole(serde_json::to_string(&centrelines_geojson(&out)));
    assert_eq!(first_difference(&centrelines, &c2), None);
    assert_eq!(centrelines, c2);
    let (hotspots, n_hotspots) = written(write_hotspots_geojson);
    let h2 = whole(serde_json::to_string(&hotspots_geojson(&out)));
    assert_eq!(first_difference(&hotspots, &h2), None);
    assert_eq!(hotspots, h2);
    // Several blocks of 2 048 each.
    assert!(n_routes > 2 * 2048, "{n_routes} routes");
    assert!(n_segments > 2048, "{n_segments} segments");
    assert!(n_hotspots > 2048, "{n_hotspots} hotspots");
    assert_eq!(routes["caution"], catchwalk::CAUTION);
}

#[test]
fn an_audit_that_lets_go_of_its_text_gives_the_same_results() {
    // The page's worker audits with `run_audit_owned` (the layers' text dropped once read).
    let raw = synthetic_layers();
    let kept = match run_audit(&raw, &Config::default(), &mut Silent) {
        Ok(o) => o,
        Err(e) => panic!("audit: {e}"),
    };
    let owned = match catchwalk::pipeline::run_audit_owned(raw, &Config::default(), &mut Silent) {
        Ok(o) => o,
        Err(e) => panic!("audit: {e}"),
    };
    assert!(kept.homes.iter().filter(|h| h.shortest.is_some()).count() > 1_000);
    assert_eq!(kept.homes, owned.homes);
    assert_eq!(kept.warnings, owned.warnings);
    assert_eq!(homes_csv(&kept), homes_csv(&owned));
    assert_eq!(summary_figures(&kept), summary_figures(&owned));
}
