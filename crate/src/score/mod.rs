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
}

impl Default for ScoreConfig {
    fn default() -> Self {
        ScoreConfig {
            rules: rules::RuleSet::default(),
            walkable_share: 0.5,
            safe_share: 0.5,
        }
    }
}
