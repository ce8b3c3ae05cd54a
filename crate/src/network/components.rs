//! QA: connected pieces of the centreline graph. A small piece apart from the rest is often
//! a digitising gap, or a bridge whose ends do not meet the approach roads.

use super::qa::{QaItem, QaKind};
use super::unionfind::UnionFind;
use super::{Junction, Segment};
use crate::input::Street;
use std::collections::HashMap;

/// Component count, largest share and one `TinyComponent` item per small piece that is not
/// the largest.
pub(crate) fn component_qa(
    junctions: &[Junction],
    segments: &[Segment],
    streets: &[Street],
    tiny_segments: usize,
    items: &mut Vec<QaItem>,
) -> (usize, f64) {
    let mut uf = UnionFind::new(junctions.len());
    for s in segments {
        uf.union(s.from, s.to);
    }
    // root -> (segment count, first segment)
    let mut comps: HashMap<u32, (usize, usize)> = HashMap::new();
    for (i, s) in segments.iter().enumerate() {
        let e = comps.entry(uf.find(s.from)).or_insert((0, i));
        e.0 += 1;
    }
    if segments.is_empty() {
        return (0, 0.0);
    }
    let mut list: Vec<(usize, usize)> = comps.into_values().collect();
    list.sort_by_key(|&(n, first)| (std::cmp::Reverse(n), first));
    let largest = list.first().map(|c| c.0).unwrap_or(0);
    for &(n, first) in list.iter().skip(1) {
        if n >= tiny_segments {
            continue;
        }
        let Some(seg) = segments.get(first) else {
            continue;
        };
        let street = streets.get(seg.street);
        let mid = seg
            .line
            .get(seg.line.len() / 2)
            .copied()
            .unwrap_or([0.0, 0.0]);
        items.push(QaItem {
            kind: QaKind::TinyComponent,
            at: mid,
            feature: street.map(|s| s.feature),
            message: format!(
                "street {} belongs to a piece of {n} segment(s) that does not connect to the \
                 main network; join its ends to the streets they meet (shared vertex, or \
                 matching layer for a bridge or tunnel), or remove it",
                street.map(|s| s.id.as_str()).unwrap_or("?")
            ),
        });
    }
    (list.len(), largest as f64 / segments.len() as f64)
}
