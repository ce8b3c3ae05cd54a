//! Monotonicity of the risk index and the safe-route test, as property tests on random small
//! networks (built by hand as layers, then through `build_network` and the whole audit) and on
//! the demo town (plain preset):
//!
//! - raising any speed never lowers risk (every edge; every route walked as before);
//! - adding a control never raises it;
//! - lowering a speed or adding a sidewalk never turns a safe route unsafe;
//! - the recommended route's risk is never above the shortest route's;
//! - the detour cap holds.

mod common;
use common::demo_town;

use catchwalk::config::Config;
use catchwalk::input::{
    Control, ControlScope, CrossingPoint, Device, Home, Layers, RoadClass, School, SideWalk,
    Street, Students, TimeWindow,
};
use catchwalk::network::{PedEdgeKind, PedGraph};
use catchwalk::pipeline::{audit_layers, AuditOutput, Silent};
use catchwalk::risk::edge_risk_points;
use catchwalk::score::home::score_home;
use catchwalk::score::plan::route_risk;
use proptest::prelude::*;

const STEP: f64 = 0.0012; // about 133 m at the equator

#[derive(Debug, Clone)]
struct StreetSpec {
    class: u8,
    speed: u8,
    lanes: u8,
    sidewalk: u8,
}

fn street_spec() -> impl Strategy<Value = StreetSpec> {
    (0u8..4, 0u8..6, 0u8..3, 0u8..4).prop_map(|(class, speed, lanes, sidewalk)| StreetSpec {
        class,
        speed,
        lanes,
        sidewalk,
    })
}

fn control(code: u8) -> Control {
    let mut c = Control::UNCONTROLLED;
    match code % 8 {
        0 => c.device = Device::Marked,
        1 => c.device = Device::Beacon,
        2 => c.device = Device::Stop,
        3 => c.device = Device::AllWayStop,
        4 => c.device = Device::Signal,
        5 => c.refuge_island = true,
        6 => c.guard = Some(vec![]),
        _ => c.raised = true,
    }
    c
}

/// A grid town of `nx x ny` junctions: every block edge its own street.
fn grid_layers(
    nx: usize,
    ny: usize,
    specs: &[StreetSpec],
    crossings: &[(usize, u8)],
    homes: &[(usize, u8)],
    school_at: usize,
) -> Layers {
    let at = |i: usize, j: usize| [i as f64 * STEP, j as f64 * STEP];
    let mut lines = Vec::new();
    for j in 0..ny {
        for i in 0..nx.saturating_sub(1) {
            lines.push(vec![at(i, j), at(i + 1, j)]);
        }
    }
    for i in 0..nx {
        for j in 0..ny.saturating_sub(1) {
            lines.push(vec![at(i, j), at(i, j + 1)]);
        }
    }
    let streets: Vec<Street> = lines
        .into_iter()
        .enumerate()
        .map(|(k, line)| {
            let s = &specs[k % specs.len()];
            let class = [
                RoadClass::Arterial,
                RoadClass::Collector,
                RoadClass::Local,
                RoadClass::Path,
            ][s.class as usize % 4];
            let sw = [
                SideWalk::Present,
                SideWalk::Absent,
                SideWalk::Unknown,
                SideWalk::Present,
            ][s.sidewalk as usize % 4];
            Street {
                id: format!("s{k}"),
                left: sw,
                right: if s.sidewalk == 3 {
                    SideWalk::Absent
                } else {
                    sw
                },
                ..Street::new(
                    k,
                    class,
                    [20.0, 30.0, 40.0, 50.0, 60.0, 70.0][s.speed as usize % 6],
                    [1, 2, 4][s.lanes as usize % 3],
                    line,
                )
            }
        })
        .collect();
    let n = nx * ny;
    let node = |k: usize| at(k % nx, (k / nx) % ny);
    let crossings = crossings
        .iter()
        .enumerate()
        .map(|(f, &(k, code))| CrossingPoint {
            feature: f,
            id: format!("c{f}"),
            at: node(k % n),
            control: control(code),
            scope: ControlScope::AllLegs,
        })
        .collect();
    // Homes sit 10 m off the middle of a block edge (east-west edges, north side).
    let homes = homes
        .iter()
        .enumerate()
        .map(|(f, &(k, children))| {
            let i = k % nx.saturating_sub(1).max(1);
            let j = (k / nx) % ny;
            let p = at(i, j);
            Home {
                feature: f,
                id: format!("h{f}"),
                at: [p[0] + STEP * 0.5, p[1] + 0.00009],
                children: 1 + children as u32 % 3,
                school: None,
            }
        })
        .collect();
    let sp = node(school_at % n);
    Layers {
        streets,
        crossings,
        schools: vec![School {
            feature: 0,
            id: "S".into(),
            name: "School".into(),
            entrances: vec![[sp[0] + 0.00004, sp[1] + 0.00004]],
            students: Students::Elementary,
        }],
        homes,
        ..Layers::default()
    }
}

fn town() -> impl Strategy<Value = Layers> {
    (
        3usize..5,
        3usize..5,
        prop::collection::vec(street_spec(), 6..14),
        prop::collection::vec((0usize..25, any::<u8>()), 0..8),
        prop::collection::vec((0usize..25, any::<u8>()), 1..7),
        0usize..25,
    )
        .prop_map(|(nx, ny, specs, crossings, homes, school)| {
            grid_layers(nx, ny, &specs, &crossings, &homes, school)
        })
}

fn audit(layers: &Layers, config: &Config) -> AuditOutput {
    match audit_layers(layers.clone(), config, &mut Silent) {
        Ok(out) => out,
        Err(e) => panic!("audit failed: {e}"),
    }
}

fn edge_risks(g: &PedGraph, streets: &[Street], c: &Config) -> Vec<f64> {
    g.edges
        .iter()
        .map(|e| edge_risk_points(g, e, streets, &c.risk))
        .collect()
}

fn students(out: &AuditOutput, i: usize) -> Students {
    out.homes[i]
        .assignment
        .school
        .map(|s| out.layers.schools[s].students)
        .unwrap_or_default()
}

// --- the properties, as plain checks shared by the random towns and the demo town --------

fn check_routes(out: &AuditOutput) -> Result<(), String> {
    let cap = out.config.route.detour_cap;
    for (i, h) in out.homes.iter().enumerate() {
        if let (Some(s), Some(r)) = (&h.shortest, &h.recommended) {
            if r.risk > s.risk + 1e-9 {
                return Err(format!(
                    "home {i}: recommended risk {} > shortest {}",
                    r.risk, s.risk
                ));
            }
            if r.audit.walked_m > cap * s.audit.walked_m + 1e-6 {
                return Err(format!(
                    "home {i}: recommended {} m over {cap} x shortest {} m",
                    r.audit.walked_m, s.audit.walked_m
                ));
            }
        }
    }
    Ok(())
}

fn check_raising_speed(out: &AuditOutput, street: usize, by_kmh: f64) -> Result<(), String> {
    let g = &out.network.graph;
    let c = &out.config;
    let before = edge_risks(g, &out.layers.streets, c);
    let mut streets = out.layers.streets.clone();
    if let Some(s) = streets.get_mut(street) {
        s.speed_kmh += by_kmh;
    }
    let after = edge_risks(g, &streets, c);
    for (k, (b, a)) in before.iter().zip(&after).enumerate() {
        if a + 1e-12 < *b {
            return Err(format!("edge {k}: risk fell from {b} to {a}"));
        }
    }
    for (i, h) in out.homes.iter().enumerate() {
        for r in [&h.shortest, &h.recommended].into_iter().flatten() {
            let a = route_risk(g, &streets, c, &r.route);
            if a + 1e-12 < r.risk {
                return Err(format!("home {i}: route risk fell from {} to {a}", r.risk));
            }
        }
    }
    Ok(())
}

fn check_adding_control(out: &AuditOutput, code: u8) -> Result<(), String> {
    let c = &out.config;
    let g = &out.network.graph;
    let streets = &out.layers.streets;
    let mut g2 = g.clone();
    for e in g2.edges.iter_mut() {
        if let PedEdgeKind::Crossing { control, .. } = &mut e.kind {
            match code % 5 {
                0 => control.device = control.device.max(Device::Beacon),
                1 => control.device = Device::Signal,
                2 => control.refuge_island = true,
                3 => control.raised = true,
                _ => {
                    control.guard = Some(vec![TimeWindow {
                        start_min: 7 * 60,
                        end_min: 9 * 60,
                    }])
                }
            }
        }
    }
    let before = edge_risks(g, streets, c);
    let after = edge_risks(&g2, streets, c);
    for (k, (b, a)) in before.iter().zip(&after).enumerate() {
        if *a > b + 1e-12 {
            return Err(format!("edge {k}: a control raised risk from {b} to {a}"));
        }
    }
    Ok(())
}

/// Lowering a street's speed, or giving it sidewalks, never turns a safe route unsafe: the
/// same routes, judged on the changed network, stay safe; and after the whole audit runs
/// again on the changed network, no home that had a safe route loses it (the safe route is
/// the shortest route no rule flags, so the change can only shorten it).
fn check_safe_stays_safe(out: &AuditOutput, street: usize, sidewalk: bool) -> Result<(), String> {
    let mut layers = out.layers.clone();
    if let Some(s) = layers.streets.get_mut(street) {
        if sidewalk {
            s.left = SideWalk::Present;
            s.right = SideWalk::Present;
        } else {
            s.speed_kmh = (s.speed_kmh - 20.0).max(10.0);
        }
    }
    let after = audit(&layers, &out.config);
    if after.network.graph.edges.len() != out.network.graph.edges.len() {
        return Err("the change altered the network's shape".into());
    }
    for (i, h) in out.homes.iter().enumerate() {
        let was = &out.scores.homes[i];
        let now = score_home(
            h.shortest.as_ref(),
            h.recommended.as_ref(),
            h.safe.as_ref(),
            students(out, i),
            &after.network.graph,
            &after.layers.streets,
            &after.config,
        );
        if was.safe_route && !now.safe_route {
            return Err(format!(
                "home {i}: same route turned unsafe: {}",
                now.unsafe_reason
            ));
        }
        if now.risk > was.risk + 1e-12 {
            return Err(format!(
                "home {i}: same route got riskier: {} -> {}",
                was.risk, now.risk
            ));
        }
    }
    for (i, (was, now)) in out.scores.homes.iter().zip(&after.scores.homes).enumerate() {
        if was.safe_route && !now.safe_route {
            return Err(format!(
                "home {i}: re-routed, lost its safe route: {}",
                now.unsafe_reason
            ));
        }
    }
    Ok(())
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 24, failure_persistence: None, ..ProptestConfig::default() })]

    #[test]
    fn random_towns_recommended_never_riskier_and_cap_holds(layers in town()) {
        let out = audit(&layers, &Config::default());
        prop_assert!(out.homes.iter().any(|h| h.recommended.is_some()), "no home was routed");
        check_routes(&out).map_err(TestCaseError::fail)?;
        let mut tight = Config::default();
        tight.route.detour_cap = 1.1;
        tight.route.metres_per_risk_point = 2000.0;
        check_routes(&audit(&layers, &tight)).map_err(TestCaseError::fail)?;
    }

    #[test]
    fn random_towns_raising_a_speed_never_lowers_risk(
        layers in town(), street in 0usize..40, by in 1.0f64..40.0
    ) {
        let out = audit(&layers, &Config::default());
        check_raising_speed(&out, street % layers.streets.len(), by).map_err(TestCaseError::fail)?;
    }

    #[test]
    fn random_towns_adding_a_control_never_raises_risk(layers in town(), code in any::<u8>()) {
        let out = audit(&layers, &Config::default());
        check_adding_control(&out, code).map_err(TestCaseError::fail)?;
    }

    #[test]
    fn random_towns_lower_speed_or_sidewalk_keeps_safe_routes_safe(
        layers in town(), street in 0usize..40, sidewalk in any::<bool>()
    ) {
        let out = audit(&layers, &Config::default());
        check_safe_stays_safe(&out, street % layers.streets.len(), sidewalk)
            .map_err(TestCaseError::fail)?;
        let pa = Config {
            score: catchwalk::score::ScoreConfig {
                rules: catchwalk::score::rules::RuleSet::builtin("pa-447").unwrap_or_default(),
                ..Default::default()
            },
            ..Config::default()
        };
        let out = audit(&layers, &pa);
        check_safe_stays_safe(&out, street % layers.streets.len(), sidewalk)
            .map_err(TestCaseError::fail)?;
    }
}

// --- the demo town -------------------------------------------------------------------------

#[test]
fn demo_town_monotonicity() {
    let layers = demo_town();
    let out = audit(&layers, &Config::default());
    assert!(out.homes.iter().filter(|h| h.recommended.is_some()).count() > 300);
    check_routes(&out).unwrap();
    check_adding_control(&out, 0).unwrap();
    check_adding_control(&out, 2).unwrap();
    check_adding_control(&out, 4).unwrap();
    // Every street whose speed or sidewalks could matter: the non-foot streets, a sample.
    let roads: Vec<usize> = (0..layers.streets.len())
        .filter(|&k| !layers.streets[k].class.is_foot_only())
        .collect();
    for &k in roads.iter().step_by(4) {
        check_raising_speed(&out, k, 20.0).unwrap();
    }
    for &k in roads.iter().step_by(3) {
        for sidewalk in [false, true] {
            check_safe_stays_safe(&out, k, sidewalk).unwrap();
        }
    }
}
