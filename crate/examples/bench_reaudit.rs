//! Times a re-audit after one intervention against the audit from scratch, on the synthetic
//! district: a crossing guard at a junction next to one school's entrance. Checks that both
//! give the same homes and scores.
//!
//! `cargo run --release --example bench_reaudit [grid_side] [homes] [schools]`
//! (defaults 224, 20000, 40: about 100 k segments). The wasm figure on the demo town comes
//! from `node tools/bench_reaudit.mjs` (after `make web-build`).

#[path = "support/synthetic_district.rs"]
mod synthetic_district;

use catchwalk::config::Config;
use catchwalk::input::{Control, Layers};
use catchwalk::pipeline::{audit_layers, Silent};
use catchwalk::scenario::reaudit::{audit_overlay, reaudit};
use catchwalk::scenario::{Change, Intervention, Origin};
use std::sync::Arc;
use std::time::Instant;

fn guard_near_school(layers: &Layers) -> Intervention {
    let at = layers
        .schools
        .first()
        .and_then(|s| s.entrances.first())
        .copied()
        .unwrap_or([-35.0, 42.0]);
    // The grid junction just west of the entrance (junctions sit every 0.0012 degrees).
    let step = 0.0012;
    let x = ((at[0] + 35.0) / step).floor() * step - 35.0;
    let y = ((at[1] - 42.0) / (step * 0.75)).round() * step * 0.75 + 42.0;
    Intervention {
        feature: 0,
        id: Some("bench".into()),
        kind: "guard".into(),
        change: Change::Control {
            at: [x, y],
            control: Control {
                guard: Some(Vec::new()),
                ..Control::UNCONTROLLED
            },
            scope: catchwalk::input::ControlScope::NearestLeg,
        },
        at: Some([x, y]),
        origin: Origin::Proposal,
        note: None,
    }
}

fn main() {
    let arg = synthetic_district::arg;
    let (side, n_homes, n_schools) = (arg(1, 224), arg(2, 20_000), arg(3, 40));
    let layers = synthetic_district::district(side, n_homes, n_schools);
    let config = Config::default();
    let iv = guard_near_school(&layers);
    let t = Instant::now();
    let mut clock = synthetic_district::Clock(Instant::now());
    let base = match audit_layers(layers.clone(), &config, &mut clock) {
        Ok(o) => o,
        Err(e) => return eprintln!("audit failed: {e}"),
    };
    let base_ms = t.elapsed().as_secs_f64() * 1e3;
    let t = Instant::now();
    let (re, stats) = match reaudit(&base, vec![iv.clone()], &mut Silent) {
        Ok(r) => r,
        Err(e) => return eprintln!("re-audit failed: {e}"),
    };
    let re_ms = t.elapsed().as_secs_f64() * 1e3;
    let t = Instant::now();
    let scratch = match audit_overlay(Arc::new(layers), vec![iv], &config, &mut Silent) {
        Ok(o) => o,
        Err(e) => return eprintln!("audit failed: {e}"),
    };
    let scratch_ms = t.elapsed().as_secs_f64() * 1e3;
    println!(
        "segments {}, schools {}, homes {}",
        base.network.graph.segments.len(),
        base.layers.schools.len(),
        base.layers.homes.len()
    );
    println!("baseline audit {base_ms:.0} ms; with one guard: from scratch {scratch_ms:.0} ms, re-audit {re_ms:.0} ms ({} of {} schools re-routed, full: {})",
        stats.schools_rerouted, stats.schools, stats.full);
    println!(
        "re-audit equals the audit from scratch: {}",
        re.homes == scratch.homes && re.scores == scratch.scores
    );
}
