//! A catchment computed by hand: one school, three homes (1, 2 and 1 children), two routes
//! each (shortest and recommended), every scored figure checked against a hand computation
//! from the equations in docs/methods.md (default config: Rosén & Sander 2009 curve, default
//! local volume 500 veh/day, K = 0.10, PHF = 0.92, HCM crossing speed 1.07 m/s, t_s = 3 s; walking time and active minutes at 1.22 m/s).
//!
//! Edges (lengths in metres):
//! - A: side of Oak Street (local, 50 km/h, 2 lanes, sidewalk), 400 -> no risk
//! - B: side of Fern Lane (local, 50 km/h, no sidewalk, no shoulder), 200 -> 2 points
//!   (100 m beside the reference street is 1 point)
//! - P, Q: foot paths, 800 and 1500 -> no risk
//! - X: uncontrolled crossing of Oak Street, 7.2 wide -> exactly 1 point (the reference)
//! - Y: uncontrolled crossing of Ring Road (arterial, 60 km/h, 4 lanes, 100 vehicles in the
//!   peak 15 minutes), 14.4 wide:
//!   severity ratio 1/(1+e^(6.9-5.4)) / 1/(1+e^(6.9-4.5)) = 0.182426/0.083173 = 2.193334;
//!   P_d = 1 - e^(-(100/900)(14.4/1.07 + 3)) = 0.839385; reference P_d =
//!   1 - e^(-(13.5870/900)(7.2/1.07 + 3)) = 0.136598; exposure 6.144841;
//!   risk = 2.193334 x 6.144841 = 13.477691 points.
//!
//! Homes:
//! - H1 (1 child): both routes A(300 of 400) + X: network 300, walked 307.2, risk 1.
//! - H2 (2 children): shortest B + A + X (network 600, walked 607.2, risk 3); recommended
//!   P + X (network 800, walked 807.2 <= 1.5 x 607.2, risk 1).
//! - H3 (1 child): both routes B + Q + Y: network 1700 (> 1600 walk zone), walked 1714.4,
//!   risk 2 + 13.477691 = 15.477691.

use catchwalk::audit::audit_route;
use catchwalk::config::Config;
use catchwalk::input::{Control, Home, Layers, RoadClass, School, SideWalk, Street, Students};
use catchwalk::network::{Corner, Junction, PedEdge, PedEdgeKind, PedGraph, Segment, Side};
use catchwalk::pipeline::{AuditedRoute, HomeResult};
use catchwalk::route::assign::{AssignedBy, Assignment};
use catchwalk::route::{Route, RouteKind, RouteStep};
use catchwalk::score::catchment::Quadrant;
use catchwalk::score::plan::route_risk;
use catchwalk::score::score_audit;

fn street(id: &str, name: &str, class: RoadClass, speed: f64, lanes: u32, sw: SideWalk) -> Street {
    Street {
        id: id.into(),
        name: Some(name.into()),
        left: sw,
        right: sw,
        ..Street::new(0, class, speed, lanes, vec![[0.0, 0.0], [0.001, 0.0]])
    }
}

const A: u32 = 0;
const B: u32 = 1;
const P: u32 = 2;
const Q: u32 = 3;
const X: u32 = 4;
const Y: u32 = 5;

fn fixture() -> (Layers, PedGraph) {
    let mut ring = street(
        "ring",
        "Ring Road",
        RoadClass::Arterial,
        60.0,
        4,
        SideWalk::Present,
    );
    ring.vehicles_15min = Some(100.0);
    let streets = vec![
        street(
            "oak",
            "Oak Street",
            RoadClass::Local,
            50.0,
            2,
            SideWalk::Present,
        ),
        street(
            "fern",
            "Fern Lane",
            RoadClass::Local,
            50.0,
            2,
            SideWalk::Absent,
        ),
        street(
            "path",
            "Park Path",
            RoadClass::Path,
            5.0,
            1,
            SideWalk::Present,
        ),
        ring,
    ];
    let mut g = PedGraph::default();
    g.junctions.push(Junction {
        at: [0.0, 0.0],
        layer: 0,
    });
    g.corners.push(Corner {
        junction: 0,
        at: [0.0, 0.0],
    });
    // Segments: 0 Oak, 1 Fern, 2 and 3 paths, 4 Ring.
    for (street, len) in [(0, 400.0), (1, 200.0), (2, 800.0), (2, 1500.0), (3, 300.0)] {
        g.segments.push(Segment {
            street,
            from: 0,
            to: 0,
            line: vec![[0.0, 0.0], [0.001, 0.0]],
            length_m: len,
        });
    }
    let side = |segment, sidewalk| PedEdgeKind::Side {
        segment,
        side: Side::Left,
        sidewalk,
    };
    let crossing = |segment| PedEdgeKind::Crossing {
        junction: 0,
        segment,
        control: Control::UNCONTROLLED,
        midblock: false,
    };
    for (kind, len) in [
        (side(0, SideWalk::Present), 400.0),
        (side(1, SideWalk::Absent), 200.0),
        (PedEdgeKind::Path { segment: 2 }, 800.0),
        (PedEdgeKind::Path { segment: 3 }, 1500.0),
        (crossing(0), 7.2),
        (crossing(4), 14.4),
    ] {
        g.edges.push(PedEdge {
            a: 0,
            b: 0,
            kind,
            length_m: len,
        });
    }
    let home = |id: &str, children| Home {
        feature: 0,
        id: id.into(),
        at: [0.0, 0.0],
        children,
        school: None,
    };
    let layers = Layers {
        streets,
        crossings: vec![],
        schools: vec![School {
            feature: 0,
            id: "S".into(),
            name: "Hand School".into(),
            entrances: vec![[0.0, 0.0]],
            students: Students::Elementary,
        }],
        homes: vec![home("H1", 1), home("H2", 2), home("H3", 1)],
        ..Layers::default()
    };
    (layers, g)
}

fn route(steps: &[(u32, f64, f64)]) -> Route {
    Route {
        steps: steps
            .iter()
            .map(|&(edge, from_frac, to_frac)| RouteStep {
                edge,
                from_frac,
                to_frac,
            })
            .collect(),
        cost: 0.0,
        entrance: 0,
    }
}

fn audited(l: &Layers, g: &PedGraph, c: &Config, kind: RouteKind, r: Route) -> AuditedRoute {
    AuditedRoute {
        kind,
        audit: audit_route(g, &l.streets, &r),
        risk: route_risk(g, &l.streets, c, &r),
        route: r,
    }
}

/// The route as a safe route, if no rule flags any of its edges (by hand: the rule-clean
/// route is the safe route of this fixture).
fn safe_of(l: &Layers, g: &PedGraph, c: &Config, r: &Route) -> Option<AuditedRoute> {
    let clean = r.steps.iter().all(|s| {
        !c.score.rules.flags_edge(
            g,
            &g.edges[s.edge as usize],
            &l.streets,
            &c.risk,
            Students::Elementary,
        )
    });
    clean.then(|| audited(l, g, c, RouteKind::Safe, r.clone()))
}

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() < 1e-5
}

#[test]
fn every_figure_of_a_three_home_catchment_matches_the_hand_computation() {
    let (layers, g) = fixture();
    let c = Config::default();
    let r1 = route(&[(A, 0.25, 1.0), (X, 0.0, 1.0)]);
    let r2s = route(&[(B, 0.0, 1.0), (A, 0.0, 1.0), (X, 0.0, 1.0)]);
    let r2r = route(&[(P, 0.0, 1.0), (X, 0.0, 1.0)]);
    let r3 = route(&[(B, 0.0, 1.0), (Q, 0.0, 1.0), (Y, 0.0, 1.0)]);
    let home = |sh: &Route, rec: &Route| HomeResult {
        assignment: Assignment {
            school: Some(0),
            by: AssignedBy::Catchment,
        },
        attachment: None,
        shortest: Some(audited(&layers, &g, &c, RouteKind::Shortest, sh.clone())),
        recommended: Some(audited(
            &layers,
            &g,
            &c,
            RouteKind::Recommended,
            rec.clone(),
        )),
        safe: safe_of(&layers, &g, &c, rec),
        over_detour_cap: false,
    };
    let homes = vec![home(&r1, &r1), home(&r2s, &r2r), home(&r3, &r3)];
    let risk_y = 13.477_691;

    // Route figures.
    let rec = |i: usize| homes[i].recommended.as_ref().unwrap();
    assert!(close(rec(0).audit.walked_m, 307.2) && close(rec(0).risk, 1.0));
    assert!(close(homes[1].shortest.as_ref().unwrap().risk, 3.0));
    assert!(close(rec(1).audit.walked_m, 807.2) && close(rec(1).risk, 1.0));
    assert!(close(rec(2).audit.network_m, 1700.0) && close(rec(2).audit.walked_m, 1714.4));
    assert!(close(rec(2).risk, 2.0 + risk_y), "{}", rec(2).risk);

    let s = score_audit(&layers, &g, &homes, &c);

    // Homes: active minutes = 2 x walked / 1.22 m/s / 60 (the walking speed; 1.07 m/s, the
    // signal-timing speed, stays for crossings and waits; figures changed by issue 9 item 11).
    let h = &s.homes;
    assert!(close(h[0].active_minutes, 8.393_443));
    assert!(close(h[1].active_minutes, 22.054_645));
    assert!(close(h[0].guideline_share, 8.393_443 / 60.0));
    // Energy: 3.0 MET x 32 kg x hours.
    assert!(close(h[1].energy_kcal, 3.0 * 32.0 * 22.054_645 / 60.0));
    assert_eq!(
        h.iter().map(|x| x.in_walk_zone).collect::<Vec<_>>(),
        [true, true, false]
    );
    assert_eq!(
        h.iter().map(|x| x.safe_route).collect::<Vec<_>>(),
        [true, true, false]
    );
    assert_eq!(
        h.iter().map(|x| x.hazardous).collect::<Vec<_>>(),
        [false, false, true]
    );
    assert!(h[0].unsafe_reason.is_empty() && h[1].unsafe_reason.is_empty());
    assert_eq!(h[2].unsafe_reason, "outside the walk zone: 1700 m > 1600 m");
    assert!(
        h[2].hazard_reason.starts_with("uncontrolled-crossing-60:")
            && h[2].hazard_reason.ends_with("(Ring Road)"),
        "{}",
        h[2].hazard_reason
    );
    // H3's route breaks four default rules: the 60 km/h crossing (hazardous), the crossing
    // above 50 km/h, the four-lane crossing without refuge, 200 m with no sidewalk.
    let mut rules: Vec<&str> = h[2].findings.iter().map(|f| f.rule.as_str()).collect();
    rules.sort_unstable();
    assert_eq!(
        rules,
        [
            "no-sidewalk-beside-traffic",
            "uncontrolled-crossing-60",
            "uncontrolled-fast-crossing",
            "uncontrolled-multilane-crossing"
        ]
    );
    // HCM wait at Y: (e^(v t_c) - v t_c - 1)/v with v = 1/9 veh/s, t_c = 16.457944 s.
    assert!(close(h[2].longest_wait_s, 30.571_930));
    assert_eq!(h[2].longest_wait_los.map(|l| l.as_str()), Some("E"));

    // Catchment.
    let k = &s.catchments[0];
    assert_eq!((k.children, k.children_routed), (4.0, 4.0));
    assert_eq!(
        (
            k.children_in_walk_zone,
            k.children_safe_route,
            k.children_hazardous
        ),
        (3.0, 3.0, 1.0)
    );
    assert_eq!(k.walk_zone_share, Some(0.75));
    assert_eq!(k.route_ok_share, Some(0.75));
    assert_eq!(k.safe_route_share, Some(0.75));
    assert_eq!(k.gap, Some(0.0));
    // Mean risk per trip: (1x1 + 2x1 + 1x15.477691) / 4.
    assert!(close(
        k.mean_risk_per_trip.unwrap(),
        (3.0 + 2.0 + risk_y) / 4.0
    ));
    // 90th percentile: sorted 1 (w 1), 1 (w 2), 15.48 (w 1); 0.9 x 4 = 3.6 is reached at 15.48.
    assert!(close(k.p90_risk_per_trip.unwrap(), 2.0 + risk_y));
    // Walk-zone children: (8.393443 + 2 x 22.054645) / 3 minutes; daily risk (2 + 2x2)/3 = 2.
    assert!(close(k.mean_active_minutes.unwrap(), 17.500_911));
    assert!(close(k.mean_daily_risk_walk_zone.unwrap(), 2.0));
    assert!(close(k.minutes_per_risk_point.unwrap(), 8.750_455));
    assert_eq!(k.quadrant, Quadrant::WalkableAndSafe);
    assert_eq!(
        (k.walkable_share_threshold, k.safe_share_threshold),
        (0.5, 0.5)
    );

    // Hotspots on the recommended routes: Y (H3: 1 child x 13.48), X (H1 and H2: 3 children
    // x 1), B (H3 only, H2's recommended route avoids it: 1 child x 2); A, P, Q carry no risk.
    let hs: Vec<(u32, f64, f64)> = s
        .hotspots
        .iter()
        .map(|x| (x.edge, x.children, x.product))
        .collect();
    assert_eq!(hs.len(), 3);
    assert_eq!((hs[0].0, hs[0].1), (Y, 1.0));
    assert!(close(hs[0].2, risk_y));
    assert_eq!((hs[1].0, hs[1].1, hs[1].2), (X, 3.0, 3.0));
    assert_eq!(hs[2].0, B);
    assert!(close(hs[2].2, 2.0));
    assert_eq!(s.hotspots[0].control, "none");
    assert_eq!((s.hotspots[0].speed_kmh, s.hotspots[0].lanes), (60.0, 4));
}

#[test]
fn under_the_pennsylvania_rules_only_table_i_decides_the_crossing() {
    let (layers, g) = fixture();
    let mut c = Config::default();
    c.score.rules = catchwalk::score::rules::RuleSet::builtin("pa-447").unwrap();
    let r = route(&[(Y, 0.0, 1.0)]);
    let hr = |v15: f64| {
        let mut l = layers.clone();
        l.streets[3].vehicles_15min = Some(v15);
        let h = HomeResult {
            assignment: Assignment {
                school: Some(0),
                by: AssignedBy::Catchment,
            },
            attachment: None,
            shortest: Some(audited(&l, &g, &c, RouteKind::Shortest, r.clone())),
            recommended: Some(audited(&l, &g, &c, RouteKind::Recommended, r.clone())),
            safe: safe_of(&l, &g, &c, &r),
            over_detour_cap: false,
        };
        score_audit(&l, &g, &[h], &c).homes[0].clone()
    };
    // 14.4 m = 47.2 ft: the 48 ft row, 40 vehicles for elementary students.
    assert!(!hr(40.0).hazardous);
    let over = hr(41.0);
    assert!(over.hazardous && over.hazard_reason.starts_with("447.4(a)(2):"));
    assert!(!over.safe_route);
}
