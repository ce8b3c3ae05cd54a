//! Whole-graph cases whose answers are known by hand: small networks in a local metric frame,
//! routed with the audit's own Dijkstra tree (walked-length costs) and audited.

use catchwalk::audit::{audit_route, RouteAudit};
use catchwalk::config::NetworkConfig;
use catchwalk::geodesy::LocalFrame;
use catchwalk::input::{
    Control, ControlScope, CrossingPoint, Device, Layers, LonLat, RoadClass, SideWalk, Street,
};
use catchwalk::network::qa::QaKind;
use catchwalk::network::{build_network, Network, PedEdgeKind, PedGraph, Side};
use catchwalk::route::path::{entrance_sources, route_to_school};
use catchwalk::route::tree::Tree;

const ORIGIN: LonLat = [10.0, 50.0];

/// Metres east and north of the origin to `[lon, lat]`.
fn m(x: f64, y: f64) -> LonLat {
    LocalFrame::new(ORIGIN).to_lonlat([x, y])
}

fn road(feature: usize, pts: &[(f64, f64)]) -> Street {
    Street {
        id: format!("s{feature}"),
        ..Street::new(
            feature,
            RoadClass::Local,
            50.0,
            2,
            pts.iter().map(|&(x, y)| m(x, y)).collect(),
        )
    }
}

fn path(feature: usize, pts: &[(f64, f64)]) -> Street {
    Street {
        class: RoadClass::Path,
        lanes: 0,
        speed_kmh: 0.0,
        ..road(feature, pts)
    }
}

fn layers(streets: Vec<Street>) -> Layers {
    Layers {
        streets,
        ..Layers::default()
    }
}

fn net(l: &Layers) -> Network {
    build_network(l, &NetworkConfig::default())
}

/// Shortest walked route from a home to a school (both in metres from the origin).
fn walk(n: &Network, l: &Layers, home: (f64, f64), school: (f64, f64)) -> Option<RouteAudit> {
    let g = &n.graph;
    // Doorstep crossings closed: these cases test the corners and crossings at junctions.
    let cost: Vec<f64> = g
        .edges
        .iter()
        .map(|e| {
            if PedGraph::is_doorstep(e) {
                f64::INFINITY
            } else {
                e.length_m
            }
        })
        .collect();
    let s = n.index.attach(g, m(school.0, school.1), 50.0)?;
    let h = n.index.attach(g, m(home.0, home.1), 50.0)?;
    let mut tree = Tree::for_graph(g);
    tree.grow(g, &cost, &entrance_sources(g, &cost, &[s]), &[]);
    let r = route_to_school(g, &tree, &cost, &h, &[s])?;
    Some(audit_route(g, &l.streets, &r))
}

fn close(a: f64, b: f64, tol: f64) -> bool {
    (a - b).abs() <= tol
}

/// West-east main street (feature 0) and south-north side street (feature 1) meeting at the
/// origin, each 200 m long with the junction as an interior vertex.
fn four_way() -> Layers {
    layers(vec![
        road(0, &[(-100.0, 0.0), (0.0, 0.0), (100.0, 0.0)]),
        road(1, &[(0.0, -100.0), (0.0, 0.0), (0.0, 100.0)]),
    ])
}

#[test]
fn four_way_straight_on_crosses_the_side_street_once() {
    let l = four_way();
    let n = net(&l);
    assert_eq!(n.graph.junctions.len(), 5);
    assert_eq!(n.graph.segments.len(), 4);
    assert_eq!(
        n.graph.corners.len(),
        4 + 4,
        "four at the centre, one per dead end"
    );
    let a = walk(&n, &l, (-50.0, 8.0), (50.0, 8.0)).expect("a route");
    assert_eq!(a.crossings.len(), 1);
    assert!(close(a.network_m, 100.0, 0.5), "network {}", a.network_m);
    assert!(
        close(a.walked_m, 100.0 + 2.0 * 3.6, 0.5),
        "walked {}",
        a.walked_m
    );
    assert_eq!(a.uncontrolled_crossings, 1);
    // The crossing is of the side street.
    let e = &n.graph.edges[a.crossings[0].edge as usize];
    let seg = &n.graph.segments[e.segment() as usize];
    assert_eq!(seg.street, 1);
}

#[test]
fn four_way_turning_the_corner_crosses_nothing() {
    let l = four_way();
    let n = net(&l);
    let a = walk(&n, &l, (-50.0, 8.0), (-8.0, 50.0)).expect("a route");
    assert_eq!(a.crossings.len(), 0);
    assert!(close(a.network_m, 100.0, 0.5));
}

#[test]
fn four_way_diagonal_corner_crosses_twice() {
    let l = four_way();
    let n = net(&l);
    let a = walk(&n, &l, (-50.0, 8.0), (50.0, -8.0)).expect("a route");
    assert_eq!(a.crossings.len(), 2);
    assert!(close(a.walked_m, 100.0 + 2.0 * 7.2, 0.5));
    let streets: Vec<usize> = a
        .crossings
        .iter()
        .map(|c| n.graph.segments[n.graph.edges[c.edge as usize].segment() as usize].street)
        .collect();
    assert!(streets.contains(&0) && streets.contains(&1), "{streets:?}");
}

#[test]
fn t_junction_sides() {
    // Main street west-east; a side street leaves southward from the origin.
    let l = layers(vec![
        road(0, &[(-100.0, 0.0), (0.0, 0.0), (100.0, 0.0)]),
        road(1, &[(0.0, 0.0), (0.0, -100.0)]),
    ]);
    let n = net(&l);
    // The north side runs through unbroken.
    let north = walk(&n, &l, (-50.0, 8.0), (50.0, 8.0)).expect("north");
    assert_eq!(north.crossings.len(), 0);
    // The south side crosses the side street.
    let south = walk(&n, &l, (-50.0, -8.0), (50.0, -8.0)).expect("south");
    assert_eq!(south.crossings.len(), 1);
    // North side to the east side of the side street: cross the main street once.
    let across = walk(&n, &l, (-50.0, 8.0), (8.0, -50.0)).expect("across");
    assert_eq!(across.crossings.len(), 1);
    let seg =
        &n.graph.segments[n.graph.edges[across.crossings[0].edge as usize].segment() as usize];
    assert_eq!(seg.street, 0);
    // A T has three corners at its junction and three crossings there.
    let centre = n
        .graph
        .corners
        .iter()
        .filter(|c| n.graph.junctions[c.junction as usize].at == m(0.0, 0.0))
        .count();
    assert_eq!(centre, 3);
}

#[test]
fn dead_end_walk_round_the_end_crosses_nothing() {
    // A cul-de-sac 100 m north off a through street.
    let l = layers(vec![
        road(0, &[(-100.0, 0.0), (0.0, 0.0), (100.0, 0.0)]),
        road(1, &[(0.0, 0.0), (0.0, 100.0)]),
    ]);
    let n = net(&l);
    let a = walk(&n, &l, (-8.0, 80.0), (8.0, 80.0)).expect("a route");
    assert_eq!(a.crossings.len(), 0);
    assert!(
        close(a.network_m, 40.0, 0.5),
        "round the end: {}",
        a.network_m
    );
    assert_eq!(n.qa.count(QaKind::DanglingEnd), 3);
}

fn midblock_layers(device: Device) -> Layers {
    let mut l = layers(vec![road(0, &[(-200.0, 0.0), (200.0, 0.0)])]);
    l.crossings.push(CrossingPoint {
        feature: 0,
        id: "c0".into(),
        at: m(0.0, 0.5),
        control: Control {
            device,
            ..Control::UNCONTROLLED
        },
        scope: ControlScope::NearestLeg,
    });
    l
}

#[test]
fn midblock_crossing_point_splits_the_segment_and_its_control_is_on_the_route() {
    let l = midblock_layers(Device::Signal);
    let n = net(&l);
    assert_eq!(n.graph.segments.len(), 2, "split in two");
    assert!(close(
        n.graph.segments[0].length_m + n.graph.segments[1].length_m,
        400.0,
        0.01
    ));
    let crossings: Vec<_> = n.graph.corner_edges().filter(|e| e.is_crossing()).collect();
    assert_eq!(
        crossings.len(),
        1,
        "one crossing edge at a two-leg mid-block junction"
    );
    let a = walk(&n, &l, (-10.0, 8.0), (10.0, -8.0)).expect("a route");
    assert_eq!(a.crossings.len(), 1);
    assert!(a.crossings[0].midblock);
    assert_eq!(a.crossings[0].device, Device::Signal);
    assert_eq!(a.uncontrolled_crossings, 0);
    assert!(close(a.network_m, 20.0, 0.6), "{}", a.network_m);
    // Staying on one side passes the mid-block junction without crossing.
    let same = walk(&n, &l, (-10.0, 8.0), (10.0, 8.0)).expect("same side");
    assert_eq!(same.crossings.len(), 0);
    assert!(close(same.network_m, 20.0, 0.6));
    assert!(n.midblock.iter().filter(|&&b| b).count() == 1);
}

#[test]
fn crossing_point_near_a_junction_controls_only_its_leg() {
    // A marked crosswalk 8 m up the north arm of a four-way junction, scope: nearest leg.
    let mut l = four_way();
    l.crossings.push(CrossingPoint {
        feature: 0,
        id: "zebra".into(),
        at: m(0.0, 8.0),
        control: Control {
            device: Device::Marked,
            ..Control::UNCONTROLLED
        },
        scope: ControlScope::NearestLeg,
    });
    let n = net(&l);
    assert_eq!(
        n.graph.segments.len(),
        4,
        "within 15 m of the junction: no split"
    );
    let marked: Vec<_> = n
        .graph
        .edges
        .iter()
        .filter_map(|e| match &e.kind {
            PedEdgeKind::Crossing {
                control, segment, ..
            } if control.device == Device::Marked => Some(*segment),
            _ => None,
        })
        .collect();
    assert_eq!(marked.len(), 1);
    let seg = &n.graph.segments[marked[0] as usize];
    assert_eq!(seg.street, 1);
    assert!(
        n.graph.junctions[seg.to as usize].at[1] > ORIGIN[1],
        "north arm"
    );
    let a = walk(&n, &l, (-50.0, 8.0), (50.0, 8.0)).expect("a route");
    assert_eq!(a.crossings[0].device, Device::Marked);
}

#[test]
fn bridge_without_shared_vertex_does_not_connect() {
    let mut bridge = road(0, &[(-100.0, 0.0), (100.0, 0.0)]);
    bridge.layer = 1;
    let below = road(1, &[(0.0, -100.0), (0.0, 100.0)]);
    let l = layers(vec![bridge, below]);
    let n = net(&l);
    assert_eq!(n.graph.segments.len(), 2);
    assert_eq!(n.qa.components, 2);
    assert!(walk(&n, &l, (-50.0, 8.0), (8.0, 50.0)).is_none());
    // Even in the same layer, a mere crossing without a shared vertex does not node.
    let l2 = layers(vec![
        road(0, &[(-100.0, 0.0), (100.0, 0.0)]),
        road(1, &[(0.0, -100.0), (0.0, 100.0)]),
    ]);
    let n2 = net(&l2);
    assert_eq!(n2.qa.components, 2);
    assert!(walk(&n2, &l2, (-50.0, 8.0), (8.0, 50.0)).is_none());
}

#[test]
fn bridge_sharing_its_end_vertices_connects_to_its_approaches() {
    let mut bridge = road(0, &[(-50.0, 0.0), (50.0, 0.0)]);
    bridge.layer = 1;
    let l = layers(vec![
        road(1, &[(-150.0, 0.0), (-50.0, 0.0)]),
        bridge,
        road(2, &[(50.0, 0.0), (150.0, 0.0)]),
        road(3, &[(0.0, -100.0), (0.0, 100.0)]),
    ]);
    let n = net(&l);
    let a = walk(&n, &l, (-100.0, 8.0), (100.0, 8.0)).expect("over the bridge");
    assert_eq!(a.crossings.len(), 0);
    assert!(close(a.network_m, 200.0, 0.5));
    assert!(
        walk(&n, &l, (-100.0, 8.0), (8.0, 60.0)).is_none(),
        "road below stays apart"
    );
    assert_eq!(n.qa.components, 2);
    assert_eq!(n.qa.count(QaKind::TinyComponent), 1);
}

fn near_pair(layer_b: i32, tol_m: f64) -> (Layers, Network) {
    // A ends at (100, 0); B starts 0.3 m north of it and runs north.
    let a = road(0, &[(0.0, 0.0), (100.0, 0.0)]);
    let mut b = road(1, &[(100.0, 0.3), (100.0, 100.0)]);
    b.layer = layer_b;
    let l = layers(vec![a, b]);
    let cfg = NetworkConfig {
        snap_tolerance_m: tol_m,
        ..NetworkConfig::default()
    };
    let n = build_network(&l, &cfg);
    (l, n)
}

#[test]
fn ends_0_3_m_apart_in_the_same_layer_join() {
    let (l, n) = near_pair(0, 0.5);
    assert_eq!(n.graph.junctions.len(), 3);
    assert_eq!(n.qa.components, 1);
    let a = walk(&n, &l, (50.0, 8.0), (92.0, 50.0)).expect("joined");
    assert_eq!(a.crossings.len(), 0, "the inside of the bend");
    assert_eq!(n.qa.count(QaKind::NearMiss), 0);
}

#[test]
fn ends_0_3_m_apart_in_different_layers_stay_apart() {
    let (l, n) = near_pair(1, 0.5);
    assert_eq!(n.graph.junctions.len(), 4);
    assert_eq!(n.qa.components, 2);
    assert!(walk(&n, &l, (50.0, 8.0), (92.0, 50.0)).is_none());
    assert_eq!(
        n.qa.count(QaKind::NearMiss),
        0,
        "grade separation is not a gap"
    );
}

#[test]
fn ends_closer_than_near_miss_but_beyond_snap_are_reported() {
    let (_, n) = near_pair(0, 0.2);
    assert_eq!(n.qa.components, 2);
    assert_eq!(
        n.qa.count(QaKind::NearMiss),
        2,
        "each end is near the other street"
    );
    let item =
        n.qa.items
            .iter()
            .find(|i| i.kind == QaKind::NearMiss)
            .expect("near miss");
    assert!(item.message.contains("0.3 m"), "{}", item.message);
}

/// A road with separately drawn sidewalks 6 m either side, and a footway crossing it at the
/// origin through a crossing node shared with the road.
fn separate_sidewalks(scope: ControlScope) -> Layers {
    let mut r = road(0, &[(-100.0, 0.0), (0.0, 0.0), (100.0, 0.0)]);
    r.left = SideWalk::Separate;
    r.right = SideWalk::Separate;
    r.class = RoadClass::Collector;
    let mut l = layers(vec![
        r,
        path(1, &[(-100.0, 6.0), (0.0, 6.0), (100.0, 6.0)]),
        path(2, &[(-100.0, -6.0), (0.0, -6.0), (100.0, -6.0)]),
        path(3, &[(0.0, 6.0), (0.0, 0.0), (0.0, -6.0)]),
    ]);
    l.crossings.push(CrossingPoint {
        feature: 0,
        id: "sig".into(),
        at: m(0.0, 0.0),
        control: Control {
            device: Device::Signal,
            ..Control::UNCONTROLLED
        },
        scope,
    });
    l
}

#[test]
fn separately_drawn_sidewalks_cross_once_with_the_signal() {
    for scope in [ControlScope::NearestLeg, ControlScope::AllLegs] {
        let l = separate_sidewalks(scope);
        let n = net(&l);
        let sides = n
            .graph
            .edges
            .iter()
            .filter(|e| matches!(e.kind, PedEdgeKind::Side { .. }))
            .count();
        assert_eq!(sides, 0, "the road's sidewalks are drawn separately");
        let a = walk(&n, &l, (-50.0, 10.0), (50.0, -10.0)).expect("a route");
        assert_eq!(a.crossings.len(), 1, "{scope:?}");
        assert_eq!(a.crossings[0].device, Device::Signal);
        assert_eq!(a.crossings[0].class, RoadClass::Collector);
        assert_eq!(a.uncontrolled_crossings, 0);
        assert!(
            close(a.network_m, 50.0 + 12.0 + 50.0, 0.5),
            "{}",
            a.network_m
        );
        // Along one sidewalk: no crossing at all (foot legs are free).
        let along = walk(&n, &l, (-50.0, 10.0), (50.0, 10.0)).expect("along");
        assert_eq!(along.crossings.len(), 0);
    }
}

#[test]
fn attachment_picks_the_side_the_point_is_on_and_skips_separate_sides() {
    let l = four_way();
    let n = net(&l);
    let g = &n.graph;
    // Main street runs west to east: north is its left.
    let north = n.index.attach(g, m(-50.0, 8.0), 50.0).expect("north");
    let south = n.index.attach(g, m(-50.0, -8.0), 50.0).expect("south");
    let side_of = |e: u32| match g.edges[e as usize].kind {
        PedEdgeKind::Side { side, .. } => Some(side),
        _ => None,
    };
    assert_eq!(side_of(north.edge), Some(Side::Left));
    assert_eq!(side_of(south.edge), Some(Side::Right));
    assert!(close(north.snap_m, 8.0, 0.01));
    assert!(close(north.offset_m, 50.0, 0.05), "{}", north.offset_m);
    assert!(n.index.attach(g, m(-50.0, 80.0), 50.0).is_some());
    assert!(
        n.index.attach(g, m(-50.0, 80.0), 20.0).is_none(),
        "beyond max_m"
    );

    // Separate sidewalks: a home beside the road attaches to the sidewalk path, not the road.
    let l = separate_sidewalks(ControlScope::AllLegs);
    let n = net(&l);
    let att = n
        .index
        .attach(&n.graph, m(-50.0, 2.0), 50.0)
        .expect("attached");
    let e = &n.graph.edges[att.edge as usize];
    assert!(matches!(e.kind, PedEdgeKind::Path { .. }));
    assert_eq!(
        n.graph.segments[e.segment() as usize].street,
        1,
        "the north sidewalk"
    );
    // One side separate, the other present: the point on the separate side falls back.
    let mut half = four_way();
    half.streets[0].left = SideWalk::Separate;
    let n = net(&half);
    let att = n
        .index
        .attach(&n.graph, m(-50.0, 8.0), 50.0)
        .expect("attached");
    assert_eq!(
        match n.graph.edges[att.edge as usize].kind {
            PedEdgeKind::Side { side, .. } => Some(side),
            _ => None,
        },
        Some(Side::Right)
    );
}

#[test]
fn unattached_crossing_is_reported() {
    let mut l = four_way();
    l.crossings.push(CrossingPoint {
        feature: 7,
        id: "far".into(),
        at: m(0.0, 2000.0),
        control: Control::UNCONTROLLED,
        scope: ControlScope::AllLegs,
    });
    let n = net(&l);
    assert_eq!(n.qa.count(QaKind::UnattachedCrossing), 1);
    let item =
        n.qa.items
            .iter()
            .find(|i| i.kind == QaKind::UnattachedCrossing)
            .expect("item");
    assert_eq!(item.feature, Some(7));
}

#[test]
fn awkward_inputs_do_not_panic() {
    // A street looping back on itself, a zero-length street, a duplicated street, legs that
    // all leave in one direction, crossings on an empty layer.
    let l = layers(vec![
        road(
            0,
            &[
                (0.0, 0.0),
                (50.0, 0.0),
                (50.0, 50.0),
                (0.0, 50.0),
                (0.0, 0.0),
            ],
        ),
        road(1, &[(10.0, 10.0), (10.0, 10.0)]),
        road(2, &[(0.0, 0.0), (100.0, 0.0)]),
        road(3, &[(0.0, 0.0), (100.0, 0.0)]),
        path(4, &[(0.0, 0.0), (100.0, 0.0)]),
    ]);
    let n = net(&l);
    assert!(n.graph.segments.len() >= 4);
    for e in n.graph.corner_edges() {
        assert!((e.a as usize) < n.graph.corners.len() && (e.b as usize) < n.graph.corners.len());
        assert!(e.length_m.is_finite());
    }
    let _ = walk(&n, &l, (25.0, 8.0), (90.0, -8.0));
    let empty = Layers {
        crossings: separate_sidewalks(ControlScope::AllLegs).crossings,
        ..Layers::default()
    };
    let n = net(&empty);
    assert!(n.graph.edges.is_empty());
    assert_eq!(n.qa.count(QaKind::UnattachedCrossing), 1);
    assert!(n.index.attach(&n.graph, m(0.0, 0.0), 100.0).is_none());
}

#[test]
fn every_side_edge_meets_corners_at_its_own_segment_ends() {
    let l = four_way();
    let n = net(&l);
    let g = &n.graph;
    for e in g.corner_edges() {
        if let PedEdgeKind::Side { segment, .. } = e.kind {
            let s = &g.segments[segment as usize];
            assert_eq!(g.corners[e.a as usize].junction, s.from);
            assert_eq!(g.corners[e.b as usize].junction, s.to);
        }
    }
    // Each road segment has two sides; each of the four legs at the centre one crossing.
    assert_eq!(g.corner_edges().filter(|e| !e.is_crossing()).count(), 8);
    assert_eq!(g.corner_edges().filter(|e| e.is_crossing()).count(), 4);
}

#[test]
fn a_point_on_the_junction_node_controls_every_road_leg() {
    // Drawn on the node itself (within 1 m): every leg, whatever the scope says.
    let mut l = four_way();
    l.crossings.push(CrossingPoint {
        feature: 0,
        id: "node".into(),
        at: m(0.3, 0.3),
        control: Control {
            device: Device::AllWayStop,
            ..Control::UNCONTROLLED
        },
        scope: ControlScope::NearestLeg,
    });
    let n = net(&l);
    let devices: Vec<Device> = n
        .graph
        .corner_edges()
        .filter_map(|e| match &e.kind {
            PedEdgeKind::Crossing { control, .. } => Some(control.device),
            _ => None,
        })
        .collect();
    assert_eq!(devices, vec![Device::AllWayStop; 4]);
    let a = walk(&n, &l, (-50.0, 8.0), (50.0, -8.0)).expect("a route");
    assert_eq!(a.uncontrolled_crossings, 0);
}

#[test]
fn several_points_on_one_leg_keep_the_strongest_control_and_the_guard() {
    let mut l = four_way();
    for (id, at, control) in [
        (
            "zebra",
            m(0.0, 6.0),
            Control {
                device: Device::Marked,
                guard: Some(Vec::new()),
                ..Control::UNCONTROLLED
            },
        ),
        (
            "signal",
            m(0.0, 10.0),
            Control {
                device: Device::Signal,
                ..Control::UNCONTROLLED
            },
        ),
    ] {
        l.crossings.push(CrossingPoint {
            feature: 0,
            id: id.into(),
            at,
            control,
            scope: ControlScope::NearestLeg,
        });
    }
    let n = net(&l);
    let controlled: Vec<&Control> = n
        .graph
        .edges
        .iter()
        .filter_map(|e| match &e.kind {
            PedEdgeKind::Crossing { control, .. } if !control.is_uncontrolled() => Some(control),
            _ => None,
        })
        .collect();
    assert_eq!(controlled.len(), 1);
    assert_eq!(controlled[0].device, Device::Signal);
    assert_eq!(controlled[0].guard, Some(Vec::new()));
}

mod random {
    use super::*;
    use proptest::prelude::*;

    fn arb_street() -> impl Strategy<Value = (Vec<(i32, i32)>, u8, u8, u8, i32)> {
        (
            prop::collection::vec((0..6i32, 0..6i32), 1..6),
            0..4u8,
            0..4u8,
            0..4u8,
            -1..2i32,
        )
    }

    fn side(k: u8) -> SideWalk {
        [
            SideWalk::Present,
            SideWalk::Absent,
            SideWalk::Unknown,
            SideWalk::Separate,
        ][k as usize % 4]
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(200))]
        /// Lines on a 6 x 6 grid of 20 m cells (so vertices are shared, repeated, looped and
        /// overlapping), random classes, sidewalks and layers, crossing points anywhere.
        #[test]
        fn random_networks_build_consistent_graphs(
            raw in prop::collection::vec(arb_street(), 0..8),
            pts in prop::collection::vec((0..120i32, 0..120i32, any::<bool>()), 0..5),
            tol in prop_oneof![Just(0.0), Just(0.5)],
        ) {
            let streets: Vec<Street> = raw
                .iter()
                .enumerate()
                .map(|(i, (p, class, l, r, layer))| {
                    let line: Vec<(f64, f64)> =
                        p.iter().map(|&(x, y)| (x as f64 * 20.0, y as f64 * 20.0)).collect();
                    let mut s = if *class == 3 { path(i, &line) } else { road(i, &line) };
                    s.left = side(*l);
                    s.right = side(*r);
                    s.layer = *layer;
                    s
                })
                .collect();
            let mut l = layers(streets);
            for (k, &(x, y, all)) in pts.iter().enumerate() {
                l.crossings.push(CrossingPoint {
                    feature: k,
                    id: k.to_string(),
                    at: m(x as f64, y as f64),
                    control: Control { device: Device::Signal, ..Control::UNCONTROLLED },
                    scope: if all { ControlScope::AllLegs } else { ControlScope::NearestLeg },
                });
            }
            let cfg = NetworkConfig { snap_tolerance_m: tol, ..NetworkConfig::default() };
            let n = build_network(&l, &cfg);
            let g = &n.graph;
            prop_assert_eq!(n.midblock.len(), g.junctions.len());
            for e in g.corner_edges() {
                prop_assert!((e.a as usize) < g.corners.len() && (e.b as usize) < g.corners.len());
                prop_assert!(e.length_m.is_finite() && e.length_m >= 0.0);
                let seg = &g.segments[e.segment() as usize];
                match &e.kind {
                    PedEdgeKind::Side { .. } | PedEdgeKind::Path { .. } => {
                        prop_assert_eq!(g.corners[e.a as usize].junction, seg.from);
                        prop_assert_eq!(g.corners[e.b as usize].junction, seg.to);
                        prop_assert!((e.length_m - seg.length_m).abs() < 1e-9);
                    }
                    PedEdgeKind::Crossing { junction, .. } => {
                        prop_assert_eq!(g.corners[e.a as usize].junction, *junction);
                        prop_assert_eq!(g.corners[e.b as usize].junction, *junction);
                        prop_assert!(seg.from == *junction || seg.to == *junction);
                    }
                }
            }
            for s in &g.segments {
                prop_assert_eq!(s.line.first(), Some(&g.junctions[s.from as usize].at));
                prop_assert_eq!(s.line.last(), Some(&g.junctions[s.to as usize].at));
            }
            // Without snapping, noding and splitting keep every street's length.
            if tol == 0.0 {
                for (i, s) in l.streets.iter().enumerate() {
                    let pieces: f64 =
                        g.segments.iter().filter(|x| x.street == i).map(|x| x.length_m).sum();
                    let whole = catchwalk::geodesy::line_length_m(&s.line);
                    prop_assert!((pieces - whole).abs() < 1e-6 * whole.max(1.0),
                        "street {} pieces {} whole {}", i, pieces, whole);
                }
            }
            let _ = walk(&n, &l, (30.0, 30.0), (70.0, 90.0));
        }
    }
}

#[test]
fn a_crossing_point_near_a_dead_end_splits_rather_than_vanish() {
    // 10 m from the end of a cul-de-sac: the dead end has no road leg to cross, so the
    // point makes its own mid-block crossing.
    let mut l = layers(vec![
        road(0, &[(-100.0, 0.0), (0.0, 0.0), (100.0, 0.0)]),
        road(1, &[(0.0, 0.0), (0.0, 100.0)]),
    ]);
    l.crossings.push(CrossingPoint {
        feature: 0,
        id: "end".into(),
        at: m(0.5, 90.0),
        control: Control {
            device: Device::Marked,
            ..Control::UNCONTROLLED
        },
        scope: ControlScope::NearestLeg,
    });
    let n = net(&l);
    assert_eq!(n.graph.segments.len(), 4);
    let marked = n
        .graph
        .edges
        .iter()
        .filter(|e| matches!(&e.kind, PedEdgeKind::Crossing { control, midblock: true, .. } if control.device == Device::Marked))
        .count();
    assert_eq!(marked, 1);
    let a = walk(&n, &l, (-8.0, 80.0), (8.0, 80.0)).expect("a route");
    assert_eq!(
        a.crossings.len(),
        1,
        "across at the crosswalk beats walking round the end"
    );
    assert_eq!(a.crossings[0].device, Device::Marked);
}
