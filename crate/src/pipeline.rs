//! The whole audit as one plain function: layers in, every stage's output out.
//! The CLI, the wasm bindings and the tests all call [`run_audit`].

use crate::audit::{audit_route, RouteAudit};
use crate::config::Config;
use crate::error::{Error, Result, Warning};
use crate::facts::EdgeTable;
use crate::input::{read_layers, Layers, RawLayers, Street, Students};
use crate::network::qa::{QaItem, QaKind};
use crate::network::{build_network, Attachment, Network, PedEdge, PedGraph};
use crate::risk::edge_risk_points;
use crate::route::assign::{assign_schools, Assignment};
use crate::route::path::{entrance_sources, route_to_school};
use crate::route::tree::{Reached, Tree};
use crate::route::{Route, RouteKind};
use rustc_hash::FxHashMap as HashMap;
use serde::Serialize;

/// The stages a long audit reports progress on.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Stage {
    Parsing,
    Network,
    Routing,
    Scoring,
}

/// Progress, cancellation and a clock, supplied by the caller (terminal, worker or test).
pub trait Progress {
    /// Reports `done` of `total` in `stage`; return `false` to cancel.
    fn report(&mut self, stage: Stage, done: usize, total: usize) -> bool;
    /// Milliseconds from any fixed start (the core has no clock of its own on wasm).
    fn now_ms(&self) -> f64;
}

/// A `Progress` that reports nothing and has no clock (timings read 0).
pub struct Silent;
impl Progress for Silent {
    fn report(&mut self, _: Stage, _: usize, _: usize) -> bool {
        true
    }
    fn now_ms(&self) -> f64 {
        0.0
    }
}

/// One route with its audit and risk.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct AuditedRoute {
    pub kind: RouteKind,
    pub route: Route,
    pub audit: RouteAudit,
    /// Risk points of one trip along the route.
    pub risk: f64,
}

/// Everything the audit found for one home.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct HomeResult {
    pub assignment: Assignment,
    pub attachment: Option<Attachment>,
    pub shortest: Option<AuditedRoute>,
    pub recommended: Option<AuditedRoute>,
    /// The shortest route that no rule of the rule set flags (no flagged crossing, no flagged
    /// stretch), if one exists: the home has a safe route when it lies within the walk zone.
    pub safe: Option<AuditedRoute>,
    /// The recommended route would exceed the detour cap, so the shortest stands.
    pub over_detour_cap: bool,
}

impl HomeResult {
    /// Recommended walked length over shortest walked length.
    pub fn detour_ratio(&self) -> Option<f64> {
        match (&self.shortest, &self.recommended) {
            (Some(s), Some(r)) if s.audit.walked_m > 0.0 => {
                Some(r.audit.walked_m / s.audit.walked_m)
            }
            (Some(_), Some(_)) => Some(1.0),
            _ => None,
        }
    }
}

/// Wall-clock milliseconds per stage.
#[derive(Debug, Clone, Default, PartialEq, Serialize)]
pub struct Timings {
    pub parse_ms: f64,
    pub network_ms: f64,
    pub routing_ms: f64,
    pub scoring_ms: f64,
    pub total_ms: f64,
}

/// The audit's output: inputs as read, the network, every home's routes.
#[derive(Debug, Clone)]
pub struct AuditOutput {
    pub config: Config,
    pub layers: Layers,
    pub warnings: Vec<Warning>,
    pub network: Network,
    /// Attachments of each school's entrances (empty when none reaches the network).
    pub school_att: Vec<Vec<Attachment>>,
    pub homes: Vec<HomeResult>,
    /// Per-home, per-catchment and hotspot scores (the scoring stage).
    pub scores: crate::score::Scores,
    /// Per school: the corners each of its trees (shortest, recommended, safe) reached
    /// (empty when not routed); a change to edges with neither end among them cannot alter
    /// that tree (`scenario::reaudit`).
    pub tree_reach: Vec<[Reached; 3]>,
    /// The interventions the audit ran with, over which base layers (`None`: the layers as
    /// read).
    pub scenario: Option<crate::scenario::Overlay>,
    pub timings: Timings,
}

/// Reads the layers and runs the audit.
pub fn run_audit(
    raw: &RawLayers,
    config: &Config,
    progress: &mut dyn Progress,
) -> Result<AuditOutput> {
    let t0 = progress.now_ms();
    let read = read_all(raw, config, progress)?;
    audit_read(read, t0, config, progress)
}

/// [`run_audit`] that lets go of the layers' text once it is read: the page's worker, whose
/// memory never shrinks, then audits a district in about 50 MB less.
pub fn run_audit_owned(
    raw: RawLayers,
    config: &Config,
    progress: &mut dyn Progress,
) -> Result<AuditOutput> {
    let t0 = progress.now_ms();
    let read = read_all(&raw, config, progress)?;
    drop(raw);
    audit_read(read, t0, config, progress)
}

/// The layers as read, their warnings and the interventions, if any.
type Read = (
    Layers,
    Vec<Warning>,
    Option<Vec<crate::scenario::Intervention>>,
);

fn read_all(raw: &RawLayers, config: &Config, progress: &mut dyn Progress) -> Result<Read> {
    config.validate()?;
    if !progress.report(Stage::Parsing, 0, 1) {
        return Err(Error::Cancelled);
    }
    let (layers, warnings) = read_layers(raw)?;
    let interventions = match raw
        .interventions
        .as_deref()
        .filter(|t| !t.trim().is_empty())
    {
        Some(text) => Some(crate::scenario::read::read_interventions(text)?),
        None => None,
    };
    Ok((layers, warnings, interventions))
}

/// The audit of layers read by [`read_all`] from `t0` on.
fn audit_read(
    (layers, warnings, interventions): Read,
    t0: f64,
    config: &Config,
    progress: &mut dyn Progress,
) -> Result<AuditOutput> {
    let t1 = progress.now_ms();
    let mut out = match interventions {
        Some(list) => crate::scenario::reaudit::audit_overlay(
            std::sync::Arc::new(layers),
            list,
            config,
            progress,
        )?,
        None => audit_layers(layers, config, progress)?,
    };
    out.warnings.splice(0..0, warnings);
    if let Some(message) = out.network.qa.headline() {
        out.warnings.push(Warning {
            at: crate::error::Location::layer(crate::error::LayerName::Streets),
            message,
        });
    }
    // Homes not reached are said in words on the terminal and the page (score::unreached).
    let unreached = crate::score::unreached::unreached(&out);
    if let Some(message) =
        crate::score::unreached::describe(&unreached, config.network.max_attach_m)
    {
        out.warnings.push(Warning {
            at: crate::error::Location::layer(crate::error::LayerName::Homes),
            message,
        });
    }
    out.timings.parse_ms = t1 - t0;
    out.timings.total_ms = progress.now_ms() - t0;
    Ok(out)
}

/// Rounds a cost to a multiple of 2^-20 m (about a micrometre), exactly representable, so
/// sums along paths are exact and routes that tie in exact arithmetic tie in both the native
/// and the wasm build (their trigonometry can differ in the last bit and would break such
/// ties differently).
///
/// ```
/// use catchwalk::pipeline::quantize_cost;
/// assert_eq!(quantize_cost(0.1 + 0.2), quantize_cost(0.3));
/// ```
pub fn quantize_cost(x: f64) -> f64 {
    const SCALE: f64 = 1_048_576.0;
    (x * SCALE).round() / SCALE
}

/// One edge's cost for the shortest (walked metres) or recommended (walked metres plus risk
/// in metres) route. The safe route's costs are [`safe_costs`].
pub fn edge_cost(
    g: &PedGraph,
    e: &PedEdge,
    streets: &[Street],
    config: &Config,
    kind: RouteKind,
) -> f64 {
    quantize_cost(match kind {
        RouteKind::Shortest | RouteKind::Safe => e.length_m,
        RouteKind::Recommended => {
            e.length_m
                + config.route.metres_per_risk_point * edge_risk_points(g, e, streets, &config.risk)
        }
    })
}

/// Edge costs for the shortest or recommended route, indexed like `graph.edges`.
pub fn edge_costs(
    graph: &PedGraph,
    streets: &[Street],
    config: &Config,
    kind: RouteKind,
) -> Vec<f64> {
    graph
        .edges
        .iter()
        .map(|e| edge_cost(graph, e, streets, config, kind))
        .collect()
}

/// Recommended-route edge costs of a graph.
pub fn recommended_costs(graph: &PedGraph, streets: &[Street], config: &Config) -> Vec<f64> {
    edge_costs(graph, streets, config, RouteKind::Recommended)
}

/// Holds a home's recommended route to the detour cap: when it is more than `cap` times the
/// shortest walked length, the shortest route stands in and the home is flagged. Returns
/// whether it did.
pub fn apply_detour_cap(h: &mut HomeResult, cap: f64) -> bool {
    let Some(sh) = &h.shortest else { return false };
    let over = h
        .recommended
        .as_ref()
        .is_some_and(|rec| rec.audit.walked_m > cap * sh.audit.walked_m + 1e-9);
    if over {
        let mut standin = sh.clone();
        standin.kind = RouteKind::Recommended;
        h.recommended = Some(standin);
        h.over_detour_cap = true;
    }
    over
}

/// Safe-route edge costs: walked metres, impassable where a rule of the rule set flags the
/// edge for these students.
pub fn safe_costs(
    graph: &PedGraph,
    streets: &[Street],
    config: &Config,
    students: Students,
) -> Vec<f64> {
    graph
        .edges
        .iter()
        .map(|e| safe_edge_cost(graph, e, streets, config, students))
        .collect()
}

/// One edge's safe-route cost.
pub fn safe_edge_cost(
    g: &PedGraph,
    e: &PedEdge,
    streets: &[Street],
    config: &Config,
    students: Students,
) -> f64 {
    if config
        .score
        .rules
        .flags_edge(g, e, streets, &config.risk, students)
    {
        f64::INFINITY
    } else {
        quantize_cost(e.length_m)
    }
}

/// A route with its audit and risk.
pub fn audited_route(
    g: &PedGraph,
    streets: &[Street],
    config: &Config,
    kind: RouteKind,
    route: Route,
) -> AuditedRoute {
    AuditedRoute {
        kind,
        audit: audit_route(g, streets, &route),
        risk: route_risk(g, streets, config, &route),
        route,
    }
}

/// Routes `members` (home indices with attachments in `home_att`) to one school in a tree
/// grown with `cost`; homes sharing a snap point share the route. Indexed like `members`.
#[allow(clippy::too_many_arguments)]
pub fn route_members(
    g: &PedGraph,
    streets: &[Street],
    config: &Config,
    kind: RouteKind,
    cost: &[f64],
    entrances: &[Attachment],
    members: &[usize],
    home_att: &[Option<Attachment>],
    tree: &mut Tree,
) -> Vec<Option<AuditedRoute>> {
    let risk = |r: &Route| route_risk(g, streets, config, r);
    let at = RouteTargets {
        g,
        streets,
        home_att,
        entrances,
    };
    at.route(kind, cost, members, tree, &risk)
}

/// What routing members to one school reads; the risk of a route is passed in, so the audit
/// (the facts table) and the planner (its own costs) share one routing.
struct RouteTargets<'a> {
    g: &'a PedGraph,
    streets: &'a [Street],
    home_att: &'a [Option<Attachment>],
    entrances: &'a [Attachment],
}

impl RouteTargets<'_> {
    fn route(
        &self,
        kind: RouteKind,
        cost: &[f64],
        members: &[usize],
        tree: &mut Tree,
        risk: &dyn Fn(&Route) -> f64,
    ) -> Vec<Option<AuditedRoute>> {
        let g = self.g;
        let mut targets = Vec::with_capacity(members.len() * 2);
        for att in members
            .iter()
            .filter_map(|&i| self.home_att.get(i).copied().flatten())
        {
            if let Some(e) = g.edges.get(att.edge as usize) {
                targets.push(e.a);
                targets.push(e.b);
            }
        }
        if self.entrances.is_empty() || targets.is_empty() {
            return vec![None; members.len()];
        }
        tree.grow(
            g,
            cost,
            &entrance_sources(g, cost, self.entrances),
            &targets,
        );
        // Homes on the same spot share one route: each spot is routed once, and its route is
        // cloned only for the homes before its last (a lone home's route is moved, not copied).
        // Sized up front: growing them re-copies every route, which costs most in wasm.
        let mut slot_of: HashMap<(u32, u64), usize> =
            HashMap::with_capacity_and_hasher(members.len(), Default::default());
        let mut routes: Vec<Option<AuditedRoute>> = Vec::with_capacity(members.len());
        let mut uses: Vec<u32> = Vec::with_capacity(members.len());
        let slots: Vec<Option<usize>> = members
            .iter()
            .map(|&i| {
                let att = self.home_att.get(i).copied().flatten()?;
                let slot = *slot_of
                    .entry((att.edge, att.offset_m.to_bits()))
                    .or_insert_with(|| {
                        routes.push(route_to_school(g, tree, cost, &att, self.entrances).map(
                            |r| AuditedRoute {
                                kind,
                                audit: audit_route(g, self.streets, &r),
                                risk: risk(&r),
                                route: r,
                            },
                        ));
                        uses.push(0);
                        routes.len() - 1
                    });
                uses[slot] += 1;
                Some(slot)
            })
            .collect();
        slots
            .into_iter()
            .map(|slot| {
                let slot = slot?;
                uses[slot] -= 1;
                if uses[slot] == 0 {
                    routes[slot].take()
                } else {
                    routes[slot].clone()
                }
            })
            .collect()
    }
}

/// Runs the audit on layers already read.
pub fn audit_layers(
    layers: Layers,
    config: &Config,
    progress: &mut dyn Progress,
) -> Result<AuditOutput> {
    let t0 = progress.now_ms();
    if !progress.report(Stage::Network, 0, 1) {
        return Err(Error::Cancelled);
    }
    let (mut network, school_att, home_att) = prepare_network(&layers, config);
    let t1 = progress.now_ms();

    let facts = EdgeTable::build(&network.graph, &layers.streets, config);
    let assignments = assign_schools(
        &network.graph,
        &facts.walk_cost,
        &layers.homes,
        &home_att,
        &layers.schools,
        &school_att,
        &layers.catchments,
    );
    let mut homes: Vec<HomeResult> = assignments
        .iter()
        .zip(&home_att)
        .map(|(a, att)| HomeResult {
            assignment: *a,
            attachment: *att,
            shortest: None,
            recommended: None,
            safe: None,
            over_detour_cap: false,
        })
        .collect();

    let n_schools = layers.schools.len();
    let mut tree_reach = vec![<[Reached; 3]>::default(); n_schools];
    let members = school_members(&homes, n_schools);
    let ctx = SchoolRouting {
        g: &network.graph,
        streets: &layers.streets,
        facts: &facts,
        schools: &layers.schools,
        home_att: &home_att,
        trees: TreePool::default(),
    };
    let jobs: Vec<(usize, &[Attachment], Vec<usize>)> = school_att
        .iter()
        .zip(members)
        .enumerate()
        .filter(|(_, (ent, m))| !m.is_empty() && !ent.is_empty())
        .map(|(s, (ent, m))| (s, ent.as_slice(), m))
        .collect();
    // Schools in batches: progress and cancellation between batches, the batch in parallel
    // natively (each school's routes depend on that school alone, so the result is the same
    // in any order and on any number of threads).
    for batch in jobs.chunks(ROUTING_BATCH) {
        let done = batch.first().map_or(n_schools, |j| j.0);
        if !progress.report(Stage::Routing, done, n_schools) {
            return Err(Error::Cancelled);
        }
        for (job, (routed, reach)) in batch.iter().zip(ctx.route_batch(batch)) {
            if let Some(r) = tree_reach.get_mut(job.0) {
                *r = reach;
            }
            for (&i, (sh, (rec, safe))) in job.2.iter().zip(routed) {
                let h = &mut homes[i];
                h.shortest = sh;
                h.recommended = rec;
                h.safe = safe;
                apply_detour_cap(h, config.route.detour_cap);
            }
        }
    }
    progress.report(Stage::Routing, n_schools, n_schools);
    unreachable_qa(&layers, &homes, &mut network.qa);
    if !progress.report(Stage::Scoring, 0, 1) {
        return Err(Error::Cancelled);
    }
    let t_scoring = progress.now_ms();
    let scores = crate::score::score_audit(&layers, &network.graph, &homes, config);
    progress.report(Stage::Scoring, 1, 1);
    let t2 = progress.now_ms();
    Ok(AuditOutput {
        config: config.clone(),
        layers,
        warnings: Vec::new(),
        network,
        school_att,
        homes,
        scores,
        tree_reach,
        scenario: None,
        timings: Timings {
            parse_ms: 0.0,
            network_ms: t1 - t0,
            routing_ms: t_scoring - t1,
            scoring_ms: t2 - t_scoring,
            total_ms: t2 - t0,
        },
    })
}

/// Home indices assigned to each of `n_schools` schools, in home order: one pass over the
/// homes, where a scan of every home per school made a county's audit homes x schools.
pub fn homes_by_school(homes: &[HomeResult], n_schools: usize) -> Vec<Vec<usize>> {
    let mut by_school = vec![Vec::new(); n_schools];
    for (i, h) in homes.iter().enumerate() {
        if let Some(m) = h.assignment.school.and_then(|s| by_school.get_mut(s)) {
            m.push(i);
        }
    }
    by_school
}

/// Per school, the home indices assigned to it that reach the network, in home order.
pub fn school_members(homes: &[HomeResult], n_schools: usize) -> Vec<Vec<usize>> {
    let mut by_school = homes_by_school(homes, n_schools);
    for m in &mut by_school {
        m.retain(|&i| homes[i].attachment.is_some());
    }
    by_school
}

/// Routes one school's `members` on the shortest, recommended and safe costs (in that order
/// in `costs`), holds the recommended routes to the detour cap, and returns the corners each
/// tree reached.
#[allow(clippy::too_many_arguments)]
pub fn route_school(
    g: &PedGraph,
    streets: &[Street],
    config: &Config,
    costs: [&[f64]; 3],
    entrances: &[Attachment],
    members: &[usize],
    homes: &mut [HomeResult],
    tree: &mut Tree,
) -> [Reached; 3] {
    let home_att: Vec<Option<Attachment>> = homes.iter().map(|h| h.attachment).collect();
    let mut reach = <[Reached; 3]>::default();
    for (k, (kind, cost)) in [RouteKind::Shortest, RouteKind::Recommended, RouteKind::Safe]
        .into_iter()
        .zip(costs)
        .enumerate()
    {
        let routes = route_members(
            g, streets, config, kind, cost, entrances, members, &home_att, tree,
        );
        if let Some(r) = reach.get_mut(k) {
            *r = tree.reached();
        }
        for (&i, r) in members.iter().zip(routes) {
            let Some(h) = homes.get_mut(i) else { continue };
            match kind {
                RouteKind::Shortest => h.shortest = r,
                RouteKind::Recommended => h.recommended = r,
                RouteKind::Safe => h.safe = r,
            }
        }
    }
    for &i in members {
        if let Some(h) = homes.get_mut(i) {
            apply_detour_cap(h, config.route.detour_cap);
        }
    }
    reach
}

/// QA items for homes that reach the network but not their school.
pub fn unreachable_qa(layers: &Layers, homes: &[HomeResult], qa: &mut crate::network::qa::Qa) {
    for (h, home) in homes.iter().zip(&layers.homes) {
        if h.shortest.is_some() || h.attachment.is_none() {
            continue; // unattached homes are reported by prepare_network
        }
        let why = if h.assignment.school.is_none() {
            format!("home {} has no school it can reach on foot", home.id)
        } else {
            format!(
                "home {} cannot reach its school on the walking network",
                home.id
            )
        };
        qa.items.push(QaItem {
            kind: QaKind::UnreachableHome,
            at: home.at,
            feature: Some(home.feature),
            message: why,
        });
    }
}

/// Schools routed between two progress reports: in the page's one thread few, so a cancel is
/// heard soon; natively enough that a batch's last, largest school seldom leaves a core idle.
#[cfg(target_arch = "wasm32")]
const ROUTING_BATCH: usize = 8;
#[cfg(not(target_arch = "wasm32"))]
const ROUTING_BATCH: usize = 32;

/// The per-home routes of one school: (shortest, (recommended, safe)), indexed like its members.
type SchoolRoutes = Vec<(
    Option<AuditedRoute>,
    (Option<AuditedRoute>, Option<AuditedRoute>),
)>;

/// What routing one school reads: the graph, the facts table and the home attachments.
struct SchoolRouting<'a> {
    g: &'a PedGraph,
    streets: &'a [Street],
    facts: &'a EdgeTable,
    schools: &'a [crate::input::School],
    home_att: &'a [Option<Attachment>],
    trees: TreePool,
}

/// Trees kept from one batch of schools to the next. A tree holds a slot for every corner of
/// the graph, so making fresh ones for each batch cost a county's audit (4.8 M edges, 250
/// batches) more than growing them; each tree resets only the corners it touched.
#[derive(Default)]
struct TreePool(std::sync::Mutex<Vec<Tree>>);

impl TreePool {
    fn take(&self, g: &PedGraph) -> PooledTree<'_> {
        let kept = self.0.lock().ok().and_then(|mut free| free.pop());
        PooledTree {
            tree: Some(kept.unwrap_or_else(|| Tree::for_graph(g))),
            pool: self,
        }
    }
}

/// A tree on loan from a [`TreePool`]; it goes back to the pool when dropped.
struct PooledTree<'p> {
    tree: Option<Tree>,
    pool: &'p TreePool,
}

impl Drop for PooledTree<'_> {
    fn drop(&mut self) {
        if let (Some(t), Ok(mut free)) = (self.tree.take(), self.pool.0.lock()) {
            free.push(t);
        }
    }
}

impl SchoolRouting<'_> {
    /// The three route kinds of one school's members, in one reused tree, with the corners
    /// each tree reached (what a re-audit reads to tell which schools a change touches).
    fn route_school(
        &self,
        entrances: &[Attachment],
        members: &[usize],
        students: Students,
        tree: &mut Tree,
    ) -> (SchoolRoutes, [Reached; 3]) {
        let mut reach = <[Reached; 3]>::default();
        let mut by_kind: [Vec<Option<AuditedRoute>>; 3] = Default::default();
        for (k, kind) in [RouteKind::Shortest, RouteKind::Recommended, RouteKind::Safe]
            .into_iter()
            .enumerate()
        {
            let cost = self.facts.costs(kind, students);
            by_kind[k] = route_members_with(self, kind, cost, entrances, members, tree);
            reach[k] = tree.reached();
        }
        let [sh, rec, safe] = by_kind;
        let routes = sh.into_iter().zip(rec.into_iter().zip(safe)).collect();
        (routes, reach)
    }

    /// Routes a batch of schools: in parallel natively, in turn in wasm.
    fn route_batch(
        &self,
        batch: &[(usize, &[Attachment], Vec<usize>)],
    ) -> Vec<(SchoolRoutes, [Reached; 3])> {
        let one = |loan: &mut PooledTree, (s, ent, m): &(usize, &[Attachment], Vec<usize>)| {
            let students = self.schools.get(*s).map(|x| x.students).unwrap_or_default();
            let tree = loan.tree.get_or_insert_with(|| Tree::for_graph(self.g));
            self.route_school(ent, m, students, tree)
        };
        #[cfg(not(target_arch = "wasm32"))]
        {
            use rayon::prelude::*;
            batch
                .par_iter()
                .map_init(|| self.trees.take(self.g), one)
                .collect()
        }
        #[cfg(target_arch = "wasm32")]
        {
            let mut loan = self.trees.take(self.g);
            batch.iter().map(|j| one(&mut loan, j)).collect()
        }
    }
}

/// Routes members to one school with the facts table's risk (see [`route_members`]).
fn route_members_with(
    ctx: &SchoolRouting,
    kind: RouteKind,
    cost: &[f64],
    entrances: &[Attachment],
    members: &[usize],
    tree: &mut Tree,
) -> Vec<Option<AuditedRoute>> {
    let risk = |r: &Route| route_risk_from(ctx.g, &ctx.facts.risk_points, r);
    let at = RouteTargets {
        g: ctx.g,
        streets: ctx.streets,
        home_att: ctx.home_att,
        entrances,
    };
    at.route(kind, cost, members, tree, &risk)
}

/// Risk points of one trip along a route from per-edge risk points (partial edges pro rata).
pub fn route_risk_from(g: &PedGraph, risk_points: &[f64], route: &Route) -> f64 {
    route
        .steps
        .iter()
        .filter_map(|s| {
            let e = g.edges.get(s.edge as usize)?;
            let share = if e.is_crossing() { 1.0 } else { s.share() };
            Some(share * risk_points.get(s.edge as usize).copied().unwrap_or(0.0))
        })
        .sum()
}

/// Risk points of one trip along a route (partial edges pro rata).
pub fn route_risk(g: &PedGraph, streets: &[Street], config: &Config, route: &Route) -> f64 {
    route
        .steps
        .iter()
        .filter_map(|s| g.edges.get(s.edge as usize).map(|e| (s, e)))
        .map(|(s, e)| {
            let share = if e.is_crossing() { 1.0 } else { s.share() };
            share * edge_risk_points(g, e, streets, &config.risk)
        })
        .sum()
}

/// The network stage with attachments: the graph, each school's entrances and each home on
/// the graph, and QA items for schools that reach no walkable street.
pub fn prepare_network(
    layers: &Layers,
    config: &Config,
) -> (Network, Vec<Vec<Attachment>>, Vec<Option<Attachment>>) {
    let mut network = build_network(layers, &config.network);
    let max_m = config.network.max_attach_m;
    let school_att: Vec<Vec<Attachment>> = layers
        .schools
        .iter()
        .map(|s| {
            s.entrances
                .iter()
                .filter_map(|&p| network.index.attach(&network.graph, p, max_m))
                .collect()
        })
        .collect();
    // A district's homes, each attached on its own: on every core natively, in home order.
    let home_att: Vec<Option<Attachment>> = crate::cores::map(&layers.homes, |h| {
        network.index.attach(&network.graph, h.at, max_m)
    });
    for (s, atts) in school_att.iter().enumerate() {
        if atts.is_empty() {
            let school = &layers.schools[s];
            network.qa.items.push(QaItem {
                kind: QaKind::UnreachableSchool,
                at: school.entrances.first().copied().unwrap_or([0.0, 0.0]),
                feature: Some(school.feature),
                message: format!(
                    "school {} is more than {max_m} m from any walkable street",
                    school.id
                ),
            });
        }
    }
    for (i, att) in home_att.iter().enumerate() {
        if att.is_none() {
            let home = &layers.homes[i];
            network.qa.items.push(QaItem {
                kind: QaKind::UnreachableHome,
                at: home.at,
                feature: Some(home.feature),
                message: format!(
                    "home {} is more than {max_m} m from any walkable street",
                    home.id
                ),
            });
        }
    }
    (network, school_att, home_att)
}

/// What `catchwalk check` reports: layers as read, warnings, the network and its QA.
#[derive(Debug, Clone)]
pub struct CheckOutput {
    pub layers: Layers,
    pub warnings: Vec<Warning>,
    pub network: Network,
}

/// Reads the layers and builds the network without routing: validation and network QA only.
pub fn check_layers(
    raw: &RawLayers,
    config: &Config,
    progress: &mut dyn Progress,
) -> Result<CheckOutput> {
    config.validate()?;
    if !progress.report(Stage::Parsing, 0, 1) {
        return Err(Error::Cancelled);
    }
    let (layers, warnings) = read_layers(raw)?;
    if !progress.report(Stage::Network, 0, 1) {
        return Err(Error::Cancelled);
    }
    let (network, _, _) = prepare_network(&layers, config);
    let mut warnings = warnings;
    if let Some(message) = network.qa.headline() {
        warnings.push(Warning {
            at: crate::error::Location::layer(crate::error::LayerName::Streets),
            message,
        });
    }
    Ok(CheckOutput {
        layers,
        warnings,
        network,
    })
}
