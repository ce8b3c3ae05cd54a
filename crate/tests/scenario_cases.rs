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

/// Replaces street `id` by its pieces before vertex `cut[0]`, between the two cuts, and after
/// `cut[1]`, each with the street's properties; the middle piece gets `change`, or is left out
/// when `change` is `None` (a closure), as a planner would edit the file by hand.
fn cut_street(streets: &mut Value, id: &str, cut: &[usize; 2], change: Option<(&str, Value)>) {
    let features = features_mut(streets);
    let Some(k) = features.iter().position(|f| f["properties"]["id"] == id) else {
        panic!("no street {id}");
    };
    let f = features.remove(k);
    let line = f["geometry"]["coordinates"]
        .as_array()
        .cloned()
        .unwrap_or_default();
    let piece = |a: usize, b: usize| {
        let mut g = f.clone();
        g["geometry"]["coordinates"] = json!(line[a..=b]);
        g
    };
    let mut parts = vec![piece(0, cut[0])];
    if let Some((key, value)) = change {
        let mut mid = piece(cut[0], cut[1]);
        mid["properties"][key] = value;
        parts.push(mid);
    }
    parts.push(piece(cut[1], line.len() - 1));
    for (j, p) in parts.into_iter().enumerate() {
        features.insert(k + j, p);
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
                Value::Null,
                json!({"kind": "sidewalk", "street": "ST027", "side": "right"}),
            ),
            edit: Box::new(|s, _| {
                street_props(s, "ST027").insert("sidewalk".into(), json!("both"));
            }),
        },
        Case {
            name: "sidewalk on one block (a Point)",
            intervention: feature(
                pt(-35.0108629, 42.0013505),
                json!({"kind": "sidewalk", "street": "ST027", "side": "right"}),
            ),
            edit: Box::new(|s, _| {
                cut_street(s, "ST027", &[1, 2], Some(("sidewalk", json!("both"))))
            }),
        },
        Case {
            name: "close one block (a Point)",
            intervention: feature(
                pt(-35.006035, 42.0013505),
                json!({"kind": "close", "street": "ST027"}),
            ),
            edit: Box::new(|s, _| cut_street(s, "ST027", &[3, 4], None)),
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
        // (a change to one block may route no child differently: its check is the equality)
        assert!(
            case.name.contains("one block") || homes_csv(&with) != homes_csv(&baseline),
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
    // Whole-street cases only: the block cases cut the same street a second way.
    for case in cases()
        .into_iter()
        .filter(|c| !c.name.contains("one block"))
    {
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

// ---- the same through the command line -------------------------------------------------

struct Run {
    ok: bool,
    stdout: String,
    stderr: String,
}

fn catchwalk(args: &[&str]) -> Run {
    match std::process::Command::new(env!("CARGO_BIN_EXE_catchwalk"))
        .args(args)
        .output()
    {
        Ok(o) => Run {
            ok: o.status.success(),
            stdout: String::from_utf8_lossy(&o.stdout).into(),
            stderr: String::from_utf8_lossy(&o.stderr).into(),
        },
        Err(e) => panic!("cannot run catchwalk: {e}"),
    }
}

/// A fresh scratch folder for one test.
fn scratch(name: &str) -> std::path::PathBuf {
    let d = std::env::temp_dir().join(format!("catchwalk-scenario-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    if let Err(e) = std::fs::create_dir_all(&d) {
        panic!("{e}");
    }
    d
}

fn put(dir: &std::path::Path, name: &str, v: &Value) -> String {
    let p = dir.join(name);
    if let Err(e) = std::fs::write(&p, v.to_string()) {
        panic!("{e}");
    }
    p.to_string_lossy().into_owned()
}

fn slurp(p: &std::path::Path) -> String {
    std::fs::read_to_string(p).unwrap_or_default()
}

/// `catchwalk audit` of the demo town with the given streets, crossings and interventions.
fn cli_audit(dir: &std::path::Path, tag: &str, s: &Value, c: &Value, iv: Option<&Value>) -> Run {
    let streets = put(dir, &format!("{tag}-streets.geojson"), s);
    let crossings = put(dir, &format!("{tag}-crossings.geojson"), c);
    let out = dir.join(tag).to_string_lossy().into_owned();
    let mut args = vec![
        "audit".to_string(),
        "--streets".into(),
        streets,
        "--crossings".into(),
        crossings,
        "--schools".into(),
        format!("{DIR}schools.geojson"),
        "--homes".into(),
        format!("{DIR}homes.geojson"),
        "--catchments".into(),
        format!("{DIR}catchments.geojson"),
        "--out".into(),
        out,
    ];
    if let Some(iv) = iv {
        args.push("--interventions".into());
        args.push(put(dir, &format!("{tag}-interventions.geojson"), iv));
    }
    let refs: Vec<&str> = args.iter().map(|a| a.as_str()).collect();
    catchwalk(&refs)
}

#[test]
fn cli_every_kind_gives_the_homes_csv_of_the_edited_layers() {
    let dir = scratch("kinds");
    let (streets, crossings) = (file("streets.geojson"), file("crossings.geojson"));
    for (k, case) in cases().into_iter().enumerate() {
        let iv = fc(vec![case.intervention.clone()]);
        let a = cli_audit(&dir, &format!("iv{k}"), &streets, &crossings, Some(&iv));
        assert!(a.ok, "{}: {}", case.name, a.stderr);
        let (mut s, mut c) = (streets.clone(), crossings.clone());
        (case.edit)(&mut s, &mut c);
        let b = cli_audit(&dir, &format!("ed{k}"), &s, &c, None);
        assert!(b.ok, "{}: {}", case.name, b.stderr);
        let homes = |t: &str| slurp(&dir.join(t).join("homes.csv"));
        assert!(!homes(&format!("iv{k}")).is_empty());
        assert_eq!(
            homes(&format!("iv{k}")),
            homes(&format!("ed{k}")),
            "{}",
            case.name
        );
        let summary: Value =
            serde_json::from_str(&slurp(&dir.join(format!("iv{k}")).join("summary.json")))
                .unwrap_or(Value::Null);
        assert_eq!(
            summary["interventions"].as_array().map(|a| a.len()),
            Some(1)
        );
    }
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn cli_signalising_every_crossing_leaves_only_doorstep_crossings_uncontrolled() {
    let dir = scratch("signal-all");
    let (streets, crossings) = (file("streets.geojson"), file("crossings.geojson"));
    // A signal on every vertex of every road: every junction, and every crossing point's
    // place (a crossing point sits on a vertex in the demo town, or splits a segment).
    let mut points: Vec<[f64; 2]> = Vec::new();
    for f in streets["features"].as_array().into_iter().flatten() {
        if f["properties"]["class"] == "path" || f["properties"]["class"] == "steps" {
            continue;
        }
        for p in f["geometry"]["coordinates"]
            .as_array()
            .into_iter()
            .flatten()
        {
            let q = [p[0].as_f64().unwrap_or(0.0), p[1].as_f64().unwrap_or(0.0)];
            if !points.contains(&q) {
                points.push(q);
            }
        }
    }
    for f in crossings["features"].as_array().into_iter().flatten() {
        let p = &f["geometry"]["coordinates"];
        points.push([p[0].as_f64().unwrap_or(0.0), p[1].as_f64().unwrap_or(0.0)]);
    }
    let iv = fc(points
        .iter()
        .map(|p| {
            feature(
                json!({"type": "Point", "coordinates": p}),
                json!({"kind": "signal"}),
            )
        })
        .collect());
    let before = cli_audit(&dir, "before", &streets, &crossings, None);
    let after = cli_audit(&dir, "after", &streets, &crossings, Some(&iv));
    assert!(before.ok && after.ok, "{}{}", before.stderr, after.stderr);
    // Doorstep crossings (crossing one's own street at the door, see network/doorstep.rs)
    // stand where no crossing exists to control: they are the only uncontrolled ones left.
    let out = audit(&raw(&streets, &crossings, Some(&iv)));
    let (mut at_crossings, mut at_doors) = (0, 0);
    for h in &out.homes {
        for c in h.recommended.iter().flat_map(|r| r.audit.crossings.iter()) {
            if c.uncontrolled {
                match out.network.graph.edges.get(c.edge as usize) {
                    Some(e) if catchwalk::network::PedGraph::is_doorstep(e) => at_doors += 1,
                    _ => at_crossings += 1,
                }
            }
        }
    }
    assert_eq!(
        at_crossings, 0,
        "uncontrolled junction or mid-block crossings left"
    );
    let uncontrolled = |t: &str| -> (usize, usize) {
        let text = slurp(&dir.join(t).join("homes.csv"));
        let mut r = csv::ReaderBuilder::new()
            .comment(Some(b'#'))
            .from_reader(text.as_bytes());
        let header = r.headers().cloned().unwrap_or_default();
        let col = header.iter().position(|h| h == "uncontrolled_crossings");
        let mut n = (0, 0);
        for rec in r.records().flatten() {
            if let Some(v) = col
                .and_then(|c| rec.get(c))
                .and_then(|v| v.parse::<usize>().ok())
            {
                n.0 += v;
                n.1 += 1;
            }
        }
        n
    };
    let (b, routed_b) = uncontrolled("before");
    let (a, routed_a) = uncontrolled("after");
    assert!(
        b > 0 && routed_b > 0,
        "the demo town has uncontrolled crossings to begin with"
    );
    assert_eq!(routed_a, routed_b);
    assert_eq!(
        a, at_doors,
        "uncontrolled crossings after signalising every crossing"
    );
    assert!(a * 4 < b, "{a} of {b} left");
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn cli_an_unknown_street_is_a_located_error() {
    let dir = scratch("unknown");
    let (streets, crossings) = (file("streets.geojson"), file("crossings.geojson"));
    let iv = fc(vec![feature(
        Value::Null,
        json!({"kind": "sidewalk", "street": "ST999", "side": "both", "id": "n1"}),
    )]);
    let r = cli_audit(&dir, "bad", &streets, &crossings, Some(&iv));
    assert!(!r.ok);
    assert!(
        r.stderr
            .contains("interventions feature 0 (id n1), property 'street'")
            && r.stderr.contains("ST999"),
        "{}",
        r.stderr
    );
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn cli_plan_writes_interventions_that_reproduce_its_figures_and_compare_agrees() {
    let dir = scratch("plan");
    let layer = |f: &str| format!("{DIR}{f}");
    let plan_out = dir.join("plan").to_string_lossy().into_owned();
    let args = [
        "plan",
        "--budget",
        "3",
        "--streets",
        &layer("streets.geojson"),
        "--crossings",
        &layer("crossings.geojson"),
        "--schools",
        &layer("schools.geojson"),
        "--homes",
        &layer("homes.geojson"),
        "--catchments",
        &layer("catchments.geojson"),
        "--out",
        &plan_out,
    ];
    let r = catchwalk(&args);
    assert!(r.ok, "{}", r.stderr);
    let plan: Value =
        serde_json::from_str(&slurp(&dir.join("plan").join("plan.json"))).unwrap_or(Value::Null);
    let iv: Value = serde_json::from_str(&slurp(&dir.join("plan").join("interventions.geojson")))
        .unwrap_or(Value::Null);
    let steps = plan["plan"]["steps"]
        .as_array()
        .map(|a| a.len())
        .unwrap_or(0);
    assert!(steps > 0, "the demo town's plan chooses upgrades");
    assert_eq!(iv["features"].as_array().map(|a| a.len()), Some(steps));
    let (streets, crossings) = (file("streets.geojson"), file("crossings.geojson"));
    let before = cli_audit(&dir, "before", &streets, &crossings, None);
    let after = cli_audit(&dir, "after", &streets, &crossings, Some(&iv));
    assert!(before.ok && after.ok, "{}{}", before.stderr, after.stderr);
    let summary: Value = serde_json::from_str(&slurp(&dir.join("after").join("summary.json")))
        .unwrap_or(Value::Null);
    // The plan's figures per catchment, against the audit of its interventions file.
    for share in plan["plan"]["after"].as_array().into_iter().flatten() {
        let id = &share["school_id"];
        let audited = summary["catchments"]
            .as_array()
            .into_iter()
            .flatten()
            .find(|c| &c["school_id"] == id)
            .map(|c| c["children_safe_route"].clone())
            .unwrap_or(Value::Null);
        assert_eq!(audited, share["children_safe_route"], "school {id}");
    }
    // Compare: the safe-route change per catchment is the children gained less those lost.
    let cmp_out = dir.join("cmp").to_string_lossy().into_owned();
    let b = dir.join("before").to_string_lossy().into_owned();
    let a = dir.join("after").to_string_lossy().into_owned();
    let r = catchwalk(&["compare", &b, &a, "--out", &cmp_out]);
    assert!(r.ok, "{}", r.stderr);
    assert!(r.stdout.contains("gained"), "{}", r.stdout);
    let c: Value = serde_json::from_str(&slurp(&dir.join("cmp").join("comparison.json")))
        .unwrap_or(Value::Null);
    let mut gained_total = 0.0;
    for k in c["catchments"].as_array().into_iter().flatten() {
        let delta = k["after"]["children_safe_route"]
            .as_f64()
            .unwrap_or(f64::NAN)
            - k["before"]["children_safe_route"]
                .as_f64()
                .unwrap_or(f64::NAN);
        let net = k["children_gained_safe_route"].as_f64().unwrap_or(f64::NAN)
            - k["children_lost_safe_route"].as_f64().unwrap_or(f64::NAN);
        assert!((delta - net).abs() < 1e-9, "{k}");
        gained_total += net;
    }
    let plan_gain = plan["plan"]["safe_children_after"].as_f64().unwrap_or(0.0)
        - plan["plan"]["safe_children_before"].as_f64().unwrap_or(0.0);
    assert!(
        (gained_total - plan_gain).abs() < 1e-9,
        "{gained_total} vs {plan_gain}"
    );
    // Plain RFC 4180, header first; the caution and units sit in the CSVW metadata beside it.
    assert!(slurp(&dir.join("cmp").join("comparison.csv")).starts_with("school_id,"));
    let meta = slurp(&dir.join("cmp").join("comparison.csv-metadata.json"));
    assert!(meta.contains(catchwalk::CAUTION) && meta.contains("children_lost_safe_route"));
    let _ = std::fs::remove_dir_all(&dir);
}
