//! Traffic volumes: daily defaults by road class, and the 15-minute school-time volume.
//!
//! Daily defaults sit inside the typical urban AADT ranges of FHWA, *Highway Functional
//! Classification Concepts, Criteria and Procedures* (2013), Tables 3-1 to 3-4 (ranges from
//! memory: minor arterial about 3,000-14,000, collectors about 1,100-6,300, local roads about
//! 80-700 vehicles per day). Service roads are our assumption.
//!
//! Without a measured count, the busiest 15 minutes of school travel are estimated from the
//! daily volume as `AADT x K / (4 x PHF)`: K is the share of daily traffic in the design hour
//! (0.10, common practice for urban streets; from memory), PHF the Highway Capacity Manual's
//! default peak hour factor (0.92, HCM 2010; from memory). PHF = hourly volume / (4 x peak
//! 15-minute volume), so the peak 15 minutes carry `hourly / (4 PHF)` vehicles.

use crate::input::{RoadClass, Street};
use serde::{Deserialize, Serialize};

/// Daily volume (vehicles per day, both directions) assumed by class when a street has none.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct DefaultVolumes {
    pub arterial: f64,
    pub collector: f64,
    pub local: f64,
    pub service: f64,
}

impl Default for DefaultVolumes {
    fn default() -> Self {
        DefaultVolumes {
            arterial: 12_000.0,
            collector: 3_500.0,
            local: 500.0,
            service: 100.0,
        }
    }
}

impl DefaultVolumes {
    /// The default daily volume of a class (foot-only ways carry none).
    ///
    /// ```
    /// use catchwalk::input::RoadClass;
    /// let d = catchwalk::risk::volume::DefaultVolumes::default();
    /// assert_eq!(d.of(RoadClass::Local), 500.0);
    /// assert_eq!(d.of(RoadClass::Path), 0.0);
    /// ```
    pub fn of(&self, class: RoadClass) -> f64 {
        match class {
            RoadClass::Arterial => self.arterial,
            RoadClass::Collector => self.collector,
            RoadClass::Local => self.local,
            RoadClass::Service => self.service,
            RoadClass::Path | RoadClass::Steps => 0.0,
        }
    }
}

/// How daily volumes become a 15-minute school-time volume.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct VolumeConfig {
    pub default_aadt: DefaultVolumes,
    /// Share of daily traffic in the busiest hour (K).
    pub design_hour_factor: f64,
    /// Peak hour factor (hourly volume / 4 x peak 15-minute volume).
    pub peak_hour_factor: f64,
    /// Share of a class's two-way default volume carried by a one-way carriageway (0.5: a
    /// dual carriageway drawn as two one-way ways carries the class default between them;
    /// our assumption). A street's own `aadt` or count is taken as that carriageway's.
    pub oneway_share: f64,
}

impl VolumeConfig {
    /// Range checks: volumes are vehicles per day, factors are shares.
    pub fn validate(&self, at: &str, c: &mut crate::range::Checks) {
        let d = &self.default_aadt;
        for (name, v) in [
            ("arterial", d.arterial),
            ("collector", d.collector),
            ("local", d.local),
            ("service", d.service),
        ] {
            c.at_least(&format!("{at}.default_aadt"), name, v, 0.0, 1e6);
        }
        c.above(at, "design_hour_factor", self.design_hour_factor, 0.0, 1.0);
        c.above(at, "peak_hour_factor", self.peak_hour_factor, 0.0, 1.0);
        c.at_least(at, "oneway_share", self.oneway_share, 0.0, 1.0);
    }
}

impl Default for VolumeConfig {
    fn default() -> Self {
        VolumeConfig {
            default_aadt: DefaultVolumes::default(),
            design_hour_factor: 0.10,
            peak_hour_factor: 0.92,
            oneway_share: 0.5,
        }
    }
}

/// Daily volume of a street: its own, else the class default (a one-way carriageway: its
/// `oneway_share` of it).
///
/// ```
/// use catchwalk::input::{RoadClass, Street};
/// use catchwalk::risk::volume::{daily_volume, VolumeConfig};
/// let mut s = Street::new(0, RoadClass::Arterial, 50.0, 2, vec![[0.0, 0.0], [0.001, 0.0]]);
/// s.oneway = true;
/// assert_eq!(daily_volume(&s, &VolumeConfig::default()), 6_000.0);
/// ```
pub fn daily_volume(street: &Street, cfg: &VolumeConfig) -> f64 {
    match street.aadt {
        Some(v) if v.is_finite() && v >= 0.0 => v,
        _ if street.oneway => cfg.default_aadt.of(street.class) * cfg.oneway_share.clamp(0.0, 1.0),
        _ => cfg.default_aadt.of(street.class),
    }
}

/// Peak 15-minute volume from a daily volume: `AADT x K / (4 x PHF)`.
///
/// ```
/// let cfg = catchwalk::risk::volume::VolumeConfig::default();
/// let v15 = catchwalk::risk::volume::vehicles_15min_from_daily(9200.0, &cfg);
/// assert!((v15 - 250.0).abs() < 1e-9); // 9200 x 0.10 / (4 x 0.92)
/// ```
pub fn vehicles_15min_from_daily(aadt: f64, cfg: &VolumeConfig) -> f64 {
    let phf = if cfg.peak_hour_factor > 0.0 {
        cfg.peak_hour_factor.min(1.0)
    } else {
        1.0
    };
    aadt.max(0.0) * cfg.design_hour_factor.max(0.0) / (4.0 * phf)
}

/// Vehicles in the busiest 15 minutes of school travel: the measured count, else estimated.
pub fn vehicles_15min(street: &Street, cfg: &VolumeConfig) -> f64 {
    if street.class.is_foot_only() {
        return 0.0;
    }
    match street.vehicles_15min {
        Some(v) if v.is_finite() && v >= 0.0 => v,
        _ => vehicles_15min_from_daily(daily_volume(street, cfg), cfg),
    }
}

/// Flow rate in vehicles per second during that peak 15 minutes.
pub fn peak_flow_per_s(vehicles_15min: f64) -> f64 {
    vehicles_15min.max(0.0) / 900.0
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn measured_count_wins_over_daily_volume() {
        let cfg = VolumeConfig::default();
        let mut s = crate::risk::tests::street(RoadClass::Collector, 50.0, 2);
        assert!((vehicles_15min(&s, &cfg) - 3500.0 * 0.1 / 3.68).abs() < 1e-9);
        s.aadt = Some(920.0);
        assert!((vehicles_15min(&s, &cfg) - 25.0).abs() < 1e-9);
        // A one-way carriageway keeps its own count, or half the class default.
        s.oneway = true;
        assert!((vehicles_15min(&s, &cfg) - 25.0).abs() < 1e-9);
        s.aadt = None;
        assert!((vehicles_15min(&s, &cfg) - 1750.0 * 0.1 / 3.68).abs() < 1e-9);
        s.oneway = false;
        s.vehicles_15min = Some(77.0);
        assert_eq!(vehicles_15min(&s, &cfg), 77.0);
        s.class = RoadClass::Path;
        assert_eq!(vehicles_15min(&s, &cfg), 0.0);
    }

    #[test]
    fn defaults_rank_with_class() {
        let d = DefaultVolumes::default();
        assert!(d.arterial > d.collector && d.collector > d.local && d.local > d.service);
        // Inside the FHWA 2013 typical urban ranges quoted in the module doc (from memory).
        assert!((3_000.0..=27_000.0).contains(&d.arterial));
        assert!((1_100.0..=6_300.0).contains(&d.collector));
        assert!((80.0..=700.0).contains(&d.local));
    }
}
