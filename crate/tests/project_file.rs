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
