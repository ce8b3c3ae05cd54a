//! Issue 9's cases worked by hand on tiny layers, through the whole audit: a rail crossing
//! (67 Pa. Code § 447.4(a)(3)), crashes near a crossing (§ 447.4(a)(1)), and homes between
//! one and one and a half miles from school (24 P.S. § 13-1362).

use catchwalk::config::Config;
use catchwalk::export::{homes_csv, hotspots_csv};
use catchwalk::geodesy::distance_m;
use catchwalk::input::{RawLayers, Students};
use catchwalk::pipeline::{run_audit, AuditOutput, Silent};
use catchwalk::score::rules::RuleSet;

mod hand_layers;
use hand_layers::{fc, line, point, EAST, MID, WEST};

fn pa_447() -> Config {
    let mut c = Config::default();
    c.score.rules = RuleSet::builtin("pa-447").unwrap_or_default();
    c
}

/// Main street west-east through a junction with a side street at MID; home north of the
/// west end, school north of the east end: the route walks the north side and crosses the
/// side street's north leg at MID (uncontrolled).
fn four_way(crossings: Option<String>, crashes: Option<String>, config: &Config) -> AuditOutput {
    let local = r#""class":"local","speed_kmh":40,"lanes":2,"sidewalk":"both""#;
    let raw = RawLayers {
        streets: fc(&[
            line("main", local, &[WEST, MID, EAST]),
            line("side", local, &[[MID[0], 41.999], MID, [MID[0], 42.001]]),
        ]),
        crossings,
        crashes,
        schools: fc(&[point(
            r#""id":"S1","name":"East school""#,
            [-34.9965, 42.0001],
        )]),
        homes: fc(&[point(r#""id":"h1","children":2"#, [-34.9995, 42.0001])]),
        ..RawLayers::default()
    };
    match run_audit(&raw, config, &mut Silent) {
        Ok(out) => out,
        Err(e) => panic!("audit failed: {e}"),
    }
}

fn column(text: &str, name: &str) -> Vec<String> {
    // A `# caution` first line, where an export carries one, is skipped.
    let mut r = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(text.as_bytes());
    let Some(k) = r
        .headers()
        .ok()
        .and_then(|h| h.iter().position(|x| x == name))
    else {
        return Vec::new();
    };
    r.records()
        .filter_map(|x| x.ok())
        .map(|rec| rec.get(k).unwrap_or("").to_string())
        .collect()
}

/// § 447.4(a)(3): "two or more tracks" and "not protected by a flashing light signal or a
/// crossing guard" give a candidate whose train times, speed and sight distance are checked
/// on site. Worked by hand: two unprotected tracks on the walked street -> one check; gates
/// or a single track -> none. The rail point is no road control: the crossing count stays 1.
#[test]
fn a_rail_crossing_on_the_route_is_a_candidate_with_a_site_check() {
    let at = [-34.997, 42.0];
    let rail = |props: &str| Some(fc(&[point(props, at)]));
    let out = four_way(rail(r#""id":"r1","rail_tracks":2"#), None, &pa_447());
    let homes = homes_csv(&out);
    let checks = column(&homes, "site_checks");
    assert!(
        checks[0].contains("447.4(a)(3) (rail crossing r1, 2 tracks)")
            && checks[0].contains("sight distance"),
        "{checks:?}"
    );
    assert_eq!(column(&homes, "hazardous"), ["false"]);
    assert_eq!(column(&homes, "crossings"), ["1"]);
    for props in [
        r#""id":"r1","rail_tracks":2,"rail_warning":"gates""#,
        r#""id":"r1","rail_tracks":1"#,
    ] {
        let out = four_way(rail(props), None, &pa_447());
        let checks = column(&homes_csv(&out), "site_checks");
        assert!(!checks[0].contains("447.4(a)(3)"), "{props}: {checks:?}");
    }
}

/// § 447.4(a)(1): "two or more pedestrian-related accidents ... during the last 3 years ...
/// during hours students are normally going to or from school". Worked by hand: two
/// pedestrian crashes 5 m from the junction at school times, 2024 and 2025 -> both join
/// the junction's crossings: the hotspot of the side-street crossing shows 2 crashes
/// (1 killed or seriously injured) beside its modelled risk, and the home gets a check.
/// With the second at noon, or in 2019 (over 3 years before the latest), no check.
#[test]
fn crashes_near_a_crossing_show_on_its_hotspot_and_make_a_candidate() {
    let near = [MID[0] + 0.00003, 42.00003]; // about 5 m from the junction
    assert!(distance_m(near, MID) < 15.0);
    let crash = |date: &str, time: &str, sev: &str| {
        point(
            &format!(
                r#""date":"{date}","time":"{time}","severity":"{sev}","pedestrian":true,"age":9"#
            ),
            near,
        )
    };
    let out = four_way(
        None,
        Some(fc(&[
            crash("2024-10-03", "08:05", "A"),
            crash("2025-03-12", "15:10", "C"),
        ])),
        &pa_447(),
    );
    let hot = hotspots_csv(&out);
    let kinds = column(&hot, "kind");
    let crashes = column(&hot, "crashes");
    let ksi = column(&hot, "crashes_ksi");
    let i = kinds
        .iter()
        .position(|k| k == "crossing")
        .unwrap_or(usize::MAX);
    assert_eq!(
        (
            crashes.get(i).map(String::as_str),
            ksi.get(i).map(String::as_str)
        ),
        (Some("2"), Some("1")),
        "{hot}"
    );
    let checks = column(&homes_csv(&out), "site_checks");
    assert!(
        checks[0].contains("447.4(a)(1) (2 pedestrian crashes joined to the route)"),
        "{checks:?}"
    );
    for (d2, t2) in [("2025-03-12", "12:00"), ("2019-03-12", "08:00")] {
        let out = four_way(
            None,
            Some(fc(&[crash("2024-10-03", "08:05", "A"), crash(d2, t2, "C")])),
            &pa_447(),
        );
        let checks = column(&homes_csv(&out), "site_checks");
        assert!(!checks[0].contains("447.4(a)(1)"), "{d2} {t2}: {checks:?}");
    }
}

/// 24 P.S. § 13-1362: elementary pupils within 1.5 miles (2,414 m) walk; the default walk
/// zone is 1,600 m. Worked by hand: a home about 1.2 miles (1,950 m) along one street from
/// an elementary school is in pa-447's walk zone and outside the default one; a school of
/// grades 7-12 (secondary, § 447.2) has a 2-mile (3,219 m) zone.
#[test]
fn a_home_between_one_and_one_and_a_half_miles() {
    let far = [-34.9766, 42.0];
    let run = |school_props: &str, config: &Config| {
        let raw = RawLayers {
            streets: fc(&[line(
                "long",
                r#""class":"local","speed_kmh":40,"lanes":2,"sidewalk":"both""#,
                &[WEST, far],
            )]),
            schools: fc(&[point(school_props, [far[0] - 0.0001, 42.0001])]),
            homes: fc(&[point(r#""id":"h1""#, [WEST[0] + 0.0001, 42.0001])]),
            ..RawLayers::default()
        };
        match run_audit(&raw, config, &mut Silent) {
            Ok(out) => homes_csv(&out),
            Err(e) => panic!("audit failed: {e}"),
        }
    };
    let network_m = distance_m([WEST[0] + 0.0001, 42.0], [far[0] - 0.0001, 42.0]);
    assert!((1609.344..2414.016).contains(&network_m), "{network_m}");
    let pa = run(r#""id":"S1""#, &pa_447());
    assert_eq!(column(&pa, "in_walk_zone"), ["true"]);
    assert_eq!(column(&pa, "walk_zone_m"), ["2414.02"]);
    let default = run(r#""id":"S1""#, &Config::default());
    assert_eq!(column(&default, "in_walk_zone"), ["false"]);
    let secondary = run(r#""id":"S1","grades":"7-12""#, &pa_447());
    assert_eq!(column(&secondary, "walk_zone_m"), ["3218.69"]);
    let pa_set = RuleSet::builtin("pa-447").unwrap_or_default();
    assert!((pa_set.walk_zone_for(Students::Secondary, 0.0) - 2.0 * 1609.344).abs() < 1e-9);
}
