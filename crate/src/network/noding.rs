//! Noding: cutting the street centrelines into segments between junctions.
//!
//! A junction is every line end and every vertex that two or more lines share or that one
//! line visits twice (exact coordinate equality, whatever the layer tags say), plus vertices
//! merged by [`snap`](super::snap) within one vertical layer. Two lines that merely cross
//! without a shared vertex are not noded: a bridge over a road does not connect to it.

use super::snap::{snap_points, SnapInput};
use super::unionfind::UnionFind;
use super::{Junction, Segment};
use crate::geodesy::{line_length_m, LocalFrame};
use crate::input::{LonLat, Street};
use rustc_hash::FxHashMap as HashMap;

/// Junctions and the segments between them.
#[derive(Debug, Clone, Default)]
pub(crate) struct Noded {
    pub junctions: Vec<Junction>,
    pub segments: Vec<Segment>,
}

/// Exact-equality key of a coordinate (`-0.0` and `0.0` are the same place).
fn key(p: LonLat) -> (u64, u64) {
    ((p[0] + 0.0).to_bits(), (p[1] + 0.0).to_bits())
}

/// A street's points without non-finite values or immediate repeats.
fn clean_line(line: &[LonLat]) -> Vec<LonLat> {
    let mut out: Vec<LonLat> = Vec::with_capacity(line.len());
    for &p in line {
        if !(p[0].is_finite() && p[1].is_finite()) {
            continue;
        }
        if out.last().map(|&q| key(q) == key(p)).unwrap_or(false) {
            continue;
        }
        out.push(p);
    }
    out
}

/// Nodes the streets. `tol_m` is the snap tolerance; `frame` a metric frame over the data.
///
/// A piece that starts and ends at the same junction and is no longer than twice the
/// tolerance is dropped (snapping closed it up); a longer one is a loop and is kept.
pub(crate) fn node_streets(streets: &[Street], tol_m: f64, frame: &LocalFrame) -> Noded {
    let lines: Vec<Vec<LonLat>> = streets
        .iter()
        .map(|s| {
            let l = clean_line(&s.line);
            if l.len() >= 2 {
                l
            } else {
                Vec::new()
            }
        })
        .collect();

    // Exact points, how often they occur, and whether one is a line end.
    let mut ids: HashMap<(u64, u64), u32> = HashMap::default();
    let mut points: Vec<LonLat> = Vec::new();
    let mut count: Vec<u32> = Vec::new();
    let mut node: Vec<bool> = Vec::new();
    let mut point_layer: Vec<i32> = Vec::new();
    let mut point_of: Vec<u32> = Vec::new();
    let mut layer_of: Vec<i32> = Vec::new();
    let mut start: Vec<usize> = Vec::with_capacity(lines.len());
    for (s, line) in lines.iter().enumerate() {
        start.push(point_of.len());
        let layer = streets.get(s).map(|st| st.layer).unwrap_or(0);
        let last = line.len().saturating_sub(1);
        for (i, &p) in line.iter().enumerate() {
            let id = *ids.entry(key(p)).or_insert_with(|| {
                points.push(p);
                count.push(0);
                node.push(false);
                point_layer.push(layer);
                (points.len() - 1) as u32
            });
            let k = id as usize;
            if let Some(c) = count.get_mut(k) {
                *c += 1;
                if *c >= 2 {
                    node[k] = true;
                }
            }
            if i == 0 || i == last {
                node[k] = true;
            }
            point_of.push(id);
            layer_of.push(layer);
        }
    }

    let mut uf = UnionFind::new(points.len());
    snap_points(
        &SnapInput {
            point_of: &point_of,
            layer_of: &layer_of,
            points: &points,
        },
        &mut node,
        &mut uf,
        tol_m,
        frame,
    );

    // Each cluster's position: its most shared point (ties: the first seen), so an end that
    // snapped moves onto the through street, not the other way round.
    let mut best: HashMap<u32, u32> = HashMap::default();
    for p in 0..points.len() as u32 {
        if !node[p as usize] {
            continue;
        }
        let root = uf.find(p);
        let e = best.entry(root).or_insert(p);
        if count[p as usize] > count[*e as usize] {
            *e = p;
        }
    }

    // Junction ids in order of first appearance along the streets.
    let mut maker = JunctionMaker {
        of_root: HashMap::default(),
        junctions: Vec::new(),
        best: &best,
        points: &points,
        point_layer: &point_layer,
    };
    let mut segments: Vec<Segment> = Vec::new();
    for (s, line) in lines.iter().enumerate() {
        if line.len() < 2 {
            continue;
        }
        let base = start[s];
        let mut from = maker.junction_at(point_of[base], &mut uf);
        let mut piece: Vec<LonLat> = vec![line[0]];
        for (i, &p) in line.iter().enumerate().skip(1) {
            piece.push(p);
            let pid = point_of[base + i];
            if !node[pid as usize] {
                continue;
            }
            let to = maker.junction_at(pid, &mut uf);
            let mut geom = std::mem::replace(&mut piece, vec![p]);
            if let (Some(f), Some(jf)) = (geom.first_mut(), maker.junctions.get(from as usize)) {
                *f = jf.at;
            }
            if let (Some(l), Some(jt)) = (geom.last_mut(), maker.junctions.get(to as usize)) {
                *l = jt.at;
            }
            geom.dedup_by(|a, b| key(*a) == key(*b));
            if geom.len() == 1 {
                geom.push(geom[0]);
            }
            let length_m = line_length_m(&geom);
            let degenerate = from == to && length_m <= 2.0 * tol_m.max(0.0);
            if !degenerate {
                segments.push(Segment {
                    street: s,
                    from,
                    to,
                    line: geom,
                    length_m,
                });
            }
            from = to;
        }
    }
    Noded {
        junctions: maker.junctions,
        segments,
    }
}

/// Hands out junction ids, one per snapped cluster of node points.
struct JunctionMaker<'a> {
    of_root: HashMap<u32, u32>,
    junctions: Vec<Junction>,
    best: &'a HashMap<u32, u32>,
    points: &'a [LonLat],
    point_layer: &'a [i32],
}

impl JunctionMaker<'_> {
    fn junction_at(&mut self, p: u32, uf: &mut UnionFind) -> u32 {
        let root = uf.find(p);
        if let Some(&j) = self.of_root.get(&root) {
            return j;
        }
        let rep = self.best.get(&root).copied().unwrap_or(p) as usize;
        self.junctions.push(Junction {
            at: self.points.get(rep).copied().unwrap_or([0.0, 0.0]),
            layer: self.point_layer.get(rep).copied().unwrap_or(0),
        });
        let j = (self.junctions.len() - 1) as u32;
        self.of_root.insert(root, j);
        j
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::network::test_util::street;

    fn frame() -> LocalFrame {
        LocalFrame::new([10.0, 50.0])
    }

    #[test]
    fn shared_interior_vertex_is_a_junction_and_mere_crossing_is_not() {
        // A runs west-east through (10.001, 50); B runs south-north through the same vertex.
        let a = street(vec![[10.0, 50.0], [10.001, 50.0], [10.002, 50.0]]);
        let b = street(vec![[10.001, 49.999], [10.001, 50.0], [10.001, 50.001]]);
        // C crosses A between vertices, without a shared vertex.
        let c = street(vec![[10.0015, 49.999], [10.0015, 50.001]]);
        let n = node_streets(&[a, b, c], 0.5, &frame());
        assert_eq!(n.segments.len(), 5, "A and B split in two, C whole");
        assert_eq!(n.junctions.len(), 7);
        let c_segs: Vec<_> = n.segments.iter().filter(|s| s.street == 2).collect();
        assert_eq!(c_segs.len(), 1);
    }

    #[test]
    fn a_line_visiting_a_vertex_twice_is_noded_there() {
        // A lollipop: out, round a loop and back through the same vertex.
        let l = street(vec![
            [10.0, 50.0],
            [10.001, 50.0],
            [10.002, 50.0],
            [10.002, 50.001],
            [10.001, 50.0],
        ]);
        let n = node_streets(&[l], 0.5, &frame());
        assert_eq!(n.segments.len(), 2);
        let lp = &n.segments[1];
        assert_eq!(
            lp.from, lp.to,
            "the loop starts and ends at the shared vertex"
        );
        assert!(lp.length_m > 200.0);
    }

    #[test]
    fn degenerate_input_never_panics() {
        let pts = street(vec![[10.0, 50.0], [10.0, 50.0], [10.0, 50.0]]);
        let nan = street(vec![[f64::NAN, 50.0], [10.0, 50.0]]);
        let empty = street(vec![]);
        let n = node_streets(&[pts, nan, empty], 0.5, &frame());
        assert!(n.segments.is_empty());
        let n = node_streets(&[], 0.5, &frame());
        assert!(n.junctions.is_empty());
    }

    #[test]
    fn segment_geometry_runs_from_from_to_to() {
        let a = street(vec![[10.0, 50.0], [10.001, 50.0005], [10.002, 50.0]]);
        let n = node_streets(&[a], 0.5, &frame());
        let s = &n.segments[0];
        assert_eq!(s.line.first(), Some(&n.junctions[s.from as usize].at));
        assert_eq!(s.line.last(), Some(&n.junctions[s.to as usize].at));
        assert_eq!(s.line.len(), 3);
    }
}

#[cfg(test)]
mod snap_tests {
    use super::*;
    use crate::network::test_util::street;

    fn m(x: f64, y: f64) -> LonLat {
        LocalFrame::new([10.0, 50.0]).to_lonlat([x, y])
    }

    #[test]
    fn an_end_short_of_a_through_street_snaps_onto_its_vertex() {
        // A T whose stem stops 0.4 m short of the through street's vertex.
        let through = street(vec![m(-50.0, 0.0), m(0.0, 0.0), m(50.0, 0.0)]);
        let stem = street(vec![m(0.0, -0.4), m(0.0, -50.0)]);
        let n = node_streets(&[through, stem], 0.5, &LocalFrame::new([10.0, 50.0]));
        assert_eq!(n.junctions.len(), 4);
        assert_eq!(n.segments.len(), 3);
        // The junction sits on the through street, not at the stem's end.
        let stem_seg = n.segments.iter().find(|s| s.street == 1).expect("stem");
        assert_eq!(n.junctions[stem_seg.from as usize].at, m(0.0, 0.0));
    }

    #[test]
    fn two_plain_interior_vertices_close_together_do_not_snap() {
        let a = street(vec![m(-50.0, 0.0), m(0.0, 0.0), m(50.0, 0.0)]);
        let b = street(vec![m(0.3, -50.0), m(0.3, 0.2), m(0.3, 50.0)]);
        let n = node_streets(&[a, b], 0.5, &LocalFrame::new([10.0, 50.0]));
        assert_eq!(n.segments.len(), 2);
    }
}
