//! Times a whole audit on a synthetic district: a street grid of about 100 k segments with
//! arterials every tenth street, crossing points at some junctions, tens of schools and
//! thousands of homes. Layers are built in memory (parsing is measured separately).
//!
//! `cargo run --release --example bench_district [grid_side] [homes] [schools]`
//! (defaults 224, 20000, 40: about 100 k segments).

#[path = "support/synthetic_district.rs"]
mod synthetic_district;

use catchwalk::config::Config;
use catchwalk::pipeline::{audit_layers, Progress, Stage};
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

fn main() {
    let arg = |i: usize, d: usize| {
        std::env::args()
            .nth(i)
            .and_then(|s| s.parse().ok())
            .unwrap_or(d)
    };
    let (side, n_homes, n_schools) = (arg(1, 224), arg(2, 20_000), arg(3, 40));
    let layers = synthetic_district::district(side, n_homes, n_schools);
    let config = Config::default();
    let t = Instant::now();
    let mut clock = Clock(Instant::now());
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
