//! QA: dangling ends and near-misses.
//!
//! A dangling end is a road end that meets nothing: often a real dead end, sometimes a gap in
//! the drawing. Ends of foot-only paths are not listed (paths end at doors, gates and parks
//! all the time), but they are checked for near-misses like any other end: an end within the
//! near-miss distance of another segment of the same layer that it did not join is almost
//! always a gap.

use super::pieces::{project, Piece};
use super::qa::{QaItem, QaKind};
use super::{Junction, Segment};
use crate::geodesy::{distance_m, LocalFrame};
use crate::input::Street;
use rstar::RTree;

/// Appends `DanglingEnd` and `NearMiss` items.
pub(crate) fn end_qa(
    junctions: &[Junction],
    segments: &[Segment],
    streets: &[Street],
    midblock: &[bool],
    near_miss_m: f64,
    pieces: Option<(&LocalFrame, &RTree<Piece>)>,
    items: &mut Vec<QaItem>,
) {
    let mut degree = vec![0u32; junctions.len()];
    let mut only: Vec<Option<usize>> = vec![None; junctions.len()];
    for (i, s) in segments.iter().enumerate() {
        for j in [s.from, s.to] {
            if let (Some(d), Some(o)) = (degree.get_mut(j as usize), only.get_mut(j as usize)) {
                *d += 1;
                *o = Some(i);
            }
        }
    }
    for (j, jn) in junctions.iter().enumerate() {
        if degree.get(j) != Some(&1) || midblock.get(j) == Some(&true) {
            continue;
        }
        let Some(si) = only.get(j).copied().flatten() else {
            continue;
        };
        let Some(seg) = segments.get(si) else {
            continue;
        };
        let Some(street) = streets.get(seg.street) else {
            continue;
        };
        let foot = street.class.is_foot_only();
        if !foot {
            items.push(QaItem {
                kind: QaKind::DanglingEnd,
                at: jn.at,
                feature: Some(street.feature),
                message: format!(
                    "street {} ends here without meeting another street; if it is not a real \
                     dead end, make its end vertex the same point as the street it meets",
                    street.id
                ),
            });
        }
        let Some((frame, tree)) = pieces else {
            continue;
        };
        if !(near_miss_m.is_finite() && near_miss_m > 0.0) {
            continue;
        }
        // Segments this end already reaches: its own, and those at its other end.
        let far = if seg.from == j as u32 {
            seg.to
        } else {
            seg.from
        };
        let q = frame.to_xy(jn.at);
        let r2 = (near_miss_m * 1.01) * (near_miss_m * 1.01);
        let mut best: Option<(f64, usize)> = None;
        for hit in tree.locate_within_distance(q, r2) {
            let other = hit.data.segment as usize;
            let Some(os) = segments.get(other) else {
                continue;
            };
            if other == si
                || os.from == far
                || os.to == far
                || streets.get(os.street).map(|s| s.layer) != Some(street.layer)
            {
                continue;
            }
            let (_, xy) = project(hit.geom(), q);
            let on = distance_m(jn.at, frame.to_lonlat(xy));
            if on <= near_miss_m && best.map(|b| on < b.0).unwrap_or(true) {
                best = Some((on, other));
            }
        }
        if let Some((d, other)) = best {
            let oid = segments
                .get(other)
                .and_then(|s| streets.get(s.street))
                .map(|s| s.id.as_str())
                .unwrap_or("?");
            items.push(QaItem {
                kind: QaKind::NearMiss,
                at: jn.at,
                feature: Some(street.feature),
                message: format!(
                    "the end of street {} is {d:.1} m from street {oid} but does not join it; \
                     if they meet, share a vertex (or widen the snap tolerance)",
                    street.id
                ),
            });
        }
    }
}
