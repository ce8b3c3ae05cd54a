//! Corners: at each junction the legs are sorted clockwise by bearing, and a corner lies
//! between each road leg and the next. A dead end has one corner, where both sides meet.
//!
//! Foot-only legs (paths, steps) carry no traffic, so they do not divide the walkable space:
//! a foot leg lies inside the corner between the road legs on either side of it, and a
//! junction of foot legs only is one corner. This is what "crossing a foot-only leg is free"
//! means, without free crossing edges that a route audit would count as crossings.

use super::crossings::End;
use super::{Corner, Junction, Segment};
use crate::geodesy::LocalFrame;
use crate::input::LonLat;
use std::f64::consts::TAU;

/// How far along a leg its bearing is taken: far enough that a short first piece of the
/// line does not flip the order of legs (common practice for digitised centrelines).
pub(crate) const BEARING_PROBE_M: f64 = 5.0;
/// How far into its corner a corner's drawing point sits.
pub(crate) const CORNER_DRAW_M: f64 = 3.0;

/// One end of a segment at a junction.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct Leg {
    pub segment: u32,
    pub end: End,
    /// Compass bearing from the junction, radians clockwise from north, in `[0, 2 pi)`.
    pub bearing: f64,
    /// A road leg (not foot-only).
    pub road: bool,
    /// The corner on this leg's left and right, looking outward (the same for a foot leg).
    pub left: u32,
    pub right: u32,
}

/// Legs and corners of every junction.
#[derive(Debug, Clone, Default)]
pub(crate) struct Corners {
    pub corners: Vec<Corner>,
    /// Legs of each junction, clockwise.
    pub legs: Vec<Vec<Leg>>,
    /// Position of each segment's `[from, to]` end in its junction's leg list.
    pub leg_pos: Vec<[u32; 2]>,
}

impl Corners {
    fn leg(&self, j: u32, k: u32) -> Option<&Leg> {
        self.legs.get(j as usize).and_then(|l| l.get(k as usize))
    }
    /// The corner on leg `k`'s right, looking outward from junction `j` along it.
    pub(crate) fn right_out(&self, j: u32, k: u32) -> u32 {
        self.leg(j, k).map(|l| l.right).unwrap_or(0)
    }
    /// The corner on leg `k`'s left, looking outward.
    pub(crate) fn left_out(&self, j: u32, k: u32) -> u32 {
        self.leg(j, k).map(|l| l.left).unwrap_or(0)
    }
}

/// A point `probe_m` along the leg from the junction (or the far end, if the leg is
/// shorter), in the junction's frame.
fn probe(line: &[LonLat], end: End, frame: &LocalFrame, probe_m: f64) -> [f64; 2] {
    let pts: Vec<[f64; 2]> = match end {
        End::From => line.iter().map(|&p| frame.to_xy(p)).collect(),
        End::To => line.iter().rev().map(|&p| frame.to_xy(p)).collect(),
    };
    let mut walked = 0.0;
    for w in pts.windows(2) {
        let d = [w[1][0] - w[0][0], w[1][1] - w[0][1]];
        let len = (d[0] * d[0] + d[1] * d[1]).sqrt();
        if walked + len >= probe_m && len > 0.0 {
            let t = (probe_m - walked) / len;
            return [w[0][0] + t * d[0], w[0][1] + t * d[1]];
        }
        walked += len;
    }
    pts.last().copied().unwrap_or([0.0, 0.0])
}

fn bearing_of(v: [f64; 2]) -> f64 {
    let b = v[0].atan2(v[1]);
    let b = if b < 0.0 { b + TAU } else { b };
    if b.is_finite() && b < TAU {
        b
    } else {
        0.0
    }
}

/// Sorts the legs and places the corners. `foot[s]` says whether segment `s` is foot-only.
pub(crate) fn build_corners(
    junctions: &[Junction],
    segments: &[Segment],
    foot: &[bool],
) -> Corners {
    let mut legs: Vec<Vec<Leg>> = vec![Vec::new(); junctions.len()];
    let frames: Vec<LocalFrame> = junctions.iter().map(|j| LocalFrame::new(j.at)).collect();
    for (s, seg) in segments.iter().enumerate() {
        let road = !foot.get(s).copied().unwrap_or(false);
        for (end, j) in [(End::From, seg.from), (End::To, seg.to)] {
            let (Some(list), Some(frame), Some(jn)) = (
                legs.get_mut(j as usize),
                frames.get(j as usize),
                junctions.get(j as usize),
            ) else {
                continue;
            };
            let p = probe(&seg.line, end, frame, BEARING_PROBE_M);
            let o = frame.to_xy(jn.at);
            list.push(Leg {
                segment: s as u32,
                end,
                bearing: bearing_of([p[0] - o[0], p[1] - o[1]]),
                road,
                left: 0,
                right: 0,
            });
        }
    }
    let mut out = Corners {
        corners: Vec::new(),
        legs: Vec::with_capacity(junctions.len()),
        leg_pos: vec![[0, 0]; segments.len()],
    };
    for (j, mut list) in legs.into_iter().enumerate() {
        // Ties (legs leaving in the same direction) break by segment and end: deterministic.
        list.sort_by(|a, b| {
            a.bearing
                .total_cmp(&b.bearing)
                .then(a.segment.cmp(&b.segment))
                .then(a.end.cmp(&b.end))
        });
        if list.is_empty() {
            out.legs.push(list);
            continue;
        }
        let base = out.corners.len() as u32;
        let roads: Vec<usize> = (0..list.len()).filter(|&k| list[k].road).collect();
        let m = roads.len();
        let (Some(frame), Some(jn)) = (frames.get(j), junctions.get(j)) else {
            out.legs.push(list);
            continue;
        };
        let o = frame.to_xy(jn.at);
        if m == 0 {
            out.corners.push(Corner {
                junction: j as u32,
                at: jn.at,
            });
        }
        // Corner i lies clockwise after road leg roads[i], up to the next road leg.
        for (i, &k) in roads.iter().enumerate() {
            let here = list[k].bearing;
            let next = list[roads[(i + 1) % m]].bearing;
            let mut gap = (next - here).rem_euclid(TAU);
            if m == 1 {
                gap = TAU; // a dead end's corner sits behind the end
            }
            let mid = here + gap / 2.0;
            let at = frame.to_lonlat([
                o[0] + CORNER_DRAW_M * mid.sin(),
                o[1] + CORNER_DRAW_M * mid.cos(),
            ]);
            out.corners.push(Corner {
                junction: j as u32,
                at,
            });
        }
        // Walk clockwise: a foot leg sits in the corner of the last road leg before it.
        let last_road = roads.last().copied();
        let mut current = last_road.map(|_| (m - 1) as u32).unwrap_or(0);
        for (k, leg) in list.iter_mut().enumerate() {
            if leg.road {
                let i = roads.iter().position(|&r| r == k).unwrap_or(0) as u32;
                leg.right = base + i;
                leg.left = base + (i + m as u32 - 1) % m as u32;
                current = i;
            } else {
                leg.left = base + current;
                leg.right = base + current;
            }
            if let Some(pos) = out.leg_pos.get_mut(leg.segment as usize) {
                pos[(leg.end == End::To) as usize] = k as u32;
            }
        }
        out.legs.push(list);
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::network::noding::node_streets;
    use crate::network::test_util::street;

    #[test]
    fn legs_sort_clockwise_from_north_even_with_a_short_kink() {
        // Four arms from (10, 50): north, east, south, west. The east arm starts with a
        // 0.5 m kink to the north-west before heading east; the probe must see "east".
        let c = [10.0, 50.0];
        let n = street(vec![c, [10.0, 50.001]]);
        let e = street(vec![c, [9.999_996, 50.000_004], [10.001, 50.0]]);
        let s = street(vec![c, [10.0, 49.999]]);
        let w = street(vec![c, [9.999, 50.0]]);
        let noded = node_streets(&[s, w, n, e], 0.0, &LocalFrame::new(c));
        let corners = build_corners(&noded.junctions, &noded.segments, &[]);
        let centre = noded
            .junctions
            .iter()
            .position(|j| j.at == c)
            .unwrap_or(usize::MAX);
        let order: Vec<usize> = corners.legs[centre]
            .iter()
            .map(|l| noded.segments[l.segment as usize].street)
            .collect();
        assert_eq!(order, vec![2, 3, 0, 1], "north, east, south, west");
        // The corner between north and east is to the north-east.
        let ne = corners.corners[corners.legs[centre][0].right as usize].at;
        assert!(ne[0] > c[0] && ne[1] > c[1]);
    }

    #[test]
    fn legs_with_the_same_bearing_still_get_corners() {
        let c = [10.0, 50.0];
        let a = street(vec![c, [10.001, 50.0]]);
        let b = street(vec![c, [10.001, 50.0]]);
        let noded = node_streets(&[a, b], 0.0, &LocalFrame::new(c));
        let corners = build_corners(&noded.junctions, &noded.segments, &[]);
        assert_eq!(corners.corners.len(), 4);
        assert!(corners.corners.iter().all(|k| k.at[0].is_finite()));
    }
}
