//! Every tunable default in one place, each with where it comes from.
//! A config file (JSON) may override any subset; absent fields keep these defaults.

use serde::{Deserialize, Serialize};

/// Network building.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct NetworkConfig {
    /// Vertices closer than this merge, within the same vertical layer (DESIGN.md default).
    pub snap_tolerance_m: f64,
    /// A crossing point this close to a junction attaches to it; farther, it splits the
    /// segment into a mid-block crossing (DESIGN.md default).
    pub crossing_attach_m: f64,
    /// Lane width used for crossing widths when the layer gives none (common practice).
    pub lane_width_m: f64,
    /// Homes and schools farther than this from any walkable edge are reported unreachable.
    pub max_attach_m: f64,
    /// Components with fewer segments than this are reported as tiny in network QA.
    pub tiny_component_segments: usize,
    /// A dangling end this close to a same-layer street it did not join is a near-miss.
    pub near_miss_m: f64,
}

impl Default for NetworkConfig {
    fn default() -> Self {
        NetworkConfig {
            snap_tolerance_m: 0.5,
            crossing_attach_m: 15.0,
            lane_width_m: 3.6,
            max_attach_m: 300.0,
            tiny_component_segments: 5,
            near_miss_m: 5.0,
        }
    }
}

/// Routing.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct RouteConfig {
    /// The recommended route may be at most this many times the shortest walked length;
    /// over it the shortest stands and the home is flagged (DESIGN.md default).
    pub detour_cap: f64,
    /// Metres of walking that one risk point is worth in the recommended route's cost.
    pub metres_per_risk_point: f64,
}

impl Default for RouteConfig {
    fn default() -> Self {
        RouteConfig {
            detour_cap: 1.5,
            metres_per_risk_point: 250.0,
        }
    }
}

/// Benefit of walking.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct BenefitConfig {
    /// Walking speed for walking time and active minutes: 1.22 m/s (4.0 ft/s), the Highway
    /// Capacity Manual's walking speed for pedestrians where under 20 % are elderly (HCM
    /// 2010, from memory) and the design speed Knoblauch, Pietrucha & Nitzburg 1996 (TRR
    /// 1538) recommend for pedestrians under 65 (from memory). Not a child-specific figure:
    /// children's speeds vary with age and company. Crossing times and HCM waits keep the
    /// signal-timing 3.5 ft/s (`risk.walk_mps`).
    pub walking_speed_mps: f64,
    /// Network distance that defines the walk zone (common practice: about one mile).
    pub walk_zone_m: f64,
    /// Minutes a day of moderate-to-vigorous activity for ages 5-17 (WHO 2020 guidelines on
    /// physical activity and sedentary behaviour).
    pub guideline_min_per_day: f64,
    /// MET of walking at about 2.5 mph on a level, firm surface: 3.0 (Compendium of Physical
    /// Activities 2011, code 17170; from memory).
    pub walking_met: f64,
    /// Body mass for energy figures (about a 10-year-old's; our assumption).
    pub body_mass_kg: f64,
}

impl Default for BenefitConfig {
    fn default() -> Self {
        BenefitConfig {
            walking_speed_mps: 1.22,
            walk_zone_m: 1600.0,
            guideline_min_per_day: 60.0,
            walking_met: 3.0,
            body_mass_kg: 32.0,
        }
    }
}

/// The whole configuration.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct Config {
    pub network: NetworkConfig,
    pub route: RouteConfig,
    pub benefit: BenefitConfig,
    pub risk: crate::risk::RiskConfig,
    pub score: crate::score::ScoreConfig,
}

impl Config {
    /// Reads a JSON config; unknown fields are refused so a typo does not pass silently.
    pub fn from_json(text: &str) -> crate::error::Result<Config> {
        serde_json::from_str(text).map_err(|e| {
            crate::error::Error::Config(format!(
                "config: {e}; see DEVELOPERS.md for the fields and their defaults"
            ))
        })
    }
}
