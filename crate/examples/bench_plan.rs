//! Times the upgrade planner on a synthetic district (the same grid as `bench_district`:
//! arterials every tenth street, signals where arterials meet, uncontrolled crossings of the
//! arterials elsewhere).
//!
//! `cargo run --release --example bench_plan [grid_side] [homes] [schools] [budget] [check]`
//! (defaults 100, 5000, 20, 5, 0); `check` 1 also plans afresh (every candidate tried every
//! round), times it, and says whether the two plans are identical.

#[path = "support/synthetic_district.rs"]
mod synthetic_district;

use catchwalk::config::Config;
use catchwalk::pipeline::audit_layers;
use catchwalk::score::plan::{plan_upgrades, plan_upgrades_afresh};
use std::time::Instant;

fn main() {
    let arg = synthetic_district::arg;
    let (side, n_homes, n_schools, budget) = (arg(1, 100), arg(2, 5_000), arg(3, 20), arg(4, 5));
    let layers = synthetic_district::district(side, n_homes, n_schools);
    let config = Config::default();
    let t = Instant::now();
    let mut clock = synthetic_district::Clock(Instant::now());
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
            if arg(5, 0) == 1 {
                let t = Instant::now();
                let afresh = plan_upgrades_afresh(&out, &out.scores.homes, budget);
                println!(
                    "afresh: {:.0} ms; identical plans: {}",
                    t.elapsed().as_secs_f64() * 1000.0,
                    afresh == plan
                );
            }
        }
        Err(e) => eprintln!("audit failed: {e}"),
    }
}
