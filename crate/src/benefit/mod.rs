//! Benefit of walking: time, daily active minutes, share of the WHO guideline, energy, and
//! the walk zone. Defaults and sources live on [`BenefitConfig`].

use crate::config::BenefitConfig;

/// Walking time in seconds for a walked length at the configured child walking speed.
///
/// ```
/// let cfg = catchwalk::config::BenefitConfig::default();
/// assert!((catchwalk::benefit::walking_time_s(122.0, &cfg) - 100.0).abs() < 1e-9);
/// ```
pub fn walking_time_s(walked_m: f64, cfg: &BenefitConfig) -> f64 {
    if cfg.walking_speed_mps > 0.0 {
        walked_m.max(0.0) / cfg.walking_speed_mps
    } else {
        0.0
    }
}

/// Active minutes a day from walking to school and back (two trips of `one_way_walked_m`).
///
/// ```
/// let cfg = catchwalk::config::BenefitConfig::default();
/// let m = catchwalk::benefit::active_minutes_per_day(732.0, &cfg);
/// assert!((m - 20.0).abs() < 1e-9); // 2 x 732 m / 1.22 m/s = 1200 s
/// ```
pub fn active_minutes_per_day(one_way_walked_m: f64, cfg: &BenefitConfig) -> f64 {
    2.0 * walking_time_s(one_way_walked_m, cfg) / 60.0
}

/// Share of the WHO 2020 guideline (60 minutes a day of moderate-to-vigorous activity,
/// ages 5-17) that the walk provides. Counting every walking minute assumes the walk is of
/// moderate intensity (about 3 MET or more; our assumption: a slow stroll may not be).
///
/// ```
/// let cfg = catchwalk::config::BenefitConfig::default();
/// assert!((catchwalk::benefit::guideline_share(15.0, &cfg) - 0.25).abs() < 1e-12);
/// ```
pub fn guideline_share(active_min: f64, cfg: &BenefitConfig) -> f64 {
    if cfg.guideline_min_per_day > 0.0 {
        active_min / cfg.guideline_min_per_day
    } else {
        0.0
    }
}

/// Energy spent walking, kcal a day: `MET x body mass (kg) x hours` (the Compendium's
/// convention, 1 MET ~ 1 kcal/kg/h).
///
/// ```
/// let cfg = catchwalk::config::BenefitConfig::default();
/// let kcal = catchwalk::benefit::energy_kcal_per_day(60.0, &cfg);
/// assert!((kcal - cfg.walking_met * cfg.body_mass_kg).abs() < 1e-9);
/// ```
pub fn energy_kcal_per_day(active_min: f64, cfg: &BenefitConfig) -> f64 {
    cfg.walking_met.max(0.0) * cfg.body_mass_kg.max(0.0) * active_min.max(0.0) / 60.0
}

/// A home is in the walk zone when its shortest route's network length is within the zone.
///
/// ```
/// let cfg = catchwalk::config::BenefitConfig::default();
/// assert!(catchwalk::benefit::in_walk_zone(1600.0, &cfg));
/// assert!(!catchwalk::benefit::in_walk_zone(1600.5, &cfg));
/// ```
pub fn in_walk_zone(network_m: f64, cfg: &BenefitConfig) -> bool {
    network_m <= cfg.walk_zone_m
}
