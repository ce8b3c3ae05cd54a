//! What the rule set makes of each edge, per kind of pupil, with the edge's risk points and its
//! Highway Capacity Manual wait: the facts home scoring reads at every step of every route.
//!
//! [`EdgeRules::build`] evaluates each edge the routes walk once per network and
//! configuration; a county's 50 000 routes then look their steps up instead of re-deriving the street's facts and
//! re-running every rule at each step (that re-derivation was a tenth of a whole audit).
//! [`OnTheFly`] gives the same answers computed when asked, for the planner, whose graph
//! changes with each upgrade it tries. Both answer through [`EdgeRuleLookup`], and the table
//! is filled from [`OnTheFly`], so the two cannot disagree.

use super::rules::{edge_facts, EdgeFacts, RuleMatch, RuleSet, Target};
use crate::config::Config;
use crate::facts::pupil_index;
use crate::input::{Street, Students};
use crate::network::PedGraph;
use crate::risk::crossing_delay::gap_delay;
use crate::risk::edge_risk_points;
use crate::risk::volume::peak_flow_per_s;
use std::borrow::Cow;

/// One rule that matches an edge: its index in the rule set and how it matches (never
/// [`RuleMatch::No`]).
pub type RuleHit = (u32, RuleMatch);

/// The per-edge facts that home scoring reads.
pub trait EdgeRuleLookup: Sync {
    /// The rules that match `edge` for this kind of pupil, in rule-set order (empty for a
    /// foot-only or unknown edge).
    fn hits(&self, edge: u32, students: Students) -> Cow<'_, [RuleHit]>;
    /// Risk points of walking the whole edge once.
    fn risk_points(&self, edge: u32) -> f64;
    /// HCM gap-acceptance average wait (s) at an uncontrolled crossing edge; 0 for a crossing
    /// a signal, stop sign or guard controls, and for every other edge.
    fn wait_s(&self, edge: u32) -> f64;
}

/// The lookups computed from the graph each time they are asked.
#[derive(Debug, Clone, Copy)]
pub struct OnTheFly<'a> {
    pub rules: &'a RuleSet,
    pub graph: &'a PedGraph,
    pub streets: &'a [Street],
    pub config: &'a Config,
}

impl EdgeRuleLookup for OnTheFly<'_> {
    fn hits(&self, edge: u32, students: Students) -> Cow<'_, [RuleHit]> {
        let Some(e) = self.graph.edges.get(edge as usize) else {
            return Cow::Borrowed(&[]);
        };
        let Some(facts) = self
            .rules
            .edge_facts(self.graph, e, self.streets, &self.config.risk)
        else {
            return Cow::Borrowed(&[]);
        };
        let hits: Vec<RuleHit> = self
            .rules
            .rules
            .iter()
            .enumerate()
            .filter_map(|(k, rule)| {
                let m = match &facts {
                    EdgeFacts::Crossing(f) => rule.crossing_match(f, students),
                    EdgeFacts::Stretch(f) => rule.stretch_match(f, students),
                };
                (m != RuleMatch::No).then_some((k as u32, m))
            })
            .collect();
        Cow::Owned(hits)
    }

    fn risk_points(&self, edge: u32) -> f64 {
        self.graph.edges.get(edge as usize).map_or(0.0, |e| {
            edge_risk_points(self.graph, e, self.streets, &self.config.risk)
        })
    }

    fn wait_s(&self, edge: u32) -> f64 {
        use super::rules::ControlTag as T;
        let r = &self.config.risk;
        let Some(e) = self.graph.edges.get(edge as usize) else {
            return 0.0;
        };
        match edge_facts(self.graph, e, self.streets, r) {
            Some(EdgeFacts::Crossing(f))
                if !f
                    .tags
                    .iter()
                    .any(|t| matches!(t, T::Signal | T::Stop | T::AllWayStop | T::Guard)) =>
            {
                gap_delay(
                    f.width_m,
                    f.lanes,
                    peak_flow_per_s(f.vehicles_15min),
                    r.walk_mps,
                    r.start_up_s,
                )
                .average_delay_s
            }
            _ => 0.0,
        }
    }
}

/// The lookups of a set of edges, computed once (the edges a set of routes walks); any other
/// edge is answered live.
#[derive(Debug, Clone)]
pub struct EdgeRules<'a> {
    live: OnTheFly<'a>,
    /// Per graph edge: its row in the table, or `u32::MAX` for an edge outside it.
    row: Vec<u32>,
    /// Per kind of pupil: where each row's hits start in `hits` (one entry more than rows).
    start: [Vec<u32>; 2],
    hits: [Vec<RuleHit>; 2],
    risk_points: Vec<f64>,
    wait_s: Vec<f64>,
}

impl<'a> EdgeRules<'a> {
    /// Evaluates `edges` (repeats and unknown edges are skipped) once each, natively on every
    /// core; the table does not depend on the thread count.
    pub fn build(live: OnTheFly<'a>, edges: impl IntoIterator<Item = u32>) -> Self {
        let n = live.graph.edges.len();
        let mut row = vec![u32::MAX; n];
        let mut rows: Vec<u32> = Vec::new();
        for e in edges {
            if let Some(r) = row.get_mut(e as usize) {
                if *r == u32::MAX {
                    *r = rows.len() as u32;
                    rows.push(e);
                }
            }
        }
        let one = |&e: &u32| {
            let hits =
                [Students::Elementary, Students::Secondary].map(|s| live.hits(e, s).into_owned());
            (hits, live.risk_points(e), live.wait_s(e))
        };
        let per_edge: Vec<_> = crate::cores::map(&rows, one);
        let mut t = EdgeRules {
            live,
            row,
            start: [vec![0], vec![0]],
            hits: Default::default(),
            risk_points: Vec::with_capacity(per_edge.len()),
            wait_s: Vec::with_capacity(per_edge.len()),
        };
        for (hits, risk, wait) in per_edge {
            for (k, h) in hits.into_iter().enumerate() {
                t.hits[k].extend(h);
                t.start[k].push(t.hits[k].len() as u32);
            }
            t.risk_points.push(risk);
            t.wait_s.push(wait);
        }
        t
    }

    /// The edge's row in the table, if it has one.
    fn row_of(&self, edge: u32) -> Option<usize> {
        self.row
            .get(edge as usize)
            .filter(|&&r| r != u32::MAX)
            .map(|&r| r as usize)
    }
}

impl EdgeRuleLookup for EdgeRules<'_> {
    fn hits(&self, edge: u32, students: Students) -> Cow<'_, [RuleHit]> {
        let Some(r) = self.row_of(edge) else {
            return self.live.hits(edge, students);
        };
        let k = pupil_index(students);
        let at = |i: usize| self.start[k].get(i).map(|&x| x as usize);
        match (at(r), at(r + 1)) {
            (Some(a), Some(b)) => Cow::Borrowed(self.hits[k].get(a..b).unwrap_or(&[])),
            _ => Cow::Borrowed(&[]),
        }
    }
    fn risk_points(&self, edge: u32) -> f64 {
        match self.row_of(edge) {
            Some(r) => self.risk_points.get(r).copied().unwrap_or(0.0),
            None => self.live.risk_points(edge),
        }
    }
    fn wait_s(&self, edge: u32) -> f64 {
        match self.row_of(edge) {
            Some(r) => self.wait_s.get(r).copied().unwrap_or(0.0),
            None => self.live.wait_s(edge),
        }
    }
}

/// Whether a hit is a rule that fires on the data alone (a finding, not a site check), and
/// on what kind of edge.
pub fn fires(rules: &RuleSet, hit: &RuleHit) -> Option<Target> {
    match hit.1 {
        RuleMatch::Yes => rules.rules.get(hit.0 as usize).map(|r| r.on),
        _ => None,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The table answers exactly as the live lookups on the demo town, under a rule set with
    /// checks (pa-447 asks for site checks where the data lacks a fact) and the default set.
    #[test]
    fn table_matches_the_live_lookups_on_the_demo_town() {
        let layers = crate::input::demo_town_layers();
        for set in ["default", "pa-447"] {
            let mut config = Config::default();
            config.score.rules = RuleSet::builtin(set).expect("shipped set");
            let net = crate::network::build_network(&layers, &config.network);
            let g = &net.graph;
            let rules = &config.score.rules;
            let live = OnTheFly {
                rules,
                graph: g,
                streets: &layers.streets,
                config: &config,
            };
            // Every other edge in the table (twice, to test repeats); the rest answered live.
            let table = EdgeRules::build(live, (0..g.edges.len() as u32).step_by(2).chain(0..4));
            let (mut hits, mut checks, mut waits) = (0, 0, 0);
            for e in 0..g.edges.len() as u32 + 2 {
                for s in [Students::Elementary, Students::Secondary] {
                    let h = table.hits(e, s);
                    assert_eq!(h, live.hits(e, s), "{set}: edge {e}");
                    hits += h.len();
                    checks += h
                        .iter()
                        .filter(|x| matches!(x.1, RuleMatch::Check(_)))
                        .count();
                }
                assert_eq!(table.risk_points(e), live.risk_points(e), "edge {e}");
                assert_eq!(table.wait_s(e), live.wait_s(e), "edge {e}");
                waits += usize::from(table.wait_s(e) > 0.0);
            }
            assert!(hits > 0 && waits > 0, "{set}: rules match some demo edge");
            if set == "pa-447" {
                assert!(
                    checks > 0,
                    "pa-447 asks for some site check in the demo town"
                );
            }
        }
    }
}
