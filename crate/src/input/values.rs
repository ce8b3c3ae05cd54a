//! Property values of the plain preset (also the targets of a mapping file's `values`), and
//! the class defaults.

use super::model::{Control, ControlScope, Device, RoadClass, SideWalk, Students, TimeWindow};

pub const CLASS_VALUES: &str = "arterial, collector, local, service, path, steps";
pub const SIDEWALK_VALUES: &str = "both, left, right, none, unknown, separate";
pub const BOOL_VALUES: &str = "true, false, yes, no, 1, 0";
pub const STUDENTS_VALUES: &str = "elementary, secondary";
pub const CONTROL_VALUES: &str =
    "signal, all_way_stop, stop, yield, marked, guard, refuge, raised, beacon, none (join several with ';')";

/// Reads a road class name (case-insensitive).
pub fn parse_class(t: &str) -> Option<RoadClass> {
    Some(match t.trim().to_ascii_lowercase().as_str() {
        "arterial" => RoadClass::Arterial,
        "collector" => RoadClass::Collector,
        "local" => RoadClass::Local,
        "service" => RoadClass::Service,
        "path" => RoadClass::Path,
        "steps" => RoadClass::Steps,
        _ => return None,
    })
}

/// catchwalk's default speed per class when the layer gives none (our own choice, typical
/// urban limits; not a legal value anywhere).
pub fn default_speed_kmh(class: RoadClass) -> f64 {
    match class {
        RoadClass::Arterial => 60.0,
        RoadClass::Collector => 50.0,
        RoadClass::Local => 40.0,
        RoadClass::Service => 20.0,
        RoadClass::Path | RoadClass::Steps => 0.0,
    }
}

/// The most through lanes a street may have; more is refused as a lane count (and over
/// [`super::plausible::IMPLAUSIBLE_LANES`] is warned).
pub const MAX_LANES: u32 = 32;

/// catchwalk's default through lanes (both directions) per class when the layer gives none.
pub fn default_lanes(class: RoadClass) -> u32 {
    match class {
        RoadClass::Arterial => 4,
        RoadClass::Collector | RoadClass::Local => 2,
        RoadClass::Service => 1,
        RoadClass::Path | RoadClass::Steps => 0,
    }
}

/// Reads a plain `sidewalk` value as (left, right) of the digitised direction.
pub fn parse_sidewalk(t: &str) -> Option<(SideWalk, SideWalk)> {
    use SideWalk::*;
    Some(match t.trim().to_ascii_lowercase().as_str() {
        "both" => (Present, Present),
        "left" => (Present, Absent),
        "right" => (Absent, Present),
        "none" | "no" => (Absent, Absent),
        "unknown" => (Unknown, Unknown),
        "separate" => (Separate, Separate),
        _ => return None,
    })
}

/// Reads true/false/yes/no/1/0 (case-insensitive).
pub fn parse_bool(t: &str) -> Option<bool> {
    match t.trim().to_ascii_lowercase().as_str() {
        "true" | "yes" | "1" | "y" => Some(true),
        "false" | "no" | "0" | "n" => Some(false),
        _ => None,
    }
}

/// Reads `elementary`/`secondary` (also `primary`, `high`; `middle` is elementary: a middle
/// school usually teaches grade 6, an elementary grade under 67 Pa. Code § 447.2, and the
/// youngest pupils decide).
pub fn parse_students(t: &str) -> Option<Students> {
    match t.trim().to_ascii_lowercase().as_str() {
        "elementary" | "primary" | "middle" => Some(Students::Elementary),
        "secondary" | "high" => Some(Students::Secondary),
        _ => None,
    }
}

/// The kind of pupil a school's grades make it: 67 Pa. Code § 447.2 counts kindergarten to
/// grade six as elementary; the lowest grade taught decides, so a 6-8 middle school is
/// elementary and a 7-12 school secondary. Reads `K-5`, `PK-8`, `6-8`, `9;10;11;12`, `7`.
///
/// ```
/// use catchwalk::input::{values::students_of_grades, Students};
/// assert_eq!(students_of_grades("K-5"), Some(Students::Elementary));
/// assert_eq!(students_of_grades("6-8"), Some(Students::Elementary));
/// assert_eq!(students_of_grades("7-12"), Some(Students::Secondary));
/// assert_eq!(students_of_grades("none"), None);
/// ```
pub fn students_of_grades(t: &str) -> Option<Students> {
    let lowest = t
        .split(|c: char| c == '-' || c == ';' || c == ',' || c == '–' || c.is_whitespace())
        .filter_map(|g| {
            let g = g.trim().to_ascii_uppercase();
            match g.as_str() {
                "K" | "PK" | "TK" | "KG" | "P" => Some(0),
                _ => g.parse::<u32>().ok().filter(|n| *n <= 13),
            }
        })
        .min()?;
    Some(if lowest <= 6 {
        Students::Elementary
    } else {
        Students::Secondary
    })
}

/// Reads a whole number (also `2.0`); `None` for fractions, text or out-of-range values.
pub fn parse_int(t: &str) -> Option<i64> {
    let t = t.trim();
    if let Ok(i) = t.parse::<i64>() {
        return Some(i);
    }
    let f: f64 = t.parse().ok()?;
    (f.is_finite() && f.fract() == 0.0 && f.abs() < 1e15).then_some(f as i64)
}

/// Reads a finite, non-negative number.
pub fn parse_non_negative(t: &str) -> Option<f64> {
    let f: f64 = t.trim().parse().ok()?;
    (f.is_finite() && f >= 0.0).then_some(f)
}

/// The scope a device implies: signals and all-way stops control every leg of their node.
pub fn scope_of(device: Device) -> ControlScope {
    match device {
        Device::Signal | Device::AllWayStop => ControlScope::AllLegs,
        _ => ControlScope::NearestLeg,
    }
}

/// Reads a plain `control` value such as `marked;refuge` or `signal;guard`: the strongest
/// device wins, the rest combine. Returns the control and the tokens it did not know.
///
/// ```
/// use catchwalk::input::values::parse_control;
/// use catchwalk::input::Device;
/// let (c, unknown) = parse_control("marked;refuge;signal");
/// assert_eq!(c.device, Device::Signal);
/// assert!(c.refuge_island && unknown.is_empty());
/// ```
pub fn parse_control(t: &str) -> (Control, Vec<String>) {
    let mut c = Control::UNCONTROLLED;
    let mut unknown = Vec::new();
    for token in t.split(';').map(str::trim).filter(|s| !s.is_empty()) {
        let device = match token.to_ascii_lowercase().as_str() {
            "signal" => Device::Signal,
            "all_way_stop" => Device::AllWayStop,
            "stop" => Device::Stop,
            "yield" | "give_way" => Device::Yield,
            "marked" => Device::Marked,
            "beacon" => Device::Beacon,
            "none" => Device::None,
            "guard" => {
                c.guard.get_or_insert_with(Vec::new);
                continue;
            }
            "refuge" => {
                c.refuge_island = true;
                continue;
            }
            "raised" => {
                c.raised = true;
                continue;
            }
            _ => {
                unknown.push(token.to_string());
                continue;
            }
        };
        c.device = c.device.max(device);
    }
    (c, unknown)
}

/// Reads guard hours `07:30-08:45,14:45-15:30` (`,` or `;` between windows).
///
/// ```
/// use catchwalk::input::values::parse_guard_hours;
/// let w = parse_guard_hours("07:30-08:45, 14:45-15:30").unwrap();
/// assert_eq!((w[0].start_min, w[0].end_min, w[1].start_min), (450, 525, 885));
/// ```
pub fn parse_guard_hours(t: &str) -> Result<Vec<TimeWindow>, String> {
    t.split([',', ';'])
        .map(str::trim)
        .filter(|s| !s.is_empty())
        .map(|w| parse_window(w).ok_or_else(|| w.to_string()))
        .collect()
}

fn parse_window(w: &str) -> Option<TimeWindow> {
    let (a, b) = w.split_once('-')?;
    let (start_min, end_min) = (parse_clock(a)?, parse_clock(b)?);
    (start_min < end_min).then_some(TimeWindow { start_min, end_min })
}

fn parse_clock(t: &str) -> Option<u16> {
    let (h, m) = t.trim().split_once(':')?;
    let (h, m): (u16, u16) = (h.trim().parse().ok()?, m.trim().parse().ok()?);
    (m < 60 && (h < 24 || (h == 24 && m == 0))).then_some(h * 60 + m)
}

/// Every `HH:MM-HH:MM` window found anywhere in a text (e.g. an opening-hours value such as
/// `Mo-Fr 07:30-08:30,15:00-15:30`).
pub fn find_time_windows(t: &str) -> Vec<TimeWindow> {
    t.split(|c: char| c.is_whitespace() || c == ',' || c == ';')
        .filter_map(parse_window)
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_plain_control_token() {
        let cases = [
            (
                "signal",
                Device::Signal,
                false,
                false,
                false,
                ControlScope::AllLegs,
            ),
            (
                "all_way_stop",
                Device::AllWayStop,
                false,
                false,
                false,
                ControlScope::AllLegs,
            ),
            (
                "stop",
                Device::Stop,
                false,
                false,
                false,
                ControlScope::NearestLeg,
            ),
            (
                "marked",
                Device::Marked,
                false,
                false,
                false,
                ControlScope::NearestLeg,
            ),
            (
                "beacon",
                Device::Beacon,
                false,
                false,
                false,
                ControlScope::NearestLeg,
            ),
            (
                "none",
                Device::None,
                false,
                false,
                false,
                ControlScope::NearestLeg,
            ),
            (
                "guard",
                Device::None,
                false,
                false,
                true,
                ControlScope::NearestLeg,
            ),
            (
                "marked;refuge",
                Device::Marked,
                true,
                false,
                false,
                ControlScope::NearestLeg,
            ),
            (
                "RAISED; marked",
                Device::Marked,
                false,
                true,
                false,
                ControlScope::NearestLeg,
            ),
            (
                "signal;guard",
                Device::Signal,
                false,
                false,
                true,
                ControlScope::AllLegs,
            ),
            (
                "beacon;stop;marked",
                Device::Stop,
                false,
                false,
                false,
                ControlScope::NearestLeg,
            ),
        ];
        for (t, device, refuge, raised, guard, scope) in cases {
            let (c, unknown) = parse_control(t);
            assert!(unknown.is_empty(), "{t}");
            assert_eq!(c.device, device, "{t}");
            assert_eq!(c.refuge_island, refuge, "{t}");
            assert_eq!(c.raised, raised, "{t}");
            assert_eq!(c.guard.is_some(), guard, "{t}");
            assert_eq!(scope_of(c.device), scope, "{t}");
        }
        assert_eq!(parse_control("guard").0.guard, Some(vec![]));
        // A yield sign is its own device, weaker than a stop sign.
        assert_eq!(parse_control("yield").0.device, Device::Yield);
        assert_eq!(parse_control("yield;stop").0.device, Device::Stop);
        assert_eq!(parse_control("marked;zebra").1, vec!["zebra".to_string()]);
    }

    #[test]
    fn guard_hours_and_bad_windows() {
        assert_eq!(parse_guard_hours("7:30-8:00").map(|w| w.len()), Ok(1));
        assert_eq!(
            parse_guard_hours("08:45-07:30"),
            Err("08:45-07:30".to_string())
        );
        assert_eq!(
            parse_guard_hours("25:00-26:00"),
            Err("25:00-26:00".to_string())
        );
        assert_eq!(parse_guard_hours("mornings"), Err("mornings".to_string()));
        let w = find_time_windows("Mo-Fr 07:30-08:30,15:00-15:30");
        assert_eq!(
            w,
            vec![
                TimeWindow {
                    start_min: 450,
                    end_min: 510
                },
                TimeWindow {
                    start_min: 900,
                    end_min: 930
                }
            ]
        );
    }

    #[test]
    fn classes_sidewalks_bools_numbers() {
        assert_eq!(parse_class("Arterial"), Some(RoadClass::Arterial));
        assert_eq!(parse_class("highway"), None);
        assert_eq!(
            parse_sidewalk("left"),
            Some((SideWalk::Present, SideWalk::Absent))
        );
        assert_eq!(
            parse_sidewalk("right"),
            Some((SideWalk::Absent, SideWalk::Present))
        );
        assert_eq!(
            parse_sidewalk("separate"),
            Some((SideWalk::Separate, SideWalk::Separate))
        );
        assert_eq!(parse_sidewalk("sometimes"), None);
        assert_eq!(parse_bool("YES"), Some(true));
        assert_eq!(parse_bool("maybe"), None);
        assert_eq!(parse_int("2.0"), Some(2));
        assert_eq!(parse_int("2.5"), None);
        assert_eq!(parse_non_negative("-1"), None);
        assert_eq!(default_speed_kmh(RoadClass::Service), 20.0);
        assert_eq!(default_lanes(RoadClass::Arterial), 4);
    }
}
