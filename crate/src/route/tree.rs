//! Dijkstra trees over the pedestrian graph: one tree serves every home of a school.
//!
//! petgraph holds the topology, but its `dijkstra` returns distances in a `HashMap` and no
//! predecessors; the audit needs predecessor edges for every home and flat arrays for speed
//! (see `examples/bench_tree.rs` for the measurement), so the tree is written here over
//! [`PedGraph::neighbours`]. Buffers are reused between trees: only touched entries are reset.

use crate::network::PedGraph;
use std::cmp::Ordering;
use std::collections::BinaryHeap;

/// "No edge": a source corner, or a corner the tree has not reached.
pub const NONE: u32 = u32::MAX;

/// A start of the search: a corner and the cost already spent reaching it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Source {
    pub corner: u32,
    pub cost: f64,
    /// Caller's tag for the source (an entrance, or a school in a multi-source search).
    pub origin: u32,
}

/// A shortest-path tree: cost to the nearest source, the edge towards it, and that source.
#[derive(Debug, Clone, Default)]
pub struct Tree {
    pub cost: Vec<f64>,
    pub pred_edge: Vec<u32>,
    pub origin: Vec<u32>,
    touched: Vec<u32>,
    /// Marks the corners still awaited in this growth; all false between growths.
    is_target: Vec<bool>,
    heap: BinaryHeap<HeapItem>,
}

#[derive(Debug, Clone, Copy, PartialEq)]
struct HeapItem {
    cost: f64,
    corner: u32,
}
impl Eq for HeapItem {}
impl Ord for HeapItem {
    fn cmp(&self, other: &Self) -> Ordering {
        // Min-heap on cost; costs are finite and non-negative by construction.
        other
            .cost
            .partial_cmp(&self.cost)
            .unwrap_or(Ordering::Equal)
            .then_with(|| other.corner.cmp(&self.corner))
    }
}
impl PartialOrd for HeapItem {
    fn partial_cmp(&self, other: &Self) -> Option<Ordering> {
        Some(self.cmp(other))
    }
}

impl Tree {
    /// An empty tree sized for `graph`; reuse it with [`Tree::grow`].
    pub fn for_graph(graph: &PedGraph) -> Self {
        let n = graph.corner_count();
        Tree {
            cost: vec![f64::INFINITY; n],
            pred_edge: vec![NONE; n],
            origin: vec![NONE; n],
            touched: Vec::new(),
            is_target: vec![false; n],
            heap: BinaryHeap::new(),
        }
    }

    /// Grows the tree from `sources` with per-edge costs `edge_cost` (indexed like
    /// `graph.edges`; non-finite means impassable). Stops once every corner in `targets` is
    /// settled (exact: Dijkstra settles in cost order), or when the heap runs dry;
    /// an empty `targets` grows the whole tree.
    ///
    /// ```
    /// use catchwalk::route::tree::{Source, Tree};
    /// let g = catchwalk::network::PedGraph::toy_path(&[10.0, 5.0]); // corners 0-1-2
    /// let mut t = Tree::for_graph(&g);
    /// t.grow(&g, &[10.0, 5.0], &[Source { corner: 0, cost: 0.0, origin: 0 }], &[]);
    /// assert_eq!(t.cost[2], 15.0);
    /// assert_eq!(t.pred_edge[2], 1);
    /// ```
    pub fn grow(
        &mut self,
        graph: &PedGraph,
        edge_cost: &[f64],
        sources: &[Source],
        targets: &[u32],
    ) {
        self.reset();
        for s in sources {
            let c = s.corner as usize;
            if s.cost < self.cost[c] {
                if self.cost[c].is_infinite() {
                    self.touched.push(s.corner);
                }
                self.cost[c] = s.cost;
                self.origin[c] = s.origin;
                self.pred_edge[c] = NONE;
                self.heap.push(HeapItem {
                    cost: s.cost,
                    corner: s.corner,
                });
            }
        }
        let whole_tree = targets.is_empty();
        let mut remaining = 0;
        for &t in targets {
            if let Some(flag) = self.is_target.get_mut(t as usize) {
                if !*flag {
                    *flag = true;
                    remaining += 1;
                }
            }
        }
        while let Some(HeapItem { cost, corner }) = self.heap.pop() {
            let ci = corner as usize;
            if cost > self.cost[ci] {
                continue;
            }
            if !whole_tree && self.is_target[ci] {
                self.is_target[ci] = false;
                remaining -= 1;
                if remaining == 0 {
                    break;
                }
            }
            for (edge, next) in graph.neighbours(corner) {
                // Non-finite (or NaN) is impassable; a negative cost counts as zero, so a
                // bad cost can never make the search loop round a negative cycle.
                let w = match edge_cost.get(edge as usize) {
                    Some(&w) if w.is_finite() => w.max(0.0),
                    _ => continue,
                };
                let nc = cost + w;
                let ni = next as usize;
                if nc < self.cost[ni] {
                    if self.cost[ni].is_infinite() {
                        self.touched.push(next);
                    }
                    self.cost[ni] = nc;
                    self.pred_edge[ni] = edge;
                    self.origin[ni] = self.origin[ci];
                    self.heap.push(HeapItem {
                        cost: nc,
                        corner: next,
                    });
                }
            }
        }
        self.heap.clear();
        for &t in targets {
            if let Some(flag) = self.is_target.get_mut(t as usize) {
                *flag = false;
            }
        }
    }

    /// Edges from `corner` back to its source, nearest first.
    pub fn path_to_source(&self, graph: &PedGraph, corner: u32) -> Vec<u32> {
        let mut out = Vec::new();
        let mut c = corner;
        while self.cost[c as usize].is_finite() {
            let e = self.pred_edge[c as usize];
            if e == NONE {
                break;
            }
            out.push(e);
            let edge = &graph.edges[e as usize];
            c = if edge.a == c { edge.b } else { edge.a };
            if out.len() > graph.edges.len() {
                break; // cannot happen in a tree; guards against a cycle rather than hang
            }
        }
        out
    }

    /// The corners the last growth reached (settled or only queued), as a sorted list: a
    /// change to edges with neither end among them cannot alter the tree, since Dijkstra only
    /// reads the edges of the corners it settles (`scenario::reaudit`). A list, not a bit set
    /// over the graph: an audit keeps three per school, and bit sets made that schools x corners
    /// (1.4 GB on a county of 2 000 schools).
    ///
    /// ```
    /// use catchwalk::route::tree::{Source, Tree};
    /// let g = catchwalk::network::PedGraph::toy_path(&[10.0, 5.0]);
    /// let mut t = Tree::for_graph(&g);
    /// t.grow(&g, &[10.0, 5.0], &[Source { corner: 0, cost: 0.0, origin: 0 }], &[1]);
    /// let r = t.reached();
    /// assert!(r.contains(0) && r.contains(1) && !r.contains(2)); // stopped at corner 1
    /// ```
    pub fn reached(&self) -> Reached {
        let mut corners = self.touched.clone();
        corners.sort_unstable();
        corners.dedup();
        Reached(corners)
    }

    fn reset(&mut self) {
        for &c in &self.touched {
            self.cost[c as usize] = f64::INFINITY;
            self.pred_edge[c as usize] = NONE;
            self.origin[c as usize] = NONE;
        }
        self.touched.clear();
    }
}

/// A set of corners a tree reached ([`Tree::reached`]), sorted; empty by default.
#[derive(Debug, Clone, Default, PartialEq, Eq)]
pub struct Reached(Vec<u32>);

impl Reached {
    /// Adds the corners of `other` (a stable sort merges the two sorted runs in one pass).
    pub fn merge(&mut self, other: &Reached) {
        self.0.extend_from_slice(&other.0);
        self.0.sort();
        self.0.dedup();
    }
    pub fn contains(&self, corner: u32) -> bool {
        self.0.binary_search(&corner).is_ok()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn negative_and_nan_costs_cannot_make_the_search_loop() {
        // A negative edge in an undirected graph is a negative cycle (a-b-a): a plain
        // Dijkstra would relax it forever. Here it counts as zero and NaN is impassable.
        let g = PedGraph::toy_path(&[10.0, 5.0, 7.0]);
        let mut t = Tree::for_graph(&g);
        let src = [Source {
            corner: 0,
            cost: 0.0,
            origin: 0,
        }];
        t.grow(&g, &[10.0, -250.0, 7.0], &src, &[]);
        assert_eq!(t.cost[2], 10.0);
        assert_eq!(t.cost[3], 17.0);
        t.grow(&g, &[10.0, f64::NAN, 7.0], &src, &[]);
        assert_eq!(t.cost[1], 10.0);
        assert!(t.cost[2].is_infinite());
        // A cost table shorter than the edge list leaves the missing edges impassable.
        t.grow(&g, &[10.0], &src, &[]);
        assert!(t.cost[2].is_infinite());
    }

    #[test]
    fn reached_sets_merge_and_answer_membership() {
        let g = PedGraph::toy_path(&[10.0, 5.0, 7.0]); // corners 0-1-2-3
        let mut t = Tree::for_graph(&g);
        let from = |corner| {
            [Source {
                corner,
                cost: 0.0,
                origin: 0,
            }]
        };
        t.grow(&g, &[10.0, 5.0, 7.0], &from(3), &[2]);
        let mut r = t.reached(); // 3 settled, 2 settled: stops there, 1 never queued
        assert!(r.contains(3) && r.contains(2) && !r.contains(1) && !r.contains(0));
        t.grow(&g, &[10.0, 5.0, 7.0], &from(0), &[1]);
        r.merge(&t.reached());
        assert!((0..4).all(|c| r.contains(c)));
        assert!(!r.contains(4) && !r.contains(u32::MAX));
        r.merge(&Reached::default());
        assert_eq!(r.0, vec![0, 1, 2, 3]);
    }
}
