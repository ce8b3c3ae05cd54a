//! Range checks for settings. Each module's settings type checks its own fields through a
//! [`Checks`] (`validate(&self, at, checks)`), `config.rs` only assembles them; the same walk
//! gives the page the allowed range of every field, so its settings use the core's own check.

use serde::Serialize;

/// The allowed range of one numeric setting.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Bound {
    /// Dotted path of the field in the config (`route.detour_cap`).
    pub field: String,
    pub min: f64,
    /// `true`: the value must be strictly greater than `min`.
    pub min_exclusive: bool,
    pub max: f64,
}

impl Bound {
    /// Whether `value` lies in the range (NaN never does).
    ///
    /// ```
    /// let b = catchwalk::range::Bound { field: "x".into(), min: 0.0, min_exclusive: true, max: 5.0 };
    /// assert!(b.admits(5.0) && !b.admits(0.0) && !b.admits(f64::NAN));
    /// ```
    pub fn admits(&self, value: f64) -> bool {
        let above = if self.min_exclusive {
            value > self.min
        } else {
            value >= self.min
        };
        above && value <= self.max
    }

    /// The range in words: `greater than 0 and at most 5`, `from 1 to 100`.
    pub fn describe(&self) -> String {
        if self.min_exclusive {
            format!("greater than {} and at most {}", self.min, self.max)
        } else {
            format!("from {} to {}", self.min, self.max)
        }
    }
}

/// Collects the bounds visited and the values that fall outside them.
#[derive(Debug, Default)]
pub struct Checks {
    pub bounds: Vec<Bound>,
    pub problems: Vec<String>,
}

impl Checks {
    /// Checks `at.name` = `value` against `[min, max]` (or `(min, max]` when `min_exclusive`).
    ///
    /// ```
    /// let mut c = catchwalk::range::Checks::default();
    /// c.number("route", "detour_cap", 0.5, 1.0, false, 100.0);
    /// assert!(c.problems[0].contains("route.detour_cap is 0.5"));
    /// ```
    pub fn number(
        &mut self,
        at: &str,
        name: &str,
        value: f64,
        min: f64,
        min_exclusive: bool,
        max: f64,
    ) {
        let bound = Bound {
            field: format!("{at}.{name}"),
            min,
            min_exclusive,
            max,
        };
        if !bound.admits(value) {
            self.problems.push(format!(
                "{} is {value}; allowed: {}",
                bound.field,
                bound.describe()
            ));
        }
        self.bounds.push(bound);
    }

    /// A value that must be at least `min` and at most `max`.
    pub fn at_least(&mut self, at: &str, name: &str, value: f64, min: f64, max: f64) {
        self.number(at, name, value, min, false, max);
    }

    /// A value that must be greater than `min` and at most `max`.
    pub fn above(&mut self, at: &str, name: &str, value: f64, min: f64, max: f64) {
        self.number(at, name, value, min, true, max);
    }

    /// A free-form problem found by a settings type (an inverted time window, ...).
    pub fn problem(&mut self, message: String) {
        self.problems.push(message);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn exclusive_minimum_refuses_the_minimum_itself() {
        let mut c = Checks::default();
        c.above("benefit", "walk_zone_m", 0.0, 0.0, 100_000.0);
        c.above("benefit", "walking_speed_mps", 1.0, 0.0, 5.0);
        assert_eq!(c.problems.len(), 1);
        assert!(c.problems[0].contains("benefit.walk_zone_m is 0; allowed: greater than 0"));
        assert_eq!(c.bounds.len(), 2);
    }

    #[test]
    fn nan_and_infinity_are_out_of_range() {
        let mut c = Checks::default();
        c.at_least("route", "metres_per_risk_point", f64::NAN, 0.0, 1e6);
        c.at_least("route", "metres_per_risk_point", f64::INFINITY, 0.0, 1e6);
        assert_eq!(c.problems.len(), 2);
    }
}
