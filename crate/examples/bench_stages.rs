//! Times each stage of an audit of a city written by `make_city` (or any layers in that
//! layout): read, noding, graph, attachment, routing, scoring and each export. Prints JSON
//! for `tools/bench/bench.py`.
//!
//! `cargo run --release --example bench_stages -- CITY_DIR`

use catchwalk::config::Config;
use catchwalk::export;
use catchwalk::input::{read_layers, HomesFormat, RawLayers};
use catchwalk::network::build_network;
use catchwalk::pipeline::{audit_layers, Progress, Stage};
use std::io::sink;
use std::path::PathBuf;
use std::time::Instant;

struct Clock(Instant);
impl Progress for Clock {
    fn report(&mut self, _: Stage, _: usize, _: usize) -> bool {
        true
    }
    fn now_ms(&self) -> f64 {
        self.0.elapsed().as_secs_f64() * 1000.0
    }
}

fn ms(t: Instant) -> f64 {
    (t.elapsed().as_secs_f64() * 1e4).round() / 10.0
}

fn main() -> std::process::ExitCode {
    let dir = PathBuf::from(std::env::args().nth(1).unwrap_or("out/bench/city".into()));
    let read = |f: &str| std::fs::read_to_string(dir.join(f)).unwrap_or_default();
    let raw = RawLayers {
        streets: read("streets.geojson"),
        crossings: Some(read("crossings.geojson")),
        schools: read("schools.geojson"),
        homes: read("homes.csv"),
        homes_format: HomesFormat::Csv,
        ..RawLayers::default()
    };
    let config = Config::default();
    let mut stages: Vec<(&str, f64)> = Vec::new();
    let t = Instant::now();
    let layers = match read_layers(&raw) {
        Ok((l, _)) => l,
        Err(e) => {
            eprintln!("cannot read the city: {e}");
            return std::process::ExitCode::FAILURE;
        }
    };
    stages.push(("read", ms(t)));
    drop(raw);
    let t = Instant::now();
    let net = build_network(&layers, &config.network);
    stages.push(("network (noding, corners, edges, index, QA)", ms(t)));
    drop(net);
    let t = Instant::now();
    let out = match audit_layers(layers, &config, &mut Clock(Instant::now())) {
        Ok(o) => o,
        Err(e) => {
            eprintln!("audit failed: {e}");
            return std::process::ExitCode::FAILURE;
        }
    };
    let audit_ms = ms(t);
    let tm = out.timings.clone();
    stages.push(("network and attachment", tm.network_ms));
    stages.push(("routing and route audits", tm.routing_ms));
    stages.push(("scoring (homes, catchments, hotspots)", tm.scoring_ms));
    stages.push(("audit (network to scores)", audit_ms));
    let mut time = |name: &'static str, f: &mut dyn FnMut()| {
        let t = Instant::now();
        f();
        stages.push((name, ms(t)));
    };
    let mut bytes = 0usize;
    time("export summary.json", &mut || {
        bytes += serde_json::to_string_pretty(&export::summary_json(&out)).map_or(0, |s| s.len())
    });
    time("export homes.csv", &mut || {
        bytes += export::homes_csv(&out).len()
    });
    time("export flows.geojson", &mut || {
        let _ = export::flows::write_flows_geojson(&out, &mut sink());
    });
    time("export catchments.csv", &mut || {
        bytes += export::catchments_csv(&out).len()
    });
    time("export hotspots.csv", &mut || {
        bytes += export::hotspots_csv(&out).len()
    });
    time("export hotspots.geojson", &mut || {
        let _ = export::write_hotspots_geojson(&out, &mut sink());
    });
    time("export centrelines.geojson", &mut || {
        let _ = export::write_centrelines_geojson(&out, &mut sink());
    });
    time("export qa.geojson", &mut || {
        let _ = serde_json::to_writer_pretty(sink(), &export::qa_geojson(&out.network.qa));
    });
    let routed = out.homes.iter().filter(|h| h.shortest.is_some()).count();
    let doc = serde_json::json!({
        "segments": out.network.graph.segments.len(),
        "corners": out.network.graph.corners.len(),
        "edges": out.network.graph.edges.len(),
        "schools": out.layers.schools.len(),
        "homes": out.homes.len(),
        "routed": routed,
        "core_ms": tm.total_ms,
        "stages_ms": stages.iter().map(|(n, v)| serde_json::json!([n, v])).collect::<Vec<_>>(),
        "bytes": bytes,
    });
    println!("{doc}");
    std::process::ExitCode::SUCCESS
}
