//! Writes a deterministic synthetic city (layers and centreline graph) to a folder.
//!
//! `cargo run --release --example make_city -- SEGMENTS HOMES OUT_DIR [SCHOOLS]`
//! (SCHOOLS 0 or absent: one per 250 homes). Invented data in open ocean, for benchmarks.

#[path = "support/synthetic_city.rs"]
mod synthetic_city;

use std::path::PathBuf;

fn main() -> std::process::ExitCode {
    let args: Vec<String> = std::env::args().collect();
    let num = |i: usize, d: usize| args.get(i).and_then(|s| s.parse().ok()).unwrap_or(d);
    let (segments, homes) = (num(1, 100_000), num(2, 50_000));
    let out = PathBuf::from(args.get(3).map_or("out/bench/city", |s| s.as_str()));
    let city = synthetic_city::city(segments, homes, num(4, 0));
    if let Err(e) = std::fs::create_dir_all(&out) {
        eprintln!("cannot create {}: {e}", out.display());
        return std::process::ExitCode::FAILURE;
    }
    for (name, text) in &city.files {
        if let Err(e) = std::fs::write(out.join(name), text) {
            eprintln!("cannot write {name}: {e}");
            return std::process::ExitCode::FAILURE;
        }
    }
    println!(
        "{{\"segments\": {}, \"homes\": {}, \"schools\": {}, \"nodes\": {}}}",
        city.segments, city.homes, city.schools, city.nodes
    );
    std::process::ExitCode::SUCCESS
}
