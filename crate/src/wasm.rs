//! wasm-bindgen surface for the page's worker: converts and forwards, no logic.
//!
//! The worker calls [`audit`] with the layers as text and a config as JSON, and gets one JSON
//! document back with every export the page shows. Errors come back as their one-line message.

use crate::config::Config;
use crate::error::{Error, Location};
use crate::export;
use crate::input::{HomesFormat, Preset, RawLayers};
use crate::pipeline::{run_audit, AuditOutput, Progress, Stage};
use crate::score::plan::plan_upgrades;
use serde::Deserialize;
use serde_json::{json, Value};
use wasm_bindgen::prelude::*;

/// The layers as the page sends them (field names match [`RawLayers`]).
#[derive(Deserialize)]
struct PageLayers {
    streets: String,
    #[serde(default)]
    crossings: Option<String>,
    schools: String,
    homes: String,
    #[serde(default)]
    homes_format: HomesFormat,
    #[serde(default)]
    catchments: Option<String>,
    #[serde(default)]
    preset: Preset,
    #[serde(default)]
    mapping: Option<String>,
    #[serde(default)]
    interventions: Option<String>,
}

impl From<PageLayers> for RawLayers {
    fn from(p: PageLayers) -> Self {
        RawLayers {
            streets: p.streets,
            crossings: p.crossings,
            schools: p.schools,
            homes: p.homes,
            homes_format: p.homes_format,
            catchments: p.catchments,
            preset: p.preset,
            mapping: p.mapping,
            interventions: p.interventions,
        }
    }
}

/// Forwards progress to a JS function `(stage, done, total) => boolean`; a falsy answer
/// cancels.
struct JsProgress<'a> {
    callback: &'a js_sys::Function,
}

impl Progress for JsProgress<'_> {
    fn report(&mut self, stage: Stage, done: usize, total: usize) -> bool {
        let stage = serde_json::to_value(stage)
            .ok()
            .and_then(|v| v.as_str().map(String::from))
            .unwrap_or_default();
        self.callback
            .call3(
                &JsValue::NULL,
                &JsValue::from_str(&stage),
                &JsValue::from_f64(done as f64),
                &JsValue::from_f64(total as f64),
            )
            .map(|v| v.is_truthy())
            .unwrap_or(true)
    }
    fn now_ms(&self) -> f64 {
        js_sys::Date::now()
    }
}

fn to_js(e: impl std::fmt::Display) -> JsValue {
    JsValue::from_str(&json!({ "message": e.to_string(), "at": null }).to_string())
}

/// An audit error as `{message, at}`, `at` naming the layer and feature when the error has one.
fn error_to_js(e: Error) -> JsValue {
    let at = match &e {
        Error::Input { at, .. } | Error::Projected { at, .. } => serde_json::to_value(at).ok(),
        Error::Parse { layer, .. } => serde_json::to_value(Location::layer(*layer)).ok(),
        _ => None,
    };
    JsValue::from_str(&json!({ "message": e.to_string(), "at": at }).to_string())
}

/// The default configuration as JSON (the page's settings start from it).
#[wasm_bindgen(js_name = defaultConfig)]
pub fn default_config() -> String {
    serde_json::to_string(&Config::default()).unwrap_or_default()
}

/// A rule set shipped with the core, by name (`default`, ...), as JSON; empty when unknown.
#[wasm_bindgen(js_name = ruleSet)]
pub fn rule_set(name: &str) -> String {
    crate::score::rules::RuleSet::builtin(name)
        .and_then(|r| serde_json::to_string(&r).ok())
        .unwrap_or_default()
}

/// The names of the rule sets shipped with the core.
#[wasm_bindgen(js_name = ruleSetNames)]
pub fn rule_set_names() -> Vec<String> {
    crate::score::rules::BUILTIN
        .iter()
        .map(|(n, _)| n.to_string())
        .collect()
}

/// The caution every result carries.
#[wasm_bindgen]
pub fn caution() -> String {
    crate::CAUTION.to_string()
}

/// Reads the page's layers and config and runs the audit.
fn run(
    layers_json: &str,
    config_json: &str,
    progress: &js_sys::Function,
) -> Result<AuditOutput, JsValue> {
    let page: PageLayers = serde_json::from_str(layers_json).map_err(to_js)?;
    let raw: RawLayers = page.into();
    let config = if config_json.trim().is_empty() {
        Config::default()
    } else {
        Config::from_json(config_json).map_err(error_to_js)?
    };
    let mut p = JsProgress { callback: progress };
    run_audit(&raw, &config, &mut p).map_err(error_to_js)
}

/// Runs the audit and the upgrade planner with a budget of `budget` upgrades; returns the
/// plan as the command line's `plan.json`.
#[wasm_bindgen]
pub fn plan(
    layers_json: &str,
    config_json: &str,
    budget: usize,
    progress: &js_sys::Function,
) -> Result<String, JsValue> {
    let out = run(layers_json, config_json, progress)?;
    let plan = plan_upgrades(&out, &out.scores.homes, budget);
    let mut doc = export::plan_json(&out, &plan);
    doc["interventions"] = crate::scenario::from_plan::plan_interventions(&out, &plan);
    serde_json::to_string(&doc).map_err(to_js)
}

/// The page's audit document; the large collections serialise straight to text.
#[derive(serde::Serialize)]
struct AuditDoc<'a> {
    summary: Value,
    homes_csv: String,
    catchments_csv: String,
    hotspots_csv: String,
    routes: export::layers_geojson::Collection<export::layers_geojson::RouteProps<'a>>,
    qa: Value,
    centrelines: export::layers_geojson::Collection<export::layers_geojson::SegmentProps<'a>>,
    hotspots: Value,
    layers: Value,
    warnings: &'a [crate::error::Warning],
    /// What a re-audit did (absent for a full audit).
    #[serde(skip_serializing_if = "Option::is_none")]
    reaudit: Option<Value>,
}

/// Runs the audit. `layers_json`: `{streets, crossings?, schools, homes, homes_format?,
/// catchments?, preset?, mapping?}` with each layer as text; `config_json`: a config
/// (empty for defaults). Returns one JSON: summary (with the catchment scores), the homes,
/// catchments and hotspots CSV tables, routes, QA, centrelines, hotspots, the validated layers and the warnings. An error comes
/// back as `{message, at}` JSON.
#[wasm_bindgen]
pub fn audit(
    layers_json: &str,
    config_json: &str,
    progress: &js_sys::Function,
) -> Result<String, JsValue> {
    let out = run(layers_json, config_json, progress)?;
    let doc = audit_doc(&out, None)?;
    LAST_AUDIT.with(|last| *last.borrow_mut() = Some(out));
    Ok(doc)
}

thread_local! {
    /// The last audit, which [`reaudit`] starts from (the worker is single-threaded).
    static LAST_AUDIT: std::cell::RefCell<Option<AuditOutput>> = const { std::cell::RefCell::new(None) };
}

fn audit_doc(out: &AuditOutput, extra: Option<Value>) -> Result<String, JsValue> {
    let doc = AuditDoc {
        summary: export::summary_json(out),
        homes_csv: export::homes_csv(out),
        catchments_csv: export::catchments_csv(out),
        hotspots_csv: export::hotspots_csv(out),
        routes: export::routes_geojson(out),
        qa: export::qa_geojson(&out.network.qa),
        centrelines: export::centrelines_geojson(out),
        hotspots: export::hotspots_geojson(out),
        layers: json!({
            "crossings": out.layers.crossings,
            "schools": out.layers.schools,
            "homes": out.layers.homes,
            "catchments": out.layers.catchments.iter()
                .map(|c| json!({ "feature": c.feature, "school_id": c.school_id }))
                .collect::<Vec<_>>(),
        }),
        warnings: &out.warnings,
        reaudit: extra,
    };
    serde_json::to_string(&doc).map_err(to_js)
}

/// Re-audits the last audit's layers with `interventions_geojson` (the scenario's whole list,
/// an interventions layer; empty text for none), re-routing only the schools the change
/// touches. Returns the same document as [`audit`] with `reaudit: {schools,
/// schools_rerouted, full, core_ms}`; the result becomes the last audit.
#[wasm_bindgen]
pub fn reaudit(
    interventions_geojson: &str,
    progress: &js_sys::Function,
) -> Result<String, JsValue> {
    let mut p = JsProgress { callback: progress };
    let t0 = js_sys::Date::now();
    let list = if interventions_geojson.trim().is_empty() {
        Vec::new()
    } else {
        crate::scenario::read::read_interventions(interventions_geojson).map_err(error_to_js)?
    };
    let result = LAST_AUDIT.with(|last| match last.borrow().as_ref() {
        Some(prev) => crate::scenario::reaudit::reaudit(prev, list, &mut p).map_err(error_to_js),
        None => Err(to_js("run an audit before a re-audit")),
    })?;
    let (out, stats) = result;
    let core_ms = js_sys::Date::now() - t0;
    let mut extra = serde_json::to_value(stats).map_err(to_js)?;
    extra["core_ms"] = json!(core_ms);
    let doc = audit_doc(&out, Some(extra))?;
    LAST_AUDIT.with(|last| *last.borrow_mut() = Some(out));
    Ok(doc)
}

/// Compares two audits' `homes_csv` (before, after) per catchment, as `catchwalk compare`
/// does; returns `comparison.json` as text.
#[wasm_bindgen(js_name = compareAudits)]
pub fn compare_audits(before_homes_csv: &str, after_homes_csv: &str) -> Result<String, JsValue> {
    let c =
        crate::compare::compare_homes(before_homes_csv, after_homes_csv).map_err(error_to_js)?;
    serde_json::to_string(&c).map_err(to_js)
}

/// Writes a project file (zip bytes) from the page's project JSON: `{layers, config,
/// scenarios: [{name, interventions}], notes, photos: [{name, media_type, bytes (base64)}]}`
/// (see `docs/project-format.md`).
#[wasm_bindgen(js_name = projectWrite)]
pub fn project_write(project_json: &str) -> Result<Vec<u8>, JsValue> {
    let p: crate::project::Project = serde_json::from_str(project_json).map_err(to_js)?;
    crate::project::write_project(&p).map_err(error_to_js)
}

/// Reads a project file (zip bytes) into the page's project JSON ([`project_write`]'s input).
#[wasm_bindgen(js_name = projectRead)]
pub fn project_read(bytes: &[u8]) -> Result<String, JsValue> {
    let p = crate::project::read_project(bytes).map_err(error_to_js)?;
    serde_json::to_string(&p).map_err(to_js)
}

/// The interventions layer an audit of the project runs with: the scenario `scenario` (empty
/// for none) and, with `observations`, the notes' observed corrections; empty text for none.
#[wasm_bindgen(js_name = projectInterventions)]
pub fn project_interventions(
    project_json: &str,
    scenario: &str,
    observations: bool,
) -> Result<String, JsValue> {
    let p: crate::project::Project = serde_json::from_str(project_json).map_err(to_js)?;
    let name = (!scenario.is_empty()).then_some(scenario);
    let text = p.interventions(name, observations).map_err(error_to_js)?;
    Ok(text.unwrap_or_default())
}
