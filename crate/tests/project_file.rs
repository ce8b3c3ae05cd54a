//! The project file: written and read back to the identical project (and the same bytes),
//! audited from the project as from the files, scenarios and observed notes as interventions.

use catchwalk::config::Config;
use catchwalk::export::homes_csv;
use catchwalk::input::{HomesFormat, Preset};
use catchwalk::pipeline::{run_audit, Silent};
use catchwalk::project::notes::{observed_interventions, Check, Checklist, Note, NoteTarget};
use catchwalk::project::{read_project, write_project, Photo, Project, ProjectLayers, Scenario};
use catchwalk::scenario::Origin;
use serde_json::json;

const DIR: &str = concat!(env!("CARGO_MANIFEST_DIR"), "/../sample-maps/demo-town/");

fn read(f: &str) -> String {
    std::fs::read_to_string(format!("{DIR}{f}")).unwrap_or_default()
}

fn demo_project() -> Project {
    let guard = json!({"type": "FeatureCollection", "features": [{"type": "Feature",
        "geometry": {"type": "Point", "coordinates": [-35.0144839, 42.0013505]},
        "properties": {"kind": "guard", "guard_hours": "07:45-08:15"}}]});
    let mut observed = serde_json::Map::new();
    observed.insert("kind".into(), json!("sidewalk"));
    observed.insert("street".into(), json!("ST031"));
    observed.insert("side".into(), json!("both"));
    Project {
        layers: ProjectLayers {
            streets: read("streets.geojson"),
            crossings: Some(read("crossings.geojson")),
            schools: read("schools.geojson"),
            homes: read("homes.csv"),
            homes_format: HomesFormat::Csv,
            catchments: Some(read("catchments.geojson")),
            preset: Preset::Plain,
            mapping: None,
        },
        config: Some(json!({"benefit": {"walk_zone_m": 1200}})),
        scenarios: vec![
            Scenario {
                name: "guard at the ring".into(),
                interventions: guard.to_string(),
            },
            Scenario {
                name: "nothing".into(),
                interventions: r#"{"type":"FeatureCollection","features":[]}"#.into(),
            },
        ],
        notes: vec![
            Note {
                id: "n1".into(),
                at: [-35.0096559, 42.0090031],
                target: NoteTarget::StreetSide {
                    street: "ST031".into(),
                    side: "left".into(),
                },
                checklist: Checklist {
                    sidewalk_condition: Check::Problem,
                    parked_cars: Check::Ok,
                    observed_speed_kmh: Some(35.0),
                    crossing_guard_seen: Some(false),
                    ..Checklist::default()
                },
                text: "a new sidewalk on both sides; \"fresh\" kerbs, ünïcode".into(),
                photos: vec!["n1-a.jpg".into()],
                visited: Some("2026-04-02T08:05:00".into()),
                observed: Some(observed),
            },
            Note {
                id: "n2".into(),
                at: [-35.0, 42.0108037],
                target: NoteTarget::Crossing {
                    crossing: Some("X001".into()),
                },
                checklist: Checklist {
                    sight_lines: Check::Problem,
                    ..Checklist::default()
                },
                text: String::new(),
                photos: vec![],
                visited: None,
                observed: None,
            },
        ],
        photos: vec![Photo {
            name: "n1-a.jpg".into(),
            media_type: "image/jpeg".into(),
            bytes: (0u8..=255).cycle().take(5000).collect(),
        }],
    }
}

#[test]
fn a_project_round_trips_identically() {
    let p = demo_project();
    let bytes = match write_project(&p) {
        Ok(b) => b,
        Err(e) => panic!("{e}"),
    };
    let back = match read_project(&bytes) {
        Ok(b) => b,
        Err(e) => panic!("{e}"),
    };
    assert_eq!(back, p);
    assert_eq!(
        write_project(&back).ok(),
        Some(bytes),
        "the same project writes the same bytes"
    );
    // The page's JSON form round-trips too (photos as base64).
    let text = serde_json::to_string(&p).unwrap_or_default();
    let from_json: Project = serde_json::from_str(&text).unwrap_or_default();
    assert_eq!(from_json, p);
}

#[test]
fn a_bad_project_file_is_refused_with_a_message() {
    let e = read_project(b"not a zip")
        .err()
        .map(|e| e.to_string())
        .unwrap_or_default();
    assert!(e.contains("not a zip"), "{e}");
}

#[test]
fn auditing_a_project_scenario_equals_auditing_its_files() {
    let p = demo_project();
    let config = match Config::from_json(&p.config.clone().unwrap_or_default().to_string()) {
        Ok(c) => c,
        Err(e) => panic!("{e}"),
    };
    let scenario = p
        .scenario("guard at the ring")
        .map(|s| s.interventions.clone())
        .ok();
    let from_project = run_audit(&p.layers.raw(scenario.clone()), &config, &mut Silent);
    let raw = catchwalk::input::RawLayers {
        streets: read("streets.geojson"),
        crossings: Some(read("crossings.geojson")),
        schools: read("schools.geojson"),
        homes: read("homes.csv"),
        homes_format: HomesFormat::Csv,
        catchments: Some(read("catchments.geojson")),
        interventions: scenario,
        ..Default::default()
    };
    let from_files = run_audit(&raw, &config, &mut Silent);
    match (from_project, from_files) {
        (Ok(a), Ok(b)) => assert_eq!(homes_csv(&a), homes_csv(&b)),
        (a, b) => panic!("{:?} {:?}", a.err(), b.err()),
    }
    let e = p
        .scenario("nope")
        .err()
        .map(|e| e.to_string())
        .unwrap_or_default();
    assert!(e.contains("guard at the ring, nothing"), "{e}");
}

#[test]
fn an_observed_correction_becomes_an_observation_intervention() {
    let p = demo_project();
    let list = match observed_interventions(&p.notes) {
        Ok(l) => l,
        Err(e) => panic!("{e}"),
    };
    assert_eq!(list.len(), 1);
    assert_eq!(list[0].origin, Origin::Observation);
    assert_eq!(list[0].id.as_deref(), Some("note-n1"));
    assert!(
        matches!(&list[0].change, catchwalk::scenario::Change::Sidewalk { street, .. } if street == "ST031")
    );
}

fn cli(args: &[&str]) -> (bool, String, String) {
    match std::process::Command::new(env!("CARGO_BIN_EXE_catchwalk"))
        .args(args)
        .output()
    {
        Ok(o) => (
            o.status.success(),
            String::from_utf8_lossy(&o.stdout).into(),
            String::from_utf8_lossy(&o.stderr).into(),
        ),
        Err(e) => panic!("cannot run catchwalk: {e}"),
    }
}

#[test]
fn cli_project_new_then_audit_a_scenario_equals_the_audit_of_the_files() {
    let dir = std::env::temp_dir().join(format!("catchwalk-project-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    let _ = std::fs::create_dir_all(&dir);
    let path = |f: &str| dir.join(f).to_string_lossy().into_owned();
    let iv = json!({"type": "FeatureCollection", "features": [{"type": "Feature", "geometry": null,
        "properties": {"kind": "speed", "street": "ST009", "speed_kmh": 30}}]});
    let _ = std::fs::write(path("iv.geojson"), iv.to_string());
    let _ = std::fs::write(path("photo.jpg"), [0xffu8, 0xd8, 0xff, 0xe0]);
    let notes = catchwalk::project::notes::notes_geojson(&demo_project().notes);
    let _ = std::fs::write(path("notes.geojson"), notes.to_string());
    let layer = |f: &str| format!("{DIR}{f}");
    let common = [
        "--streets".to_string(),
        layer("streets.geojson"),
        "--crossings".into(),
        layer("crossings.geojson"),
        "--schools".into(),
        layer("schools.geojson"),
        "--homes".into(),
        layer("homes.geojson"),
        "--catchments".into(),
        layer("catchments.geojson"),
        "--rules".into(),
        "pa-447".into(),
    ];
    let mut args: Vec<String> = vec!["project".into(), "new".into()];
    args.extend(common.iter().cloned());
    args.extend([
        "--add-scenario".into(),
        format!("slower ring={}", path("iv.geojson")),
        "--notes".into(),
        path("notes.geojson"),
        "--photo".into(),
        path("photo.jpg"),
        "--out".into(),
        path("town.catchwalk"),
    ]);
    let refs: Vec<&str> = args.iter().map(|a| a.as_str()).collect();
    let (ok, out, err) = cli(&refs);
    assert!(ok, "{err}");
    assert!(
        out.contains("1 scenario(s), 2 note(s), 1 photo(s)"),
        "{out}"
    );
    let (ok, _, err) = cli(&[
        "audit",
        "--project",
        &path("town.catchwalk"),
        "--scenario",
        "slower ring",
        "--out",
        &path("a"),
    ]);
    assert!(ok, "{err}");
    let mut args: Vec<String> = vec!["audit".into()];
    args.extend(common.iter().cloned());
    args.extend([
        "--interventions".into(),
        path("iv.geojson"),
        "--out".into(),
        path("b"),
    ]);
    let refs: Vec<&str> = args.iter().map(|a| a.as_str()).collect();
    let (ok, _, err) = cli(&refs);
    assert!(ok, "{err}");
    let homes =
        |d: &str| std::fs::read_to_string(dir.join(d).join("homes.csv")).unwrap_or_default();
    assert!(!homes("a").is_empty());
    assert_eq!(homes("a"), homes("b"));
    // Observations: the note's observed sidewalk joins the scenario, marked as observed.
    let (ok, _, err) = cli(&[
        "audit",
        "--project",
        &path("town.catchwalk"),
        "--scenario",
        "slower ring",
        "--observations",
        "--out",
        &path("c"),
    ]);
    assert!(ok, "{err}");
    let summary: serde_json::Value = serde_json::from_str(
        &std::fs::read_to_string(dir.join("c").join("summary.json")).unwrap_or_default(),
    )
    .unwrap_or_default();
    let origins: Vec<&str> = summary["interventions"]
        .as_array()
        .into_iter()
        .flatten()
        .filter_map(|i| i["origin"].as_str())
        .collect();
    assert_eq!(origins, ["proposal", "observation"]);
    let (ok, _, err) = cli(&[
        "audit",
        "--project",
        &path("town.catchwalk"),
        "--scenario",
        "faster",
        "--out",
        &path("d"),
    ]);
    assert!(
        !ok && err.contains("no scenario 'faster'") && err.contains("slower ring"),
        "{err}"
    );
    let _ = std::fs::remove_dir_all(&dir);
}
