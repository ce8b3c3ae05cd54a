//! Rail grade crossings and crash records on the pedestrian graph, and the rules that read
//! them (always *candidates* with a site check: the layers never hold train times, train
//! speed, sight distance or what the pedestrian in a crash was doing).
//!
//! Joining (`join_m`, default 15 m, the crossing-point attach distance):
//! - a rail crossing joins every walkable edge (both sides, or the path) of the nearest
//!   walkable segment within `join_m`; a route that walks any of them is taken to cross the
//!   tracks (conservative where the route walks only part of that segment);
//! - a crash joins the nearest walkable segment within `join_m`: if it lies within `join_m`
//!   of one of that segment's end junctions, every crossing at that junction (a crash in an
//!   intersection concerns all its crossings); else both sides of the segment. Farther
//!   crashes join nothing (counted as unjoined).

use super::rules::{RuleSet, Target};
use crate::config::Config;
use crate::geodesy::distance_m;
use crate::input::observed::{Crash, RailCrossing, RailWarning};
use crate::input::Layers;
use crate::network::attach::SideIndex;
use crate::network::{PedEdgeKind, PedGraph};
use crate::risk::control::guard_on_duty;
use crate::route::Route;
use std::collections::HashMap;

/// Where each observed point sits on the graph: edge -> indices into the layers' lists.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Located {
    pub rail_by_edge: HashMap<u32, Vec<usize>>,
    pub crashes_by_edge: HashMap<u32, Vec<usize>>,
    /// Crashes farther than `join_m` from every walkable segment.
    pub unjoined_crashes: usize,
}

/// Joins the layers' rail crossings and crashes to edges (see the module doc).
pub fn locate(layers: &Layers, graph: &PedGraph, join_m: f64) -> Located {
    let mut out = Located::default();
    if layers.rail_crossings.is_empty() && layers.crashes.is_empty() {
        return out;
    }
    let index = SideIndex::new(graph);
    // Walkable and crossing edges by segment.
    let mut by_segment: HashMap<u32, Vec<u32>> = HashMap::new();
    let mut crossings_at: HashMap<u32, Vec<u32>> = HashMap::new();
    for (i, e) in graph.edges.iter().enumerate() {
        by_segment.entry(e.segment()).or_default().push(i as u32);
        if let PedEdgeKind::Crossing { junction, .. } = e.kind {
            crossings_at.entry(junction).or_default().push(i as u32);
        }
    }
    let walkable = |seg: u32| -> Vec<u32> {
        by_segment
            .get(&seg)
            .map(|v| {
                v.iter()
                    .copied()
                    .filter(|&e| {
                        graph.edges.get(e as usize).is_some_and(|x| {
                            matches!(x.kind, PedEdgeKind::Side { .. } | PedEdgeKind::Path { .. })
                        })
                    })
                    .collect()
            })
            .unwrap_or_default()
    };
    for (k, r) in layers.rail_crossings.iter().enumerate() {
        if let Some(att) = index.attach(graph, r.at, join_m) {
            let Some(e) = graph.edges.get(att.edge as usize) else {
                continue;
            };
            for edge in walkable(e.segment()) {
                out.rail_by_edge.entry(edge).or_default().push(k);
            }
        }
    }
    for (k, c) in layers.crashes.iter().enumerate() {
        let Some(att) = index.attach(graph, c.at, join_m) else {
            out.unjoined_crashes += 1;
            continue;
        };
        let Some(seg_id) = graph.edges.get(att.edge as usize).map(|e| e.segment()) else {
            continue;
        };
        let Some(seg) = graph.segments.get(seg_id as usize) else {
            continue;
        };
        let near_end = [seg.from, seg.to]
            .into_iter()
            .filter_map(|j| {
                graph
                    .junctions
                    .get(j as usize)
                    .map(|p| (j, distance_m(p.at, c.at)))
            })
            .filter(|(_, d)| *d <= join_m)
            .min_by(|a, b| a.1.total_cmp(&b.1))
            .map(|(j, _)| j);
        let crossings: Vec<u32> = near_end
            .and_then(|j| crossings_at.get(&j).cloned())
            .unwrap_or_default();
        let edges = if crossings.is_empty() {
            walkable(seg_id)
        } else {
            crossings
        };
        for edge in edges {
            out.crashes_by_edge.entry(edge).or_default().push(k);
        }
    }
    out
}

fn rail_protected(r: &RailCrossing) -> bool {
    r.guard || r.warning != RailWarning::None
}

/// Whether a crash counts for a rule: pedestrian involved, recent enough, at school times.
fn crash_counts(
    c: &Crash,
    rule: &super::rules::Rule,
    latest_day: Option<i64>,
    cfg: &Config,
) -> bool {
    if !c.pedestrian {
        return false;
    }
    if let (Some(years), Some(latest), Some(day)) = (rule.crash_years, latest_day, c.day) {
        if (latest - day) as f64 > years * 365.25 {
            return false;
        }
    }
    if rule.crashes_in_school_windows {
        if let Some(m) = c.minute {
            let w = crate::input::TimeWindow {
                start_min: m,
                end_min: m.saturating_add(1),
            };
            if !guard_on_duty(&Some(vec![w]), &cfg.risk.school_windows) {
                return false;
            }
        }
    }
    true
}

/// Site checks that rail and crash rules give a route, one line each.
pub fn observed_site_checks(
    rules: &RuleSet,
    route: &Route,
    layers: &Layers,
    located: &Located,
    students: crate::input::Students,
    cfg: &Config,
) -> Vec<String> {
    let mut out = Vec::new();
    let mut rails: Vec<usize> = Vec::new();
    let mut crashes: Vec<usize> = Vec::new();
    for step in &route.steps {
        for &k in located.rail_by_edge.get(&step.edge).into_iter().flatten() {
            if !rails.contains(&k) {
                rails.push(k);
            }
        }
        for &k in located
            .crashes_by_edge
            .get(&step.edge)
            .into_iter()
            .flatten()
        {
            if !crashes.contains(&k) {
                crashes.push(k);
            }
        }
    }
    let latest_day = layers.crashes.iter().filter_map(|c| c.day).max();
    for rule in &rules.rules {
        if rule.students.is_some_and(|s| s != students) {
            continue;
        }
        let what = rule
            .needs_on_site
            .clone()
            .or_else(|| rule.site_check.clone())
            .unwrap_or_else(|| rule.reason.clone());
        match rule.on {
            Target::RailCrossing => {
                for &k in &rails {
                    let Some(r) = layers.rail_crossings.get(k) else {
                        continue;
                    };
                    if rule.tracks_ge.is_some_and(|n| r.tracks < n)
                        || (rule.unless_rail_protected && rail_protected(r))
                    {
                        continue;
                    }
                    out.push(format!(
                        "{} (rail crossing {}, {} track{}): check {what}",
                        rule.id,
                        r.id,
                        r.tracks,
                        if r.tracks == 1 { "" } else { "s" }
                    ));
                }
            }
            Target::CrashHistory => {
                let n = crashes
                    .iter()
                    .filter_map(|&k| layers.crashes.get(k))
                    .filter(|c| crash_counts(c, rule, latest_day, cfg))
                    .count() as u32;
                if rule.pedestrian_crashes_ge.is_some_and(|m| n >= m) {
                    out.push(format!(
                        "{} ({n} pedestrian crash{} joined to the route): check {what}",
                        rule.id,
                        if n == 1 { "" } else { "es" }
                    ));
                }
            }
            Target::Crossing | Target::Stretch => {}
        }
    }
    out
}

/// Crash counts of one edge: all, with a pedestrian involved, killed or seriously injured.
pub fn crash_counts_of(edge: u32, layers: &Layers, located: &Located) -> (u32, u32, u32) {
    let mut n = (0, 0, 0);
    for c in located
        .crashes_by_edge
        .get(&edge)
        .into_iter()
        .flatten()
        .filter_map(|&k| layers.crashes.get(k))
    {
        n.0 += 1;
        n.1 += c.pedestrian as u32;
        n.2 += c.severity.is_some_and(|s| s.is_ksi()) as u32;
    }
    n
}
