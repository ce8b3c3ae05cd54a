//! Snapping: vertices that nearly coincide merge, but only within one vertical layer.
//!
//! A grid of cells one tolerance wide holds every vertex; each node vertex (a line end or a
//! shared vertex) looks at the 3 x 3 cells around it, so the work grows with the number of
//! vertices, not its square.

use super::unionfind::UnionFind;
use crate::geodesy::{distance_m, LocalFrame};
use crate::input::LonLat;
use rustc_hash::FxHashMap as HashMap;

/// The flat vertex list the snapper works on.
pub(crate) struct SnapInput<'a> {
    /// Exact point id of each vertex.
    pub point_of: &'a [u32],
    /// Vertical layer of each vertex's street.
    pub layer_of: &'a [i32],
    /// Coordinates of each exact point.
    pub points: &'a [LonLat],
}

/// Merges points within `tol_m` of a node point in the same layer: unions them in `uf` and
/// marks the merged points as nodes. Pairs of two plain interior vertices never merge: that
/// is where lines merely pass close to each other.
pub(crate) fn snap_points(
    input: &SnapInput,
    node: &mut [bool],
    uf: &mut UnionFind,
    tol_m: f64,
    frame: &LocalFrame,
) {
    if !(tol_m.is_finite() && tol_m > 0.0) {
        return;
    }
    let cell_of = |xy: [f64; 2]| -> (i64, i64) {
        (
            (xy[0] / tol_m).floor() as i64,
            (xy[1] / tol_m).floor() as i64,
        )
    };
    let xy: Vec<[f64; 2]> = input.points.iter().map(|&p| frame.to_xy(p)).collect();
    let mut grid: HashMap<(i64, i64), Vec<u32>> = HashMap::default();
    for (v, &p) in input.point_of.iter().enumerate() {
        if let Some(&q) = xy.get(p as usize) {
            grid.entry(cell_of(q)).or_default().push(v as u32);
        }
    }
    let was_node: Vec<bool> = node.to_vec();
    let is_node = |p: u32| was_node.get(p as usize).copied().unwrap_or(false);
    for (v, &p) in input.point_of.iter().enumerate() {
        if !is_node(p) {
            continue;
        }
        let (Some(&q), Some(&layer)) = (xy.get(p as usize), input.layer_of.get(v)) else {
            continue;
        };
        let (cx, cy) = cell_of(q);
        for dx in -1..=1 {
            for dy in -1..=1 {
                let Some(cands) = grid.get(&(cx + dx, cy + dy)) else {
                    continue;
                };
                for &w in cands {
                    let Some(&pw) = input.point_of.get(w as usize) else {
                        continue;
                    };
                    if pw == p || input.layer_of.get(w as usize) != Some(&layer) {
                        continue;
                    }
                    if is_node(pw) && pw < p {
                        continue; // that pair was handled from the other side
                    }
                    let Some(&qw) = xy.get(pw as usize) else {
                        continue;
                    };
                    let flat = ((qw[0] - q[0]).powi(2) + (qw[1] - q[1]).powi(2)).sqrt();
                    if flat > tol_m * 1.01 + 1e-9 {
                        continue;
                    }
                    let (Some(&a), Some(&b)) =
                        (input.points.get(p as usize), input.points.get(pw as usize))
                    else {
                        continue;
                    };
                    if distance_m(a, b) <= tol_m {
                        uf.union(p, pw);
                        if let Some(n) = node.get_mut(pw as usize) {
                            *n = true;
                        }
                    }
                }
            }
        }
    }
}
