//! The `catchwalk` command line: parses arguments, reads files, calls the library, writes
//! files and prints. No audit logic lives here.

use catchwalk::config::Config;
use catchwalk::error::LayerName;
use catchwalk::export;
use catchwalk::export::atomic::{check_out_dir, OutputDir};
use catchwalk::input::per_layer::{self, LayerFile, PerLayer};
use catchwalk::input::{Preset, RawLayers};
use catchwalk::pipeline::{check_layers, run_audit, AuditOutput, Progress, Stage};
use catchwalk::score::plan::plan_upgrades;
use catchwalk::score::rules::RuleSet;
use clap::{Args, Parser, Subcommand, ValueEnum};
use indicatif::{ProgressBar, ProgressStyle};
use std::io::IsTerminal;
use std::path::{Path, PathBuf};
use std::process::ExitCode;
use std::time::Instant;

/// Prints a line to stdout; a closed pipe (`catchwalk ... | head`) ends the output quietly
/// instead of panicking.
macro_rules! say {
    ($($t:tt)*) => {{
        use std::io::Write;
        let _ = writeln!(std::io::stdout(), $($t)*);
    }};
}

/// Audits children's walking routes to school: which children live within walking distance,
/// the route they would walk, what it makes them cross, and how risky that is.
///
/// A screening tool for planning: it does not replace a site assessment, engineering
/// judgement, local design codes or a licensed traffic engineer.
#[derive(Parser)]
#[command(name = "catchwalk", version, about, long_about)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand)]
enum Command {
    /// Route every home to its school and write the audit (summary.json, homes.csv,
    /// flows.geojson, qa.geojson, centrelines.geojson, catchments and hotspots) to --out.
    Audit {
        #[command(flatten)]
        layers: LayerArgs,
        /// Also write routes.geojson: every home's routes as lines (personal data: one line
        /// per home; large). By default only flows.geojson, children per side and crossing.
        #[arg(long)]
        route_lines: bool,
        /// Folder for the outputs (created if missing).
        #[arg(long, value_name = "DIR")]
        out: PathBuf,
    },
    /// Choose up to --budget upgrades (signal, guard, refuge, speed reduction, sidewalk) that
    /// give the most children a safe route; writes plan.json and plan.csv to --out.
    Plan {
        #[command(flatten)]
        layers: LayerArgs,
        /// How many upgrades to choose (a whole number, 0 or more).
        #[arg(long, value_name = "N", allow_negative_numbers = true, value_parser = parse_budget)]
        budget: usize,
        /// Folder for the outputs (created if missing).
        #[arg(long, value_name = "DIR")]
        out: PathBuf,
    },
    /// Compare two audit output folders (before, after) per catchment: children in the walk
    /// zone, with a safe route, on hazardous routes, mean risk and active minutes, homes whose
    /// route changed, children who gained or lost a safe route. Writes comparison.json and
    /// comparison.csv to --out if given.
    Compare {
        /// The audit output folder before the change (holds homes.csv).
        before: PathBuf,
        /// The audit output folder after the change.
        after: PathBuf,
        #[arg(long, value_name = "DIR")]
        out: Option<PathBuf>,
    },
    /// Project files: one file holding the layers, settings, scenarios, notes and photos.
    Project {
        #[command(subcommand)]
        action: ProjectAction,
    },
    /// Write one layer file (GeoJSON with a crs member, a Shapefile .zip or .shp, an
    /// .osm.pbf) as the WGS84 GeoJSON the audit reads it as.
    Convert {
        /// Which layer the file is (streets, crossings, schools, homes, catchments), for messages.
        #[arg(long, default_value = "streets")]
        layer: String,
        /// The layer file.
        #[arg(long = "in", value_name = "FILE")]
        input: PathBuf,
        /// Coordinate system of a file that states none (EPSG:N or a proj string).
        #[arg(long, value_name = "EPSG:N")]
        crs: Option<String>,
        /// The GeoJSON file to write.
        #[arg(long, value_name = "FILE")]
        out: PathBuf,
    },
    /// Validate the layers and report network QA only (qa.geojson to --out if given).
    Check {
        #[command(flatten)]
        layers: LayerArgs,
        #[arg(long, value_name = "DIR")]
        out: Option<PathBuf>,
    },
}

#[derive(Subcommand)]
enum ProjectAction {
    /// Make a project file from layer files (and, optionally, scenarios, notes and photos).
    New {
        #[command(flatten)]
        layers: LayerArgs,
        /// A named scenario from an interventions file (repeatable).
        #[arg(long = "add-scenario", value_name = "NAME=FILE")]
        scenarios: Vec<String>,
        /// Site-visit notes (GeoJSON, as the page exports them).
        #[arg(long, value_name = "FILE")]
        notes: Option<PathBuf>,
        /// A photo to keep in the project (repeatable); notes refer to it by file name.
        #[arg(long = "photo", value_name = "FILE")]
        photos: Vec<PathBuf>,
        /// The project file to write.
        #[arg(long, value_name = "FILE")]
        out: PathBuf,
    },
}

#[derive(Clone, Copy, ValueEnum)]
enum PresetArg {
    /// OpenStreetMap tags (highway, maxspeed, sidewalk, crossing, ...).
    Osm,
    /// catchwalk's own property names (class, speed_kmh, sidewalk, control, ...).
    Plain,
}

#[derive(Args)]
struct LayerArgs {
    /// Streets: GeoJSON LineStrings, a Shapefile (.zip, or .shp with its .dbf/.shx/.prj beside
    /// it) or an OpenStreetMap .osm.pbf. Any layer takes these formats.
    #[arg(long, value_name = "FILE", required_unless_present = "project")]
    streets: Option<PathBuf>,
    /// Schools: GeoJSON Points or Polygons.
    #[arg(long, value_name = "FILE", required_unless_present = "project")]
    schools: Option<PathBuf>,
    /// Homes: GeoJSON Points, or CSV with lon/lat columns (told apart by content).
    #[arg(long, value_name = "FILE", required_unless_present = "project")]
    homes: Option<PathBuf>,
    /// Crossing points: GeoJSON Points with their traffic control.
    #[arg(long, value_name = "FILE")]
    crossings: Option<PathBuf>,
    /// Catchment polygons carrying the school id.
    #[arg(long, value_name = "FILE")]
    catchments: Option<PathBuf>,
    /// Observed crashes: GeoJSON Points (date, time, severity K/A/B/C/O, pedestrian,
    /// cyclist, age); personal data, shared exports carry counts only.
    #[arg(long, value_name = "FILE")]
    crashes: Option<PathBuf>,
    /// Property names for layers whose properties do not tell (each layer's names are
    /// detected: `highway` tags read as OpenStreetMap, `class`/`id`/`name` as plain).
    #[arg(long, value_enum, default_value = "plain")]
    preset: PresetArg,
    /// Property names chosen per layer, overriding detection: LAYER=osm|plain, comma-separated
    /// or repeated (e.g. --names streets=osm,schools=plain).
    #[arg(long, value_name = "LAYER=osm|plain")]
    names: Vec<String>,
    /// Coordinate system of a layer whose file does not state it (no .prj, no GeoJSON crs):
    /// LAYER=EPSG:N for one layer, EPSG:N for every layer; a proj string also works. Repeatable.
    #[arg(long, value_name = "[LAYER=]EPSG:N")]
    crs: Vec<String>,
    /// A field-mapping file (JSON) for a layer with its own property names.
    #[arg(long, value_name = "FILE")]
    mapping: Option<PathBuf>,
    /// A config file (JSON) overriding defaults (walk zone, walking speed, detour cap, ...).
    #[arg(long, value_name = "FILE")]
    config: Option<PathBuf>,
    /// Safe-route rule set: a shipped name (default, pa-447) or a rule-set JSON file.
    #[arg(long, value_name = "NAME|FILE")]
    rules: Option<String>,
    /// What-if interventions (GeoJSON, `kind` property), applied as an overlay on the layers.
    #[arg(long, value_name = "FILE")]
    interventions: Option<PathBuf>,
    /// A project file (made by `catchwalk project new` or the page): its layers and settings
    /// replace the layer options (--config and --rules still override its settings).
    #[arg(long, value_name = "FILE", conflicts_with_all = ["streets", "schools", "homes", "crossings", "catchments", "mapping"])]
    project: Option<PathBuf>,
    /// The project's scenario to apply (its interventions, by name).
    #[arg(long, value_name = "NAME", requires = "project")]
    scenario: Option<String>,
    /// Also apply the observed corrections of the project's site-visit notes.
    #[arg(long, requires = "project")]
    observations: bool,
}

/// `--budget`: a whole number of upgrades, with a message that says so.
fn parse_budget(s: &str) -> Result<usize, String> {
    s.trim().parse::<usize>().map_err(|_| {
        format!("--budget {s}: give how many upgrades to choose, a whole number 0 or more (for example --budget 5)")
    })
}

fn read(path: &Path) -> Result<String, String> {
    let bytes = std::fs::read(path).map_err(|e| format!("cannot read {}: {e}", path.display()))?;
    catchwalk::input::text::decode_utf8(&path.display().to_string(), &bytes)
}

fn read_opt(path: &Option<PathBuf>) -> Result<Option<String>, String> {
    path.as_deref().map(read).transpose()
}

/// A layer file in a binary format (zip, shp, pbf) as bytes, with a bare .shp's sidecars.
fn layer_file(layer: LayerName, path: &Path) -> Result<Option<LayerFile>, String> {
    let ext = path
        .extension()
        .and_then(|e| e.to_str())
        .unwrap_or("")
        .to_ascii_lowercase();
    if !matches!(ext.as_str(), "zip" | "shp" | "pbf") {
        return Ok(None);
    }
    let bytes =
        |p: &Path| std::fs::read(p).map_err(|e| format!("cannot read {}: {e}", p.display()));
    let name = |p: &Path| {
        p.file_name()
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_default()
    };
    let mut files = vec![(name(path), bytes(path)?)];
    if ext == "shp" {
        for side in ["shx", "dbf", "prj"] {
            let found = [side.to_string(), side.to_ascii_uppercase()]
                .into_iter()
                .map(|e| path.with_extension(e))
                .find(|p| p.exists());
            if let Some(p) = found {
                files.push((name(&p), bytes(&p)?));
            }
        }
    }
    Ok(Some(LayerFile { layer, files }))
}

fn per_layer(a: &LayerArgs) -> Result<PerLayer, String> {
    let mut per = PerLayer::default();
    for (layer, path) in [
        (LayerName::Streets, a.streets.as_ref()),
        (LayerName::Crossings, a.crossings.as_ref()),
        (LayerName::Schools, a.schools.as_ref()),
        (LayerName::Homes, a.homes.as_ref()),
        (LayerName::Catchments, a.catchments.as_ref()),
    ] {
        if let Some(f) = path.map(|p| layer_file(layer, p)).transpose()?.flatten() {
            per.files.push(f);
        }
    }
    for n in &a.names {
        per.names
            .extend(per_layer::parse_names(n).map_err(|e| format!("--names: {e}"))?);
    }
    for c in &a.crs {
        per.crs
            .push(per_layer::parse_crs(c).map_err(|e| format!("--crs: {e}"))?);
    }
    Ok(per)
}

/// A layer's text, or nothing when the layer is read from a binary file.
fn read_text(path: &Path, per: &PerLayer) -> Result<String, String> {
    let binary = per.files.iter().any(|f| {
        f.files.first().map(|(n, _)| n.as_str()) == path.file_name().and_then(|n| n.to_str())
    });
    if binary {
        Ok(String::new())
    } else {
        read(path)
    }
}

fn raw_layers(a: &LayerArgs) -> Result<(RawLayers, Config), String> {
    let (mut raw, project_config) = match &a.project {
        Some(path) => {
            let bytes =
                std::fs::read(path).map_err(|e| format!("cannot read {}: {e}", path.display()))?;
            let p = catchwalk::project::read_project(&bytes)
                .map_err(|e| format!("{}: {e}", path.display()))?;
            let iv = p
                .interventions(a.scenario.as_deref(), a.observations)
                .map_err(|e| e.to_string())?;
            (p.layers.raw(iv), p.config)
        }
        None => {
            let per = per_layer(a)?;
            let text = |p: &Path| read_text(p, &per);
            let text_opt = |p: &Option<PathBuf>| p.as_deref().map(text).transpose();
            let required = |p: &Option<PathBuf>, flag: &str| match p {
                Some(p) => text(p),
                None => Err(format!("{flag} FILE is required (or give --project FILE)")),
            };
            let homes = required(&a.homes, "--homes")?;
            let raw = RawLayers {
                streets: required(&a.streets, "--streets")?,
                crossings: text_opt(&a.crossings)?,
                schools: required(&a.schools, "--schools")?,
                // GeoJSON or CSV by content, whatever the extension (a CSV named .txt).
                homes_format: catchwalk::input::homes_csv::sniff_format(&homes),
                homes,
                catchments: text_opt(&a.catchments)?,
                crashes: read_opt(&a.crashes)?,
                preset: match a.preset {
                    PresetArg::Osm => Preset::Osm,
                    PresetArg::Plain => Preset::Plain,
                },
                mapping: read_opt(&a.mapping)?,
                interventions: None,
                per_layer: per,
            };
            (raw, None)
        }
    };
    if let Some(text) = read_opt(&a.interventions)? {
        raw.interventions = Some(text);
    }
    let mut config = match (&a.config, project_config) {
        (Some(p), _) => Config::from_json(&read(p)?).map_err(|e| e.to_string())?,
        (None, Some(v)) => Config::from_json(&v.to_string()).map_err(|e| e.to_string())?,
        (None, None) => Config::default(),
    };
    if let Some(r) = &a.rules {
        config.score.rules = match RuleSet::builtin(r) {
            Some(set) => set,
            None => {
                let text = read(Path::new(r)).map_err(|e| {
                    format!("--rules: {e}; give a shipped rule set (default, pa-447) or a rule-set JSON file")
                })?;
                RuleSet::from_json(&text).map_err(|e| e.to_string())?
            }
        };
    }
    Ok((raw, config))
}

/// A terminal progress bar, silent when stderr is not a terminal.
struct Bar {
    bar: ProgressBar,
    start: Instant,
    stage: Option<Stage>,
}

impl Bar {
    fn new() -> Self {
        let bar = if std::io::stderr().is_terminal() {
            ProgressBar::new(1)
        } else {
            ProgressBar::hidden()
        };
        bar.set_style(
            ProgressStyle::with_template("{msg:>10} [{bar:30}] {pos}/{len} {elapsed}")
                .unwrap_or_else(|_| ProgressStyle::default_bar())
                .progress_chars("=> "),
        );
        Bar {
            bar,
            start: Instant::now(),
            stage: None,
        }
    }
}

impl Progress for Bar {
    fn report(&mut self, stage: Stage, done: usize, total: usize) -> bool {
        if self.stage != Some(stage) {
            self.stage = Some(stage);
            self.bar.set_message(format!("{stage:?}").to_lowercase());
        }
        self.bar.set_length(total as u64);
        self.bar.set_position(done as u64);
        true
    }
    fn now_ms(&self) -> f64 {
        self.start.elapsed().as_secs_f64() * 1000.0
    }
}

/// Writes `files` into a new folder and swaps it in for `out` whole (export::atomic).
fn write_all(out: &Path, files: &[(String, String)]) -> Result<(), String> {
    let dir = OutputDir::begin(out)?;
    for (name, text) in files {
        dir.write(name, text)?;
    }
    dir.commit()
}

/// One output file of an audit, written into the new folder when called.
type FileJob<'a> = Box<dyn Fn() -> Result<(), String> + Send + Sync + 'a>;

/// Writes every audit output into `dir`, the files side by side on the machine's cores (a
/// large file is built in blocks joined in order, so no file's bytes depend on the thread
/// count). The tables come first, then the large layers, so that the last to start are the
/// quick ones.
fn write_audit_files(
    dir: &OutputDir,
    result: &AuditOutput,
    route_lines: bool,
) -> Result<(), String> {
    use rayon::prelude::*;
    type Writer = fn(&AuditOutput, &mut dyn std::io::Write) -> std::io::Result<()>;
    let streamed = |name: &'static str, f: Writer| -> FileJob<'_> {
        Box::new(move || dir.write_with(name, |w| f(result, w)))
    };
    // The tables first: each is built whole and then handed to the system in one write, which
    // then overlaps the building of the others.
    let mut jobs: Vec<FileJob<'_>> = vec![
        Box::new(|| dir.write("homes.csv", &export::homes_csv(result))),
        Box::new(|| dir.write("hotspots.csv", &export::hotspots_csv(result))),
    ];
    if route_lines {
        jobs.push(streamed("routes.geojson", export::write_routes_geojson));
    }
    jobs.push(streamed(
        "centrelines.geojson",
        export::write_centrelines_geojson,
    ));
    jobs.push(streamed("hotspots.geojson", export::write_hotspots_geojson));
    jobs.push(streamed(
        "flows.geojson",
        export::flows::write_flows_geojson,
    ));
    jobs.push(Box::new(|| {
        dir.write("summary.json", &json(&export::summary_json(result)))
    }));
    jobs.push(Box::new(|| {
        dir.write("qa.geojson", &json(&export::qa_geojson(&result.network.qa)))
    }));
    jobs.push(Box::new(|| {
        dir.write("catchments.csv", &export::catchments_csv(result))
    }));
    jobs.push(Box::new(|| {
        metadata_files(export::csvw::audit_metadata())
            .iter()
            .try_for_each(|(name, text)| dir.write(name, text))
    }));
    jobs.par_iter().with_max_len(1).try_for_each(|job| job())
}

/// The CSV on the Web metadata files beside the CSVs (export::csvw).
fn metadata_files(meta: Vec<(String, serde_json::Value)>) -> Vec<(String, String)> {
    meta.into_iter().map(|(n, v)| (n, json(&v))).collect()
}

fn json<T: serde::Serialize>(v: &T) -> String {
    serde_json::to_string_pretty(v).unwrap_or_default()
}

fn run(cli: Cli) -> Result<(), String> {
    match cli.command {
        Command::Audit {
            layers,
            route_lines,
            out,
        } => {
            check_out_dir(&out)?;
            let (raw, config) = raw_layers(&layers)?;
            let mut bar = Bar::new();
            let result = run_audit(&raw, &config, &mut bar).map_err(|e| e.to_string())?;
            bar.bar.finish_and_clear();
            let dir = OutputDir::begin(&out)?;
            write_audit_files(&dir, &result, route_lines)?;
            dir.commit()?;
            print_balance(&result);
            for w in &result.warnings {
                eprintln!("warning: {w}");
            }
            let not_reached = result.homes.iter().filter(|h| h.shortest.is_none()).count();
            say!(
                "audited {} homes ({} reached, {not_reached} not reached) for {} schools in {:.0} ms; wrote {}",
                result.homes.len(),
                result.homes.len() - not_reached,
                result.layers.schools.len(),
                result.timings.total_ms,
                out.display()
            );
            say!("{}", catchwalk::CAUTION);
            // The process ends here: leave the district's memory to the system at exit rather
            // than free it piece by piece (tens of milliseconds on a county).
            std::mem::forget(result);
            std::mem::forget(raw);
            Ok(())
        }
        Command::Plan {
            layers,
            budget,
            out,
        } => {
            check_out_dir(&out)?;
            let (raw, config) = raw_layers(&layers)?;
            let mut bar = Bar::new();
            let result = run_audit(&raw, &config, &mut bar).map_err(|e| e.to_string())?;
            bar.bar.finish_and_clear();
            let plan = plan_upgrades(&result, &result.scores.homes, budget);
            let mut files = vec![
                ("plan.json".into(), json(&export::plan_json(&result, &plan))),
                ("plan.csv".into(), export::plan_csv(&plan)),
                (
                    "interventions.geojson".into(),
                    json(&catchwalk::scenario::from_plan::plan_interventions(
                        &result, &plan,
                    )),
                ),
            ];
            files.extend(metadata_files(vec![export::csvw::plan_metadata()]));
            write_all(&out, &files)?;
            say!("rank upgrade          children_gained  street");
            for s in &plan.steps {
                say!(
                    "{:>4} {:<16} {:>15}  {} (edge {})",
                    s.rank,
                    s.upgrade.as_str(),
                    s.children_gained,
                    s.street,
                    s.edge
                );
            }
            let share = |x: f64| {
                if plan.children_routed > 0.0 {
                    format!("{:.1} %", 100.0 * x / plan.children_routed)
                } else {
                    "-".into()
                }
            };
            say!(
                "safe-route share: {} before, {} after ({} of {} routed children safe); wrote {}",
                share(plan.safe_children_before),
                share(plan.safe_children_after),
                plan.safe_children_after,
                plan.children_routed,
                out.display()
            );
            say!("{}", catchwalk::CAUTION);
            Ok(())
        }
        Command::Compare { before, after, out } => {
            let homes = |d: &Path| read(&d.join("homes.csv"));
            let c = catchwalk::compare::compare_homes(&homes(&before)?, &homes(&after)?)
                .map_err(|e| e.to_string())?;
            if let Some(out) = out {
                check_out_dir(&out)?;
                write_all(
                    &out,
                    &[
                        ("comparison.json".into(), json(&c)),
                        (
                            "comparison.csv".into(),
                            catchwalk::compare::comparison_csv(&c),
                        ),
                        {
                            let (name, meta) = catchwalk::compare::comparison_metadata();
                            (name, json(&meta))
                        },
                    ],
                )?;
            }
            print_comparison(&c);
            Ok(())
        }
        Command::Project {
            action:
                ProjectAction::New {
                    layers,
                    scenarios,
                    notes,
                    photos,
                    out,
                },
        } => {
            let (raw, config) = raw_layers(&layers)?;
            let mut project = catchwalk::project::Project {
                layers: catchwalk::project::ProjectLayers::from_raw(raw),
                config: serde_json::to_value(&config).ok(),
                ..Default::default()
            };
            for s in &scenarios {
                let Some((name, file)) = s.split_once('=') else {
                    return Err(format!("--add-scenario '{s}': write NAME=FILE"));
                };
                let text = read(Path::new(file))?;
                catchwalk::scenario::read::read_interventions(&text)
                    .map_err(|e| format!("scenario '{name}': {e}"))?;
                project.scenarios.push(catchwalk::project::Scenario {
                    name: name.to_string(),
                    interventions: text,
                });
            }
            if let Some(n) = &notes {
                project.notes = catchwalk::project::notes::read_notes_geojson(&read(n)?)
                    .map_err(|e| e.to_string())?;
            }
            for p in &photos {
                let bytes =
                    std::fs::read(p).map_err(|e| format!("cannot read {}: {e}", p.display()))?;
                let name = p
                    .file_name()
                    .map(|n| n.to_string_lossy().into_owned())
                    .unwrap_or_default();
                let ext = p
                    .extension()
                    .map(|e| e.to_string_lossy().to_ascii_lowercase())
                    .unwrap_or_default();
                let media_type = match ext.as_str() {
                    "jpg" | "jpeg" => "image/jpeg",
                    "png" => "image/png",
                    "webp" => "image/webp",
                    _ => "application/octet-stream",
                };
                project.photos.push(catchwalk::project::Photo {
                    name,
                    media_type: media_type.into(),
                    bytes,
                });
            }
            let bytes = catchwalk::project::write_project(&project).map_err(|e| e.to_string())?;
            std::fs::write(&out, bytes)
                .map_err(|e| format!("cannot write {}: {e}", out.display()))?;
            say!(
                "wrote {} ({} scenario(s), {} note(s), {} photo(s))",
                out.display(),
                project.scenarios.len(),
                project.notes.len(),
                project.photos.len()
            );
            Ok(())
        }
        Command::Convert {
            layer,
            input,
            crs,
            out,
        } => {
            let layer = per_layer::layer_named(&layer).ok_or_else(|| {
                format!("--layer: '{layer}' is not a layer (streets, crossings, schools, homes, catchments)")
            })?;
            let file = match layer_file(layer, &input)? {
                Some(f) => f,
                None => LayerFile {
                    layer,
                    files: vec![(
                        input.display().to_string(),
                        std::fs::read(&input)
                            .map_err(|e| format!("cannot read {}: {e}", input.display()))?,
                    )],
                },
            };
            let text = catchwalk::input::prepare::layer_geojson(&file, crs.as_deref())
                .map_err(|e| e.to_string())?;
            std::fs::write(&out, text)
                .map_err(|e| format!("cannot write {}: {e}", out.display()))?;
            say!("wrote {}", out.display());
            Ok(())
        }
        Command::Check { layers, out } => {
            if let Some(out) = &out {
                check_out_dir(out)?;
            }
            let (raw, config) = raw_layers(&layers)?;
            let mut bar = Bar::new();
            let result = check_layers(&raw, &config, &mut bar).map_err(|e| e.to_string())?;
            bar.bar.finish_and_clear();
            for w in &result.warnings {
                eprintln!("warning: {w}");
            }
            let mut s =
                export::network_summary(&result.layers, &result.network.graph, &result.network.qa);
            s["warnings"] = serde_json::json!(result.warnings.len());
            say!("{}", json(&s));
            if let Some(out) = out {
                write_all(
                    &out,
                    &[(
                        "qa.geojson".into(),
                        json(&export::qa_geojson(&result.network.qa)),
                    )],
                )?;
            }
            Ok(())
        }
    }
}

/// Prints a comparison as a table (formatting only).
fn print_comparison(c: &catchwalk::compare::Comparison) {
    let num = |x: Option<f64>| x.map(|v| format!("{v:.2}")).unwrap_or("-".into());
    say!(
        "{:<12} {:>15} {:>15} {:>15} {:>13} {:>13} {:>8} {:>6} {:>5}",
        "school",
        "walk_zone",
        "safe_route",
        "hazardous",
        "risk/trip",
        "act_min",
        "changed",
        "gained",
        "lost"
    );
    let pair = |b: f64, a: f64| format!("{b} -> {a}");
    for k in &c.catchments {
        let (b, a) = (&k.before, &k.after);
        say!(
            "{:<12} {:>15} {:>15} {:>15} {:>13} {:>13} {:>8} {:>6} {:>5}",
            k.school_id,
            pair(b.children_in_walk_zone, a.children_in_walk_zone),
            pair(b.children_safe_route, a.children_safe_route),
            pair(b.children_hazardous, a.children_hazardous),
            format!(
                "{} -> {}",
                num(b.mean_risk_per_trip),
                num(a.mean_risk_per_trip)
            ),
            format!(
                "{} -> {}",
                num(b.mean_active_minutes),
                num(a.mean_active_minutes)
            ),
            k.children_route_changed,
            k.children_gained_safe_route,
            k.children_lost_safe_route
        );
    }
    say!(
        "{} homes' routes changed; {} gained and {} lost a safe route",
        c.homes_route_changed.len(),
        c.homes_gained_safe_route.len(),
        c.homes_lost_safe_route.len()
    );
    say!("{}", catchwalk::CAUTION);
}

/// Prints the per-catchment balance and the top hotspots (formatting only).
fn print_balance(r: &AuditOutput) {
    let pct = |x: Option<f64>| {
        x.map(|v| format!("{:.0}%", 100.0 * v))
            .unwrap_or("-".into())
    };
    let num = |x: Option<f64>| x.map(|v| format!("{v:.2}")).unwrap_or("-".into());
    say!(
        "{:<12} {:>8} {:>9} {:>6} {:>5} {:>10} {:>9} {:>8}  quadrant",
        "school",
        "children",
        "walk_zone",
        "safe",
        "gap",
        "risk/trip",
        "p90_risk",
        "act_min"
    );
    for c in &r.scores.catchments {
        let id = r.layers.schools.get(c.school).map_or("", |s| s.id.as_str());
        say!(
            "{:<12} {:>8} {:>9} {:>6} {:>5} {:>10} {:>9} {:>8}  {}",
            id,
            c.children,
            pct(c.walk_zone_share),
            pct(c.safe_route_share),
            pct(c.gap),
            num(c.mean_risk_per_trip),
            num(c.p90_risk_per_trip),
            num(c.mean_active_minutes),
            c.quadrant.as_str()
        );
    }
    say!("top hotspots (children x risk per trip):");
    for h in r.scores.hotspots.iter().take(10) {
        say!(
            "{:>3}. {:<8} {:<24} {:<16} {:>3.0} km/h {} lanes  children {:>4}  risk {:.2}  product {:.2}",
            h.rank, h.kind, h.street, h.control, h.speed_kmh, h.lanes, h.children, h.risk, h.product
        );
    }
}

fn main() -> ExitCode {
    match run(Cli::parse()) {
        Ok(()) => ExitCode::SUCCESS,
        Err(e) => {
            eprintln!("catchwalk: {e}");
            ExitCode::FAILURE
        }
    }
}
