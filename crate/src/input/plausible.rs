//! Plausibility checks once the layers are read: values that parse but are unlikely to be
//! meant (speed 0 written for "unknown", 300 km/h, 20 lanes, 10 000 children in one home),
//! catchment polygons that overlap or are empty, and streets drawn twice or doubling back.
//! Each is a warning naming the feature; speed 0 is also mended (read as unknown).

use super::model::{Layers, SpeedSource};
use super::values::default_speed_kmh;
use super::warnings::Warnings;
use crate::error::{LayerName, Location};
use geo::{Area, BoundingRect, Intersects, Relate};
use std::collections::HashMap;

/// Above this a posted speed is implausible for a street children walk beside (km/h; the
/// highest urban limits are well below it: common practice).
pub const IMPLAUSIBLE_SPEED_KMH: f64 = 130.0;
/// More through lanes than this (both directions) is implausible for a street children cross.
pub const IMPLAUSIBLE_LANES: u32 = 10;
/// More children than this in one home is implausible (a count column mixed up with an id?).
pub const IMPLAUSIBLE_CHILDREN: u32 = 50;

/// Runs every plausibility check, mending speed 0 in place.
pub fn check(layers: &mut Layers, w: &mut Warnings) {
    speeds_and_lanes(layers, w);
    children(layers, w);
    catchments(layers, w);
    drawn_twice(layers, w);
}

fn street_at(s: &super::model::Street) -> Location {
    Location::feature(LayerName::Streets, s.feature, Some(s.id.clone()))
}

fn speeds_and_lanes(layers: &mut Layers, w: &mut Warnings) {
    for s in &mut layers.streets {
        if s.class.is_foot_only() {
            continue;
        }
        if s.speed_source == SpeedSource::Posted && s.speed_kmh == 0.0 {
            let d = default_speed_kmh(s.class);
            w.push(
                "speed_zero",
                street_at(s).with_property("speed_kmh"),
                format!(
                    "speed 0 read as unknown (many layers write 0 for unknown); used the {} default {d} km/h. Give the posted speed if you know it",
                    s.class.as_str()
                ),
            );
            s.speed_kmh = d;
            s.speed_source = SpeedSource::ClassDefault;
        } else if s.speed_kmh > IMPLAUSIBLE_SPEED_KMH {
            w.push(
                "speed_implausible",
                street_at(s).with_property("speed_kmh"),
                format!(
                    "speed {} km/h is implausible for a street children walk beside (over {IMPLAUSIBLE_SPEED_KMH} km/h); used as given. Check the value and its unit",
                    s.speed_kmh
                ),
            );
        }
        if s.lanes > IMPLAUSIBLE_LANES {
            w.push(
                "lanes_implausible",
                street_at(s).with_property("lanes"),
                format!(
                    "{} lanes is implausible (over {IMPLAUSIBLE_LANES} through lanes, both directions); used as given. Check the value",
                    s.lanes
                ),
            );
        }
    }
}

fn children(layers: &Layers, w: &mut Warnings) {
    for h in &layers.homes {
        if h.children > IMPLAUSIBLE_CHILDREN {
            w.push(
                "children_implausible",
                Location::feature(LayerName::Homes, h.feature, Some(h.id.clone()))
                    .with_property("children"),
                format!(
                    "{} children in one home is implausible (over {IMPLAUSIBLE_CHILDREN}); counted as given. Check the column is a count, not an id",
                    h.children
                ),
            );
        }
    }
}

fn catchment_at(c: &super::model::Catchment) -> Location {
    Location::feature(LayerName::Catchments, c.feature, None).with_property("school")
}

/// Empty or zero-area polygons, and pairs whose interiors overlap (a home in the overlap
/// goes to the first of them).
fn catchments(layers: &Layers, w: &mut Warnings) {
    let cs = &layers.catchments;
    for c in cs {
        if c.area.0.is_empty() || c.area.unsigned_area() == 0.0 {
            w.push(
                "catchment_empty",
                catchment_at(c),
                format!(
                    "the catchment of school '{}' is empty or has no area; no home falls in it, so its homes go to another catchment or the nearest school. Redraw the polygon",
                    c.school_id
                ),
            );
        }
    }
    // Catchments naming an unknown school are ignored (validate.rs warns them): skip them.
    let known: std::collections::HashSet<&str> =
        layers.schools.iter().map(|s| s.id.as_str()).collect();
    let rects: Vec<_> = cs
        .iter()
        .map(|c| {
            c.area
                .bounding_rect()
                .filter(|_| known.contains(c.school_id.as_str()))
        })
        .collect();
    for i in 0..cs.len() {
        for j in i + 1..cs.len() {
            let (Some(a), Some(b), Some(ra), Some(rb)) = (cs.get(i), cs.get(j), rects[i], rects[j])
            else {
                continue;
            };
            if !ra.intersects(&rb) || a.area.unsigned_area() == 0.0 || b.area.unsigned_area() == 0.0
            {
                continue;
            }
            let m = a.area.relate(&b.area);
            if m.is_intersects() && !m.is_touches() {
                w.push(
                    "catchment_overlap",
                    catchment_at(b),
                    format!(
                        "the catchment of school '{}' overlaps the catchment of school '{}' (catchments feature {}); a home in the overlap goes to '{}'. Redraw the boundary",
                        b.school_id, a.school_id, a.feature, a.school_id
                    ),
                );
            }
        }
    }
}

/// A segment's key: its two end keys in order, and its vertical layer.
type SegmentKey = ((i64, i64), (i64, i64), i32);

/// A point key at about a centimetre (1e-7 degree).
fn key(p: [f64; 2]) -> (i64, i64) {
    ((p[0] * 1e7).round() as i64, (p[1] * 1e7).round() as i64)
}

/// A segment drawn twice (in two features, or twice in one) and a line doubling back on
/// itself (A-B-A) add length the network does not have: network QA.
fn drawn_twice(layers: &Layers, w: &mut Warnings) {
    let mut seen: HashMap<SegmentKey, usize> = HashMap::new();
    for (si, s) in layers.streets.iter().enumerate() {
        for (k, win) in s.line.windows(3).enumerate() {
            if let [a, _, c] = win {
                if key(*a) == key(*c) {
                    w.push(
                        "doubles_back",
                        street_at(s),
                        format!("the line doubles back on itself at vertex {} (goes there and back the same way); its length would count twice. Delete the doubled part", k + 1),
                    );
                }
            }
        }
        for win in s.line.windows(2) {
            let [a, b] = win else { continue };
            let (ka, kb) = (key(*a), key(*b));
            let seg = if ka <= kb {
                (ka, kb, s.layer)
            } else {
                (kb, ka, s.layer)
            };
            match seen.get(&seg) {
                Some(&other) if other != si => {
                    let o = &layers.streets[other];
                    w.push(
                        "drawn_twice",
                        street_at(s),
                        format!(
                            "a segment is drawn twice: streets feature {} (id {}) has the same one; the network counts both. Delete one of them",
                            o.feature, o.id
                        ),
                    );
                }
                Some(_) => {}
                None => {
                    seen.insert(seg, si);
                }
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use crate::input::{read_layers, RawLayers};

    fn layers(streets: &str, homes: &str, catchments: Option<&str>) -> Vec<crate::error::Warning> {
        let raw = RawLayers {
            streets: streets.into(),
            schools: r#"{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"id":"s1"},"geometry":{"type":"Point","coordinates":[-35.0,42.0]}},{"type":"Feature","properties":{"id":"s2"},"geometry":{"type":"Point","coordinates":[-35.0,42.001]}}]}"#.into(),
            homes: homes.into(),
            catchments: catchments.map(String::from),
            ..RawLayers::default()
        };
        match read_layers(&raw) {
            Ok((_, w)) => w,
            Err(e) => panic!("{e}"),
        }
    }

    const HOME: &str = r#"{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"id":"h1"},"geometry":{"type":"Point","coordinates":[-35.0,42.0]}}]}"#;

    fn street(props: &str, coords: &str) -> String {
        format!(
            r#"{{"type":"Feature","properties":{{{props}}},"geometry":{{"type":"LineString","coordinates":{coords}}}}}"#
        )
    }

    fn fc(f: &[String]) -> String {
        format!(
            r#"{{"type":"FeatureCollection","features":[{}]}}"#,
            f.join(",")
        )
    }

    #[test]
    fn speed_zero_is_unknown_and_high_values_are_warned() {
        let s = fc(&[
            street(
                r#""id":"a","class":"arterial","speed_kmh":0"#,
                "[[-35,42],[-35.001,42]]",
            ),
            street(
                r#""id":"b","class":"local","speed_kmh":300,"lanes":14"#,
                "[[-35.001,42],[-35.002,42]]",
            ),
        ]);
        let w = layers(&s, HOME, None);
        let text: Vec<String> = w.iter().map(|w| w.to_string()).collect();
        assert!(
            text.iter().any(|t| t
                .contains("feature 0 (id a), property 'speed_kmh': speed 0 read as unknown")
                && t.contains("arterial default 60 km/h")),
            "{text:?}"
        );
        assert!(
            text.iter()
                .any(|t| t.contains("speed 300 km/h is implausible")),
            "{text:?}"
        );
        assert!(
            text.iter().any(|t| t.contains("14 lanes is implausible")),
            "{text:?}"
        );
    }

    #[test]
    fn drawn_twice_and_doubling_back_are_named() {
        let s = fc(&[
            street(r#""id":"a","class":"local""#, "[[-35,42],[-35.001,42]]"),
            street(r#""id":"b","class":"local""#, "[[-35.001,42],[-35,42]]"),
            street(
                r#""id":"c","class":"local""#,
                "[[-35.001,42],[-35.001,42.001],[-35.001,42]]",
            ),
        ]);
        let w = layers(&s, HOME, None);
        let text: Vec<String> = w.iter().map(|w| w.to_string()).collect();
        assert!(
            text.iter().any(|t| t.contains("feature 1 (id b)")
                && t.contains("drawn twice: streets feature 0 (id a)")),
            "{text:?}"
        );
        assert!(
            text.iter()
                .any(|t| t.contains("feature 2 (id c)") && t.contains("doubles back")),
            "{text:?}"
        );
    }

    #[test]
    fn overlapping_and_degenerate_catchments_are_named() {
        let poly = |school: &str, ring: &str| {
            format!(
                r#"{{"type":"Feature","properties":{{"school":"{school}"}},"geometry":{{"type":"Polygon","coordinates":[{ring}]}}}}"#
            )
        };
        let c = fc(&[
            poly(
                "s1",
                "[[-35.01,41.99],[-34.99,41.99],[-34.99,42.01],[-35.01,42.01],[-35.01,41.99]]",
            ),
            poly(
                "s2",
                "[[-35.0,41.99],[-34.98,41.99],[-34.98,42.01],[-35.0,42.01],[-35.0,41.99]]",
            ),
            poly(
                "s2",
                "[[-35.1,41.9],[-35.1,41.9],[-35.1,41.9],[-35.1,41.9]]",
            ),
        ]);
        let s = fc(&[street(
            r#""id":"a","class":"local""#,
            "[[-35,42],[-35.001,42]]",
        )]);
        let w = layers(&s, HOME, Some(&c));
        let text: Vec<String> = w.iter().map(|w| w.to_string()).collect();
        assert!(
            text.iter().any(|t| t.contains("catchments feature 1")
                && t.contains("overlaps the catchment of school 's1'")),
            "{text:?}"
        );
        assert!(
            text.iter()
                .any(|t| t.contains("catchments feature 2") && t.contains("empty or has no area")),
            "{text:?}"
        );
        // Catchments that only share a border do not overlap.
        let touching = fc(&[
            poly(
                "s1",
                "[[-35.01,41.99],[-35.0,41.99],[-35.0,42.01],[-35.01,42.01],[-35.01,41.99]]",
            ),
            poly(
                "s2",
                "[[-35.0,41.99],[-34.99,41.99],[-34.99,42.01],[-35.0,42.01],[-35.0,41.99]]",
            ),
        ]);
        let w = layers(&s, HOME, Some(&touching));
        assert!(!w.iter().any(|w| w.message.contains("overlaps")), "{w:?}");
    }
}
