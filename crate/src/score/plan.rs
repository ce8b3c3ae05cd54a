//! Upgrade planner: greedily choose the upgrades that give the most children a safe route.
//!
//! Candidates come from the rules that make routes in the walk zone unsafe (on the
//! recommended or the shortest route): a crossing can get a signal (it then controls every
//! crossing of its junction, as a crossings-layer signal does), a crossing guard or a
//! refuge island; a street can get a lower speed or sidewalks on both sides. Each round
//! tries every candidate as an overlay on the network, re-routes only the schools whose
//! routes touch it, and keeps the one that gives the most children a safe route (ties: the
//! larger cut in risk). Upgrades that gain no child are still taken while they cut risk.

use super::home::{route_findings, score_home, street_label, HomeScore};
use crate::config::Config;
use crate::input::{Device, SideWalk, Street, Students};
use crate::network::{Attachment, PedEdgeKind, PedGraph};
use crate::pipeline::{AuditOutput, AuditedRoute, HomeResult};
use crate::route::path::{entrance_sources, route_to_school};
use crate::route::tree::{Reached, Tree};
use crate::route::{Route, RouteKind};
use rustc_hash::FxHashMap as HashMap;
use serde::{Deserialize, Serialize};
use std::collections::BTreeSet;

/// Planner settings.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct PlanConfig {
    /// Speed a speed reduction sets (30 km/h zones: common practice).
    pub speed_target_kmh: f64,
    /// Candidate edges tried per round, the most-travelled first.
    pub max_candidates: usize,
}

impl PlanConfig {
    /// Range checks of the planner's settings.
    pub fn validate(&self, at: &str, c: &mut crate::range::Checks) {
        c.above(at, "speed_target_kmh", self.speed_target_kmh, 0.0, 200.0);
        c.at_least(at, "max_candidates", self.max_candidates as f64, 1.0, 1e6);
    }
}

impl Default for PlanConfig {
    fn default() -> Self {
        PlanConfig {
            speed_target_kmh: 30.0,
            max_candidates: 60,
        }
    }
}

/// An upgrade the planner can choose.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Upgrade {
    /// A traffic signal with pedestrian phase at the crossing.
    Signal,
    /// An adult crossing guard at school times.
    Guard,
    /// A refuge island in the crossing.
    Refuge,
    /// The whole street's speed lowered to the target.
    SpeedReduction,
    /// Sidewalks on both sides of the whole street.
    Sidewalk,
}

impl Upgrade {
    pub fn as_str(self) -> &'static str {
        match self {
            Upgrade::Signal => "signal",
            Upgrade::Guard => "guard",
            Upgrade::Refuge => "refuge",
            Upgrade::SpeedReduction => "speed_reduction",
            Upgrade::Sidewalk => "sidewalk",
        }
    }
}

/// One chosen upgrade.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PlanStep {
    pub rank: usize,
    pub upgrade: Upgrade,
    /// The crossing edge, or an edge of the street.
    pub edge: u32,
    pub street_id: String,
    pub street: String,
    pub children_gained: f64,
    /// Cut in risk points per school trip, summed over children.
    pub risk_reduction: f64,
    pub safe_children_after: f64,
}

/// Safe-route share of one catchment.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CatchmentShare {
    pub school: usize,
    pub school_id: String,
    pub children_routed: f64,
    pub children_safe_route: f64,
    pub safe_route_share: Option<f64>,
}

/// The planner's answer.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Plan {
    pub budget: usize,
    pub steps: Vec<PlanStep>,
    pub before: Vec<CatchmentShare>,
    pub after: Vec<CatchmentShare>,
    pub safe_children_before: f64,
    pub safe_children_after: f64,
    pub children_routed: f64,
}

enum Undo {
    Edge(u32, PedEdgeKind),
    Street(usize, f64),
}

/// Applies an upgrade to working copies of the graph and streets; returns how to undo it.
fn apply(
    up: Upgrade,
    edge: u32,
    graph: &mut PedGraph,
    streets: &mut [Street],
    cfg: &PlanConfig,
) -> Vec<Undo> {
    let mut undo = Vec::new();
    let Some(e) = graph.edges.get(edge as usize) else {
        return undo;
    };
    let street_idx = graph.segments.get(e.segment() as usize).map(|s| s.street);
    match up {
        Upgrade::Signal => {
            for k in signal_edges(graph, edge) {
                if let Some(e) = graph.edges.get_mut(k as usize) {
                    let old = e.kind.clone();
                    if let PedEdgeKind::Crossing { control, .. } = &mut e.kind {
                        control.device = Device::Signal;
                        undo.push(Undo::Edge(k, old));
                    }
                }
            }
        }
        Upgrade::Guard | Upgrade::Refuge => {
            if let Some(e) = graph.edges.get_mut(edge as usize) {
                let old = e.kind.clone();
                if let PedEdgeKind::Crossing { control, .. } = &mut e.kind {
                    match up {
                        Upgrade::Guard => control.guard = Some(Vec::new()),
                        _ => control.refuge_island = true,
                    }
                    undo.push(Undo::Edge(edge, old));
                }
            }
        }
        Upgrade::SpeedReduction => {
            if let Some(s) = street_idx.and_then(|i| streets.get_mut(i).map(|s| (i, s))) {
                undo.push(Undo::Street(s.0, s.1.speed_kmh));
                s.1.speed_kmh = s.1.speed_kmh.min(cfg.speed_target_kmh);
            }
        }
        Upgrade::Sidewalk => {
            let Some(si) = street_idx else { return undo };
            for (i, e) in graph.edges.iter_mut().enumerate() {
                let on_street = graph
                    .segments
                    .get(e.segment() as usize)
                    .is_some_and(|s| s.street == si);
                let old = e.kind.clone();
                if let PedEdgeKind::Side { sidewalk, .. } = &mut e.kind {
                    if on_street && matches!(*sidewalk, SideWalk::Absent | SideWalk::Unknown) {
                        *sidewalk = SideWalk::Present;
                        undo.push(Undo::Edge(i as u32, old));
                    }
                }
            }
        }
    }
    undo
}

/// The crossings a signal at `edge` controls: every crossing at its junction, as a
/// crossings-layer signal there would (a doorstep crossing has no junction: itself alone).
fn signal_edges(graph: &PedGraph, edge: u32) -> Vec<u32> {
    let Some(e) = graph.edges.get(edge as usize) else {
        return Vec::new();
    };
    let PedEdgeKind::Crossing { junction, .. } = e.kind else {
        return Vec::new();
    };
    if PedGraph::is_doorstep(e) {
        return vec![edge];
    }
    graph
        .edges
        .iter()
        .enumerate()
        .filter(|(_, x)| {
            !PedGraph::is_doorstep(x)
                && matches!(x.kind, PedEdgeKind::Crossing { junction: j, .. } if j == junction)
        })
        .map(|(k, _)| k as u32)
        .collect()
}

fn revert(undo: Vec<Undo>, graph: &mut PedGraph, streets: &mut [Street]) {
    for u in undo.into_iter().rev() {
        match u {
            Undo::Edge(i, kind) => {
                if let Some(e) = graph.edges.get_mut(i as usize) {
                    e.kind = kind;
                }
            }
            Undo::Street(i, v) => {
                if let Some(s) = streets.get_mut(i) {
                    s.speed_kmh = v;
                }
            }
        }
    }
}

pub use crate::pipeline::{recommended_costs, route_risk};

fn audited(
    graph: &PedGraph,
    streets: &[Street],
    config: &Config,
    kind: RouteKind,
    route: Route,
) -> AuditedRoute {
    crate::pipeline::audited_route(graph, streets, config, kind, route)
}

/// The network a re-routing runs on: graph, streets, config, recommended-route costs and
/// the safe-route costs for the school's students.
#[derive(Clone, Copy)]
pub struct RouteContext<'a> {
    pub graph: &'a PedGraph,
    pub streets: &'a [Street],
    pub config: &'a Config,
    pub cost: &'a [f64],
    pub safe_cost: &'a [f64],
}

/// Re-routes the recommended routes of one school's `members` on a (modified) graph, as the
/// audit does: one tree, shared snap points, the detour cap against the shortest route.
/// The shortest routes keep their paths; their audits are redone on the graph.
///
/// With `changed` (the edges an upgrade changed), a route that avoids them and comes out the
/// same as before keeps its old audit; each result says whether the home is unchanged
/// (`true`). `None` redoes every audit.
pub fn reroute_school(
    ctx: &RouteContext,
    entrances: &[Attachment],
    members: &[usize],
    homes: &[HomeResult],
    changed: Option<&BTreeSet<u32>>,
) -> Vec<(usize, HomeResult, bool)> {
    let mut tree = Tree::for_graph(ctx.graph);
    let mut reach = Reached::default();
    reroute_school_in(
        ctx, entrances, members, homes, changed, &mut tree, &mut reach,
    )
}

/// [`reroute_school`] in a tree's buffers kept between calls (a tree per corner of the
/// graph is several megabytes on a district: the planner reuses one per worker); adds the
/// corners its trees reached to `reach`.
pub fn reroute_school_in(
    ctx: &RouteContext,
    entrances: &[Attachment],
    members: &[usize],
    homes: &[HomeResult],
    changed: Option<&BTreeSet<u32>>,
    tree: &mut Tree,
    reach: &mut Reached,
) -> Vec<(usize, HomeResult, bool)> {
    let RouteContext {
        graph,
        streets,
        config,
        cost,
        safe_cost,
    } = *ctx;
    let touches = |r: &Route| changed.is_none_or(|c| r.steps.iter().any(|s| c.contains(&s.edge)));
    let mut out = Vec::with_capacity(members.len());
    let mut targets = Vec::new();
    for &i in members {
        if let Some(e) = homes
            .get(i)
            .and_then(|h| h.attachment)
            .and_then(|a| graph.edges.get(a.edge as usize))
        {
            targets.push(e.a);
            targets.push(e.b);
        }
    }
    if !entrances.is_empty() {
        tree.grow(
            graph,
            cost,
            &entrance_sources(graph, cost, entrances),
            &targets,
        );
        reach.merge(&tree.reached());
    }
    let mut shared: HashMap<(u32, u64), Option<Route>> = HashMap::default();
    for &i in members {
        let Some(h) = homes.get(i) else { continue };
        let mut nh = h.clone();
        nh.over_detour_cap = false;
        let mut same = true;
        nh.shortest = h.shortest.as_ref().map(|s| {
            if touches(&s.route) {
                same = false;
                audited(graph, streets, config, RouteKind::Shortest, s.route.clone())
            } else {
                s.clone()
            }
        });
        nh.recommended = match (h.attachment, entrances.is_empty()) {
            (Some(att), false) => shared
                .entry((att.edge, att.offset_m.to_bits()))
                .or_insert_with(|| route_to_school(graph, tree, cost, &att, entrances))
                .clone()
                .map(|r| match &h.recommended {
                    Some(old)
                        if !h.over_detour_cap && old.route.steps == r.steps && !touches(&r) =>
                    {
                        AuditedRoute {
                            route: r,
                            ..old.clone()
                        }
                    }
                    _ => {
                        same = false;
                        audited(graph, streets, config, RouteKind::Recommended, r)
                    }
                }),
            _ => None,
        };
        if crate::pipeline::apply_detour_cap(&mut nh, config.route.detour_cap) {
            same = false;
        }
        same &= nh.recommended.is_some() == h.recommended.is_some();
        out.push((i, nh, same));
    }
    // Safe routes: one more tree on the safe-route costs; a home whose safe route changes is
    // not unchanged.
    let home_att: Vec<Option<Attachment>> = homes.iter().map(|h| h.attachment).collect();
    let safe = crate::pipeline::route_members(
        graph,
        streets,
        config,
        RouteKind::Safe,
        safe_cost,
        entrances,
        members,
        &home_att,
        tree,
    );
    reach.merge(&tree.reached());
    for ((i, nh, same), r) in out.iter_mut().zip(safe) {
        let old = homes
            .get(*i)
            .and_then(|h| h.safe.as_ref())
            .map(|r| &r.route);
        *same &= old == r.as_ref().map(|r| &r.route);
        nh.safe = r;
    }
    out
}

/// New home results and scores of the re-routed homes, by home index.
type Evaluation = Vec<(usize, HomeResult, HomeScore)>;

/// What trying one candidate found, and what it depended on: the schools it re-routed and
/// the corners their trees reached (a later change elsewhere cannot alter it).
#[derive(Debug, Clone)]
struct Tried {
    gained: f64,
    cut: f64,
    schools: Vec<usize>,
    reach: Reached,
}

/// A graph and its streets, as one candidate sees them (the current network or a working
/// copy with the candidate applied).
type Net<'a> = (&'a PedGraph, &'a [Street]);
/// Safe-route edge costs per kind of pupil.
type SafeCosts = HashMap<Students, Vec<f64>>;
/// Recommended-route edge costs and safe-route edge costs per kind of pupil.
type Costs<'a> = (&'a [f64], &'a SafeCosts);

struct State<'a> {
    out: &'a AuditOutput,
    graph: PedGraph,
    streets: Vec<Street>,
    homes: Vec<HomeResult>,
    scores: Vec<HomeScore>,
    members: Vec<Vec<usize>>,
    /// Recommended-route edge costs of the current graph.
    cost: Vec<f64>,
    /// Safe-route edge costs of the current graph, per students' age band.
    safe_cost: HashMap<Students, Vec<f64>>,
}

impl State<'_> {
    fn weight(&self, i: usize) -> f64 {
        self.out
            .layers
            .homes
            .get(i)
            .map_or(0.0, |h| h.children as f64)
    }
    fn students(&self, s: usize) -> crate::input::Students {
        self.out
            .layers
            .schools
            .get(s)
            .map(|s| s.students)
            .unwrap_or_default()
    }
    /// Per edge, the schools whose current recommended or shortest routes use it (sorted).
    fn edge_schools(&self) -> HashMap<u32, Vec<usize>> {
        let mut by_edge: HashMap<u32, Vec<usize>> = HashMap::default();
        for h in &self.homes {
            let Some(s) = h.assignment.school else {
                continue;
            };
            for r in [&h.recommended, &h.shortest].into_iter().flatten() {
                for st in &r.route.steps {
                    let v = by_edge.entry(st.edge).or_default();
                    if !v.contains(&s) {
                        v.push(s);
                    }
                }
            }
        }
        by_edge
    }
    /// Edges an upgrade changes.
    fn changed_edges(&self, up: Upgrade, edge: u32) -> BTreeSet<u32> {
        match up {
            Upgrade::Signal => signal_edges(&self.graph, edge).into_iter().collect(),
            Upgrade::Guard | Upgrade::Refuge => [edge].into(),
            Upgrade::SpeedReduction | Upgrade::Sidewalk => {
                let street = self
                    .graph
                    .edges
                    .get(edge as usize)
                    .and_then(|e| self.graph.segments.get(e.segment() as usize))
                    .map(|s| s.street);
                self.graph
                    .edges
                    .iter()
                    .enumerate()
                    .filter(|(_, e)| {
                        self.graph
                            .segments
                            .get(e.segment() as usize)
                            .is_some_and(|s| Some(s.street) == street)
                    })
                    .map(|(i, _)| i as u32)
                    .collect()
            }
        }
    }
    /// The schools (sorted) whose current routes use any of `changed`.
    fn schools_using(
        &self,
        by_edge: &HashMap<u32, Vec<usize>>,
        changed: &BTreeSet<u32>,
    ) -> Vec<usize> {
        let mut schools: Vec<usize> = changed
            .iter()
            .filter_map(|e| by_edge.get(e))
            .flatten()
            .copied()
            .collect();
        schools.sort_unstable();
        schools.dedup();
        schools
    }
    /// Children gained and risk cut by one candidate, tried on `work` (a copy of the
    /// current network, handed back as it was found); `None` if it changes no route.
    fn try_candidate(
        &self,
        work: &mut (PedGraph, Vec<Street>, Tree),
        by_edge: &HashMap<u32, Vec<usize>>,
        (up, edge): (Upgrade, u32),
    ) -> Option<Tried> {
        let changed = self.changed_edges(up, edge);
        let schools = self.schools_using(by_edge, &changed);
        if schools.is_empty() {
            return None;
        }
        let undo = apply(
            up,
            edge,
            &mut work.0,
            &mut work.1,
            &self.out.config.score.plan,
        );
        if undo.is_empty() {
            return None;
        }
        let mut reach = Reached::default();
        let (eval, _) = self.evaluate_applied(
            (&work.0, work.1.as_slice()),
            &schools,
            &changed,
            &mut work.2,
            &mut reach,
        );
        revert(undo, &mut work.0, &mut work.1);
        let (mut gained, mut cut) = (0.0, 0.0);
        for (i, _, sc) in &eval {
            let w = self.weight(*i);
            let old = self.scores.get(*i).cloned().unwrap_or_default();
            gained += w * (sc.safe_route as u8 as f64 - old.safe_route as u8 as f64);
            cut += w * (old.risk - sc.risk);
        }
        Some(Tried {
            gained,
            cut,
            schools,
            reach,
        })
    }
    /// Every candidate tried, in candidate order: on both cores natively (each worker on its
    /// own copy of the network; the same figures as one thread), in turn in wasm.
    fn try_all(
        &self,
        cands: &[(Upgrade, u32)],
        by_edge: &HashMap<u32, Vec<usize>>,
    ) -> Vec<Option<Tried>> {
        let copy = || {
            let tree = Tree::for_graph(&self.graph);
            (self.graph.clone(), self.streets.clone(), tree)
        };
        #[cfg(not(target_arch = "wasm32"))]
        {
            use rayon::prelude::*;
            // Few large jobs: each copies the network once.
            let per_job = cands
                .len()
                .div_ceil(rayon::current_num_threads().max(1) * 4);
            cands
                .par_iter()
                .with_min_len(per_job.max(1))
                .map_init(copy, |work, &c| self.try_candidate(work, by_edge, c))
                .collect()
        }
        #[cfg(target_arch = "wasm32")]
        {
            let mut work = copy();
            cands
                .iter()
                .map(|&c| self.try_candidate(&mut work, by_edge, c))
                .collect()
        }
    }
    /// [`Self::evaluate`] on `net`, where `changed` edges were just changed: the edge costs
    /// are brought up to date first and returned with the evaluation.
    fn evaluate_applied(
        &self,
        net: Net,
        schools: &[usize],
        changed: &BTreeSet<u32>,
        tree: &mut Tree,
        reach: &mut Reached,
    ) -> (Evaluation, (Vec<f64>, SafeCosts)) {
        let cost = self.costs_with(net, changed);
        let safe_cost = self.safe_costs_with(net, changed);
        let eval = self.evaluate(net, schools, (&cost, &safe_cost), changed, tree, reach);
        (eval, (cost, safe_cost))
    }
    /// Edge costs after a change to `changed` edges (the rest are unchanged).
    fn costs_with(&self, net: Net, changed: &BTreeSet<u32>) -> Vec<f64> {
        let cfg = &self.out.config;
        let mut cost = self.cost.clone();
        for &k in changed {
            if let (Some(c), Some(e)) = (cost.get_mut(k as usize), net.0.edges.get(k as usize)) {
                *c = crate::pipeline::edge_cost(net.0, e, net.1, cfg, RouteKind::Recommended);
            }
        }
        cost
    }
    /// Safe-route costs after a change to `changed` edges.
    fn safe_costs_with(&self, net: Net, changed: &BTreeSet<u32>) -> SafeCosts {
        let cfg = &self.out.config;
        let mut all = self.safe_cost.clone();
        for (students, cost) in all.iter_mut() {
            for &k in changed {
                if let (Some(c), Some(e)) = (cost.get_mut(k as usize), net.0.edges.get(k as usize))
                {
                    *c = crate::pipeline::safe_edge_cost(net.0, e, net.1, cfg, *students);
                }
            }
        }
        all
    }
    /// Re-routes `schools` on the current graph with edge costs `cost` after `changed`
    /// edges changed: new home results and scores (unchanged homes keep their scores).
    fn evaluate(
        &self,
        net: Net,
        schools: &[usize],
        (cost, safe_cost): Costs,
        changed: &BTreeSet<u32>,
        tree: &mut Tree,
        reach: &mut Reached,
    ) -> Evaluation {
        let cfg = &self.out.config;
        let mut out = Vec::new();
        for &s in schools {
            let entrances = self
                .out
                .school_att
                .get(s)
                .map(|v| v.as_slice())
                .unwrap_or(&[]);
            let members = self.members.get(s).map(|v| v.as_slice()).unwrap_or(&[]);
            let empty = Vec::new();
            let ctx = RouteContext {
                graph: net.0,
                streets: net.1,
                config: cfg,
                cost,
                safe_cost: safe_cost.get(&self.students(s)).unwrap_or(&empty),
            };
            let routed = reroute_school_in(
                &ctx,
                entrances,
                members,
                &self.homes,
                Some(changed),
                tree,
                reach,
            );
            for (i, nh, same) in routed {
                let sc = match self.scores.get(i) {
                    Some(old) if same => old.clone(),
                    _ => score_home(
                        nh.shortest.as_ref(),
                        nh.recommended.as_ref(),
                        nh.safe.as_ref(),
                        self.students(s),
                        net.0,
                        net.1,
                        cfg,
                    ),
                };
                out.push((i, nh, sc));
            }
        }
        out
    }
}

fn shares(st: &State, scores: &[HomeScore]) -> Vec<CatchmentShare> {
    st.out
        .layers
        .schools
        .iter()
        .enumerate()
        .map(|(s, school)| {
            let m = st.members.get(s).map(|v| v.as_slice()).unwrap_or(&[]);
            let routed: f64 = m
                .iter()
                .filter(|&&i| scores.get(i).is_some_and(|x| x.routed))
                .map(|&i| st.weight(i))
                .sum();
            let safe: f64 = m
                .iter()
                .filter(|&&i| scores.get(i).is_some_and(|x| x.safe_route))
                .map(|&i| st.weight(i))
                .sum();
            CatchmentShare {
                school: s,
                school_id: school.id.clone(),
                children_routed: routed,
                children_safe_route: safe,
                safe_route_share: (routed > 0.0).then(|| safe / routed),
            }
        })
        .collect()
}

/// Candidate `(upgrade, edge)` pairs, the most-travelled flagged edges first.
fn candidates(st: &State, cfg: &PlanConfig) -> Vec<(Upgrade, u32)> {
    let c = &st.out.config;
    let mut weight: HashMap<u32, f64> = HashMap::default();
    for (i, (h, sc)) in st.homes.iter().zip(&st.scores).enumerate() {
        if !sc.routed || sc.safe_route || !sc.in_walk_zone {
            continue;
        }
        let students = h
            .assignment
            .school
            .map(|s| st.students(s))
            .unwrap_or_default();
        let mut edges: Vec<u32> = sc.findings.iter().map(|f| f.edge).collect();
        if let Some(sh) = &h.shortest {
            edges.extend(
                route_findings(
                    &c.score.rules,
                    &sh.route,
                    &st.graph,
                    &st.streets,
                    students,
                    c,
                )
                .iter()
                .map(|f| f.edge),
            );
        }
        edges.sort_unstable();
        edges.dedup();
        for e in edges {
            *weight.entry(e).or_insert(0.0) += st.weight(i);
        }
    }
    let mut ranked: Vec<(u32, f64)> = weight.into_iter().collect();
    ranked.sort_by(|a, b| b.1.total_cmp(&a.1).then(a.0.cmp(&b.0)));
    let mut out = Vec::new();
    let mut streets_seen = BTreeSet::new();
    for (e, _) in ranked.into_iter().take(cfg.max_candidates) {
        let Some(edge) = st.graph.edges.get(e as usize) else {
            continue;
        };
        let street = st
            .graph
            .segments
            .get(edge.segment() as usize)
            .map(|s| s.street);
        let speed = street
            .and_then(|s| st.streets.get(s))
            .map_or(0.0, |s| s.speed_kmh);
        if let PedEdgeKind::Crossing { control, .. } = &edge.kind {
            if control.device != Device::Signal {
                out.push((Upgrade::Signal, e));
            }
            if control.guard.is_none() {
                out.push((Upgrade::Guard, e));
            }
            if !control.refuge_island {
                out.push((Upgrade::Refuge, e));
            }
        }
        // Street-wide upgrades once per street.
        if street.is_some_and(|s| streets_seen.insert(s)) {
            if speed > cfg.speed_target_kmh {
                out.push((Upgrade::SpeedReduction, e));
            }
            if matches!(edge.kind, PedEdgeKind::Side { .. }) {
                out.push((Upgrade::Sidewalk, e));
            }
        }
    }
    out
}

/// Chooses up to `budget` upgrades greedily. Deterministic: ties go to the smaller
/// (upgrade, edge). A candidate's try is kept across rounds while no later choice could
/// alter it (see [`plan_upgrades_afresh`], which tries every candidate every round).
pub fn plan_upgrades(out: &AuditOutput, scores: &[HomeScore], budget: usize) -> Plan {
    plan(out, scores, budget, true)
}

/// [`plan_upgrades`] trying every candidate again in every round: the reference its kept
/// tries are tested against.
pub fn plan_upgrades_afresh(out: &AuditOutput, scores: &[HomeScore], budget: usize) -> Plan {
    plan(out, scores, budget, false)
}

fn plan(out: &AuditOutput, scores: &[HomeScore], budget: usize, reuse: bool) -> Plan {
    let cfg = &out.config.score.plan;
    let mut members = vec![Vec::new(); out.layers.schools.len()];
    for (i, h) in out.homes.iter().enumerate() {
        if let Some(m) = h.assignment.school.and_then(|s| members.get_mut(s)) {
            m.push(i);
        }
    }
    let mut st = State {
        out,
        graph: out.network.graph.clone(),
        streets: out.layers.streets.clone(),
        homes: out.homes.clone(),
        scores: scores.to_vec(),
        members,
        cost: recommended_costs(&out.network.graph, &out.layers.streets, &out.config),
        safe_cost: [Students::Elementary, Students::Secondary]
            .into_iter()
            .map(|st| {
                let c = crate::pipeline::safe_costs(
                    &out.network.graph,
                    &out.layers.streets,
                    &out.config,
                    st,
                );
                (st, c)
            })
            .collect(),
    };
    let before = shares(&st, &st.scores);
    let mut steps = Vec::new();
    // Tries of earlier rounds still valid: keyed by candidate.
    let mut kept: HashMap<(Upgrade, u32), Tried> = HashMap::default();
    for rank in 1..=budget {
        let cands = candidates(&st, cfg);
        let by_edge = st.edge_schools();
        let fresh: Vec<(Upgrade, u32)> = cands
            .iter()
            .copied()
            .filter(|&(up, edge)| {
                !reuse
                    || kept.get(&(up, edge)).is_none_or(|t| {
                        t.schools != st.schools_using(&by_edge, &st.changed_edges(up, edge))
                    })
            })
            .collect();
        for (c, t) in fresh.iter().zip(st.try_all(&fresh, &by_edge)) {
            match t {
                Some(t) => kept.insert(*c, t),
                None => kept.remove(c),
            };
        }
        let mut best: Option<(f64, f64, usize)> = None;
        for (k, c) in cands.iter().enumerate() {
            let Some(&Tried { gained, cut, .. }) = kept.get(c) else {
                continue;
            };
            let better = match &best {
                None => true,
                Some((g, c, _)) => gained > *g + 1e-9 || (gained > *g - 1e-9 && cut > *c + 1e-9),
            };
            if better && (gained > 1e-9 || cut > 1e-9) {
                best = Some((gained, cut, k));
            }
        }
        let Some((gained, cut, &(up, edge))) =
            best.and_then(|(g, c, k)| Some((g, c, cands.get(k)?)))
        else {
            break;
        };
        // The winner, applied for good and evaluated again (as it was tried: the same
        // network, costs and schools), so no candidate's evaluation is kept meanwhile.
        let changed = st.changed_edges(up, edge);
        let schools = st.schools_using(&by_edge, &changed);
        let _ = apply(up, edge, &mut st.graph, &mut st.streets, cfg);
        let mut tree = Tree::for_graph(&st.graph);
        let (eval, (cost, safe_cost)) = st.evaluate_applied(
            (&st.graph, st.streets.as_slice()),
            &schools,
            &changed,
            &mut tree,
            &mut Reached::default(),
        );
        // A kept try stays valid while its schools' homes are unchanged and no edge the
        // winner changed touches a corner its trees reached.
        let ends: Vec<u32> = changed
            .iter()
            .filter_map(|&k| st.graph.edges.get(k as usize))
            .flat_map(|e| [e.a, e.b])
            .collect();
        kept.retain(|_, t| {
            !t.schools.iter().any(|s| schools.contains(s))
                && !ends.iter().any(|&c| t.reach.contains(c))
        });
        st.cost = cost;
        st.safe_cost = safe_cost;
        for (i, nh, sc) in eval {
            if let (Some(h), Some(s)) = (st.homes.get_mut(i), st.scores.get_mut(i)) {
                *h = nh;
                *s = sc;
            }
        }
        let street = st
            .graph
            .edges
            .get(edge as usize)
            .and_then(|e| crate::risk::street_of(&st.graph, e, &st.streets));
        steps.push(PlanStep {
            rank,
            upgrade: up,
            edge,
            street_id: street.map(|s| s.id.clone()).unwrap_or_default(),
            street: street.map(street_label).unwrap_or_default(),
            children_gained: gained,
            risk_reduction: cut,
            safe_children_after: shares(&st, &st.scores)
                .iter()
                .map(|c| c.children_safe_route)
                .sum(),
        });
    }
    let after = shares(&st, &st.scores);
    Plan {
        budget,
        safe_children_before: before.iter().map(|c| c.children_safe_route).sum(),
        safe_children_after: after.iter().map(|c| c.children_safe_route).sum(),
        children_routed: before.iter().map(|c| c.children_routed).sum(),
        steps,
        before,
        after,
    }
}
