//! QA: connected pieces of the centreline graph. A small piece apart from the rest is often
//! a digitising gap, or a bridge whose ends do not meet the approach roads.

use super::qa::{QaItem, QaKind};
use super::unionfind::UnionFind;
use super::{Junction, Segment};
use crate::input::Street;
use rustc_hash::FxHashMap as HashMap;

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
    let mut comps: HashMap<u32, (usize, usize)> = HashMap::default();
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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geodesy::LocalFrame;
    use crate::network::noding::node_streets;
    use crate::network::test_util::street;

    #[test]
    fn counts_components_and_flags_the_small_ones() {
        let f = LocalFrame::new([10.0, 50.0]);
        let m = |x: f64, y: f64| f.to_lonlat([x, y]);
        // Main: a chain of three segments; apart: one segment.
        let main = street(vec![m(0.0, 0.0), m(10.0, 0.0)]);
        let main2 = street(vec![m(10.0, 0.0), m(20.0, 0.0)]);
        let main3 = street(vec![m(20.0, 0.0), m(30.0, 0.0)]);
        let mut apart = street(vec![m(0.0, 50.0), m(10.0, 50.0)]);
        apart.feature = 9;
        let streets = [main, main2, main3, apart];
        let n = node_streets(&streets, 0.5, &f);
        let mut items = Vec::new();
        let (count, share) = component_qa(&n.junctions, &n.segments, &streets, 2, &mut items);
        assert_eq!(count, 2);
        assert!((share - 0.75).abs() < 1e-12);
        assert_eq!(items.len(), 1);
        assert_eq!(items[0].feature, Some(9));
        let mut none = Vec::new();
        component_qa(&n.junctions, &n.segments, &streets, 1, &mut none);
        assert!(
            none.is_empty(),
            "a one-segment piece is not below a threshold of 1"
        );
    }
}
