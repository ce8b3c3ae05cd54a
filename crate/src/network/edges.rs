//! Pedestrian edges: two side edges per road segment (none on a side whose sidewalk is drawn
//! separately), one path edge per foot-only segment, and a crossing of every road leg at
//! every junction with two or more road legs. Foot legs need no crossing edge: they lie
//! inside a corner, so crossing them is free.

use super::corners::Corners;
use super::crossings::{strongest, End, JunctionControl};
use super::{PedEdge, PedEdgeKind, Segment, Side};
use crate::input::{Control, SideWalk, Street};
use std::collections::HashMap;

/// What the edge builder reads.
pub(crate) struct EdgeInput<'a> {
    pub segments: &'a [Segment],
    pub streets: &'a [Street],
    pub corners: &'a Corners,
    pub controls: &'a HashMap<u32, JunctionControl>,
    pub midblock: &'a [bool],
    pub lane_width_m: f64,
}

/// Kerb-to-kerb width: the layer's width, else lanes times the lane width.
pub(crate) fn crossing_width_m(street: &Street, lane_width_m: f64) -> f64 {
    if street.class.is_foot_only() {
        return 0.0;
    }
    match street.width_m {
        Some(w) if w.is_finite() && w >= 0.0 => w,
        _ => f64::from(street.lanes.max(1)) * lane_width_m.max(0.0),
    }
}

/// Builds every edge.
pub(crate) fn build_edges(inp: &EdgeInput) -> Vec<PedEdge> {
    let mut edges = Vec::with_capacity(inp.segments.len() * 4);
    let c = inp.corners;
    for (s, seg) in inp.segments.iter().enumerate() {
        let Some(street) = inp.streets.get(seg.street) else {
            continue;
        };
        let [kf, kt] = c.leg_pos.get(s).copied().unwrap_or([0, 0]);
        // Looking from `from` to `to`: the left side is the from-leg's left looking outward
        // and the to-leg's right looking outward (that leg points the other way).
        let left = (c.left_out(seg.from, kf), c.right_out(seg.to, kt));
        let right = (c.right_out(seg.from, kf), c.left_out(seg.to, kt));
        if street.class.is_foot_only() {
            edges.push(PedEdge {
                a: right.0,
                b: right.1,
                kind: PedEdgeKind::Path { segment: s as u32 },
                length_m: seg.length_m,
            });
            continue;
        }
        for (side, sidewalk, (a, b)) in [
            (Side::Left, street.left, left),
            (Side::Right, street.right, right),
        ] {
            if sidewalk == SideWalk::Separate {
                continue;
            }
            edges.push(PedEdge {
                a,
                b,
                kind: PedEdgeKind::Side {
                    segment: s as u32,
                    side,
                    sidewalk,
                },
                length_m: seg.length_m,
            });
        }
    }
    for (j, legs) in c.legs.iter().enumerate() {
        let j32 = j as u32;
        // Foot legs lie inside corners (see `corners`): only road legs are crossed.
        let roads: Vec<usize> = (0..legs.len()).filter(|&k| legs[k].road).collect();
        if roads.len() < 2 {
            continue; // a dead end: both sides already meet in its one corner
        }
        let none = JunctionControl::default();
        let ctl = inp.controls.get(&j32).unwrap_or(&none);
        let midblock = inp.midblock.get(j).copied().unwrap_or(false);
        let leg_key = |k: usize| {
            legs.get(k)
                .map(|l| (l.segment, l.end))
                .unwrap_or((0, End::From))
        };
        if let [r0, r1] = roads[..] {
            // A two-leg junction (a mid-block crossing, a bend, one street turning into
            // another) is crossed at one spot, with the strongest control of either leg. When
            // both legs are the same street, one crossing edge; when they are different
            // streets, a child may cross just on either side, so one crossing of each.
            let control = strongest(&ctl.of_leg(leg_key(r0)), &ctl.of_leg(leg_key(r1)));
            let same_street = match (legs.get(r0), legs.get(r1)) {
                (Some(l0), Some(l1)) => {
                    inp.segments.get(l0.segment as usize).map(|s| s.street)
                        == inp.segments.get(l1.segment as usize).map(|s| s.street)
                }
                _ => true,
            };
            push_crossing(
                &mut edges,
                inp,
                j32,
                r0 as u32,
                legs,
                control.clone(),
                midblock,
            );
            if !same_street {
                push_crossing(&mut edges, inp, j32, r1 as u32, legs, control, midblock);
            }
            continue;
        }
        for &k in &roads {
            let control = ctl.of_leg(leg_key(k));
            push_crossing(&mut edges, inp, j32, k as u32, legs, control, midblock);
        }
    }
    edges
}

fn push_crossing(
    edges: &mut Vec<PedEdge>,
    inp: &EdgeInput,
    j: u32,
    k: u32,
    legs: &[super::corners::Leg],
    control: Control,
    midblock: bool,
) {
    let Some(leg) = legs.get(k as usize) else {
        return;
    };
    let Some(street) = inp
        .segments
        .get(leg.segment as usize)
        .and_then(|s| inp.streets.get(s.street))
    else {
        return;
    };
    edges.push(PedEdge {
        a: inp.corners.left_out(j, k),
        b: inp.corners.right_out(j, k),
        kind: PedEdgeKind::Crossing {
            junction: j,
            segment: leg.segment,
            control,
            midblock,
        },
        length_m: crossing_width_m(street, inp.lane_width_m),
    });
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::input::RoadClass;
    use crate::network::test_util::street;

    #[test]
    fn crossing_width_prefers_the_layer_width_then_lanes() {
        let mut s = street(vec![]);
        assert!((crossing_width_m(&s, 3.5) - 7.0).abs() < 1e-12);
        s.width_m = Some(11.0);
        assert_eq!(crossing_width_m(&s, 3.5), 11.0);
        s.width_m = Some(f64::NAN);
        s.lanes = 0;
        assert!(
            (crossing_width_m(&s, 3.5) - 3.5).abs() < 1e-12,
            "at least one lane"
        );
        s.class = RoadClass::Steps;
        assert_eq!(crossing_width_m(&s, 3.5), 0.0);
    }
}
