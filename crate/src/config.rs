//! Every tunable default in one place, each with where it comes from.
//! A config file (JSON) may override any subset; absent fields keep these defaults.

use crate::range::{Bound, Checks};
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

impl NetworkConfig {
    /// Range checks (allowed ranges: DEVELOPERS.md, configuration table).
    pub fn validate(&self, at: &str, c: &mut Checks) {
        c.at_least(at, "snap_tolerance_m", self.snap_tolerance_m, 0.0, 50.0);
        c.at_least(at, "crossing_attach_m", self.crossing_attach_m, 0.0, 200.0);
        c.above(at, "lane_width_m", self.lane_width_m, 0.0, 10.0);
        c.above(at, "max_attach_m", self.max_attach_m, 0.0, 5_000.0);
        c.at_least(
            at,
            "tiny_component_segments",
            self.tiny_component_segments as f64,
            0.0,
            1e6,
        );
        c.at_least(at, "near_miss_m", self.near_miss_m, 0.0, 200.0);
    }
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

impl RouteConfig {
    /// Range checks: a negative risk weight would make costs negative.
    pub fn validate(&self, at: &str, c: &mut Checks) {
        c.at_least(at, "detour_cap", self.detour_cap, 1.0, 100.0);
        c.at_least(
            at,
            "metres_per_risk_point",
            self.metres_per_risk_point,
            0.0,
            1e6,
        );
    }
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

impl BenefitConfig {
    /// Range checks.
    pub fn validate(&self, at: &str, c: &mut Checks) {
        c.above(at, "walking_speed_mps", self.walking_speed_mps, 0.0, 5.0);
        c.above(at, "walk_zone_m", self.walk_zone_m, 0.0, 100_000.0);
        c.above(
            at,
            "guideline_min_per_day",
            self.guideline_min_per_day,
            0.0,
            1440.0,
        );
        c.above(at, "walking_met", self.walking_met, 0.0, 25.0);
        c.above(at, "body_mass_kg", self.body_mass_kg, 0.0, 300.0);
    }
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
    /// Reads a JSON config; unknown fields are refused so a typo does not pass silently, and
    /// every value is range-checked ([`Config::validate`]).
    ///
    /// ```
    /// use catchwalk::config::Config;
    /// let e = Config::from_json(r#"{"route": {"metres_per_risk_point": -5}}"#).unwrap_err();
    /// assert!(e.to_string().contains("route.metres_per_risk_point is -5; allowed: from 0 to"));
    /// ```
    pub fn from_json(text: &str) -> crate::error::Result<Config> {
        let config: Config = serde_json::from_str(text).map_err(|e| {
            crate::error::Error::Config(format!(
                "config: {e}; see DEVELOPERS.md for the fields and their defaults"
            ))
        })?;
        config.validate()?;
        Ok(config)
    }

    /// Runs every module's range checks.
    fn checks(&self) -> Checks {
        let mut c = Checks::default();
        self.network.validate("network", &mut c);
        self.route.validate("route", &mut c);
        self.benefit.validate("benefit", &mut c);
        self.risk.validate("risk", &mut c);
        self.score.validate("score", &mut c);
        c
    }

    /// Refuses a value outside its allowed range, naming every such field and its range.
    pub fn validate(&self) -> crate::error::Result<()> {
        let c = self.checks();
        if c.problems.is_empty() {
            Ok(())
        } else {
            Err(crate::error::Error::Config(format!(
                "config: {}; see DEVELOPERS.md for the fields and their ranges",
                c.problems.join("; ")
            )))
        }
    }

    /// The allowed range of every numeric field (the page's settings check against these).
    pub fn bounds() -> Vec<Bound> {
        Config::default().checks().bounds
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn defaults_are_in_range() {
        assert!(Config::default().validate().is_ok());
        assert!(Config::bounds().len() > 30);
    }

    #[test]
    fn every_bad_field_is_named_with_its_range() {
        let e = Config::from_json(
            r#"{"route": {"detour_cap": 0.9, "metres_per_risk_point": -1},
                "benefit": {"walk_zone_m": 0, "walking_speed_mps": -1},
                "network": {"max_attach_m": 1e9},
                "score": {"safe_share": 1.5}, "risk": {"controls": {"signal": -0.1}}}"#,
        )
        .unwrap_err()
        .to_string();
        for part in [
            "route.detour_cap is 0.9; allowed: from 1 to 100",
            "route.metres_per_risk_point is -1",
            "benefit.walk_zone_m is 0; allowed: greater than 0",
            "benefit.walking_speed_mps is -1",
            "network.max_attach_m is 1000000000",
            "score.safe_share is 1.5; allowed: from 0 to 1",
            "risk.controls.signal is -0.1",
        ] {
            assert!(e.contains(part), "{part} missing from {e}");
        }
    }
}
