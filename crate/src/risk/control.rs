//! Conflict factors of crossing controls: the share of an uncontrolled crossing's risk that
//! remains with a control, multiplied together when features combine. Where a published
//! crash-modification factor (CMF, pedestrian crashes) exists it is used; the rest are our
//! assumptions, marked as such. Every factor is at most 1, so adding a control never raises
//! risk.
//!
//! | feature | factor | source |
//! |---|---|---|
//! | marked crosswalk alone | 1.00 | Zegeer et al. 2005 (FHWA-HRT-04-100): no significant difference from unmarked at uncontrolled two-lane sites (from memory) |
//! | rectangular rapid flashing beacon | 0.526 | NCHRP Report 841 (Zegeer et al. 2017), via FHWA Proven Safety Countermeasures (up to 47 % fewer pedestrian crashes; from memory) |
//! | yield (give-way) sign on the crossed leg | 0.75 | our assumption (no pedestrian CMF found: halfway between no control and a stop sign, since drivers need not stop) |
//! | minor-leg stop on the crossed leg | 0.50 | our assumption |
//! | all-way stop | 0.48 | our assumption |
//! | signal with pedestrian phase | 0.453 | NCHRP 841 CMF for a pedestrian hybrid beacon (from memory), the nearest published figure for a signal at a formerly uncontrolled crossing |
//! | refuge island | 0.685 | NCHRP 841 (from memory); FHWA Proven Safety Countermeasures: 32 % fewer pedestrian crashes |
//! | raised crossing | 0.55 | FHWA Proven Safety Countermeasures: raised crosswalks up to 45 % fewer pedestrian crashes (from memory) |
//! | adult crossing guard on duty | 0.50 | our assumption (no CMF found); counts only when its hours overlap the school travel windows |

use crate::input::{Control, Device, TimeWindow};
use serde::{Deserialize, Serialize};

/// Conflict factors by device and feature (see the module table for sources).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct ControlFactors {
    pub none: f64,
    pub marked: f64,
    pub beacon: f64,
    pub yield_sign: f64,
    pub stop: f64,
    pub all_way_stop: f64,
    pub signal: f64,
    pub refuge_island: f64,
    pub raised: f64,
    pub guard: f64,
}

impl Default for ControlFactors {
    fn default() -> Self {
        ControlFactors {
            none: 1.0,
            marked: 1.0,
            beacon: 0.526,
            yield_sign: 0.75,
            stop: 0.50,
            all_way_stop: 0.48,
            signal: 0.453,
            refuge_island: 0.685,
            raised: 0.55,
            guard: 0.50,
        }
    }
}

impl ControlFactors {
    /// Range checks: factors multiply risk, so none may be negative.
    pub fn validate(&self, at: &str, c: &mut crate::range::Checks) {
        for (name, v) in [
            ("none", self.none),
            ("marked", self.marked),
            ("beacon", self.beacon),
            ("stop", self.stop),
            ("all_way_stop", self.all_way_stop),
            ("signal", self.signal),
            ("refuge_island", self.refuge_island),
            ("raised", self.raised),
            ("guard", self.guard),
        ] {
            c.at_least(at, name, v, 0.0, 10.0);
        }
    }

    pub fn device(&self, d: Device) -> f64 {
        let f = match d {
            Device::None => self.none,
            Device::Marked => self.marked,
            Device::Yield => self.yield_sign,
            Device::Beacon => self.beacon,
            Device::Stop => self.stop,
            Device::AllWayStop => self.all_way_stop,
            Device::Signal => self.signal,
        };
        f.clamp(0.0, 1.0)
    }
}

/// The default school travel windows: 07:30-09:00 and 14:30-16:00 (common practice).
pub fn default_school_windows() -> Vec<TimeWindow> {
    vec![
        TimeWindow {
            start_min: 7 * 60 + 30,
            end_min: 9 * 60,
        },
        TimeWindow {
            start_min: 14 * 60 + 30,
            end_min: 16 * 60,
        },
    ]
}

/// A guard protects the crossing if on duty at school times (`Some(empty)`) or if any of its
/// hours overlap any school travel window.
///
/// ```
/// use catchwalk::input::TimeWindow;
/// use catchwalk::risk::control::{default_school_windows, guard_on_duty};
/// let w = default_school_windows();
/// assert!(guard_on_duty(&Some(vec![]), &w));
/// assert!(!guard_on_duty(&Some(vec![TimeWindow { start_min: 600, end_min: 700 }]), &w));
/// assert!(!guard_on_duty(&None, &w));
/// ```
pub fn guard_on_duty(guard: &Option<Vec<TimeWindow>>, school: &[TimeWindow]) -> bool {
    match guard {
        None => false,
        Some(hours) if hours.is_empty() => true,
        Some(hours) => hours.iter().any(|h| {
            school
                .iter()
                .any(|s| h.start_min < s.end_min && s.start_min < h.end_min)
        }),
    }
}

/// The conflict factor of a crossing's control: device x refuge x raised x guard on duty.
///
/// ```
/// use catchwalk::input::{Control, Device};
/// use catchwalk::risk::control::{conflict_factor, default_school_windows, ControlFactors};
/// let f = ControlFactors::default();
/// let c = Control { device: Device::Beacon, refuge_island: true, ..Control::UNCONTROLLED };
/// let k = conflict_factor(&c, &f, &default_school_windows());
/// assert!((k - 0.526 * 0.685).abs() < 1e-12);
/// ```
pub fn conflict_factor(control: &Control, f: &ControlFactors, school: &[TimeWindow]) -> f64 {
    let mut k = f.device(control.device);
    if control.refuge_island {
        k *= f.refuge_island.clamp(0.0, 1.0);
    }
    if control.raised {
        k *= f.raised.clamp(0.0, 1.0);
    }
    if guard_on_duty(&control.guard, school) {
        k *= f.guard.clamp(0.0, 1.0);
    }
    k
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn stronger_devices_never_have_larger_factors() {
        let f = ControlFactors::default();
        let order = [
            Device::None,
            Device::Marked,
            Device::Yield,
            Device::Beacon,
            Device::Stop,
            Device::AllWayStop,
            Device::Signal,
        ];
        for w in order.windows(2) {
            assert!(f.device(w[1]) <= f.device(w[0]), "{:?}", w);
        }
    }

    #[test]
    fn guard_outside_school_hours_does_not_count() {
        let w = default_school_windows();
        let f = ControlFactors::default();
        let mut c = Control::UNCONTROLLED;
        c.guard = Some(vec![TimeWindow {
            start_min: 12 * 60,
            end_min: 13 * 60,
        }]);
        assert_eq!(conflict_factor(&c, &f, &w), 1.0);
        c.guard = Some(vec![TimeWindow {
            start_min: 8 * 60 + 45,
            end_min: 9 * 60 + 30,
        }]);
        assert_eq!(conflict_factor(&c, &f, &w), 0.5);
    }
}
