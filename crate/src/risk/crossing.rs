//! Risk of one crossing, in points:
//!
//! `severity(crossed speed) / severity(50 km/h) x conflict factor(control) x P_d / P_d,ref`
//!
//! where `P_d` is the Highway Capacity Manual probability that a pedestrian arriving at the
//! crossing is delayed (faces traffic within the critical headway, see
//! [`crossing_delay`](super::crossing_delay)), from the crossed width and the peak 15-minute
//! flow. The reference is one uncontrolled crossing of a two-lane (2 x lane width) 50 km/h
//! street at the default local daily volume, so that crossing scores exactly 1 point.

use super::control::conflict_factor;
use super::crossing_delay::gap_delay;
use super::volume::{peak_flow_per_s, vehicles_15min_from_daily};
use super::RiskConfig;
use crate::input::Control;

/// What the crossing risk depends on.
#[derive(Debug, Clone, PartialEq)]
pub struct CrossingInput<'a> {
    pub speed_kmh: f64,
    /// Kerb-to-kerb width walked.
    pub width_m: f64,
    pub lanes: u32,
    pub vehicles_15min: f64,
    pub control: &'a Control,
}

/// Probability that a pedestrian is delayed at a crossing of this width and flow.
pub fn delayed_probability(width_m: f64, lanes: u32, vehicles_15min: f64, cfg: &RiskConfig) -> f64 {
    gap_delay(
        width_m,
        lanes,
        peak_flow_per_s(vehicles_15min),
        cfg.walk_mps,
        cfg.start_up_s,
    )
    .delayed_probability
}

/// `P_d` of the reference crossing.
pub fn reference_delayed_probability(cfg: &RiskConfig) -> f64 {
    let lanes = cfg.reference_lanes.max(1);
    let v15 = vehicles_15min_from_daily(cfg.volume.default_aadt.local, &cfg.volume);
    delayed_probability(lanes as f64 * cfg.lane_width_m, lanes, v15, cfg)
}

/// Severity at `speed_kmh` relative to the reference speed, on the configured curve.
pub fn relative_severity(speed_kmh: f64, cfg: &RiskConfig) -> f64 {
    let r = cfg.curve.probability(cfg.reference_speed_kmh);
    if r > 0.0 {
        cfg.curve.probability(speed_kmh) / r
    } else {
        0.0
    }
}

/// Risk points of one crossing.
///
/// ```
/// use catchwalk::input::Control;
/// use catchwalk::risk::crossing::{crossing_points, CrossingInput};
/// use catchwalk::risk::volume::vehicles_15min_from_daily;
/// let cfg = catchwalk::risk::RiskConfig::default();
/// let v15 = vehicles_15min_from_daily(cfg.volume.default_aadt.local, &cfg.volume);
/// let reference = CrossingInput {
///     speed_kmh: 50.0, width_m: 7.2, lanes: 2, vehicles_15min: v15,
///     control: &Control::UNCONTROLLED,
/// };
/// assert!((crossing_points(&reference, &cfg) - 1.0).abs() < 1e-9);
/// ```
pub fn crossing_points(c: &CrossingInput, cfg: &RiskConfig) -> f64 {
    let pd_ref = reference_delayed_probability(cfg);
    if pd_ref <= 0.0 {
        return 0.0;
    }
    let exposure = delayed_probability(c.width_m, c.lanes, c.vehicles_15min, cfg) / pd_ref;
    let k = conflict_factor(c.control, &cfg.controls, &cfg.school_windows);
    let p = relative_severity(c.speed_kmh, cfg) * k * exposure;
    if p.is_finite() {
        p.max(0.0)
    } else {
        0.0
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::input::Device;

    fn input(speed: f64, width: f64, v15: f64, control: &Control) -> CrossingInput<'_> {
        CrossingInput {
            speed_kmh: speed,
            width_m: width,
            lanes: (width / 3.6).round().max(1.0) as u32,
            vehicles_15min: v15,
            control,
        }
    }

    #[test]
    fn reference_crossing_is_one_point_under_every_curve() {
        for curve in [
            crate::risk::severity::Curve::RosenSander2009,
            crate::risk::severity::Curve::Tefft2013,
            crate::risk::severity::Curve::AshtonMackay1979,
        ] {
            let cfg = RiskConfig {
                curve,
                ..RiskConfig::default()
            };
            let v15 = vehicles_15min_from_daily(500.0, &cfg.volume);
            let p = crossing_points(&input(50.0, 7.2, v15, &Control::UNCONTROLLED), &cfg);
            assert!((p - 1.0).abs() < 1e-9, "{curve:?}: {p}");
        }
    }

    /// Our assumption, stated in docs/methods.md: the HCM probability of meeting traffic is
    /// used as exposure, so it saturates at 1 / P_d,ref = 1 / 0.136598 = 7.32 times the
    /// reference crossing however busy or wide the road (hand computation).
    #[test]
    fn exposure_saturates_at_7_3_times_the_reference() {
        let cfg = RiskConfig::default();
        let pd_ref = reference_delayed_probability(&cfg);
        assert!((pd_ref - 0.136_598).abs() < 1e-6);
        let p = crossing_points(&input(50.0, 60.0, 5_000.0, &Control::UNCONTROLLED), &cfg);
        assert!((p - 7.320_765).abs() < 1e-5, "{p}");
    }

    #[test]
    fn faster_wider_busier_riskier_and_controls_help() {
        let cfg = RiskConfig::default();
        let u = Control::UNCONTROLLED;
        let base = crossing_points(&input(50.0, 7.2, 20.0, &u), &cfg);
        assert!(crossing_points(&input(60.0, 7.2, 20.0, &u), &cfg) > base);
        assert!(crossing_points(&input(50.0, 14.4, 20.0, &u), &cfg) > base);
        assert!(crossing_points(&input(50.0, 7.2, 80.0, &u), &cfg) > base);
        let signal = Control {
            device: Device::Signal,
            ..Control::UNCONTROLLED
        };
        let s = crossing_points(&input(50.0, 7.2, 20.0, &signal), &cfg);
        assert!((s / base - 0.453).abs() < 1e-9);
        assert_eq!(crossing_points(&input(50.0, 7.2, 0.0, &u), &cfg), 0.0);
    }
}
