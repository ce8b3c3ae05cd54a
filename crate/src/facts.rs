//! Each edge's facts, computed once per network and configuration: risk points and the rule
//! set's flags per kind of pupil, with the routing costs they give. Routing, route risk and
//! the audit read this table instead of re-deriving risk per route step.
//!
//! The table calls the risk model ([`edge_risk_points`]) and the rule set
//! ([`RuleSet::flags_edge`](crate::score::rules::RuleSet::flags_edge)) once per edge, so a
//! change to either shows up here unchanged.

use crate::config::Config;
use crate::input::{Street, Students};
use crate::network::PedGraph;
use crate::pipeline::quantize_cost;
use crate::risk::edge_risk_points;
use crate::route::RouteKind;

/// Per-edge facts and costs, indexed like `graph.edges`.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct EdgeTable {
    /// Risk points of walking the whole edge once (a crossing, or a whole side).
    pub risk_points: Vec<f64>,
    /// Whether a rule of the rule set flags the edge, for elementary and secondary pupils.
    pub flagged: [Vec<bool>; 2],
    /// Shortest-route cost: walked metres (quantised).
    pub walk_cost: Vec<f64>,
    /// Recommended-route cost: metres plus risk in metres (quantised).
    pub rec_cost: Vec<f64>,
    /// Safe-route cost per kind of pupil: metres, infinite where flagged.
    pub safe_cost: [Vec<f64>; 2],
}

/// Index of a kind of pupil in the table's per-pupil arrays.
pub fn pupil_index(students: Students) -> usize {
    match students {
        Students::Elementary => 0,
        Students::Secondary => 1,
    }
}

impl EdgeTable {
    /// Builds the table: one risk and one rule evaluation per edge and kind of pupil.
    ///
    /// ```
    /// let g = catchwalk::network::PedGraph::toy_path(&[10.0, 5.0]);
    /// let t = catchwalk::facts::EdgeTable::build(&g, &[], &catchwalk::config::Config::default());
    /// assert_eq!(t.walk_cost, vec![10.0, 5.0]);
    /// ```
    pub fn build(graph: &PedGraph, streets: &[Street], config: &Config) -> Self {
        // Each edge's facts read that edge alone: on every core natively, in edge order.
        let risk_points = crate::cores::map(&graph.edges, |e| {
            edge_risk_points(graph, e, streets, &config.risk)
        });
        let mut t = EdgeTable {
            walk_cost: graph
                .edges
                .iter()
                .map(|e| quantize_cost(e.length_m))
                .collect(),
            rec_cost: graph
                .edges
                .iter()
                .zip(&risk_points)
                .map(|(e, &risk)| {
                    quantize_cost(e.length_m + config.route.metres_per_risk_point * risk)
                })
                .collect(),
            risk_points,
            ..Default::default()
        };
        for students in [Students::Elementary, Students::Secondary] {
            let k = pupil_index(students);
            t.flagged[k] = crate::cores::map(&graph.edges, |e| {
                config
                    .score
                    .rules
                    .flags_edge(graph, e, streets, &config.risk, students)
            });
            t.safe_cost[k] = t.flagged[k]
                .iter()
                .zip(&t.walk_cost)
                .map(|(&f, &w)| if f { f64::INFINITY } else { w })
                .collect();
        }
        t
    }

    /// The routing cost of every edge for a route kind and kind of pupil.
    pub fn costs(&self, kind: RouteKind, students: Students) -> &[f64] {
        match kind {
            RouteKind::Shortest => &self.walk_cost,
            RouteKind::Recommended => &self.rec_cost,
            RouteKind::Safe => &self.safe_cost[pupil_index(students)],
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::pipeline::{edge_costs, safe_costs};

    /// The table agrees with the per-edge functions it replaces, on the demo town.
    #[test]
    fn table_matches_per_edge_functions_on_the_demo_town() {
        let layers = crate::input::demo_town_layers();
        let config = Config::default();
        let net = crate::network::build_network(&layers, &config.network);
        let t = EdgeTable::build(&net.graph, &layers.streets, &config);
        let g = &net.graph;
        assert_eq!(
            t.walk_cost,
            edge_costs(g, &layers.streets, &config, RouteKind::Shortest)
        );
        assert_eq!(
            t.rec_cost,
            edge_costs(g, &layers.streets, &config, RouteKind::Recommended)
        );
        for s in [Students::Elementary, Students::Secondary] {
            assert_eq!(
                t.costs(RouteKind::Safe, s),
                &safe_costs(g, &layers.streets, &config, s)[..]
            );
        }
        assert!(t.risk_points.iter().any(|&r| r > 0.0));
        assert!(t.flagged[0].iter().any(|&f| f), "some demo edge is flagged");
    }
}
