//! Crossing points: each attaches to the nearest road segment. Near a junction (measured
//! along the segment) its control goes to that junction; farther from both ends, or near
//! only a dead end, it splits the segment and makes a mid-block junction there.

use super::noding::Noded;
use super::pieces::{nearest_on, piece_tree};
use super::qa::{QaItem, QaKind};
use super::{Junction, Segment};
use crate::geodesy::{distance_m, line_length_m, LocalFrame};
use crate::input::{Control, ControlScope, CrossingPoint, LonLat, Street, TimeWindow};
use std::collections::HashMap;

/// A point this close to a junction controls every leg there, whatever its scope: it is a
/// crossing node of separately drawn sidewalks, or a control drawn on the node itself
/// (common practice in OpenStreetMap data).
pub(crate) const AT_JUNCTION_M: f64 = 1.0;

/// Which end of a segment a leg is.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub(crate) enum End {
    From,
    To,
}

/// The controls the crossings layer gives one junction.
#[derive(Debug, Clone, Default, PartialEq)]
pub(crate) struct JunctionControl {
    /// Applies to every road leg.
    pub all: Option<Control>,
    /// Applies to one leg, `(segment, end)`.
    pub legs: Vec<((u32, End), Control)>,
}

impl JunctionControl {
    /// The control of crossing leg `(segment, end)`: the strongest that applies.
    pub(crate) fn of_leg(&self, leg: (u32, End)) -> Control {
        let mut c = self.all.clone().unwrap_or_default();
        for (l, k) in &self.legs {
            if *l == leg {
                c = strongest(&c, k);
            }
        }
        c
    }
}

/// The graph after crossing points are placed.
#[derive(Debug, Clone, Default)]
pub(crate) struct Placed {
    pub junctions: Vec<Junction>,
    pub segments: Vec<Segment>,
    pub controls: HashMap<u32, JunctionControl>,
    /// Junctions made by splitting a segment at a crossing point.
    pub midblock: Vec<bool>,
}

/// Two controls at one crossing merged: the stronger device, and any island, raised table or
/// guard either has (several points on one leg describe one crossing). Guard hours join;
/// an empty list (on duty at every school travel time) covers any hours.
pub(crate) fn strongest(a: &Control, b: &Control) -> Control {
    let guard = match (&a.guard, &b.guard) {
        (None, None) => None,
        (Some(g), None) | (None, Some(g)) => Some(g.clone()),
        (Some(x), Some(y)) if x.is_empty() || y.is_empty() => Some(Vec::new()),
        (Some(x), Some(y)) => {
            let mut w: Vec<TimeWindow> = x.iter().chain(y.iter()).copied().collect();
            w.sort_by_key(|t| (t.start_min, t.end_min));
            w.dedup();
            Some(w)
        }
    };
    Control {
        device: a.device.max(b.device),
        refuge_island: a.refuge_island || b.refuge_island,
        raised: a.raised || b.raised,
        guard,
    }
}

/// A point that splits a segment.
struct Split {
    offset_m: f64,
    piece: u32,
    at: LonLat,
    control: Control,
}

/// Places the crossing points; points farther than `max_attach_m` from any road become
/// `UnattachedCrossing` QA items.
pub(crate) fn place_crossings(
    noded: Noded,
    streets: &[Street],
    crossings: &[CrossingPoint],
    attach_m: f64,
    max_attach_m: f64,
    frame: &LocalFrame,
    qa: &mut Vec<QaItem>,
) -> Placed {
    let Noded {
        mut junctions,
        segments,
    } = noded;
    let is_road = |seg: &Segment| {
        streets
            .get(seg.street)
            .map(|s| !s.class.is_foot_only())
            .unwrap_or(false)
    };
    let tree = piece_tree(&segments, frame, |_, s| is_road(s));
    let mut road_degree = vec![0u32; junctions.len()];
    for seg in segments.iter().filter(|s| is_road(s)) {
        for j in [seg.from, seg.to] {
            if let Some(d) = road_degree.get_mut(j as usize) {
                *d += 1;
            }
        }
    }
    let mut splits: HashMap<u32, Vec<Split>> = HashMap::new();
    // (old segment, end, every leg?, control)
    let mut at_junction: Vec<(u32, End, bool, Control)> = Vec::new();
    for c in crossings {
        let hit = nearest_on(&tree, &segments, frame, c.at, |_| true)
            .filter(|h| h.snap_m <= max_attach_m);
        let (Some(hit), Some(seg)) = (hit, hit.and_then(|h| segments.get(h.segment as usize)))
        else {
            qa.push(QaItem {
                kind: QaKind::UnattachedCrossing,
                at: c.at,
                feature: Some(c.feature),
                message: format!(
                    "crossing {} is more than {max_attach_m} m from any road, so its control \
                     is not used; move it onto the road it controls or delete it",
                    c.id
                ),
            });
            continue;
        };
        let to_from = hit.offset_m;
        let to_to = (seg.length_m - hit.offset_m).max(0.0);
        // The nearest end within reach that has a road to cross (a dead end has none: a
        // point near it splits the segment, so its control is not lost).
        let crossable = |j: u32| road_degree.get(j as usize).copied().unwrap_or(0) >= 2;
        let ends = [(End::From, to_from, seg.from), (End::To, to_to, seg.to)];
        let reach = ends
            .iter()
            .filter(|e| e.1 <= attach_m && crossable(e.2))
            .min_by(|a, b| a.1.total_cmp(&b.1));
        let nearest = if to_from <= to_to { ends[0] } else { ends[1] };
        let (end, near_m) = match reach {
            Some(e) => (e.0, e.1),
            None if nearest.1 <= AT_JUNCTION_M => (nearest.0, nearest.1),
            None => (nearest.0, f64::INFINITY),
        };
        if near_m <= attach_m {
            let junction = match end {
                End::From => seg.from,
                End::To => seg.to,
            };
            let gap_m = junctions
                .get(junction as usize)
                .map(|j| distance_m(j.at, c.at))
                .unwrap_or(f64::INFINITY);
            let every = c.scope == ControlScope::AllLegs || gap_m <= AT_JUNCTION_M;
            at_junction.push((hit.segment, end, every, c.control.clone()));
        } else {
            splits.entry(hit.segment).or_default().push(Split {
                offset_m: hit.offset_m,
                piece: hit.piece,
                at: hit.at,
                control: c.control.clone(),
            });
        }
    }

    let mut midblock = vec![false; junctions.len()];
    let mut controls: HashMap<u32, JunctionControl> = HashMap::new();
    let mut out: Vec<Segment> = Vec::with_capacity(segments.len() + splits.len());
    // first and last new segment of each old one
    let mut ends_of: Vec<(u32, u32)> = Vec::with_capacity(segments.len());
    for (s, seg) in segments.into_iter().enumerate() {
        let first = out.len() as u32;
        match splits.remove(&(s as u32)) {
            None => out.push(seg),
            Some(mut list) => {
                list.sort_by(|a, b| a.offset_m.total_cmp(&b.offset_m));
                // Points within the attach distance of the previous split join its junction.
                let mut merged: Vec<Split> = Vec::new();
                for sp in list {
                    match merged.last_mut() {
                        Some(last) if sp.offset_m - last.offset_m <= attach_m => {
                            last.control = strongest(&last.control, &sp.control);
                        }
                        _ => merged.push(sp),
                    }
                }
                let layer = streets.get(seg.street).map(|s| s.layer).unwrap_or(0);
                let mut new_ids = Vec::with_capacity(merged.len());
                for sp in &merged {
                    junctions.push(Junction { at: sp.at, layer });
                    midblock.push(true);
                    let j = (junctions.len() - 1) as u32;
                    controls.entry(j).or_default().all = Some(sp.control.clone());
                    new_ids.push(j);
                }
                cut(&seg, &merged, &new_ids, &mut out);
            }
        }
        ends_of.push((first, (out.len() as u32).saturating_sub(1).max(first)));
    }
    for (old, end, every, control) in at_junction {
        let Some(&(first, last)) = ends_of.get(old as usize) else {
            continue;
        };
        let (seg, junction) = match end {
            End::From => (first, out.get(first as usize).map(|s| s.from)),
            End::To => (last, out.get(last as usize).map(|s| s.to)),
        };
        let Some(junction) = junction else { continue };
        let jc = controls.entry(junction).or_default();
        if every {
            jc.all = Some(match &jc.all {
                Some(c) => strongest(c, &control),
                None => control,
            });
        } else {
            jc.legs.push(((seg, end), control));
        }
    }
    Placed {
        junctions,
        segments: out,
        controls,
        midblock,
    }
}

/// Cuts `seg` at the split points (sorted along it) into pieces between the new junctions.
fn cut(seg: &Segment, splits: &[Split], new_ids: &[u32], out: &mut Vec<Segment>) {
    let mut line: Vec<LonLat> = Vec::new();
    let mut from = seg.from;
    let mut k = 0;
    let push = |line: &mut Vec<LonLat>, p: LonLat| {
        if line.last() != Some(&p) {
            line.push(p);
        }
    };
    let emit = |line: &mut Vec<LonLat>, from: u32, to: u32, out: &mut Vec<Segment>| {
        let mut geom = std::mem::take(line);
        if geom.len() == 1 {
            geom.push(geom[0]);
        }
        let length_m = line_length_m(&geom);
        out.push(Segment {
            street: seg.street,
            from,
            to,
            line: geom,
            length_m,
        });
    };
    for (i, &p) in seg.line.iter().enumerate() {
        push(&mut line, p);
        while let (Some(sp), Some(&j)) = (splits.get(k), new_ids.get(k)) {
            if sp.piece as usize != i {
                break;
            }
            push(&mut line, sp.at);
            emit(&mut line, from, j, out);
            line.push(sp.at);
            from = j;
            k += 1;
        }
    }
    emit(&mut line, from, seg.to, out);
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::input::Device;

    fn ctl(device: Device, guard: Option<Vec<TimeWindow>>) -> Control {
        Control {
            device,
            refuge_island: false,
            raised: false,
            guard,
        }
    }

    #[test]
    fn strongest_keeps_the_better_device_and_the_guard() {
        let guard = Some(vec![TimeWindow {
            start_min: 480,
            end_min: 510,
        }]);
        let c = strongest(
            &ctl(Device::Marked, guard.clone()),
            &ctl(Device::Signal, None),
        );
        assert_eq!(c.device, Device::Signal);
        assert_eq!(c.guard, guard);
        let d = strongest(&ctl(Device::None, None), &ctl(Device::Stop, None));
        assert_eq!(d.device, Device::Stop);
        assert!(d.guard.is_none());
    }
}
