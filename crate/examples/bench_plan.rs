//! Times the upgrade planner on a synthetic district (the same grid as `bench_district`:
//! arterials every tenth street, signals where arterials meet, uncontrolled crossings of the
//! arterials elsewhere).
//!
//! `cargo run --release --example bench_plan [grid_side] [homes] [schools] [budget]`
//! (defaults 100, 5000, 20, 5).

#[path = "support/synthetic_district.rs"]
mod synthetic_district;

use catchwalk::config::Config;
use catchwalk::pipeline::{audit_layers, Progress, Stage};
use catchwalk::score::plan::plan_upgrades;
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
    let (side, n_homes, n_schools, budget) = (arg(1, 100), arg(2, 5_000), arg(3, 20), arg(4, 5));
    let layers = synthetic_district::district(side, n_homes, n_schools);
    let config = Config::default();
    let t = Instant::now();
    let mut clock = Clock(Instant::now());
    match audit_layers(layers, &config, &mut clock) {
        Ok(out) => {
            println!(
                "edges {}, schools {}, homes {}; audit {:.0} ms",
                out.network.graph.edges.len(),
                out.layers.schools.len(),
                out.homes.len(),
                t.elapsed().as_secs_f64() * 1000.0
            );
            let t = Instant::now();
            let plan = plan_upgrades(&out, &out.scores.homes, budget);
            println!(
                "plan of {} upgrades: {:.0} ms; safe children {} -> {} of {}",
                plan.steps.len(),
                t.elapsed().as_secs_f64() * 1000.0,
                plan.safe_children_before,
                plan.safe_children_after,
                plan.children_routed
            );
        }
        Err(e) => eprintln!("audit failed: {e}"),
    }
}
