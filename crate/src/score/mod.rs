//! Scores: per home, per catchment, hotspots, upgrade planner.

pub mod rules;

use serde::{Deserialize, Serialize};

/// Scoring settings.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct ScoreConfig {
    /// The safe-route / hazardous-route rule set (default: the shipped `default` set).
    pub rules: rules::RuleSet,
    /// A catchment is "walkable" when at least this share of its children lives in the walk
    /// zone (common practice: a majority).
    pub walkable_share: f64,
    /// A catchment is "safe" when at least this share of its children has a route that no
    /// rule flags (common practice: a majority).
    pub safe_share: f64,
    pub plan: plan::PlanConfig,
    /// Rail crossings and crashes join edges within this distance (m; the crossing-point
    /// attach distance; see `score::observed`).
    pub observed_join_m: f64,
}

impl ScoreConfig {
    /// Range checks of the scoring settings.
    pub fn validate(&self, at: &str, c: &mut crate::range::Checks) {
        c.at_least(at, "walkable_share", self.walkable_share, 0.0, 1.0);
        c.at_least(at, "safe_share", self.safe_share, 0.0, 1.0);
        c.at_least(at, "observed_join_m", self.observed_join_m, 0.0, 200.0);
        self.plan.validate(&format!("{at}.plan"), c);
    }
}

impl Default for ScoreConfig {
    fn default() -> Self {
        ScoreConfig {
            rules: rules::RuleSet::default(),
            walkable_share: 0.5,
            safe_share: 0.5,
            plan: plan::PlanConfig::default(),
            observed_join_m: 15.0,
        }
    }
}

pub mod catchment;
pub mod edge_rules;
pub mod home;
pub mod hotspots;
pub mod observed;
pub mod plan;
pub mod unreached;

use crate::config::Config;
use crate::input::Layers;
use crate::network::PedGraph;
use crate::pipeline::HomeResult;

/// Everything the scoring stage produces.
#[derive(Debug, Clone, Default, PartialEq, Serialize)]
pub struct Scores {
    /// Indexed like the homes layer.
    pub homes: Vec<home::HomeScore>,
    /// Indexed like the schools layer.
    pub catchments: Vec<catchment::CatchmentScore>,
    /// Ranked, worst first.
    pub hotspots: Vec<hotspots::Hotspot>,
}

/// Scores an audit's routes: homes, catchments, hotspots.
pub fn score_audit(
    layers: &Layers,
    graph: &PedGraph,
    homes: &[HomeResult],
    config: &Config,
) -> Scores {
    let located = observed::locate(layers, graph, config.score.observed_join_m);
    // The hotspots read the routes, not the scores: both side by side natively.
    let (mut home_scores, mut hotspots) = crate::cores::join(
        || home::score_homes(homes, &layers.schools, graph, &layers.streets, config),
        || hotspots::hotspots(homes, &layers.homes, graph, &layers.streets, config),
    );
    if !layers.rail_crossings.is_empty() || !layers.crashes.is_empty() {
        for (h, sc) in homes.iter().zip(home_scores.iter_mut()) {
            let Some(rec) = &h.recommended else { continue };
            let students = h
                .assignment
                .school
                .and_then(|s| layers.schools.get(s))
                .map(|s| s.students)
                .unwrap_or_default();
            sc.site_checks.extend(observed::observed_site_checks(
                &config.score.rules,
                &rec.route,
                layers,
                &located,
                students,
                config,
            ));
        }
    }
    let catchments = crate::pipeline::homes_by_school(homes, layers.schools.len())
        .iter()
        .enumerate()
        .map(|(s, of_school)| {
            let members: Vec<(&home::HomeScore, f64)> = of_school
                .iter()
                .filter_map(|&i| Some((home_scores.get(i)?, layers.homes.get(i)?.children as f64)))
                .collect();
            catchment::score_catchment(s, &members, &config.score)
        })
        .collect();
    for h in hotspots.iter_mut() {
        (h.crashes, h.crashes_pedestrian, h.crashes_ksi) =
            observed::crash_counts_of(h.edge, layers, &located);
    }
    Scores {
        hotspots,
        homes: home_scores,
        catchments,
    }
}
