//! Interventions as an overlay: an audit with an intervention equals, figure for figure, the
//! audit of layers that already contain the same change (every kind, on the demo town); a
//! re-audit from a previous audit equals the audit from scratch; removing the interventions
//! gives back the original audit. The "outside" reference here is the project's own audit of
//! hand-edited layers: the overlay must be indistinguishable from editing the files.

use catchwalk::config::Config;
use catchwalk::export::{catchments_csv, homes_csv};
use catchwalk::input::RawLayers;
use catchwalk::pipeline::{run_audit, AuditOutput, Silent};
use catchwalk::scenario::read::read_interventions;
use catchwalk::scenario::reaudit::reaudit;
use serde_json::{json, Value};

const DIR: &str = concat!(env!("CARGO_MANIFEST_DIR"), "/../sample-maps/demo-town/");

fn file(name: &str) -> Value {
    let text = std::fs::read_to_string(format!("{DIR}{name}")).unwrap_or_default();
    serde_json::from_str(&text).unwrap_or(Value::Null)
}

fn raw(streets: &Value, crossings: &Value, interventions: Option<&Value>) -> RawLayers {
    RawLayers {
        streets: streets.to_string(),
        crossings: Some(crossings.to_string()),
        schools: file("schools.geojson").to_string(),
        homes: file("homes.geojson").to_string(),
        catchments: Some(file("catchments.geojson").to_string()),
        interventions: interventions.map(|v| v.to_string()),
        ..RawLayers::default()
    }
}

fn audit(r: &RawLayers) -> AuditOutput {
    match run_audit(r, &Config::default(), &mut Silent) {
        Ok(out) => out,
        Err(e) => panic!("audit failed: {e}"),
    }
}

fn fc(features: Vec<Value>) -> Value {
    json!({"type": "FeatureCollection", "features": features})
}

fn feature(geometry: Value, props: Value) -> Value {
    json!({"type": "Feature", "geometry": geometry, "properties": props})
}

fn features_mut(v: &mut Value) -> &mut Vec<Value> {
    match v.get_mut("features").and_then(|f| f.as_array_mut()) {
        Some(f) => f,
        None => panic!("not a FeatureCollection"),
    }
}

fn street_props<'a>(streets: &'a mut Value, id: &str) -> &'a mut serde_json::Map<String, Value> {
    match features_mut(streets)
        .iter_mut()
        .find(|f| f["properties"]["id"] == id)
        .and_then(|f| f.get_mut("properties"))
        .and_then(|p| p.as_object_mut())
    {
        Some(p) => p,
        None => panic!("no street {id}"),
    }
}

/// The same audit, figure for figure: every home's routes and scores, catchments, hotspots.
fn assert_same(a: &AuditOutput, b: &AuditOutput, what: &str) {
    assert_eq!(homes_csv(a), homes_csv(b), "{what}: homes.csv");
    assert_eq!(
        catchments_csv(a),
        catchments_csv(b),
        "{what}: catchments.csv"
    );
    assert_eq!(a.homes, b.homes, "{what}: home results");
    assert_eq!(a.scores, b.scores, "{what}: scores");
    // Feature numbers in QA refer to the files as given: a closed street keeps its
    // neighbours' numbers in the overlay, while deleting it from the file renumbers them.
    let qa = |o: &AuditOutput| {
        let items: Vec<_> = o
            .network
            .qa
            .items
            .iter()
            .map(|i| (i.kind, i.at, i.message.clone()))
            .collect();
        (
            items,
            o.network.qa.components,
            o.network.qa.largest_component_share,
        )
    };
    assert_eq!(qa(a), qa(b), "{what}: network QA");
}

/// Edits the streets and crossings layers in place.
type Edit = dyn Fn(&mut Value, &mut Value);

struct Case {
    name: &'static str,
    intervention: Value,
    edit: Box<Edit>,
}

fn cases() -> Vec<Case> {
    let pt = |x: f64, y: f64| json!({"type": "Point", "coordinates": [x, y]});
    vec![
        Case {
            name: "signal at an uncontrolled vertex",
            intervention: feature(
                pt(-35.0120699, 42.0090031),
                json!({"kind": "signal", "id": "IV1"}),
            ),
            edit: Box::new(move |_, c| {
                features_mut(c).push(feature(
                    pt(-35.0120699, 42.0090031),
                    json!({"control": "signal", "id": "IV1"}),
                ))
            }),
        },
        Case {
            name: "guard with hours",
            intervention: feature(
                pt(-35.0144839, 42.0013505),
                json!({"kind": "guard", "guard_hours": "07:45-08:15", "id": "IV2"}),
            ),
            edit: Box::new(move |_, c| {
                features_mut(c).push(feature(
                    pt(-35.0144839, 42.0013505),
                    json!({"control": "guard", "guard_hours": "07:45-08:15", "id": "IV2"}),
                ))
            }),
        },
        Case {
            name: "speed",
            intervention: feature(
                Value::Null,
                json!({"kind": "speed", "street": "ST009", "speed_kmh": 30}),
            ),
            edit: Box::new(|s, _| {
                street_props(s, "ST009").insert("speed_kmh".into(), json!(30));
            }),
        },
        Case {
            name: "sidewalk on the right",
            intervention: feature(
                pt(-35.0120699, 42.0013505),
                json!({"kind": "sidewalk", "street": "ST027", "side": "right"}),
            ),
            edit: Box::new(|s, _| {
                street_props(s, "ST027").insert("sidewalk".into(), json!("both"));
            }),
        },
        Case {
            name: "sidewalk on both sides",
            intervention: feature(
                Value::Null,
                json!({"kind": "sidewalk", "street": "ST031", "side": "both"}),
            ),
            edit: Box::new(|s, _| {
                street_props(s, "ST031").insert("sidewalk".into(), json!("both"));
            }),
        },
        Case {
            name: "close",
            intervention: feature(Value::Null, json!({"kind": "close", "street": "ST020"})),
            edit: Box::new(|s, _| features_mut(s).retain(|f| f["properties"]["id"] != "ST020")),
        },
        Case {
            name: "path",
            intervention: feature(
                json!({"type": "LineString", "coordinates": [[-35.0120699, 42.0090031], [-35.0120699, 42.0108037]]}),
                json!({"kind": "path", "id": "IV7"}),
            ),
            edit: Box::new(|s, _| {
                features_mut(s).push(feature(
                    json!({"type": "LineString", "coordinates": [[-35.0120699, 42.0090031], [-35.0120699, 42.0108037]]}),
                    json!({"class": "path", "id": "IV7"}),
                ))
            }),
        },
    ]
}

#[test]
fn every_kind_equals_the_same_change_made_in_the_layers() {
    let (streets, crossings) = (file("streets.geojson"), file("crossings.geojson"));
    let baseline = audit(&raw(&streets, &crossings, None));
    for case in cases() {
        let with = audit(&raw(
            &streets,
            &crossings,
            Some(&fc(vec![case.intervention.clone()])),
        ));
        let (mut s, mut c) = (streets.clone(), crossings.clone());
        (case.edit)(&mut s, &mut c);
        let edited = audit(&raw(&s, &c, None));
        assert_same(&with, &edited, case.name);
        assert_ne!(
            homes_csv(&with),
            homes_csv(&baseline),
            "{}: the change should show in the demo town's figures",
            case.name
        );
        // Re-audit from the baseline, and back again.
        let list = match read_interventions(&fc(vec![case.intervention.clone()]).to_string()) {
            Ok(l) => l,
            Err(e) => panic!("{e}"),
        };
        let (re, stats) = match reaudit(&baseline, list, &mut Silent) {
            Ok(r) => r,
            Err(e) => panic!("{}: {e}", case.name),
        };
        assert_same(&re, &with, &format!("{} (re-audit)", case.name));
        assert!(stats.schools_rerouted <= stats.schools);
        let (back, _) = match reaudit(&re, Vec::new(), &mut Silent) {
            Ok(r) => r,
            Err(e) => panic!("{}: {e}", case.name),
        };
        assert_same(&back, &baseline, &format!("{} (removed)", case.name));
    }
}

#[test]
fn all_interventions_together_equal_all_edits_together() {
    let (streets, crossings) = (file("streets.geojson"), file("crossings.geojson"));
    let (mut s, mut c) = (streets.clone(), crossings.clone());
    let mut list = Vec::new();
    for case in cases() {
        (case.edit)(&mut s, &mut c);
        list.push(case.intervention);
    }
    let with = audit(&raw(&streets, &crossings, Some(&fc(list))));
    assert_same(&with, &audit(&raw(&s, &c, None)), "all kinds");
    assert_eq!(
        catchwalk::scenario::reaudit::applied(&with).len(),
        7,
        "summary lists every intervention"
    );
    let summary = catchwalk::export::summary_json(&with);
    assert_eq!(
        summary["interventions"].as_array().map(|a| a.len()),
        Some(7)
    );
}

#[test]
fn a_local_change_reroutes_only_the_schools_it_reaches() {
    let (streets, crossings) = (file("streets.geojson"), file("crossings.geojson"));
    let baseline = audit(&raw(&streets, &crossings, None));
    // A guard at a corner of the town's edge: a school on the far side never reaches it.
    let iv = fc(vec![feature(
        json!({"type": "Point", "coordinates": [-35.0144839, 42.0013505]}),
        json!({"kind": "guard"}),
    )]);
    let list = read_interventions(&iv.to_string()).unwrap_or_default();
    let (re, stats) = match reaudit(&baseline, list, &mut Silent) {
        Ok(r) => r,
        Err(e) => panic!("{e}"),
    };
    assert!(!stats.full);
    assert!(
        stats.schools_rerouted < stats.schools,
        "rerouted {} of {} schools",
        stats.schools_rerouted,
        stats.schools
    );
    assert_same(&re, &audit(&raw(&streets, &crossings, Some(&iv))), "guard");
}

#[test]
fn errors_name_the_intervention_feature() {
    let (streets, crossings) = (file("streets.geojson"), file("crossings.geojson"));
    let bad_street = fc(vec![
        feature(
            Value::Null,
            json!({"kind": "speed", "street": "ST009", "speed_kmh": 30}),
        ),
        feature(
            Value::Null,
            json!({"kind": "close", "street": "NO-SUCH", "id": "w2"}),
        ),
    ]);
    let e = run_audit(
        &raw(&streets, &crossings, Some(&bad_street)),
        &Config::default(),
        &mut Silent,
    )
    .err()
    .map(|e| e.to_string())
    .unwrap_or_default();
    assert!(
        e.contains("interventions feature 1 (id w2), property 'street'"),
        "{e}"
    );
    assert!(e.contains("NO-SUCH"), "{e}");
    let far = fc(vec![feature(
        json!({"type": "Point", "coordinates": [-34.9, 42.1]}),
        json!({"kind": "signal"}),
    )]);
    let e = run_audit(
        &raw(&streets, &crossings, Some(&far)),
        &Config::default(),
        &mut Silent,
    )
    .err()
    .map(|e| e.to_string())
    .unwrap_or_default();
    assert!(
        e.contains("interventions feature 0") && e.contains("attaches to no street"),
        "{e}"
    );
    let off_street = fc(vec![feature(
        json!({"type": "Point", "coordinates": [-35.0, 42.0108037]}),
        json!({"kind": "speed", "street": "ST031", "speed_kmh": 20}),
    )]);
    let e = run_audit(
        &raw(&streets, &crossings, Some(&off_street)),
        &Config::default(),
        &mut Silent,
    )
    .err()
    .map(|e| e.to_string())
    .unwrap_or_default();
    assert!(e.contains("m from street 'ST031'"), "{e}");
}
