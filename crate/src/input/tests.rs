//! Whole-layer tests of [`super::read_layers`]: geometry rules, errors, warnings, mapping file.

use super::*;
use crate::error::{Error, LayerName};

fn fc(features: &[&str]) -> String {
    format!(
        r#"{{"type":"FeatureCollection","features":[{}]}}"#,
        features.join(",")
    )
}
fn feat(geometry: &str, props: &str) -> String {
    format!(r#"{{"type":"Feature","geometry":{geometry},"properties":{props}}}"#)
}
fn line(coords: &str) -> String {
    format!(r#"{{"type":"LineString","coordinates":{coords}}}"#)
}
fn point(x: f64, y: f64) -> String {
    format!(r#"{{"type":"Point","coordinates":[{x},{y}]}}"#)
}

fn base() -> RawLayers {
    RawLayers {
        streets: fc(&[&feat(
            &line("[[0,0],[0.001,0]]"),
            r#"{"id":"s1","class":"local"}"#,
        )]),
        schools: fc(&[&feat(
            &point(0.0005, 0.0001),
            r#"{"id":"A","name":"Alder School"}"#,
        )]),
        homes: fc(&[&feat(
            &point(0.0002, -0.0001),
            r#"{"id":"h1","children":2,"school":"A"}"#,
        )]),
        ..RawLayers::default()
    }
}

#[test]
fn reads_a_small_town() {
    let (layers, warnings) = read_layers(&base()).unwrap_or_default();
    assert!(warnings.is_empty(), "{warnings:?}");
    assert_eq!(layers.streets.len(), 1);
    assert_eq!(layers.streets[0].line, vec![[0.0, 0.0], [0.001, 0.0]]);
    assert_eq!(layers.schools[0].entrances, vec![[0.0005, 0.0001]]);
    assert_eq!(
        (layers.homes[0].children, layers.homes[0].school.as_deref()),
        (2, Some("A"))
    );
}

#[test]
fn multilinestring_parts_become_streets_and_degenerate_parts_warn() {
    let mut raw = base();
    let multi = r#"{"type":"MultiLineString","coordinates":[[[0,0],[0,0],[0.001,0]],[[1,1],[1,1]],[[0.001,0],[0.001,0.001]]]}"#;
    raw.streets = fc(&[
        &feat(&line("[[0,0],[0,0]]"), r#"{"class":"local"}"#),
        &feat(multi, r#"{"id":"m","class":"collector"}"#),
    ]);
    let (layers, warnings) = read_layers(&raw).unwrap_or_default();
    assert_eq!(layers.streets.len(), 2);
    assert!(layers
        .streets
        .iter()
        .all(|s| s.feature == 1 && s.id == "m" && s.class == RoadClass::Collector));
    assert_eq!(layers.streets[0].line, vec![[0.0, 0.0], [0.001, 0.0]]);
    assert_eq!(warnings.len(), 2, "{warnings:?}");
    assert_eq!(
        (warnings[0].at.feature, warnings[1].at.feature),
        (Some(0), Some(1))
    );
    assert!(warnings[1].message.contains("part 1"));
}

#[test]
fn projected_coordinates_name_the_feature() {
    let mut raw = base();
    raw.streets = fc(&[
        &feat(&line("[[0,0],[0.001,0]]"), r#"{"id":"ok","class":"local"}"#),
        &feat(
            &line("[[532100.5,181200.0],[532180.0,181210.0]]"),
            r#"{"id":"bad","class":"local"}"#,
        ),
    ]);
    match read_layers(&raw) {
        Err(e @ Error::Projected { .. }) => {
            let Error::Projected { at, x, .. } = &e else {
                return;
            };
            assert_eq!(
                (at.layer, at.feature, at.id.as_deref(), *x),
                (LayerName::Streets, Some(1), Some("bad"), 532100.5)
            );
            let text = e.to_string();
            assert!(
                text.contains("streets feature 1 (id bad)") && text.contains("reproject"),
                "{text}"
            );
        }
        other => panic!("{other:?}"),
    }
}

#[test]
fn wrong_geometry_is_an_error_in_plain_and_skipped_in_osm() {
    let mut raw = base();
    raw.streets = fc(&[
        &feat(
            &line("[[0,0],[0.001,0]]"),
            r#"{"highway":"residential","class":"local"}"#,
        ),
        &feat(
            &point(0.0, 0.0),
            r#"{"highway":"bus_stop","class":"local"}"#,
        ),
    ]);
    match read_layers(&raw) {
        Err(Error::Input { at, message }) => {
            assert_eq!((at.layer, at.feature), (LayerName::Streets, Some(1)));
            assert!(
                message.contains("Point") && message.contains("LineString"),
                "{message}"
            );
        }
        other => panic!("{other:?}"),
    }
    raw.preset = Preset::Osm;
    raw.schools = fc(&[
        &feat(
            &point(0.0005, 0.0001),
            r#"{"@id":"n5","amenity":"school","name":"Alder School"}"#,
        ),
        &feat(
            &point(0.0005, 0.0001),
            r#"{"@id":"n6","amenity":"library"}"#,
        ),
    ]);
    let (layers, warnings) = read_layers(&raw).unwrap_or_default();
    assert_eq!(layers.streets.len(), 1);
    assert_eq!(layers.schools[0].id, "n5");
    // The home's school "A" is unknown now: one warning, plus two skip summaries.
    assert_eq!(warnings.len(), 3, "{warnings:?}");
    assert!(warnings.iter().any(|w| w
        .message
        .starts_with("skipped 1 feature(s): features not tagged amenity=school")));
    assert!(warnings
        .iter()
        .any(|w| w.message.starts_with("skipped 1 feature(s): not lines")));
    assert_eq!(layers.homes[0].school, None);
    raw.homes = fc(&[&feat(&line("[[0,0],[1,1]]"), "{}")]);
    assert!(
        matches!(read_layers(&raw), Err(Error::Input { at, .. }) if at.layer == LayerName::Homes)
    );
}

#[test]
fn school_errors_and_polygon_centroid() {
    let mut raw = base();
    raw.schools = fc(&[&feat(&point(0.0, 0.0), r#"{"name":"No Id School"}"#)]);
    assert!(matches!(read_layers(&raw),
        Err(Error::Input { at, .. }) if at.layer == LayerName::Schools && at.feature == Some(0) && at.property.as_deref() == Some("id")));
    let p = r#"{"type":"Feature","geometry":{"type":"Point","coordinates":[0,0]},"properties":{"id":"A"}}"#;
    raw.schools = fc(&[p, p]);
    assert!(
        matches!(read_layers(&raw), Err(Error::Input { at, message }) if at.feature == Some(1) && message.contains("twice"))
    );
    let square =
        r#"{"type":"Polygon","coordinates":[[[0,0],[0.002,0],[0.002,0.001],[0,0.001],[0,0]]]}"#;
    raw.schools = fc(&[
        &feat(square, r#"{"id":"A"}"#),
        &feat(
            square,
            r#"{"id":"B","entrances":[[0.001,0],[0.002,0.0005]]}"#,
        ),
    ]);
    let (layers, _) = read_layers(&raw).unwrap_or_default();
    assert_eq!(layers.schools.len(), 2);
    let c = layers.schools[0]
        .entrances
        .first()
        .copied()
        .unwrap_or([9.0, 9.0]);
    assert!(
        (c[0] - 0.001).abs() < 1e-12 && (c[1] - 0.0005).abs() < 1e-12,
        "{c:?}"
    );
    assert_eq!(layers.schools[0].name, "A");
    assert_eq!(
        layers.schools[1].entrances,
        vec![[0.001, 0.0], [0.002, 0.0005]]
    );
}

#[test]
fn catchments_need_a_school_id() {
    let mut raw = base();
    let square =
        r#"{"type":"Polygon","coordinates":[[[0,0],[0.002,0],[0.002,0.001],[0,0.001],[0,0]]]}"#;
    raw.catchments = Some(fc(&[
        &feat(square, r#"{"school_id":"A"}"#),
        &feat(square, r#"{"school":"Z"}"#),
    ]));
    let (layers, warnings) = read_layers(&raw).unwrap_or_default();
    assert_eq!(layers.catchments.len(), 2);
    assert_eq!(layers.catchments[0].school_id, "A");
    assert_eq!(warnings.len(), 1);
    assert_eq!(warnings[0].at.layer, LayerName::Catchments);
    raw.catchments = Some(fc(&[&feat(square, r#"{"name":"North"}"#)]));
    assert!(
        matches!(read_layers(&raw), Err(Error::Input { at, .. }) if at.layer == LayerName::Catchments)
    );
}

#[test]
fn empty_and_malformed_layers_are_errors() {
    let mut raw = base();
    raw.homes = fc(&[]);
    assert!(
        matches!(read_layers(&raw), Err(Error::Input { at, .. }) if at.layer == LayerName::Homes)
    );
    let mut raw = base();
    raw.streets = fc(&[&feat(&line("[[0,0],[0,0]]"), r#"{"class":"local"}"#)]);
    assert!(
        matches!(read_layers(&raw), Err(Error::Input { at, .. }) if at.layer == LayerName::Streets)
    );
    let mut raw = base();
    raw.schools = "{\"type\":\"Feature\"}".into();
    assert!(matches!(
        read_layers(&raw),
        Err(Error::Parse {
            layer: LayerName::Schools,
            ..
        })
    ));
    let mut raw = base();
    raw.crossings = Some("not json".into());
    assert!(matches!(
        read_layers(&raw),
        Err(Error::Parse {
            layer: LayerName::Crossings,
            ..
        })
    ));
}

#[test]
fn duplicate_ids_and_unknown_schools_warn() {
    let mut raw = base();
    raw.homes = fc(&[
        &feat(&point(0.0, 0.0), r#"{"id":"h","school":"A"}"#),
        &feat(
            &point(0.0, 0.0),
            r#"{"id":"h","school":"Q","children":"0"}"#,
        ),
    ]);
    let (layers, warnings) = read_layers(&raw).unwrap_or_default();
    let kinds: Vec<_> = warnings
        .iter()
        .map(|w| (w.at.feature, w.at.property.clone()))
        .collect();
    assert_eq!(
        kinds,
        vec![
            (Some(1), Some("children".into())),
            (Some(1), Some("id".into())),
            (Some(1), Some("school".into())),
        ]
    );
    assert_eq!(
        (layers.homes[1].school.clone(), layers.homes[1].children),
        (None, 1)
    );
}

#[test]
fn csv_homes() {
    let mut raw = base();
    raw.homes_format = HomesFormat::Csv;
    raw.homes =
        "id,children,school,Longitude,Latitude\nh1,3,A,0.0002,-0.0001\nh2,,,0.0003,0.0001\n".into();
    let (layers, warnings) = read_layers(&raw).unwrap_or_default();
    assert!(warnings.is_empty(), "{warnings:?}");
    let got: Vec<_> = layers
        .homes
        .iter()
        .map(|h| (h.id.as_str(), h.at, h.children, h.school.as_deref()))
        .collect();
    assert_eq!(
        got,
        vec![
            ("h1", [0.0002, -0.0001], 3, Some("A")),
            ("h2", [0.0003, 0.0001], 1, None)
        ]
    );
}

#[test]
fn a_municipal_layer_through_the_example_mapping() {
    let street = |id: u32, code: &str, coords: &str, extra: &str| {
        feat(
            &line(coords),
            &format!(
                r#"{{"SEG_ID":{id},"ST_NAME":"Birch Ave","ROADTYPE":"{code}","SPEED":25,"NUMLANES":2,"SW_CODE":"L","ONE_WAY":"FT","Z_LEVEL":0,"ADT":5400,"PAVE_WIDTH":36{extra}}}"#
            ),
        )
    };
    let raw = RawLayers {
        streets: fc(&[
            &street(101, "MAJ", "[[0,0],[0.001,0]]", ""),
            &street(102, "XYZ", "[[0.001,0],[0.002,0]]", ""),
            &feat(&line("[[0,0],[0,0.001]]"), r#"{"SEG_ID":103,"LANES":1}"#),
        ]),
        crossings: Some(fc(&[
            &feat(&point(0.001, 0.0), r#"{"XING_ID":"X1","CTRL":"XWALK_ISL"}"#),
            &feat(
                &point(0.0, 0.0),
                r#"{"XING_ID":"X2","CTRL":"GUARD","GUARD_TIME":"08:00-08:40"}"#,
            ),
        ])),
        schools: fc(&[&feat(
            &point(0.0005, 0.0001),
            r#"{"SCHOOL_CODE":"E-12","SCHOOL_NAME":"Juniper Elementary","GRADES":"6-8"}"#,
        )]),
        homes: fc(&[&feat(
            &point(0.0, 0.0001),
            r#"{"REC":"r1","STUDENT_COUNT":2,"ASSIGNED":"E-12"}"#,
        )]),
        catchments: Some(fc(&[&feat(
            r#"{"type":"Polygon","coordinates":[[[0,0],[1,0],[1,1],[0,0]]]}"#,
            r#"{"SCHOOL_CODE":"E-12"}"#,
        )])),
        mapping: Some(include_str!("../../../sample-maps/mapping-example.json").into()),
        ..RawLayers::default()
    };
    let (layers, warnings) = read_layers(&raw).unwrap_or_default();
    let s = &layers.streets;
    assert_eq!(s.len(), 3);
    assert_eq!(
        (s[0].id.as_str(), s[0].name.as_deref(), s[0].class),
        ("101", Some("Birch Ave"), RoadClass::Arterial)
    );
    assert!((s[0].speed_kmh - 40.2336).abs() < 1e-9, "25 mph");
    assert_eq!(
        (s[0].lanes, s[0].left, s[0].right, s[0].oneway),
        (2, SideWalk::Present, SideWalk::Absent, true)
    );
    assert_eq!(s[0].aadt, Some(5400.0));
    assert!(
        (s[0].width_m.unwrap_or(0.0) - 10.9728).abs() < 1e-9,
        "36 ft"
    );
    // Unmapped code: warning, local. Absent ROADTYPE: the mapping's default, no warning.
    assert_eq!(
        (s[1].class, s[2].class, s[2].lanes),
        (RoadClass::Local, RoadClass::Local, 1)
    );
    assert_eq!(warnings.len(), 1, "{warnings:?}");
    assert_eq!(
        (warnings[0].at.feature, warnings[0].at.property.as_deref()),
        (Some(1), Some("ROADTYPE"))
    );
    let c = &layers.crossings;
    assert_eq!(
        (
            c[0].id.as_str(),
            c[0].control.device,
            c[0].control.refuge_island
        ),
        ("X1", Device::Marked, true)
    );
    assert_eq!(
        c[1].control.guard,
        Some(vec![TimeWindow {
            start_min: 480,
            end_min: 520
        }])
    );
    let school = &layers.schools[0];
    assert_eq!(
        (school.id.as_str(), school.name.as_str(), school.students),
        ("E-12", "Juniper Elementary", Students::Secondary)
    );
    assert_eq!(
        (layers.homes[0].id.as_str(), layers.homes[0].children),
        ("r1", 2)
    );
    assert_eq!(layers.homes[0].school.as_deref(), Some("E-12"));
    assert_eq!(layers.catchments[0].school_id, "E-12");
}

#[test]
fn a_bad_mapping_file_stops_with_a_mapping_error() {
    let mut raw = base();
    raw.mapping = Some(r#"{"streets":{"class":{"from":"T","values":{"A":"motorway"}}}}"#.into());
    assert!(
        matches!(read_layers(&raw), Err(Error::Input { at, .. }) if at.layer == LayerName::Mapping)
    );
}

#[test]
fn an_osmium_style_export() {
    let poly = r#"{"type":"Polygon","coordinates":[[[0,0],[0.0001,0],[0.0001,0.0001],[0,0]]]}"#;
    let streets = fc(&[
        &feat(poly, r#"{"building":"yes"}"#),
        &feat(poly, r#"{"highway":"pedestrian","area":"yes"}"#),
        r#"{"type":"Feature","id":"w10","geometry":{"type":"LineString","coordinates":[[0,0],[0.001,0]]},"properties":{"highway":"residential","maxspeed":"30 mph","sidewalk":"separate","name":"Pine St"}}"#,
        &feat(
            &line("[[0,0.0001],[0.001,0.0001]]"),
            r#"{"@id":"w11","highway":"footway","footway":"sidewalk"}"#,
        ),
        &feat(
            &line("[[0,0.01],[0.01,0.01]]"),
            r#"{"@id":"w12","highway":"motorway","maxspeed":"110"}"#,
        ),
        &feat(
            &line("[[0,0.02],[0.01,0.02]]"),
            r#"{"@id":"w13","highway":"service","access":"private"}"#,
        ),
        &feat(&point(0.0, 0.0), r#"{"highway":"street_lamp"}"#),
        &feat(
            &line("[[0,0],[0.0001,0],[0.0001,0.0001],[0,0]]"),
            r#"{"highway":"pedestrian","area":"yes"}"#,
        ),
    ]);
    let crossings = fc(&[
        &feat(
            &point(0.0, 0.0),
            r#"{"@id":"n1","highway":"traffic_signals"}"#,
        ),
        &feat(
            &point(0.0005, 0.0),
            r#"{"@id":"n2","highway":"crossing","crossing":"zebra","crossing:island":"yes"}"#,
        ),
        &feat(&point(0.0006, 0.0), r#"{"@id":"n3","amenity":"bench"}"#),
        &feat(
            &line("[[0,0],[0.001,0]]"),
            r#"{"@id":"w20","highway":"footway","footway":"crossing"}"#,
        ),
    ]);
    let schools = fc(&[&feat(
        &point(0.0005, 0.0001),
        r#"{"id":"A","amenity":"school","isced:level":"2"}"#,
    )]);
    let raw = RawLayers {
        streets,
        crossings: Some(crossings),
        schools,
        preset: Preset::Osm,
        ..base()
    };
    let (layers, warnings) = read_layers(&raw).unwrap_or_default();
    assert_eq!(
        (layers.schools[0].id.as_str(), layers.schools[0].students),
        ("A", Students::Secondary)
    );
    let s: Vec<_> = layers
        .streets
        .iter()
        .map(|s| (s.id.as_str(), s.class, s.left))
        .collect();
    assert_eq!(
        s,
        vec![
            ("w10", RoadClass::Local, SideWalk::Separate),
            ("w11", RoadClass::Path, SideWalk::Unknown)
        ]
    );
    assert!((layers.streets[0].speed_kmh - 48.28).abs() < 0.01);
    assert_eq!(
        (layers.schools[0].id.as_str(), layers.schools[0].students),
        ("A", Students::Secondary)
    );
    let c: Vec<_> = layers
        .crossings
        .iter()
        .map(|c| {
            (
                c.id.as_str(),
                c.control.device,
                c.control.refuge_island,
                c.scope,
            )
        })
        .collect();
    assert_eq!(
        c,
        vec![
            ("n1", Device::Signal, false, ControlScope::AllLegs),
            ("n2", Device::Marked, true, ControlScope::NearestLeg),
        ]
    );
    // Only summaries: no warning per skipped feature. The home's school "A" is still known.
    assert!(
        warnings
            .iter()
            .all(|w| w.message.starts_with("skipped") && w.at.feature.is_none()),
        "{warnings:?}"
    );
    assert_eq!(warnings.len(), 6, "{warnings:?}");

    let only_buildings = fc(&[&feat(poly, r#"{"building":"yes"}"#)]);
    let raw = RawLayers {
        streets: only_buildings,
        ..raw
    };
    match read_layers(&raw) {
        Err(Error::Input { at, message }) => {
            assert_eq!(at.layer, LayerName::Streets);
            assert!(message.contains("1 feature(s) were skipped"), "{message}");
        }
        other => panic!("{other:?}"),
    }
}

mod never_panics {
    use super::*;
    use proptest::prelude::*;
    use serde_json::{json, Value};

    fn value() -> impl Strategy<Value = Value> {
        prop_oneof![
            Just(Value::Null),
            any::<bool>().prop_map(Value::Bool),
            any::<i64>().prop_map(|i| json!(i)),
            any::<f64>().prop_map(|f| json!(f)),
            "[a-z:;0-9 .-]{0,12}".prop_map(Value::String),
            prop::sample::select(vec![
                "local",
                "30 mph",
                "both",
                "signal;guard",
                "07:30-08:00",
                "-1",
                "yes"
            ])
            .prop_map(|s| json!(s)),
        ]
    }

    fn props() -> impl Strategy<Value = Value> {
        let keys = prop::sample::select(vec![
            "id",
            "class",
            "speed_kmh",
            "lanes",
            "sidewalk",
            "oneway",
            "layer",
            "aadt",
            "width_m",
            "control",
            "guard_hours",
            "children",
            "school",
            "highway",
            "maxspeed",
            "crossing",
            "sidewalk:left",
            "bridge",
            "width",
            "entrances",
            "students",
        ]);
        prop::collection::btree_map(keys, value(), 0..8)
            .prop_map(|m| Value::Object(m.into_iter().map(|(k, v)| (k.to_string(), v)).collect()))
    }

    fn coords() -> impl Strategy<Value = Value> {
        let point = prop_oneof![
            9 => (-180.0..180.0f64, -90.0..90.0f64),
            1 => (-1e6..1e6f64, -1e6..1e6f64),
        ];
        prop::collection::vec(point, 0..4).prop_map(|v| {
            json!(v
                .into_iter()
                .map(|(x, y)| json!([x, y]))
                .collect::<Vec<_>>())
        })
    }

    fn layer(kind: &'static str) -> impl Strategy<Value = String> {
        prop::collection::vec((coords(), props()), 1..4).prop_map(move |fs| {
            let features: Vec<Value> = fs
                .into_iter()
                .enumerate()
                .map(|(i, (c, mut p))| {
                    if kind == "school" {
                        if let Some(o) = p.as_object_mut() {
                            o.insert("id".into(), json!(format!("school{i}")));
                        }
                    }
                    let geometry = match kind {
                        "line" => json!({"type": "LineString", "coordinates": c}),
                        _ => json!({"type": "Point", "coordinates": c.get(0).cloned().unwrap_or(json!([0, 0]))}),
                    };
                    json!({"type": "Feature", "geometry": geometry, "properties": p})
                })
                .collect();
            json!({"type": "FeatureCollection", "features": features}).to_string()
        })
    }

    proptest! {
        #[test]
        fn any_layers_give_a_result(
            streets in layer("line"), crossings in layer("point"), schools in layer("school"),
            homes in layer("point"), osm in any::<bool>(),
        ) {
            let raw = RawLayers {
                streets, crossings: Some(crossings), schools, homes,
                preset: if osm { Preset::Osm } else { Preset::Plain },
                ..RawLayers::default()
            };
            if let Ok((layers, _)) = read_layers(&raw) {
                prop_assert!(!layers.streets.is_empty() && !layers.schools.is_empty() && !layers.homes.is_empty());
                for s in &layers.streets {
                    prop_assert!(s.line.len() >= 2);
                    prop_assert!(s.line.windows(2).all(|w| w[0] != w[1]));
                    prop_assert!(s.line.iter().all(|p| p[0].abs() <= 180.0 && p[1].abs() <= 90.0));
                    prop_assert!(s.speed_kmh.is_finite() && s.speed_kmh >= 0.0);
                }
                prop_assert!(layers.homes.iter().all(|h| h.children >= 1));
            }
        }

        #[test]
        fn any_text_gives_a_result(text in ".{0,200}", csv in any::<bool>()) {
            let mut raw = base();
            raw.homes = text.clone();
            raw.homes_format = if csv { HomesFormat::Csv } else { HomesFormat::GeoJson };
            raw.mapping = Some(text);
            let _ = read_layers(&raw);
        }
    }
}

#[test]
fn blank_optional_layers_count_as_absent() {
    let raw = RawLayers {
        crossings: Some(" \n".into()),
        catchments: Some(String::new()),
        mapping: Some(String::new()),
        ..base()
    };
    let (layers, _) = read_layers(&raw).unwrap_or_default();
    assert_eq!((layers.streets.len(), layers.crossings.len()), (1, 0));
}

#[test]
fn osm_schools_need_an_id() {
    let raw = RawLayers {
        schools: fc(&[&feat(
            &point(0.0, 0.0),
            r#"{"amenity":"school","name":"Oak"}"#,
        )]),
        preset: Preset::Osm,
        streets: fc(&[&feat(
            &line("[[0,0],[0.001,0]]"),
            r#"{"highway":"residential"}"#,
        )]),
        ..base()
    };
    match read_layers(&raw) {
        Err(Error::Input { at, message }) => {
            assert_eq!(
                (at.layer, at.feature, at.property.as_deref()),
                (LayerName::Schools, Some(0), Some("@id"))
            );
            assert!(message.contains("--add-unique-id"), "{message}");
        }
        other => panic!("{other:?}"),
    }
}
