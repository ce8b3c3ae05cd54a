//! Points observed on the ground that are no road control: rail grade crossings (from the
//! crossings layer) and crash records (the optional `crashes` layer).
//!
//! Rail crossings. OpenStreetMap: a node tagged `railway=level_crossing` (a road crosses
//! the tracks) or `railway=crossing` (a foot path crosses them); its track count is the sum
//! of the `tracks` tags (default 1) of the rail ways (`railway=rail|light_rail|tram|
//! narrow_gauge|subway`) that share the node's position in the same file, else the node's
//! own `tracks`, else 1; `crossing:barrier` (other than `no`) or `crossing=barrier` reads
//! as gates, `crossing:light=yes` as flashing lights; `supervised` (other than `no`) as a crossing guard (OpenStreetMap
//! wiki, "Tag:railway=level_crossing", from memory). Plain names: a crossings-layer point
//! with `rail_tracks` (a whole number of tracks) is a rail crossing, never a road control;
//! `rail_warning` is `none`, `flashing_lights` or `gates`; `guard` (true/false).
//!
//! Crashes (plain names only, one Point each): `date` (YYYY-MM-DD), `time` (HH:MM, optional),
//! `severity` on the KABCO scale (K fatal, A suspected serious injury, B suspected minor
//! injury, C possible injury, O property damage only; the Model Minimum Uniform Crash
//! Criteria scale), `pedestrian` and `cyclist` (true/false), `age` (of the youngest person
//! involved, when known). Crash records are personal data: they stay on the machine, and
//! shared exports carry counts per hotspot, never the points.

use super::geojson_read::{for_each_feature, lonlat};
use super::model::LonLat;
use super::values::{parse_bool, parse_int};
use super::warnings::{Ctx, Warnings};
use crate::error::{LayerName, Result};
use geojson::GeometryValue;
use serde::{Deserialize, Serialize};
use std::collections::HashMap;

/// What warns of trains at a rail crossing.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum RailWarning {
    #[default]
    None,
    FlashingLights,
    /// Gates (which come with flashing lights).
    Gates,
}

/// A rail grade crossing that walkers use.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RailCrossing {
    pub feature: usize,
    pub id: String,
    pub at: LonLat,
    pub tracks: u32,
    pub warning: RailWarning,
    pub guard: bool,
}

/// KABCO injury severity (Model Minimum Uniform Crash Criteria).
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize, Deserialize)]
pub enum Kabco {
    K,
    A,
    B,
    C,
    O,
}

impl Kabco {
    /// Reads `K`, `A`, `B`, `C`, `O` (also `fatal`, `serious`, `minor`, `possible`, `pdo`).
    ///
    /// ```
    /// use catchwalk::input::observed::Kabco;
    /// assert_eq!(Kabco::parse("a"), Some(Kabco::A));
    /// assert_eq!(Kabco::parse("fatal"), Some(Kabco::K));
    /// assert_eq!(Kabco::parse("bad"), None);
    /// ```
    pub fn parse(t: &str) -> Option<Kabco> {
        Some(match t.trim().to_ascii_lowercase().as_str() {
            "k" | "fatal" => Kabco::K,
            "a" | "serious" => Kabco::A,
            "b" | "minor" => Kabco::B,
            "c" | "possible" => Kabco::C,
            "o" | "pdo" | "none" => Kabco::O,
            _ => return None,
        })
    }
    /// Killed or seriously injured (K or A).
    pub fn is_ksi(self) -> bool {
        matches!(self, Kabco::K | Kabco::A)
    }
}

/// One crash record.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Crash {
    pub feature: usize,
    pub id: String,
    pub at: LonLat,
    /// Days since 1970-01-01 (from `date`), if given.
    pub day: Option<i64>,
    /// `date` as given.
    pub date: Option<String>,
    /// Minutes after midnight, if given.
    pub minute: Option<u16>,
    pub severity: Option<Kabco>,
    pub pedestrian: bool,
    pub cyclist: bool,
    pub age: Option<u32>,
}

/// Days since 1970-01-01 of a `YYYY-MM-DD` date (proleptic Gregorian).
///
/// ```
/// use catchwalk::input::observed::day_number;
/// assert_eq!(day_number("1970-01-01"), Some(0));
/// assert_eq!(day_number("2000-03-01"), Some(11_017));
/// assert_eq!(day_number("2021-02-30"), None);
/// ```
pub fn day_number(t: &str) -> Option<i64> {
    let mut it = t.trim().get(..10)?.split('-');
    let y: i64 = it.next()?.parse().ok()?;
    let m: i64 = it.next()?.parse().ok()?;
    let d: i64 = it.next()?.parse().ok()?;
    let leap = (y % 4 == 0 && y % 100 != 0) || y % 400 == 0;
    let len = [
        31,
        if leap { 29 } else { 28 },
        31,
        30,
        31,
        30,
        31,
        31,
        30,
        31,
        30,
        31,
    ];
    if !(1..=12).contains(&m) || d < 1 || d > *len.get((m - 1) as usize)? {
        return None;
    }
    // Days from civil (Howard Hinnant's algorithm).
    let y = if m <= 2 { y - 1 } else { y };
    let era = y.div_euclid(400);
    let yoe = y - era * 400;
    let mp = (m + 9) % 12;
    let doy = (153 * mp + 2) / 5 + d - 1;
    let doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
    Some(era * 146_097 + doe - 719_468)
}

fn text(props: &super::geojson_read::Props, key: &str) -> Option<String> {
    match props.get(key)? {
        serde_json::Value::String(s) if !s.trim().is_empty() => Some(s.trim().to_string()),
        serde_json::Value::Number(n) => Some(n.to_string()),
        serde_json::Value::Bool(b) => Some(b.to_string()),
        _ => None,
    }
}

const RAIL_WAYS: [&str; 5] = ["rail", "light_rail", "tram", "narrow_gauge", "subway"];

fn key(p: LonLat) -> (i64, i64) {
    ((p[0] * 1e7).round() as i64, (p[1] * 1e7).round() as i64)
}

/// Reads the rail crossings of a crossings layer (`osm`: OpenStreetMap tags; else plain).
pub fn rail_crossings(text_in: &str, osm: bool, w: &mut Warnings) -> Result<Vec<RailCrossing>> {
    let layer = LayerName::Crossings;
    // Tracks of the rail ways through each vertex (OpenStreetMap files hold them).
    let mut tracks_at: HashMap<(i64, i64), u32> = HashMap::new();
    let mut points = Vec::new();
    for_each_feature(text_in, layer, |index, f| {
        let props = f.properties.clone().unwrap_or_default();
        match f.geometry.map(|g| g.value) {
            Some(GeometryValue::Point { coordinates }) => points.push((index, props, coordinates)),
            Some(GeometryValue::LineString { coordinates }) if osm => {
                let is_rail =
                    text(&props, "railway").is_some_and(|r| RAIL_WAYS.contains(&r.as_str()));
                if is_rail {
                    let n = text(&props, "tracks")
                        .and_then(|t| parse_int(&t))
                        .filter(|n| (1..=20).contains(n))
                        .unwrap_or(1) as u32;
                    for c in coordinates {
                        if let [x, y, ..] = c[..] {
                            *tracks_at.entry(key([x, y])).or_insert(0) += n;
                        }
                    }
                }
            }
            _ => {}
        }
        Ok(())
    })?;
    let mut out = Vec::new();
    for (index, props, coordinates) in points {
        let ctx = Ctx {
            layer,
            index,
            id: text(&props, "id").or_else(|| text(&props, "@id")),
        };
        let at = lonlat(&coordinates, &|| ctx.at())?;
        let id = ctx.id.clone().unwrap_or_else(|| index.to_string());
        if osm {
            let rail = text(&props, "railway");
            if !matches!(rail.as_deref(), Some("level_crossing" | "crossing")) {
                continue;
            }
            let own = text(&props, "tracks")
                .and_then(|t| parse_int(&t))
                .filter(|n| (1..=20).contains(n))
                .map(|n| n as u32);
            let tracks = tracks_at.get(&key(at)).copied().or(own).unwrap_or(1);
            let gates = text(&props, "crossing:barrier").is_some_and(|v| v != "no")
                || text(&props, "crossing").as_deref() == Some("barrier");
            let lights = text(&props, "crossing:light").as_deref() == Some("yes");
            let warning = if gates {
                RailWarning::Gates
            } else if lights {
                RailWarning::FlashingLights
            } else {
                RailWarning::None
            };
            let guard = text(&props, "supervised").is_some_and(|v| v != "no");
            out.push(RailCrossing {
                feature: index,
                id,
                at,
                tracks,
                warning,
                guard,
            });
        } else {
            let Some(t) = text(&props, "rail_tracks") else {
                continue;
            };
            let tracks = match parse_int(&t).filter(|n| (1..=20).contains(n)) {
                Some(n) => n as u32,
                None => {
                    w.push(
                        "rail_tracks",
                        ctx.at_prop("rail_tracks"),
                        format!("cannot read rail_tracks '{t}' (a whole number of tracks); used 1"),
                    );
                    1
                }
            };
            let warning = match text(&props, "rail_warning").as_deref() {
                None | Some("none") => RailWarning::None,
                Some("flashing_lights") => RailWarning::FlashingLights,
                Some("gates") => RailWarning::Gates,
                Some(v) => {
                    w.push(
                        "rail_warning",
                        ctx.at_prop("rail_warning"),
                        format!("unknown rail_warning '{v}'; allowed: none, flashing_lights, gates; used none"),
                    );
                    RailWarning::None
                }
            };
            let guard = text(&props, "guard")
                .and_then(|g| parse_bool(&g))
                .unwrap_or(false);
            out.push(RailCrossing {
                feature: index,
                id,
                at,
                tracks,
                warning,
                guard,
            });
        }
    }
    Ok(out)
}

/// Reads the crashes layer (Points with plain names; other geometries are skipped).
pub fn crashes(text_in: &str, w: &mut Warnings) -> Result<Vec<Crash>> {
    let layer = LayerName::Crashes;
    let mut out = Vec::new();
    for_each_feature(text_in, layer, |index, f| {
        let props = f.properties.unwrap_or_default();
        let Some(GeometryValue::Point { coordinates }) = f.geometry.map(|g| g.value) else {
            w.skip(layer, "crash records that are not Points");
            return Ok(());
        };
        let ctx = Ctx {
            layer,
            index,
            id: text(&props, "id"),
        };
        let at = lonlat(&coordinates, &|| ctx.at())?;
        let date = text(&props, "date");
        let day = date.as_deref().and_then(day_number);
        if date.is_some() && day.is_none() {
            w.push(
                "date",
                ctx.at_prop("date"),
                "cannot read date (YYYY-MM-DD); the crash counts in every period",
            );
        }
        let minute = text(&props, "time").and_then(|t| {
            let (h, m) = t.split_once(':')?;
            let (h, m): (u16, u16) = (h.trim().parse().ok()?, m.trim().get(..2)?.parse().ok()?);
            (h < 24 && m < 60).then_some(h * 60 + m)
        });
        let severity = text(&props, "severity").and_then(|s| {
            let k = Kabco::parse(&s);
            if k.is_none() {
                w.push(
                    "severity",
                    ctx.at_prop("severity"),
                    format!("unknown severity '{s}'; allowed: K, A, B, C, O; left unknown"),
                );
            }
            k
        });
        let flag = |k: &str| {
            text(&props, k)
                .and_then(|v| parse_bool(&v))
                .unwrap_or(false)
        };
        out.push(Crash {
            feature: index,
            id: ctx.id.clone().unwrap_or_else(|| index.to_string()),
            at,
            day,
            date,
            minute,
            severity,
            pedestrian: flag("pedestrian"),
            cyclist: flag("cyclist"),
            age: text(&props, "age")
                .and_then(|a| parse_int(&a))
                .filter(|a| (0..=120).contains(a))
                .map(|a| a as u32),
        });
        Ok(())
    })?;
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// OpenStreetMap: a level crossing node shared by two rail ways (`tracks=1` each) has two
    /// tracks; a node with `crossing:barrier=full` has gates.
    #[test]
    fn osm_level_crossing_counts_the_rail_ways_through_it() {
        let text = r#"{"type":"FeatureCollection","features":[
          {"type":"Feature","properties":{"railway":"level_crossing","crossing:barrier":"full"},"geometry":{"type":"Point","coordinates":[-35.0,42.0]}},
          {"type":"Feature","properties":{"railway":"rail"},"geometry":{"type":"LineString","coordinates":[[-35.001,42.0],[-35.0,42.0],[-34.999,42.0]]}},
          {"type":"Feature","properties":{"railway":"rail","tracks":"1"},"geometry":{"type":"LineString","coordinates":[[-35.001,42.00001],[-35.0,42.0]]}},
          {"type":"Feature","properties":{"highway":"crossing"},"geometry":{"type":"Point","coordinates":[-35.0,42.001]}}
        ]}"#;
        let mut w = Warnings::default();
        let r = rail_crossings(text, true, &mut w).unwrap();
        assert_eq!(r.len(), 1);
        assert_eq!((r[0].tracks, r[0].warning), (2, RailWarning::Gates));
    }

    #[test]
    fn plain_rail_points_and_crash_records() {
        let text = r#"{"type":"FeatureCollection","features":[
          {"type":"Feature","properties":{"id":"r1","rail_tracks":2},"geometry":{"type":"Point","coordinates":[-35.0,42.0]}},
          {"type":"Feature","properties":{"id":"c1","control":"signal"},"geometry":{"type":"Point","coordinates":[-35.0,42.001]}}
        ]}"#;
        let mut w = Warnings::default();
        let r = rail_crossings(text, false, &mut w).unwrap();
        assert_eq!(r.len(), 1);
        assert_eq!(
            (r[0].id.as_str(), r[0].tracks, r[0].warning),
            ("r1", 2, RailWarning::None)
        );
        let crashes_text = r#"{"type":"FeatureCollection","features":[
          {"type":"Feature","properties":{"date":"2024-10-03","time":"08:05","severity":"B","pedestrian":true,"age":9},"geometry":{"type":"Point","coordinates":[-35.0,42.0]}},
          {"type":"Feature","properties":{"severity":"Q"},"geometry":{"type":"Point","coordinates":[-35.0,42.0]}}
        ]}"#;
        let c = crashes(crashes_text, &mut w).unwrap();
        assert_eq!(c.len(), 2);
        assert_eq!(
            (c[0].minute, c[0].severity, c[0].pedestrian, c[0].age),
            (Some(485), Some(Kabco::B), true, Some(9))
        );
        assert_eq!(c[1].severity, None);
        assert_eq!(w.finish().len(), 1);
    }
}
