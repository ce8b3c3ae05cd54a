//! Speed and length values with units, as OpenStreetMap's `maxspeed` and `width` tags and
//! municipal layers write them.

/// Kilometres per statute mile (exact by definition).
pub const KM_PER_MILE: f64 = 1.609_344;
/// Kilometres per nautical mile (exact by definition).
pub const KM_PER_NAUTICAL_MILE: f64 = 1.852;
/// Metres per international foot (exact by definition).
pub const M_PER_FOOT: f64 = 0.3048;
/// `maxspeed=walk`: walking pace, taken as 7 km/h (common practice for "walking speed"
/// zones; the legal meaning varies by country).
pub const WALK_KMH: f64 = 7.0;

/// The unit a bare number is read in.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Deserialize)]
pub enum SpeedUnit {
    #[default]
    #[serde(rename = "km/h", alias = "kmh", alias = "kph")]
    Kmh,
    #[serde(rename = "mph")]
    Mph,
}

/// Parses a speed limit to km/h: `50`, `50 km/h`, `30 mph`, `20 knots`, `walk`, and zone codes
/// that carry a number (`DE:zone30`, `DE:zone:30`, `zone:maxspeed` style). Several values
/// (`50;30`) give the highest, the conservative choice for risk. `None` when no speed can be
/// read (`none`, `signals`, `DE:urban`, `variable`): the caller uses the class default.
///
/// ```
/// use catchwalk::input::speed::{parse_speed_kmh, SpeedUnit};
/// let mph = parse_speed_kmh("30 mph", SpeedUnit::Kmh).unwrap();
/// assert!((mph - 48.28).abs() < 0.01);
/// assert_eq!(parse_speed_kmh("DE:zone30", SpeedUnit::Kmh), Some(30.0));
/// assert_eq!(parse_speed_kmh("signals", SpeedUnit::Kmh), None);
/// ```
pub fn parse_speed_kmh(text: &str, unit: SpeedUnit) -> Option<f64> {
    text.split(';')
        .filter_map(|t| one_speed_kmh(t, unit))
        .fold(None, |best: Option<f64>, v| {
            Some(best.map_or(v, |b| b.max(v)))
        })
}

fn one_speed_kmh(text: &str, unit: SpeedUnit) -> Option<f64> {
    let t = text.trim().to_ascii_lowercase();
    if t == "walk" {
        return Some(WALK_KMH);
    }
    // Zone codes: keep what follows the last ':' and a leading "zone".
    let t = t.rsplit(':').next().unwrap_or("");
    let t = t.strip_prefix("zone").unwrap_or(t).trim();
    let (number, rest) = split_number(t)?;
    let factor = match rest.trim() {
        "" => match unit {
            SpeedUnit::Kmh => 1.0,
            SpeedUnit::Mph => KM_PER_MILE,
        },
        "km/h" | "kmh" | "kph" | "km" => 1.0,
        "mph" => KM_PER_MILE,
        "knots" | "kn" | "kt" => KM_PER_NAUTICAL_MILE,
        _ => return None,
    };
    (number >= 0.0).then_some(number * factor)
}

/// The length unit a bare number is read in.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Deserialize)]
pub enum LengthUnit {
    #[default]
    #[serde(rename = "m")]
    M,
    #[serde(rename = "ft")]
    Ft,
}

/// Parses a length to metres: `7`, `7.5 m`, `24 ft`, `24'`. `None` if unreadable or negative.
///
/// ```
/// use catchwalk::input::speed::{parse_length_m, LengthUnit};
/// assert_eq!(parse_length_m("7.5 m", LengthUnit::M), Some(7.5));
/// assert!((parse_length_m("10 ft", LengthUnit::M).unwrap() - 3.048).abs() < 1e-9);
/// ```
pub fn parse_length_m(text: &str, unit: LengthUnit) -> Option<f64> {
    let t = text.trim().to_ascii_lowercase();
    let (number, rest) = split_number(&t)?;
    let factor = match rest.trim() {
        "" => match unit {
            LengthUnit::M => 1.0,
            LengthUnit::Ft => M_PER_FOOT,
        },
        "m" | "metres" | "meters" => 1.0,
        "ft" | "'" | "feet" => M_PER_FOOT,
        _ => return None,
    };
    (number >= 0.0).then_some(number * factor)
}

/// Splits a leading decimal number from the rest of the text.
fn split_number(t: &str) -> Option<(f64, &str)> {
    let end = t
        .char_indices()
        .find(|(i, c)| !(c.is_ascii_digit() || *c == '.' || (*i == 0 && *c == '-')))
        .map_or(t.len(), |(i, _)| i);
    let number: f64 = t.get(..end)?.parse().ok()?;
    number
        .is_finite()
        .then_some((number, t.get(end..).unwrap_or("")))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn speed_units_and_codes() {
        let k = SpeedUnit::Kmh;
        assert_eq!(parse_speed_kmh("50", k), Some(50.0));
        assert_eq!(parse_speed_kmh(" 50 km/h", k), Some(50.0));
        // 30 mph = 30 x 1.609344 = 48.28032 km/h (mile defined as 1609.344 m).
        let mph = parse_speed_kmh("30 mph", k).unwrap_or(0.0);
        assert!((mph - 48.280_32).abs() < 1e-9);
        assert!((parse_speed_kmh("20 knots", k).unwrap_or(0.0) - 37.04).abs() < 1e-9);
        assert_eq!(parse_speed_kmh("walk", k), Some(WALK_KMH));
        assert_eq!(parse_speed_kmh("DE:zone30", k), Some(30.0));
        assert_eq!(parse_speed_kmh("DE:zone:30", k), Some(30.0));
        assert_eq!(parse_speed_kmh("50;30", k), Some(50.0));
        assert!((parse_speed_kmh("25", SpeedUnit::Mph).unwrap_or(0.0) - 40.2336).abs() < 1e-9);
        for none in [
            "none", "signals", "DE:urban", "FR:rural", "variable", "", "-5", "fast",
        ] {
            assert_eq!(parse_speed_kmh(none, k), None, "{none}");
        }
    }

    #[test]
    fn lengths() {
        assert_eq!(parse_length_m("7", LengthUnit::M), Some(7.0));
        assert!((parse_length_m("24'", LengthUnit::M).unwrap_or(0.0) - 7.3152).abs() < 1e-9);
        assert!((parse_length_m("24", LengthUnit::Ft).unwrap_or(0.0) - 7.3152).abs() < 1e-9);
        assert_eq!(parse_length_m("wide", LengthUnit::M), None);
        assert_eq!(parse_length_m("-3", LengthUnit::M), None);
    }
}
