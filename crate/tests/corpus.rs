//! The committed corpus of broken and odd inputs (`tests/corpus/NN-name/`, written by
//! `tools/make_corpus.py`): each case's files go through the library as the CLI reads them,
//! and the outcome (error or warning, layer, feature, words) must be the one in its
//! `expected.json`. One more test runs the binary on every case for its exit code.

use catchwalk::config::Config;
use catchwalk::error::{Error, Location, Warning};
use catchwalk::input::homes_csv::sniff_format;
use catchwalk::input::text::decode_utf8;
use catchwalk::input::RawLayers;
use catchwalk::pipeline::{run_audit, Silent};
use serde_json::Value;
use std::path::{Path, PathBuf};

fn corpus() -> Vec<(PathBuf, Value)> {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("../tests/corpus");
    let mut cases: Vec<(PathBuf, Value)> = std::fs::read_dir(&dir)
        .expect("tests/corpus exists")
        .filter_map(|e| e.ok())
        .map(|e| e.path())
        .filter(|p| p.join("expected.json").is_file())
        .map(|p| {
            let text = std::fs::read_to_string(p.join("expected.json")).unwrap_or_default();
            let v: Value = serde_json::from_str(&text).expect("expected.json is JSON");
            (p, v)
        })
        .collect();
    cases.sort_by(|a, b| a.0.cmp(&b.0));
    cases
}

/// The homes file of a case (GeoJSON or CSV, under whatever name).
fn homes_file(dir: &Path) -> Option<PathBuf> {
    ["homes.geojson", "homes.csv", "homes.txt", "homes.json"]
        .iter()
        .map(|n| dir.join(n))
        .find(|p| p.is_file())
}

/// Reads a case as the CLI does: bytes decoded as UTF-8, homes told apart by content.
fn read_case(dir: &Path) -> Result<(RawLayers, Config), String> {
    let read = |p: &Path| -> Result<String, String> {
        let bytes = std::fs::read(p).map_err(|e| e.to_string())?;
        decode_utf8(&p.display().to_string(), &bytes)
    };
    let opt = |n: &str| -> Result<Option<String>, String> {
        let p = dir.join(n);
        if p.is_file() {
            read(&p).map(Some)
        } else {
            Ok(None)
        }
    };
    let homes = match homes_file(dir) {
        Some(p) => read(&p)?,
        None => String::new(),
    };
    let raw = RawLayers {
        streets: read(&dir.join("streets.geojson"))?,
        schools: read(&dir.join("schools.geojson"))?,
        homes_format: sniff_format(&homes),
        homes,
        crossings: opt("crossings.geojson")?,
        catchments: opt("catchments.geojson")?,
        mapping: opt("mapping.json")?,
        ..RawLayers::default()
    };
    let config = match opt("config.json")? {
        Some(t) => Config::from_json(&t).map_err(|e| e.to_string())?,
        None => Config::default(),
    };
    Ok((raw, config))
}

fn words(v: &Value) -> Vec<String> {
    v["words"]
        .as_array()
        .map(|a| {
            a.iter()
                .filter_map(|w| w.as_str().map(String::from))
                .collect()
        })
        .unwrap_or_default()
}

fn location_matches(at: &Location, v: &Value) -> bool {
    let layer_ok = v["layer"]
        .as_str()
        .is_none_or(|l| at.layer.to_string() == l);
    let feature_ok = v["feature"]
        .as_u64()
        .is_none_or(|f| at.feature == Some(f as usize));
    layer_ok && feature_ok
}

fn error_location(e: &Error) -> Option<Location> {
    match e {
        Error::Input { at, .. } | Error::Projected { at, .. } => Some(at.clone()),
        Error::Parse { layer, .. } => Some(Location::layer(*layer)),
        _ => None,
    }
}

fn warning_matches(w: &Warning, v: &Value) -> bool {
    let text = w.to_string();
    location_matches(&w.at, v) && words(v).iter().all(|x| text.contains(x.as_str()))
}

/// The cells of `column` in a CSV text, read with the csv crate (header first).
fn column(text: &str, name: &str) -> Vec<String> {
    let mut r = csv::Reader::from_reader(text.as_bytes());
    let Some(i) = r
        .headers()
        .ok()
        .and_then(|h| h.iter().position(|c| c == name))
    else {
        return Vec::new();
    };
    r.records()
        .filter_map(|x| x.ok())
        .filter_map(|x| x.get(i).map(String::from))
        .collect()
}

#[test]
fn corpus_has_at_least_sixty_cases() {
    assert!(corpus().len() >= 60, "{} cases", corpus().len());
}

#[test]
fn every_case_gives_its_expected_outcome_through_the_library() {
    let mut failures = Vec::new();
    for (dir, v) in corpus() {
        if v["command"] != "audit" {
            continue; // command-line arguments: the binary test below
        }
        let name = dir
            .file_name()
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_default();
        let result = read_case(&dir).and_then(|(raw, config)| {
            run_audit(&raw, &config, &mut Silent).map_err(|e| {
                let loc = error_location(&e);
                let text = e.to_string();
                if loc.as_ref().is_some_and(|l| !location_matches(l, &v)) {
                    format!("{text} [at the wrong place: {loc:?}]")
                } else {
                    text
                }
            })
        });
        let max = v["max_message_chars"].as_u64().map(|m| m as usize);
        match (v["outcome"].as_str(), result) {
            (Some("error"), Err(text)) => {
                if text.contains("[at the wrong place")
                    || !words(&v).iter().all(|w| text.contains(w.as_str()))
                {
                    failures.push(format!(
                        "{name}: error '{text}' lacks {:?} or names the wrong place",
                        words(&v)
                    ));
                }
                if max.is_some_and(|m| text.chars().count() > m) {
                    failures.push(format!(
                        "{name}: error message {} characters long",
                        text.chars().count()
                    ));
                }
            }
            (Some("error"), Ok(_)) => {
                failures.push(format!("{name}: expected an error, the audit ran"))
            }
            (Some(kind), Err(text)) => {
                failures.push(format!("{name}: expected {kind}, got error '{text}'"))
            }
            (Some(kind), Ok(out)) => {
                if kind == "warning" && !out.warnings.iter().any(|w| warning_matches(w, &v)) {
                    let got: Vec<String> = out.warnings.iter().map(|w| w.to_string()).collect();
                    failures.push(format!(
                        "{name}: no warning with {:?} at {} {}: {got:?}",
                        words(&v),
                        v["layer"],
                        v["feature"]
                    ));
                }
                if kind == "ok" && !out.warnings.is_empty() {
                    let got: Vec<String> = out.warnings.iter().map(|w| w.to_string()).collect();
                    failures.push(format!("{name}: expected no warning, got {got:?}"));
                }
                if let Some(m) = max {
                    if let Some(w) = out
                        .warnings
                        .iter()
                        .find(|w| w.to_string().chars().count() > m)
                    {
                        failures.push(format!(
                            "{name}: warning {} characters long",
                            w.to_string().chars().count()
                        ));
                    }
                }
                for cell in v["csv_cells"].as_array().into_iter().flatten() {
                    let (file, col, want) = (
                        cell[0].as_str().unwrap_or(""),
                        cell[1].as_str().unwrap_or(""),
                        cell[2].as_str().unwrap_or(""),
                    );
                    let text = match file {
                        "homes.csv" => catchwalk::export::homes_csv(&out),
                        "catchments.csv" => catchwalk::export::catchments_csv(&out),
                        _ => catchwalk::export::hotspots_csv(&out),
                    };
                    if !column(&text, col).iter().any(|c| c == want) {
                        failures.push(format!(
                            "{name}: {file} column {col} has no cell {want:?}: {:?}",
                            column(&text, col)
                        ));
                    }
                }
            }
            (None, _) => failures.push(format!("{name}: expected.json has no outcome")),
        }
    }
    assert!(
        failures.is_empty(),
        "{} case(s) failed:\n{}",
        failures.len(),
        failures.join("\n")
    );
}

#[test]
fn every_case_gives_its_exit_code_and_words_through_the_binary() {
    let bin = env!("CARGO_BIN_EXE_catchwalk");
    let scratch = std::env::temp_dir().join(format!("cw-corpus-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&scratch);
    std::fs::create_dir_all(&scratch).expect("scratch folder");
    let mut failures = Vec::new();
    for (dir, v) in corpus() {
        let name = dir
            .file_name()
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_default();
        let mut cmd = std::process::Command::new(bin);
        cmd.arg(v["command"].as_str().unwrap_or("audit"));
        for a in v["args"].as_array().into_iter().flatten() {
            cmd.arg(a.as_str().unwrap_or(""));
        }
        cmd.arg("--streets").arg(dir.join("streets.geojson"));
        cmd.arg("--schools").arg(dir.join("schools.geojson"));
        cmd.arg("--homes")
            .arg(homes_file(&dir).unwrap_or_else(|| dir.join("homes.geojson")));
        for (flag, file) in [
            ("--crossings", "crossings.geojson"),
            ("--catchments", "catchments.geojson"),
            ("--mapping", "mapping.json"),
            ("--config", "config.json"),
        ] {
            if dir.join(file).is_file() {
                cmd.arg(flag).arg(dir.join(file));
            }
        }
        cmd.arg("--out").arg(scratch.join(&name));
        let out = match cmd.output() {
            Ok(o) => o,
            Err(e) => panic!("cannot run {bin}: {e}"),
        };
        let code = out.status.code().unwrap_or(-1);
        let want = v["exit_code"].as_i64().unwrap_or(0) as i32;
        let stderr = String::from_utf8_lossy(&out.stderr);
        if code != want {
            failures.push(format!(
                "{name}: exit code {code}, expected {want}: {stderr}"
            ));
        } else if !words(&v).iter().all(|w| stderr.contains(w.as_str())) {
            failures.push(format!("{name}: stderr lacks {:?}: {stderr}", words(&v)));
        }
        if want == 0
            && !scratch
                .join(&name)
                .join("homes.csv-metadata.json")
                .is_file()
            && v["command"] == "audit"
        {
            failures.push(format!("{name}: no homes.csv-metadata.json written"));
        }
    }
    let _ = std::fs::remove_dir_all(&scratch);
    assert!(
        failures.is_empty(),
        "{} case(s) failed:\n{}",
        failures.len(),
        failures.join("\n")
    );
}
