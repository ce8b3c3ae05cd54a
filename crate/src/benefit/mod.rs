//! Benefit of walking: time, active minutes.

use crate::config::BenefitConfig;

/// Walking time in seconds for a walked length at the configured child walking speed.
///
/// ```
/// let cfg = catchwalk::config::BenefitConfig::default();
/// assert!((catchwalk::benefit::walking_time_s(107.0, &cfg) - 100.0).abs() < 1e-9);
/// ```
pub fn walking_time_s(walked_m: f64, cfg: &BenefitConfig) -> f64 {
    walked_m / cfg.walking_speed_mps
}
