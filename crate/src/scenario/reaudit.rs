//! Audits with interventions: from scratch ([`audit_overlay`]), or from a previous audit
//! re-routing only the schools whose trees the change touches ([`reaudit`]).

use super::apply::{check_controls_attached, overlay};
use super::{Intervention, Overlay};
use crate::config::Config;
use crate::error::{Error, Result};
use crate::input::{Layers, Students};
use crate::network::{PedGraph, NO_CORNER};
use crate::pipeline::{
    audit_layers, edge_costs, prepare_network, route_school, safe_costs, school_members,
    unreachable_qa, AuditOutput, Progress, Stage, Timings,
};
use crate::route::tree::{Reached, Tree};
use crate::route::RouteKind;
use serde::Serialize;
use std::collections::{BTreeSet, HashMap};
use std::sync::Arc;

/// Audits `base` with `list` applied, from scratch.
pub fn audit_overlay(
    base: Arc<Layers>,
    list: Vec<Intervention>,
    config: &Config,
    progress: &mut dyn Progress,
) -> Result<AuditOutput> {
    let (layers, ov) = overlay(base, list, &config.network)?;
    let mut out = audit_layers(layers, config, progress)?;
    check_controls_attached(&out.network, &ov)?;
    out.scenario = Some(ov);
    Ok(out)
}

/// What a re-audit did.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct ReauditStats {
    pub schools: usize,
    pub schools_rerouted: usize,
    /// The change altered the network's shape (a path, a closure, a mid-block crossing
    /// point): every school was audited again.
    pub full: bool,
}

/// True when two graphs have the same corners and edges between the same corners on the
/// same segments: only edge properties (controls, sidewalks) can differ.
fn same_shape(a: &PedGraph, b: &PedGraph) -> bool {
    a.corners.len() == b.corners.len()
        && a.junctions == b.junctions
        && a.edges.len() == b.edges.len()
        && a.segments.len() == b.segments.len()
        && a.segments.iter().zip(&b.segments).all(|(x, y)| {
            x.street == y.street && x.from == y.from && x.to == y.to && x.length_m == y.length_m
        })
        && a.edges.iter().zip(&b.edges).all(|(x, y)| {
            x.a == y.a
                && x.b == y.b
                && x.segment() == y.segment()
                && std::mem::discriminant(&x.kind) == std::mem::discriminant(&y.kind)
        })
}

/// The audit of the previous audit's base layers with `list` applied (the whole new list,
/// not a difference), equal to [`audit_overlay`] of the same list, figure for figure. When
/// the network keeps its shape, only schools whose trees reached a changed edge are routed
/// again: a tree that never reached either end of an edge cannot change when that edge's
/// cost does (Dijkstra reads only the edges of the corners it settles), and a route that does
/// not use a changed edge keeps its figures.
pub fn reaudit(
    prev: &AuditOutput,
    list: Vec<Intervention>,
    progress: &mut dyn Progress,
) -> Result<(AuditOutput, ReauditStats)> {
    let config = &prev.config;
    let t0 = progress.now_ms();
    if !progress.report(Stage::Network, 0, 1) {
        return Err(Error::Cancelled);
    }
    let base = match &prev.scenario {
        Some(ov) => ov.base.clone(),
        None => Arc::new(prev.layers.clone()),
    };
    let (layers, ov) = overlay(base, list, &config.network)?;
    let (mut network, school_att, home_att) = prepare_network(&layers, config);
    check_controls_attached(&network, &ov)?;
    let n_schools = layers.schools.len();
    let old_g = &prev.network.graph;
    let g = &network.graph;
    let walk_cost = edge_costs(g, &layers.streets, config, RouteKind::Shortest);
    let shape_kept = same_shape(old_g, g)
        && school_att == prev.school_att
        && prev.homes.len() == home_att.len()
        && prev
            .homes
            .iter()
            .zip(&home_att)
            .all(|(h, a)| h.attachment == *a)
        && prev.layers.streets.len() == layers.streets.len()
        && prev.tree_reach.len() == n_schools
        && walk_cost == edge_costs(old_g, &prev.layers.streets, config, RouteKind::Shortest);
    if !shape_kept {
        let mut out = audit_layers(layers, config, progress)?;
        out.scenario = Some(ov);
        let stats = ReauditStats {
            schools: n_schools,
            schools_rerouted: n_schools,
            full: true,
        };
        return Ok((out, stats));
    }
    let t1 = progress.now_ms();
    let rec_cost = edge_costs(g, &layers.streets, config, RouteKind::Recommended);
    let old_rec = edge_costs(old_g, &prev.layers.streets, config, RouteKind::Recommended);
    let bands = [Students::Elementary, Students::Secondary];
    let safe: HashMap<Students, (Vec<f64>, Vec<f64>)> = bands
        .iter()
        .map(|&b| {
            let new = safe_costs(g, &layers.streets, config, b);
            let old = safe_costs(old_g, &prev.layers.streets, config, b);
            (b, (new, old))
        })
        .collect();
    let street_changed = |seg: u32| {
        g.segments
            .get(seg as usize)
            .is_some_and(|s| prev.layers.streets.get(s.street) != layers.streets.get(s.street))
    };
    let bits = |v: &[f64], i: usize| v.get(i).map(|c| c.to_bits());
    // Changed edges, with whether each tree's cost of it changed (shortest, recommended,
    // safe for either age band). An edge whose figures change but whose costs do not
    // (a guard on an edge the rules do not flag) matters only to routes that use it.
    let changed: Vec<(u32, [bool; 3])> = (0..g.edges.len())
        .filter_map(|i| {
            let any = old_g.edges.get(i) != g.edges.get(i) || street_changed(g.edges[i].segment());
            let costs = [
                false, // walk costs are equal, checked above
                bits(&rec_cost, i) != bits(&old_rec, i),
                safe.values().any(|(n, o)| bits(n, i) != bits(o, i)),
            ];
            (any || costs.iter().any(|&c| c)).then_some((i as u32, costs))
        })
        .collect();
    let changed_set: BTreeSet<u32> = changed.iter().map(|c| c.0).collect();

    let mut homes = prev.homes.clone();
    let mut tree_reach = prev.tree_reach.clone();
    let mut tree = Tree::for_graph(g);
    let mut rerouted = 0;
    // Re-routing changes routes only, never a home's school or attachment.
    let members_of = school_members(&homes, n_schools);
    for (s, entrances) in school_att.iter().enumerate() {
        if !progress.report(Stage::Routing, s, n_schools) {
            return Err(Error::Cancelled);
        }
        let members = members_of.get(s).map_or(&[][..], |m| m.as_slice());
        if members.is_empty() || entrances.is_empty() || changed.is_empty() {
            continue;
        }
        let near: BTreeSet<u32> = members
            .iter()
            .filter_map(|&i| homes.get(i).and_then(|h| h.attachment))
            .chain(entrances.iter().copied())
            .filter_map(|a| g.edges.get(a.edge as usize).map(|e| e.segment()))
            .collect();
        let empty_reach = <[Reached; 3]>::default();
        let reach = tree_reach.get(s).unwrap_or(&empty_reach);
        let on_routes = members.iter().filter_map(|&i| homes.get(i)).any(|h| {
            [&h.shortest, &h.recommended, &h.safe].iter().any(|r| {
                r.as_ref().is_some_and(|r| {
                    r.route
                        .steps
                        .iter()
                        .any(|st| changed_set.contains(&st.edge))
                })
            })
        });
        let touched = on_routes
            || changed.iter().any(|&(k, costs)| {
                let Some(e) = g.edges.get(k as usize) else {
                    return true;
                };
                if near.contains(&e.segment()) {
                    return true;
                }
                if e.a == NO_CORNER || e.b == NO_CORNER {
                    return false; // doorstep crossings count only on a home's or entrance's segment
                }
                costs
                    .iter()
                    .zip(reach)
                    .any(|(&c, r)| c && (r.contains(e.a) || r.contains(e.b)))
            });
        if !touched {
            continue;
        }
        rerouted += 1;
        for &i in members {
            if let Some(h) = homes.get_mut(i) {
                h.over_detour_cap = false;
            }
        }
        let students = layers
            .schools
            .get(s)
            .map(|x| x.students)
            .unwrap_or_default();
        let empty = Vec::new();
        let safe_cost = safe.get(&students).map(|(n, _)| n).unwrap_or(&empty);
        let r = route_school(
            g,
            &layers.streets,
            config,
            [&walk_cost, &rec_cost, safe_cost],
            entrances,
            members,
            &mut homes,
            &mut tree,
        );
        if let Some(t) = tree_reach.get_mut(s) {
            *t = r;
        }
    }
    progress.report(Stage::Routing, n_schools, n_schools);
    unreachable_qa(&layers, &homes, &mut network.qa);
    if !progress.report(Stage::Scoring, 0, 1) {
        return Err(Error::Cancelled);
    }
    let ts = progress.now_ms();
    let scores = crate::score::score_audit(&layers, &network.graph, &homes, config);
    progress.report(Stage::Scoring, 1, 1);
    let t2 = progress.now_ms();
    let out = AuditOutput {
        config: config.clone(),
        layers,
        warnings: prev.warnings.clone(),
        network,
        school_att,
        homes,
        scores,
        tree_reach,
        scenario: Some(ov),
        timings: Timings {
            parse_ms: 0.0,
            network_ms: t1 - t0,
            routing_ms: ts - t1,
            scoring_ms: t2 - ts,
            total_ms: t2 - t0,
        },
    };
    let stats = ReauditStats {
        schools: n_schools,
        schools_rerouted: rerouted,
        full: false,
    };
    Ok((out, stats))
}

/// The overlay's interventions, for listing (empty without an overlay).
pub fn applied(out: &AuditOutput) -> &[Intervention] {
    out.scenario
        .as_ref()
        .map(|o: &Overlay| o.applied.as_slice())
        .unwrap_or(&[])
}
