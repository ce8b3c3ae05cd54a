//! Reading one home's route out of a school's tree.

use super::tree::{Source, Tree, NONE};
use crate::network::{Attachment, PedGraph};
use serde::Serialize;

/// One piece of a route: edge `edge` walked from fraction `from_frac` to `to_frac` of its
/// length (0 is corner `a`, 1 is corner `b`). Crossings are always walked whole.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct RouteStep {
    pub edge: u32,
    pub from_frac: f64,
    pub to_frac: f64,
}

impl RouteStep {
    /// Share of the edge walked (0..=1).
    pub fn share(&self) -> f64 {
        (self.to_frac - self.from_frac).abs()
    }
}

/// A route from a home to a school entrance, home first.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Route {
    pub steps: Vec<RouteStep>,
    /// Total cost under the tree's edge costs.
    pub cost: f64,
    /// Index of the school entrance reached.
    pub entrance: u32,
}

fn frac(graph: &PedGraph, att: &Attachment) -> f64 {
    let len = graph.edges[att.edge as usize].length_m;
    if len > 0.0 {
        (att.offset_m / len).clamp(0.0, 1.0)
    } else {
        0.0
    }
}

/// The sources of a school's tree: each entrance reaches both ends of its edge.
pub fn entrance_sources(
    graph: &PedGraph,
    edge_cost: &[f64],
    entrances: &[Attachment],
) -> Vec<Source> {
    let mut out = Vec::with_capacity(entrances.len() * 2);
    for (k, att) in entrances.iter().enumerate() {
        let e = &graph.edges[att.edge as usize];
        let w = edge_cost[att.edge as usize];
        if !w.is_finite() {
            continue;
        }
        let s = frac(graph, att);
        out.push(Source {
            corner: e.a,
            cost: w * s,
            origin: k as u32,
        });
        out.push(Source {
            corner: e.b,
            cost: w * (1.0 - s),
            origin: k as u32,
        });
    }
    out
}

/// The cheapest route from `home` to any of `entrances` in a tree grown from
/// [`entrance_sources`] with the same `edge_cost`. `None` when the tree does not reach it.
pub fn route_to_school(
    graph: &PedGraph,
    tree: &Tree,
    edge_cost: &[f64],
    home: &Attachment,
    entrances: &[Attachment],
) -> Option<Route> {
    let e = &graph.edges[home.edge as usize];
    let w = edge_cost[home.edge as usize];
    if !w.is_finite() {
        return None;
    }
    let u = frac(graph, home);
    let via_a = tree.cost[e.a as usize] + w * u;
    let via_b = tree.cost[e.b as usize] + w * (1.0 - u);
    // A home on the same edge as an entrance may walk straight to it.
    let direct = entrances
        .iter()
        .enumerate()
        .filter(|(_, s)| s.edge == home.edge)
        .map(|(k, s)| (w * (frac(graph, s) - u).abs(), k, frac(graph, s)))
        .min_by(|x, y| x.0.total_cmp(&y.0));
    let best_via = via_a.min(via_b);
    if let Some((cost, k, s)) = direct {
        if cost <= best_via {
            return Some(Route {
                steps: vec![RouteStep {
                    edge: home.edge,
                    from_frac: u,
                    to_frac: s,
                }],
                cost,
                entrance: k as u32,
            });
        }
    }
    if !best_via.is_finite() {
        return None;
    }
    let (corner, end_frac) = if via_a <= via_b {
        (e.a, 0.0)
    } else {
        (e.b, 1.0)
    };
    let mut steps = vec![RouteStep {
        edge: home.edge,
        from_frac: u,
        to_frac: end_frac,
    }];
    let mut c = corner;
    for edge in tree.path_to_source(graph, corner) {
        let ed = &graph.edges[edge as usize];
        let (from_frac, to_frac, next) = if ed.a == c {
            (0.0, 1.0, ed.b)
        } else {
            (1.0, 0.0, ed.a)
        };
        steps.push(RouteStep {
            edge,
            from_frac,
            to_frac,
        });
        c = next;
    }
    let k = tree.origin[c as usize];
    if k == NONE {
        return None;
    }
    let ent = &entrances[k as usize];
    let ee = &graph.edges[ent.edge as usize];
    let start = if ee.a == c { 0.0 } else { 1.0 };
    steps.push(RouteStep {
        edge: ent.edge,
        from_frac: start,
        to_frac: frac(graph, ent),
    });
    steps.retain(|s| s.from_frac != s.to_frac || graph.edges[s.edge as usize].is_crossing());
    Some(Route {
        steps,
        cost: best_via,
        entrance: k,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn att(g: &PedGraph, edge: u32, offset_m: f64) -> Attachment {
        let _ = g;
        Attachment {
            edge,
            offset_m,
            at: [0.0, 0.0],
            snap_m: 0.0,
        }
    }

    #[test]
    fn route_along_a_chain_sums_partial_and_whole_edges() {
        // corners 0 -10m- 1 -5m- 2 -20m- 3 ; school 2 m into edge 0, home 15 m into edge 2.
        let g = PedGraph::toy_path(&[10.0, 5.0, 20.0]);
        let cost: Vec<f64> = g.edges.iter().map(|e| e.length_m).collect();
        let school = [att(&g, 0, 2.0)];
        let mut t = Tree::for_graph(&g);
        t.grow(&g, &cost, &entrance_sources(&g, &cost, &school), &[]);
        let r = route_to_school(&g, &t, &cost, &att(&g, 2, 15.0), &school).unwrap();
        assert!((r.cost - (15.0 + 5.0 + 8.0)).abs() < 1e-9);
        let walked: f64 = r
            .steps
            .iter()
            .map(|s| s.share() * g.edges[s.edge as usize].length_m)
            .sum();
        assert!((walked - r.cost).abs() < 1e-9);
        assert_eq!(r.steps.first().unwrap().edge, 2);
        assert_eq!(r.steps.last().unwrap().edge, 0);
    }

    #[test]
    fn home_on_the_school_edge_walks_straight_there() {
        let g = PedGraph::toy_path(&[100.0]);
        let cost: Vec<f64> = g.edges.iter().map(|e| e.length_m).collect();
        let school = [att(&g, 0, 70.0)];
        let mut t = Tree::for_graph(&g);
        t.grow(&g, &cost, &entrance_sources(&g, &cost, &school), &[]);
        let r = route_to_school(&g, &t, &cost, &att(&g, 0, 20.0), &school).unwrap();
        assert!((r.cost - 50.0).abs() < 1e-9);
        assert_eq!(r.steps.len(), 1);
    }

    #[test]
    fn unreachable_home_has_no_route() {
        let mut g = PedGraph::toy_path(&[10.0, 10.0]);
        let cost = vec![10.0, f64::INFINITY];
        g.index_topology();
        let school = [att(&g, 0, 0.0)];
        let mut t = Tree::for_graph(&g);
        t.grow(&g, &cost, &entrance_sources(&g, &cost, &school), &[]);
        assert!(route_to_school(&g, &t, &cost, &att(&g, 1, 5.0), &school).is_none());
    }
}
