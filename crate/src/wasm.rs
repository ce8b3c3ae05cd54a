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
    serde_json::to_string(&export::plan_json(&out, &plan)).map_err(to_js)
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
    hotspots: export::hotspots::HotspotCollection<'a>,
    layers: Value,
    warnings: &'a [crate::error::Warning],
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
    let doc = AuditDoc {
        summary: export::summary_json(&out),
        homes_csv: export::homes_csv(&out),
        catchments_csv: export::catchments_csv(&out),
        hotspots_csv: export::hotspots_csv(&out),
        routes: export::routes_geojson(&out),
        qa: export::qa_geojson(&out.network.qa),
        centrelines: export::centrelines_geojson(&out),
        hotspots: export::hotspots_geojson(&out),
        layers: json!({
            "crossings": out.layers.crossings,
            "schools": out.layers.schools,
            "homes": out.layers.homes,
            "catchments": out.layers.catchments.iter()
                .map(|c| json!({ "feature": c.feature, "school_id": c.school_id }))
                .collect::<Vec<_>>(),
        }),
        warnings: &out.warnings,
    };
    serde_json::to_string(&doc).map_err(to_js)
}

/// Runs the audit and returns only its stage timings and counts as JSON (`make bench` times
/// the wasm core against the native one on the same layers without building the page's
/// documents).
#[wasm_bindgen]
pub fn audit_timings(layers_json: &str, config_json: &str) -> Result<String, JsValue> {
    let noop = js_sys::Function::new_no_args("return true");
    let out = run(layers_json, config_json, &noop)?;
    let routed = out.homes.iter().filter(|h| h.shortest.is_some()).count();
    Ok(
        json!({ "timings_ms": out.timings, "homes": out.homes.len(), "routed": routed })
            .to_string(),
    )
}
