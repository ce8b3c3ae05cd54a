//! The `catchwalk` command line: parses arguments, reads files, calls the library, writes
//! files and prints. No audit logic lives here.

use catchwalk::config::Config;
use catchwalk::export;
use catchwalk::input::{HomesFormat, Preset, RawLayers};
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
        /// How many upgrades to choose.
        #[arg(long, value_name = "N")]
        budget: usize,
        /// Folder for the outputs (created if missing).
        #[arg(long, value_name = "DIR")]
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

#[derive(Clone, Copy, ValueEnum)]
enum PresetArg {
    /// OpenStreetMap tags (highway, maxspeed, sidewalk, crossing, ...).
    Osm,
    /// catchwalk's own property names (class, speed_kmh, sidewalk, control, ...).
    Plain,
}

#[derive(Args)]
struct LayerArgs {
    /// Streets: GeoJSON LineStrings in WGS84 longitude/latitude.
    #[arg(long, value_name = "FILE")]
    streets: PathBuf,
    /// Schools: GeoJSON Points or Polygons.
    #[arg(long, value_name = "FILE")]
    schools: PathBuf,
    /// Homes: GeoJSON Points, or CSV with lon/lat columns (by the .csv extension).
    #[arg(long, value_name = "FILE")]
    homes: PathBuf,
    /// Crossing points: GeoJSON Points with their traffic control.
    #[arg(long, value_name = "FILE")]
    crossings: Option<PathBuf>,
    /// Catchment polygons carrying the school id.
    #[arg(long, value_name = "FILE")]
    catchments: Option<PathBuf>,
    /// How property names are read.
    #[arg(long, value_enum, default_value = "plain")]
    preset: PresetArg,
    /// A field-mapping file (JSON) for a layer with its own property names.
    #[arg(long, value_name = "FILE")]
    mapping: Option<PathBuf>,
    /// A config file (JSON) overriding defaults (walk zone, walking speed, detour cap, ...).
    #[arg(long, value_name = "FILE")]
    config: Option<PathBuf>,
    /// Safe-route rule set: a shipped name (default, pa-447) or a rule-set JSON file.
    #[arg(long, value_name = "NAME|FILE")]
    rules: Option<String>,
}

fn read(path: &Path) -> Result<String, String> {
    std::fs::read_to_string(path).map_err(|e| format!("cannot read {}: {e}", path.display()))
}

fn read_opt(path: &Option<PathBuf>) -> Result<Option<String>, String> {
    path.as_deref().map(read).transpose()
}

fn raw_layers(a: &LayerArgs) -> Result<(RawLayers, Config), String> {
    let homes_format = match a.homes.extension().and_then(|e| e.to_str()) {
        Some(e) if e.eq_ignore_ascii_case("csv") => HomesFormat::Csv,
        _ => HomesFormat::GeoJson,
    };
    let raw = RawLayers {
        streets: read(&a.streets)?,
        crossings: read_opt(&a.crossings)?,
        schools: read(&a.schools)?,
        homes: read(&a.homes)?,
        homes_format,
        catchments: read_opt(&a.catchments)?,
        preset: match a.preset {
            PresetArg::Osm => Preset::Osm,
            PresetArg::Plain => Preset::Plain,
        },
        mapping: read_opt(&a.mapping)?,
    };
    let mut config = match &a.config {
        Some(p) => Config::from_json(&read(p)?).map_err(|e| e.to_string())?,
        None => Config::default(),
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

fn write(dir: &Path, name: &str, text: &str) -> Result<(), String> {
    let p = dir.join(name);
    std::fs::write(&p, text).map_err(|e| format!("cannot write {}: {e}", p.display()))
}

/// Writes a large output straight to its file through a buffer, without the whole text in
/// memory first.
fn write_stream(
    dir: &Path,
    name: &str,
    body: impl FnOnce(&mut dyn std::io::Write) -> std::io::Result<()>,
) -> Result<(), String> {
    use std::io::Write;
    let p = dir.join(name);
    let fail = |e: std::io::Error| format!("cannot write {}: {e}", p.display());
    let mut w = std::io::BufWriter::new(std::fs::File::create(&p).map_err(fail)?);
    body(&mut w).map_err(fail)?;
    w.flush().map_err(fail)
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
            let (raw, config) = raw_layers(&layers)?;
            let mut bar = Bar::new();
            let result = run_audit(&raw, &config, &mut bar).map_err(|e| e.to_string())?;
            bar.bar.finish_and_clear();
            std::fs::create_dir_all(&out)
                .map_err(|e| format!("cannot create {}: {e}", out.display()))?;
            write(&out, "summary.json", &json(&export::summary_json(&result)))?;
            write(&out, "homes.csv", &export::homes_csv(&result))?;
            write_stream(&out, "flows.geojson", |w| {
                export::flows::write_flows_geojson(&result, w)
            })?;
            if route_lines {
                write_stream(&out, "routes.geojson", |w| {
                    serde_json::to_writer_pretty(w, &export::routes_geojson(&result))
                        .map_err(std::io::Error::from)
                })?;
            }
            write(
                &out,
                "qa.geojson",
                &json(&export::qa_geojson(&result.network.qa)),
            )?;
            write_stream(&out, "centrelines.geojson", |w| {
                serde_json::to_writer_pretty(w, &export::centrelines_geojson(&result))
                    .map_err(std::io::Error::from)
            })?;
            write(&out, "catchments.csv", &export::catchments_csv(&result))?;
            write(&out, "hotspots.csv", &export::hotspots_csv(&result))?;
            write_stream(&out, "hotspots.geojson", |w| {
                serde_json::to_writer_pretty(w, &export::hotspots_geojson(&result))
                    .map_err(std::io::Error::from)
            })?;
            print_balance(&result);
            for w in &result.warnings {
                eprintln!("warning: {w}");
            }
            say!(
                "audited {} homes for {} schools in {:.0} ms; wrote {}",
                result.homes.len(),
                result.layers.schools.len(),
                result.timings.total_ms,
                out.display()
            );
            say!("{}", catchwalk::CAUTION);
            Ok(())
        }
        Command::Plan {
            layers,
            budget,
            out,
        } => {
            let (raw, config) = raw_layers(&layers)?;
            let mut bar = Bar::new();
            let result = run_audit(&raw, &config, &mut bar).map_err(|e| e.to_string())?;
            bar.bar.finish_and_clear();
            let plan = plan_upgrades(&result, &result.scores.homes, budget);
            std::fs::create_dir_all(&out)
                .map_err(|e| format!("cannot create {}: {e}", out.display()))?;
            write(&out, "plan.json", &json(&export::plan_json(&result, &plan)))?;
            write(&out, "plan.csv", &export::plan_csv(&plan))?;
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
        Command::Check { layers, out } => {
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
                std::fs::create_dir_all(&out)
                    .map_err(|e| format!("cannot create {}: {e}", out.display()))?;
                write(
                    &out,
                    "qa.geojson",
                    &json(&export::qa_geojson(&result.network.qa)),
                )?;
            }
            Ok(())
        }
    }
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
