//! Reading one home's route out of a school's tree.

use super::tree::{Source, Tree, NONE};
use crate::network::{Attachment, PedGraph, NO_CORNER};
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

/// Where a route may start or end for one attachment: on its own edge, or, after a doorstep
/// crossing of its street, on the other side's edge at the same place.
#[derive(Debug, Clone, Copy)]
struct EndOption {
    edge: u32,
    /// Cost spent before walking along `edge` (the doorstep crossing, or nothing).
    extra: f64,
    doorstep: Option<u32>,
}

fn end_options(graph: &PedGraph, edge_cost: &[f64], att: &Attachment) -> [Option<EndOption>; 2] {
    let own = Some(EndOption {
        edge: att.edge,
        extra: 0.0,
        doorstep: None,
    });
    let seg = graph.edges[att.edge as usize].segment() as usize;
    let (Some(pair), Some(&door)) = (graph.sides.get(seg), graph.doorstep.get(seg)) else {
        return [own, None];
    };
    if door == NO_CORNER {
        return [own, None];
    }
    let twin = if pair[0] == att.edge {
        pair[1]
    } else {
        pair[0]
    };
    let extra = edge_cost[door as usize];
    if twin == NO_CORNER || twin == att.edge || !extra.is_finite() {
        return [own, None];
    }
    [
        own,
        Some(EndOption {
            edge: twin,
            extra,
            doorstep: Some(door),
        }),
    ]
}

/// A candidate start: cost, the home's option, the corner reached with the fraction at which
/// the home's edge is left (or `None` for a walk straight along one edge), and the entrance
/// option for such a straight walk.
type Start = (
    f64,
    EndOption,
    Option<(u32, f64)>,
    Option<(usize, EndOption)>,
);

/// The sources of a school's tree: each entrance reaches both ends of its edge, and both ends
/// of the other side's edge after a doorstep crossing. The origin tag is `entrance * 2 + j`,
/// `j = 1` for the doorstep option.
pub fn entrance_sources(
    graph: &PedGraph,
    edge_cost: &[f64],
    entrances: &[Attachment],
) -> Vec<Source> {
    let mut out = Vec::with_capacity(entrances.len() * 4);
    for (k, att) in entrances.iter().enumerate() {
        let s = frac(graph, att);
        for (j, opt) in end_options(graph, edge_cost, att).iter().enumerate() {
            let Some(opt) = opt else { continue };
            let e = &graph.edges[opt.edge as usize];
            let w = edge_cost[opt.edge as usize];
            if !w.is_finite() {
                continue;
            }
            let origin = (k * 2 + j) as u32;
            out.push(Source {
                corner: e.a,
                cost: opt.extra + w * s,
                origin,
            });
            out.push(Source {
                corner: e.b,
                cost: opt.extra + w * (1.0 - s),
                origin,
            });
        }
    }
    out
}

/// The cheapest route from `home` to any of `entrances` in a tree grown from
/// [`entrance_sources`] with the same `edge_cost`. `None` when the tree does not reach it.
/// The entrance index of the result is the position in `entrances`.
pub fn route_to_school(
    graph: &PedGraph,
    tree: &Tree,
    edge_cost: &[f64],
    home: &Attachment,
    entrances: &[Attachment],
) -> Option<Route> {
    route_to_school_among(graph, tree, edge_cost, home, entrances, 0..entrances.len())
}

/// [`route_to_school`] where only the entrances at `same_segment` (indices into
/// `entrances`) can stand on the home's street segment, so only they are tried for a walk
/// straight along one edge. A home's edge and its twin lie on one segment, so any entrance
/// elsewhere cannot share an edge with it. The nearest-school search has every school's
/// entrances in one list: trying each of them for every home made it homes x schools.
pub fn route_to_school_among(
    graph: &PedGraph,
    tree: &Tree,
    edge_cost: &[f64],
    home: &Attachment,
    entrances: &[Attachment],
    same_segment: impl Iterator<Item = usize> + Clone,
) -> Option<Route> {
    let u = frac(graph, home);
    let mut best: Option<Start> = None;
    let mut consider = |cand: Start| {
        if cand.0.is_finite() && best.as_ref().is_none_or(|b| cand.0 < b.0) {
            best = Some(cand);
        }
    };
    let home_opts = end_options(graph, edge_cost, home);
    for opt in home_opts.iter().flatten() {
        let e = &graph.edges[opt.edge as usize];
        let w = edge_cost[opt.edge as usize];
        if !w.is_finite() {
            continue;
        }
        consider((
            opt.extra + tree.cost[e.a as usize] + w * u,
            *opt,
            Some((e.a, 0.0)),
            None,
        ));
        consider((
            opt.extra + tree.cost[e.b as usize] + w * (1.0 - u),
            *opt,
            Some((e.b, 1.0)),
            None,
        ));
        // Straight along the same edge to an entrance on it.
        for k in same_segment.clone() {
            let Some(ent) = entrances.get(k) else {
                continue;
            };
            for eopt in end_options(graph, edge_cost, ent).iter().flatten() {
                if eopt.edge == opt.edge {
                    let d = w * (frac(graph, ent) - u).abs();
                    consider((opt.extra + eopt.extra + d, *opt, None, Some((k, *eopt))));
                }
            }
        }
    }
    let (cost, start, via, direct) = best?;
    let mut steps = Vec::new();
    if let Some(door) = start.doorstep {
        steps.push(RouteStep {
            edge: door,
            from_frac: u,
            to_frac: u,
        });
    }
    let (k, eopt, c) = match (via, direct) {
        (None, Some((k, eopt))) => {
            steps.push(RouteStep {
                edge: start.edge,
                from_frac: u,
                to_frac: frac(graph, &entrances[k]),
            });
            (k, eopt, None)
        }
        (Some((corner, end_frac)), _) => {
            steps.push(RouteStep {
                edge: start.edge,
                from_frac: u,
                to_frac: end_frac,
            });
            let mut c = corner;
            let path = tree.path_to_source(graph, corner);
            steps.reserve_exact(path.len() + 2);
            for edge in path {
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
            let origin = tree.origin[c as usize];
            if origin == NONE {
                return None;
            }
            let k = (origin / 2) as usize;
            let ent = entrances.get(k)?;
            let eopt = end_options(graph, edge_cost, ent)[(origin % 2) as usize]?;
            (k, eopt, Some(c))
        }
        (None, None) => return None,
    };
    let ent = &entrances[k];
    let s = frac(graph, ent);
    if let Some(c) = c {
        let ee = &graph.edges[eopt.edge as usize];
        let start_frac = if ee.a == c { 0.0 } else { 1.0 };
        steps.push(RouteStep {
            edge: eopt.edge,
            from_frac: start_frac,
            to_frac: s,
        });
    }
    if let Some(door) = eopt.doorstep {
        steps.push(RouteStep {
            edge: door,
            from_frac: s,
            to_frac: s,
        });
    }
    steps.retain(|s| s.from_frac != s.to_frac || graph.edges[s.edge as usize].is_crossing());
    Some(Route {
        steps,
        cost,
        entrance: k as u32,
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
