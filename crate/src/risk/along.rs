//! Risk of walking along a side with no sidewalk, in points per 100 m:
//!
//! `severity(speed) / severity(50 km/h) x vehicles_15min / vehicles_15min,ref`
//!
//! Exposure grows with the vehicles that pass the walker, so the volume factor is linear in
//! the flow, relative to the default local street's. 100 m beside the reference street (50
//! km/h, default local volume) is 1 point, the same as one reference crossing.

use super::crossing::relative_severity;
use super::volume::vehicles_15min_from_daily;
use super::RiskConfig;

/// Points for each 100 m walked without a sidewalk beside traffic at this speed and flow.
///
/// ```
/// use catchwalk::risk::{along::along_points_per_100m, RiskConfig};
/// use catchwalk::risk::volume::vehicles_15min_from_daily;
/// let cfg = RiskConfig::default();
/// let v15 = vehicles_15min_from_daily(cfg.volume.default_aadt.local, &cfg.volume);
/// assert!((along_points_per_100m(50.0, v15, &cfg) - 1.0).abs() < 1e-9);
/// assert!((along_points_per_100m(50.0, 2.0 * v15, &cfg) - 2.0).abs() < 1e-9);
/// ```
pub fn along_points_per_100m(speed_kmh: f64, vehicles_15min: f64, cfg: &RiskConfig) -> f64 {
    let v_ref = vehicles_15min_from_daily(cfg.volume.default_aadt.local, &cfg.volume);
    if v_ref <= 0.0 {
        return 0.0;
    }
    let p = relative_severity(speed_kmh, cfg) * vehicles_15min.max(0.0) / v_ref;
    if p.is_finite() {
        p
    } else {
        0.0
    }
}
