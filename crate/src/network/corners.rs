//! Corners: at each junction the legs are sorted clockwise by bearing, and a corner lies
//! between each leg and the next. A dead end has one corner, where both sides meet.

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
}

/// Legs and corners of every junction.
#[derive(Debug, Clone, Default)]
pub(crate) struct Corners {
    pub corners: Vec<Corner>,
    /// Legs of each junction, clockwise.
    pub legs: Vec<Vec<Leg>>,
    /// First corner id of each junction.
    pub base: Vec<u32>,
    /// Position of each segment's `[from, to]` end in its junction's leg list.
    pub leg_pos: Vec<[u32; 2]>,
}

impl Corners {
    /// The corner on leg `k`'s right, looking outward from junction `j` along it.
    pub(crate) fn right_out(&self, j: u32, k: u32) -> u32 {
        let base = self.base.get(j as usize).copied().unwrap_or(0);
        base + k
    }
    /// The corner on leg `k`'s left, looking outward.
    pub(crate) fn left_out(&self, j: u32, k: u32) -> u32 {
        let base = self.base.get(j as usize).copied().unwrap_or(0);
        let n = self
            .legs
            .get(j as usize)
            .map(|l| l.len() as u32)
            .unwrap_or(1)
            .max(1);
        base + (k + n - 1) % n
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

/// Sorts the legs and places the corners.
pub(crate) fn build_corners(junctions: &[Junction], segments: &[Segment]) -> Corners {
    let mut legs: Vec<Vec<Leg>> = vec![Vec::new(); junctions.len()];
    let frames: Vec<LocalFrame> = junctions.iter().map(|j| LocalFrame::new(j.at)).collect();
    for (s, seg) in segments.iter().enumerate() {
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
            });
        }
    }
    let mut out = Corners {
        corners: Vec::new(),
        legs: Vec::with_capacity(junctions.len()),
        base: Vec::with_capacity(junctions.len()),
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
        out.base.push(out.corners.len() as u32);
        let n = list.len();
        for (k, leg) in list.iter().enumerate() {
            if let Some(pos) = out.leg_pos.get_mut(leg.segment as usize) {
                pos[(leg.end == End::To) as usize] = k as u32;
            }
            let next = list
                .get((k + 1) % n)
                .map(|l| l.bearing)
                .unwrap_or(leg.bearing);
            let mut gap = (next - leg.bearing).rem_euclid(TAU);
            if n == 1 {
                gap = TAU; // a dead end's corner sits behind the end
            }
            let mid = leg.bearing + gap / 2.0;
            let (Some(frame), Some(jn)) = (frames.get(j), junctions.get(j)) else {
                continue;
            };
            let o = frame.to_xy(jn.at);
            let at = frame.to_lonlat([
                o[0] + CORNER_DRAW_M * mid.sin(),
                o[1] + CORNER_DRAW_M * mid.cos(),
            ]);
            out.corners.push(Corner {
                junction: j as u32,
                at,
            });
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
        let corners = build_corners(&noded.junctions, &noded.segments);
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
        let ne = corners.corners[corners.base[centre] as usize].at;
        assert!(ne[0] > c[0] && ne[1] > c[1]);
    }

    #[test]
    fn legs_with_the_same_bearing_still_get_corners() {
        let c = [10.0, 50.0];
        let a = street(vec![c, [10.001, 50.0]]);
        let b = street(vec![c, [10.001, 50.0]]);
        let noded = node_streets(&[a, b], 0.0, &LocalFrame::new(c));
        let corners = build_corners(&noded.junctions, &noded.segments);
        assert_eq!(corners.corners.len(), 4);
        assert!(corners.corners.iter().all(|k| k.at[0].is_finite()));
    }
}
