//! Times a whole audit on a synthetic district: a street grid of about 100 k segments with
//! arterials every tenth street, crossing points at some junctions, tens of schools and
//! thousands of homes. Layers are built in memory (parsing is measured separately).
//!
//! `cargo run --release --example bench_district [grid_side] [homes] [schools]`
//! (defaults 224, 20000, 40: about 100 k segments).

#[path = "support/synthetic_district.rs"]
mod synthetic_district;

use catchwalk::config::Config;
use catchwalk::pipeline::audit_layers;
use std::time::Instant;

fn main() {
    let arg = synthetic_district::arg;
    let (side, n_homes, n_schools) = (arg(1, 224), arg(2, 20_000), arg(3, 40));
    let layers = synthetic_district::district(side, n_homes, n_schools);
    let config = Config::default();
    let t = Instant::now();
    let mut clock = synthetic_district::Clock(Instant::now());
    match audit_layers(layers, &config, &mut clock) {
        Ok(out) => {
            let routed = out.homes.iter().filter(|h| h.shortest.is_some()).count();
            println!(
                "segments {}, corners {}, edges {}, schools {}, homes {} ({} routed)",
                out.network.graph.segments.len(),
                out.network.graph.corners.len(),
                out.network.graph.edges.len(),
                out.layers.schools.len(),
                out.homes.len(),
                routed
            );
            println!(
                "network {:.0} ms, routing {:.0} ms, total {:.0} ms",
                out.timings.network_ms,
                out.timings.routing_ms,
                t.elapsed().as_secs_f64() * 1000.0
            );
        }
        Err(e) => eprintln!("audit failed: {e}"),
    }
}
