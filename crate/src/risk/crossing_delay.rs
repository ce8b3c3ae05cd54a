//! Pedestrian delay at an unsignalised crossing by the Highway Capacity Manual's
//! gap-acceptance method (HCM 2010, Chapter 19, pedestrian mode at two-way STOP-controlled
//! intersections; the same method serves mid-block crossings). Equations as published there
//! (from memory):
//!
//! - critical headway `t_c = L / S_p + t_s` (crosswalk length, walking speed, start-up and
//!   end clearance time),
//! - probability that a lane is blocked `P_b = 1 - exp(-t_c v / N)`,
//! - probability of a delayed crossing `P_d = 1 - (1 - P_b)^N`,
//! - average delay waiting for an adequate gap `d_g = (1/v) (exp(v t_c) - v t_c - 1)`,
//! - average delay of those delayed `d_gd = d_g / P_d`.
//!
//! Vehicles are taken not to yield (the HCM's conservative case); platooning is ignored.
//! Long waits are where children accept short gaps: the audit reports them.

use serde::Serialize;

/// Pedestrian level of service at an unsignalised crossing, by average delay (HCM 2010
/// Exhibit 19-2 bands, from memory: A <= 5 s, B 5-10, C 10-20, D 20-30, E 30-45, F > 45).
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize)]
pub enum Los {
    A,
    B,
    C,
    D,
    E,
    F,
}

impl Los {
    /// The band an average delay falls in.
    ///
    /// ```
    /// use catchwalk::risk::crossing_delay::Los;
    /// assert_eq!(Los::of_delay_s(5.0), Los::A);
    /// assert_eq!(Los::of_delay_s(46.0), Los::F);
    /// ```
    pub fn of_delay_s(delay_s: f64) -> Los {
        match delay_s {
            d if d <= 5.0 => Los::A,
            d if d <= 10.0 => Los::B,
            d if d <= 20.0 => Los::C,
            d if d <= 30.0 => Los::D,
            d if d <= 45.0 => Los::E,
            _ => Los::F,
        }
    }
    pub fn as_str(self) -> &'static str {
        match self {
            Los::A => "A",
            Los::B => "B",
            Los::C => "C",
            Los::D => "D",
            Los::E => "E",
            Los::F => "F",
        }
    }
}

/// Everything the method yields for one crossing.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct GapDelay {
    pub critical_headway_s: f64,
    pub blocked_lane_probability: f64,
    pub delayed_probability: f64,
    pub average_delay_s: f64,
    /// Average delay of the pedestrians who are delayed (0 when none is).
    pub delay_if_delayed_s: f64,
    pub los: Los,
}

/// Critical headway `t_c = L / S_p + t_s`.
///
/// ```
/// let tc = catchwalk::risk::crossing_delay::critical_headway_s(7.2, 1.2, 3.0);
/// assert!((tc - 9.0).abs() < 1e-12);
/// ```
pub fn critical_headway_s(length_m: f64, walk_mps: f64, start_up_s: f64) -> f64 {
    let walk = if walk_mps > 0.0 { walk_mps } else { 1.0 };
    length_m.max(0.0) / walk + start_up_s.max(0.0)
}

/// The gap-acceptance delay for a crossing of `length_m` over `lanes` lanes carrying a
/// two-way flow of `vehicles_per_s`, walked at `walk_mps` with start-up time `start_up_s`.
///
/// ```
/// use catchwalk::risk::crossing_delay::{gap_delay, Los};
/// let d = gap_delay(7.2, 2, 0.1, 1.07, 3.0);
/// assert_eq!(d.los, Los::B);
/// ```
pub fn gap_delay(
    length_m: f64,
    lanes: u32,
    vehicles_per_s: f64,
    walk_mps: f64,
    start_up_s: f64,
) -> GapDelay {
    let tc = critical_headway_s(length_m, walk_mps, start_up_s);
    let n = lanes.max(1) as f64;
    let v = if vehicles_per_s.is_finite() {
        vehicles_per_s.max(0.0)
    } else {
        0.0
    };
    let pb = 1.0 - (-tc * v / n).exp();
    let pd = 1.0 - (1.0 - pb).powf(n);
    // d_g -> 0 as v -> 0; the series v t_c^2 / 2 avoids cancellation at tiny flows.
    let vt = v * tc;
    let dg = if v <= 0.0 {
        0.0
    } else if vt < 1e-6 {
        tc * vt / 2.0
    } else {
        (vt.exp() - vt - 1.0) / v
    };
    let dg = if dg.is_finite() { dg } else { f64::MAX };
    GapDelay {
        critical_headway_s: tc,
        blocked_lane_probability: pb,
        delayed_probability: pd,
        average_delay_s: dg,
        delay_if_delayed_s: if pd > 0.0 { dg / pd } else { 0.0 },
        los: Los::of_delay_s(dg),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Hand computation from the published HCM 2010 Chapter 19 equations (module doc):
    /// L = 7.2 m, S_p = 1.07 m/s (3.5 ft/s), t_s = 3 s, v = 0.1 veh/s (360 veh/h), N = 2:
    /// t_c = 7.2/1.07 + 3 = 9.728972 s; P_b = 1 - e^(-0.486449) = 0.385194;
    /// P_d = 1 - 0.614806^2 = 0.622014; d_g = 10 (e^0.972897 - 0.972897 - 1) = 6.727010 s;
    /// d_gd = 6.727010 / 0.622014 = 10.814891 s; 6.7 s is LOS B (5-10 s).
    #[test]
    fn matches_a_hand_computation_from_the_hcm_equations() {
        let d = gap_delay(7.2, 2, 0.1, 1.07, 3.0);
        assert!((d.critical_headway_s - 9.728_972).abs() < 1e-6);
        assert!((d.blocked_lane_probability - 0.385_194).abs() < 1e-6);
        assert!((d.delayed_probability - 0.622_014).abs() < 1e-6);
        assert!((d.average_delay_s - 6.727_010).abs() < 1e-6);
        assert!((d.delay_if_delayed_s - 10.814_891).abs() < 1e-6);
        assert_eq!(d.los, Los::B);
    }

    #[test]
    fn los_band_edges() {
        assert_eq!(Los::of_delay_s(0.0), Los::A);
        assert_eq!(Los::of_delay_s(5.01), Los::B);
        assert_eq!(Los::of_delay_s(10.0), Los::B);
        assert_eq!(Los::of_delay_s(20.0), Los::C);
        assert_eq!(Los::of_delay_s(30.0), Los::D);
        assert_eq!(Los::of_delay_s(45.0), Los::E);
        assert_eq!(Los::of_delay_s(45.01), Los::F);
    }

    #[test]
    fn no_traffic_no_delay_and_more_traffic_more_delay() {
        let z = gap_delay(10.0, 2, 0.0, 1.07, 3.0);
        assert_eq!((z.average_delay_s, z.delayed_probability), (0.0, 0.0));
        let mut last = 0.0;
        for k in 1..50 {
            let d = gap_delay(10.0, 2, k as f64 * 0.02, 1.07, 3.0);
            assert!(d.average_delay_s > last && d.delayed_probability <= 1.0);
            last = d.average_delay_s;
        }
        assert!(gap_delay(30.0, 6, 1.0, 1.07, 3.0)
            .average_delay_s
            .is_finite());
    }
}
