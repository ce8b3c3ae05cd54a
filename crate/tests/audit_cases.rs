//! Whole-audit cases on tiny hand-made layers: every figure known by hand.

use catchwalk::config::Config;
use catchwalk::export::homes_csv;
use catchwalk::geodesy::distance_m;
use catchwalk::input::{HomesFormat, Preset, RawLayers};
use catchwalk::pipeline::{run_audit, AuditOutput, Silent};
use std::collections::HashMap;

mod hand_layers;
use hand_layers::{fc, line, point, EAST, MID, WEST};

/// A main street west-east through a four-way junction with a side street (shared vertex MID),
/// a school north of the east end and one home north of the west end.
fn four_way(crossings: Option<String>) -> AuditOutput {
    four_way_with_home(crossings, [-34.9995, 42.0001])
}

fn four_way_with_home(crossings: Option<String>, home: [f64; 2]) -> AuditOutput {
    let local = r#""class":"local","speed_kmh":40,"lanes":2,"sidewalk":"both""#;
    let streets = fc(&[
        line("main", local, &[WEST, MID, EAST]),
        line("side", local, &[[MID[0], 41.999], MID, [MID[0], 42.001]]),
    ]);
    let raw = RawLayers {
        streets,
        crossings,
        schools: fc(&[point(
            r#""id":"S1","name":"East school""#,
            [-34.9965, 42.0001],
        )]),
        homes: fc(&[point(r#""id":"h1","children":2"#, home)]),
        homes_format: HomesFormat::GeoJson,
        catchments: None,
        crashes: None,
        preset: Preset::Plain,
        mapping: None,
        ..RawLayers::default()
    };
    match run_audit(&raw, &Config::default(), &mut Silent) {
        Ok(out) => out,
        Err(e) => panic!("audit failed: {e}"),
    }
}

fn csv_row(out: &AuditOutput) -> HashMap<String, String> {
    let text = homes_csv(out);
    let mut r = csv::Reader::from_reader(text.as_bytes());
    let header: Vec<String> = r
        .headers()
        .map(|h| h.iter().map(String::from).collect())
        .unwrap_or_default();
    let row = r
        .records()
        .next()
        .and_then(|x| x.ok())
        .map(|rec| rec.iter().map(String::from).collect::<Vec<_>>())
        .unwrap_or_default();
    header.into_iter().zip(row).collect()
}

fn num(row: &HashMap<String, String>, k: &str) -> f64 {
    row.get(k).and_then(|v| v.parse().ok()).unwrap_or(f64::NAN)
}

#[test]
fn walking_straight_on_across_a_side_street_crosses_it_once_uncontrolled() {
    let out = four_way(None);
    let row = csv_row(&out);
    assert_eq!(row["school_id"], "S1");
    assert_eq!(row["children"], "2");
    // Along the north side from the home's foot to the school's foot: the centreline distance.
    let expected = distance_m([-34.9995, 42.0], [-34.9965, 42.0]);
    assert!(
        (num(&row, "shortest_network_m") - expected).abs() < 0.02,
        "{row:?}"
    );
    // Walked adds one crossing of a two-lane street: 2 x 3.6 m.
    assert!((num(&row, "shortest_walked_m") - expected - 7.2).abs() < 0.02);
    assert_eq!(num(&row, "shortest_crossings"), 1.0);
    assert_eq!(num(&row, "shortest_uncontrolled_crossings"), 1.0);
    assert_eq!(num(&row, "shortest_arterial_crossings"), 0.0);
    assert!((num(&row, "shortest_along_31_50_m") - expected).abs() < 0.02);
    assert_eq!(num(&row, "shortest_no_sidewalk_m"), 0.0);
    // Walking time at the default 1.22 m/s (4.0 ft/s; was 1.07 m/s before issue 9's item 11).
    assert!((num(&row, "shortest_walking_time_min") - (expected + 7.2) / 1.22 / 60.0).abs() < 0.01);
}

#[test]
fn a_signal_at_the_junction_controls_that_crossing() {
    let crossings = fc(&[point(r#""id":"c1","control":"signal""#, MID)]);
    let out = four_way(Some(crossings));
    let row = csv_row(&out);
    assert_eq!(num(&row, "shortest_crossings"), 1.0);
    assert_eq!(num(&row, "shortest_uncontrolled_crossings"), 0.0);
    assert_eq!(num(&row, "uncontrolled_crossings"), 0.0);
}

#[test]
fn a_home_across_the_street_from_the_school_crosses_at_the_door() {
    // Home on the south side facing the school on the north side of the same block.
    let out = four_way_with_home(None, [-34.9966, 41.9999]);
    let row = csv_row(&out);
    let along = distance_m([-34.9966, 42.0], [-34.9965, 42.0]);
    assert!(
        (num(&row, "shortest_network_m") - along).abs() < 0.02,
        "{row:?}"
    );
    assert!((num(&row, "shortest_walked_m") - along - 7.2).abs() < 0.02);
    assert_eq!(num(&row, "shortest_crossings"), 1.0);
    assert_eq!(num(&row, "shortest_uncontrolled_crossings"), 1.0);
    let crossing = &out.homes[0]
        .shortest
        .as_ref()
        .map(|r| r.audit.crossings.clone())
        .unwrap_or_default();
    assert!(crossing.iter().all(|c| c.midblock));
}
