//! wasm-bindgen surface for the page's worker: converts and forwards, no logic.
//!
//! The worker calls [`audit`] with the layers as text and a config as JSON, and gets one JSON
//! document back with every export the page shows. Errors come back as their one-line message.

use crate::config::Config;
use crate::error::{Error, Location};
use crate::export;
use crate::input::{HomesFormat, Preset, RawLayers};
use crate::pipeline::{run_audit_owned, AuditOutput, Progress, Stage};
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
    crashes: Option<String>,
    #[serde(default)]
    preset: Preset,
    #[serde(default)]
    mapping: Option<String>,
    #[serde(default)]
    interventions: Option<String>,
    /// Property names by layer (`{"streets": "osm", "schools": "plain"}`); others detected.
    #[serde(default)]
    names: std::collections::BTreeMap<String, String>,
    /// Coordinate system by layer for layers that do not state one
    /// (`{"streets": "EPSG:2272"}`; the key `"all"` for every layer).
    #[serde(default)]
    crs: std::collections::BTreeMap<String, String>,
}

impl TryFrom<PageLayers> for RawLayers {
    type Error = Error;
    fn try_from(p: PageLayers) -> Result<Self, Error> {
        let mut per_layer = crate::input::per_layer::PerLayer::default();
        for (layer, names) in &p.names {
            per_layer
                .names
                .extend(crate::input::per_layer::parse_names(&format!(
                    "{layer}={names}"
                ))?);
        }
        for (layer, crs) in p.crs.iter().filter(|(_, c)| !c.trim().is_empty()) {
            let choice = if layer == "all" {
                crs.clone()
            } else {
                format!("{layer}={crs}")
            };
            per_layer
                .crs
                .push(crate::input::per_layer::parse_crs(&choice)?);
        }
        Ok(RawLayers {
            streets: p.streets,
            crossings: p.crossings,
            schools: p.schools,
            homes: p.homes,
            homes_format: p.homes_format,
            catchments: p.catchments,
            crashes: p.crashes,
            preset: p.preset,
            mapping: p.mapping,
            per_layer,
            interventions: p.interventions,
        })
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

/// The allowed range of every numeric config field, as JSON `[{field, min, min_exclusive,
/// max}]`: the page's settings fields check against the core's own ranges.
#[wasm_bindgen(js_name = configBounds)]
pub fn config_bounds() -> String {
    serde_json::to_string(&Config::bounds()).unwrap_or_default()
}

/// The core's check of a whole config: empty when it is valid, else the message.
#[wasm_bindgen(js_name = checkConfig)]
pub fn check_config(config_json: &str) -> String {
    match Config::from_json(config_json) {
        Ok(_) => String::new(),
        Err(e) => e.to_string(),
    }
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

/// A layer file in a binary format (a zipped Shapefile `.zip`, an OpenStreetMap `.osm.pbf`;
/// by `file_name`'s extension, else its first bytes) as WGS84 GeoJSON text, which the page
/// then loads like any GeoJSON layer. `crs`: the coordinate system for a Shapefile without a
/// `.prj` (empty: none). `layer` names the layer for messages (`streets`, ...).
#[wasm_bindgen(js_name = layerToGeojson)]
pub fn layer_to_geojson(
    layer: &str,
    file_name: &str,
    bytes: &[u8],
    crs: &str,
) -> Result<String, JsValue> {
    let layer = crate::input::per_layer::layer_named(layer)
        .ok_or_else(|| to_js(format!("'{layer}' is not a layer")))?;
    let file = crate::input::per_layer::LayerFile {
        layer,
        files: vec![(file_name.to_string(), bytes.to_vec())],
    };
    let crs = Some(crs).filter(|c| !c.trim().is_empty());
    crate::input::prepare::layer_geojson(&file, crs).map_err(error_to_js)
}

/// The caution every result carries.
#[wasm_bindgen]
pub fn caution() -> String {
    crate::CAUTION.to_string()
}

/// Grows the wasm memory once, before an audit, to about what an audit of `layers_bytes` of
/// layers needs (12 bytes per byte of layers text: 368 MB for the 30.7 MB page layers of a
/// 100 k-segment, 50 000-home district whose audit, document written, peaks at 367.5 MB
/// without this, in Node; it peaked at 480 MB before the layers' text was let go once read and
/// the document was written into a buffer of its exact size), by taking one block and giving
/// it back to the allocator.
/// Rust's wasm allocator grows memory by little more than each allocation needs, and each
/// `memory.grow` is dear in the JavaScript engine: without this, the first audit of that
/// district spent about half its routing time growing memory (10.5 s against 5.7 s for the
/// same audit once memory had grown; `node --cpu-prof`, docs/scaling.md). Memory never
/// shrinks in wasm, and the audit reaches this size anyway.
fn reserve_heap(layers_bytes: usize) {
    let have = core::arch::wasm32::memory_size(0) * 65536;
    let want = layers_bytes.saturating_mul(12).min(1 << 30);
    if want > have + (have / 4) {
        drop(std::hint::black_box(Vec::<u8>::with_capacity(want - have)));
    }
}

/// Reads the page's layers and config and runs the audit. The layers document is owned so
/// that it, and then the layers' text, are let go once read.
fn run(
    layers_json: String,
    config_json: &str,
    progress: &js_sys::Function,
) -> Result<AuditOutput, JsValue> {
    reserve_heap(layers_json.len());
    let page: PageLayers = serde_json::from_str(&layers_json).map_err(to_js)?;
    drop(layers_json);
    let raw = RawLayers::try_from(page).map_err(error_to_js)?;
    let config = if config_json.trim().is_empty() {
        Config::default()
    } else {
        Config::from_json(config_json).map_err(error_to_js)?
    };
    let mut p = JsProgress { callback: progress };
    run_audit_owned(raw, &config, &mut p).map_err(error_to_js)
}

/// Runs the audit and the upgrade planner with a budget of `budget` upgrades; returns the
/// plan as the command line's `plan.json`.
#[wasm_bindgen]
pub fn plan(
    layers_json: String,
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

/// The layers as read, for the page's panels and map (keys in alphabetical order, as the
/// `json!` map that this replaced wrote them), serialised straight from the audit's own.
#[derive(serde::Serialize)]
struct LayersDoc<'a> {
    catchments: Vec<CatchmentDoc<'a>>,
    crashes: &'a [crate::input::observed::Crash],
    crossings: &'a [crate::input::CrossingPoint],
    homes: &'a [crate::input::Home],
    rail_crossings: &'a [crate::input::observed::RailCrossing],
    schools: &'a [crate::input::School],
}

/// Which feature of the catchments layer belongs to which school.
#[derive(serde::Serialize)]
struct CatchmentDoc<'a> {
    feature: usize,
    school_id: &'a str,
}

/// Counts the bytes written to it.
struct ByteCount(usize);
impl std::io::Write for ByteCount {
    fn write(&mut self, b: &[u8]) -> std::io::Result<usize> {
        self.0 += b.len();
        Ok(b.len())
    }
    fn flush(&mut self) -> std::io::Result<()> {
        Ok(())
    }
}

/// `v` as JSON text written into a buffer of exactly its size: a growing buffer of a
/// district's 34 MB document would hold up to twice that, old and new, while it is copied,
/// and the worker's memory keeps its peak.
fn exact_json<T: serde::Serialize>(v: &T) -> Result<String, JsValue> {
    let mut count = ByteCount(0);
    serde_json::to_writer(&mut count, v).map_err(to_js)?;
    let mut text = Vec::with_capacity(count.0);
    serde_json::to_writer(&mut text, v).map_err(to_js)?;
    String::from_utf8(text).map_err(to_js)
}

/// The page's audit document; the large collections serialise straight to text.
#[derive(serde::Serialize)]
struct AuditDoc<'a> {
    summary: Value,
    homes_csv: String,
    catchments_csv: String,
    hotspots_csv: String,
    /// Which held audit this is: [`route_lines`] draws its routes (the document carries none).
    audit_id: u32,
    qa: Value,
    /// West, south, east, north of the noded centrelines (the centrelines themselves come from
    /// [`street_tile`] as map tiles: the page never parses them).
    bounds: Option<[f64; 4]>,
    /// The named streets as drawn, with their names (labels, the find box).
    street_names: export::layers_geojson::Collection<export::layers_geojson::NameProps<'a>>,
    hotspots: export::hotspots::HotspotCollection<'a>,
    layers: LayersDoc<'a>,
    warnings: &'a [crate::error::Warning],
    /// What a re-audit did (absent for a full audit).
    #[serde(skip_serializing_if = "Option::is_none")]
    reaudit: Option<Value>,
    /// CSV on the Web metadata of each CSV (columns, units, caution), by metadata file name.
    csv_metadata: serde_json::Map<String, Value>,
    /// The worker's wasm memory when the document was written, in bytes (wasm memory only
    /// grows: this is the core's peak so far, held audits included).
    core_memory_bytes: usize,
}

/// Runs the audit. `layers_json`: `{streets, crossings?, schools, homes, homes_format?,
/// catchments?, crashes?, preset?, mapping?, names?, crs?}` with each layer as text (binary files
/// first through [`layer_to_geojson`]); `config_json`: a config
/// (empty for defaults). Returns one JSON: summary (with the catchment scores), the homes,
/// catchments and hotspots CSV tables, the id of the held audit (routes come from
/// [`route_lines`], the centrelines as map tiles from [`street_tile`]), QA, the centrelines' bounds,
/// the named streets, hotspots, the validated layers and the warnings. An error comes back as
/// `{message, at}` JSON.
#[wasm_bindgen]
pub fn audit(
    layers_json: String,
    config_json: &str,
    progress: &js_sys::Function,
) -> Result<String, JsValue> {
    let out = run(layers_json, config_json, progress)?;
    HELD.with(|held| {
        let mut held = held.borrow_mut();
        held.audits.clear();
        held.tiles = None;
        held.hotspot_tiles = None;
        held.hold(out, None)
    })
}

/// At most how many audits the worker holds: the page releases each one it stops showing
/// ([`release_audit`]; it keeps four views), so this only bounds memory should it not.
const HELD_AUDITS: usize = 8;

/// The audits the worker holds, oldest first; the first is the full audit the rest re-audit.
#[derive(Default)]
struct Held {
    next_id: u32,
    audits: Vec<(u32, AuditOutput)>,
    /// The segment index of the audit whose map tiles were asked for last.
    tiles: Option<(u32, export::map_tiles::SegmentIndex)>,
    /// The hotspot points of the audit whose hotspot tiles were asked for last.
    hotspot_tiles: Option<(u32, export::map_tiles::HotspotIndex)>,
}

impl Held {
    /// Holds `out` as the latest audit, letting go of the oldest re-audit past the limit, and
    /// writes its document.
    fn hold(&mut self, out: AuditOutput, extra: Option<Value>) -> Result<String, JsValue> {
        while self.audits.len() >= HELD_AUDITS {
            self.audits.remove(1);
        }
        self.next_id += 1;
        let doc = audit_doc(&out, self.next_id, extra);
        self.audits.push((self.next_id, out));
        doc
    }
}

thread_local! {
    /// The audits [`reaudit`] starts from and [`route_lines`] reads (the worker is
    /// single-threaded).
    static HELD: std::cell::RefCell<Held> = std::cell::RefCell::new(Held::default());
}

/// Lets go of a held audit the page no longer shows (the full audit the others re-audit stays
/// until the next full audit).
#[wasm_bindgen(js_name = releaseAudit)]
pub fn release_audit(audit_id: u32) {
    HELD.with(|held| {
        let mut held = held.borrow_mut();
        if let Some(i) = held.audits.iter().position(|(id, _)| *id == audit_id) {
            if i > 0 {
                held.audits.remove(i);
            }
        }
    });
}

/// Which routes the page asks for: one home's, or one school's homes' (all when both empty).
#[derive(Deserialize, Default)]
struct RouteQuery {
    #[serde(default)]
    homes: Vec<String>,
    #[serde(default)]
    school: Option<String>,
    /// Route kinds to draw (`shortest`, `recommended`, `safe`); empty for all three.
    #[serde(default)]
    kinds: Vec<String>,
}

/// The routes of a held audit as GeoJSON text: `query_json` is `{homes?: [id], school?: id,
/// kinds?: [kind]}` (`{}` for every route, as `routes.geojson`). The audit document carries no
/// route lines, so a district's page never parses every home's routes at once.
#[wasm_bindgen(js_name = routeLines)]
pub fn route_lines(audit_id: u32, query_json: &str) -> Result<String, JsValue> {
    let q: RouteQuery = if query_json.trim().is_empty() {
        RouteQuery::default()
    } else {
        serde_json::from_str(query_json).map_err(to_js)?
    };
    HELD.with(|held| {
        let held = held.borrow();
        let out = held_audit(&held.audits, audit_id, " to draw its routes")?;
        let school = match &q.school {
            Some(id) => Some(
                out.layers
                    .schools
                    .iter()
                    .position(|s| &s.id == id)
                    .ok_or_else(|| to_js(format!("no school with id \"{id}\" in this audit")))?,
            ),
            None => None,
        };
        let homes: std::collections::HashSet<&str> = q.homes.iter().map(String::as_str).collect();
        let keep_home = |i: usize| {
            (homes.is_empty() || homes.contains(out.layers.homes[i].id.as_str()))
                && (school.is_none() || out.homes[i].assignment.school == school)
        };
        let keep_kind = |k: crate::route::RouteKind| {
            q.kinds.is_empty() || q.kinds.iter().any(|x| x == k.as_str())
        };
        serde_json::to_string(&export::routes_geojson_of(out, keep_home, keep_kind)).map_err(to_js)
    })
}

/// Runs `f` on the held audit `audit_id`, or says it is no longer held.
fn with_held<T>(
    audit_id: u32,
    f: impl FnOnce(&AuditOutput) -> Result<T, JsValue>,
) -> Result<T, JsValue> {
    HELD.with(|held| f(held_audit(&held.borrow().audits, audit_id, "")?))
}

/// The audit `audit_id` among the held `audits`, or the message that it is held no more
/// (`then`: what running it again would be for, after a space; empty for nothing).
fn held_audit<'a>(
    audits: &'a [(u32, AuditOutput)],
    audit_id: u32,
    then: &str,
) -> Result<&'a AuditOutput, JsValue> {
    audits
        .iter()
        .find(|(id, _)| *id == audit_id)
        .map(|(_, out)| out)
        .ok_or_else(|| {
            to_js(format!(
                "audit {audit_id} is no longer held by the worker: run it again{then}"
            ))
        })
}

/// The map index kept in `slot` for `audit_id`, built by `build` when the slot holds none or
/// another audit's (the map asks for tiles of the audit shown, one at a time).
fn index_of<T>(slot: &mut Option<(u32, T)>, audit_id: u32, build: impl FnOnce() -> T) -> &T {
    if slot.as_ref().is_some_and(|(id, _)| *id != audit_id) {
        *slot = None;
    }
    &slot.get_or_insert_with(|| (audit_id, build())).1
}

/// The street tile `z/x/y` of a held audit's centrelines as Mapbox Vector Tile bytes
/// ([`export::map_tiles`]): the page's map asks for each tile it draws, so neither the page nor
/// the map holds a district's segments. The segment index is built on the first tile asked of
/// an audit and kept for that audit. [`segment_feature`] gives one segment's every property.
#[wasm_bindgen(js_name = streetTile)]
pub fn street_tile(audit_id: u32, z: u32, x: u32, y: u32) -> Result<Vec<u8>, JsValue> {
    HELD.with(|held| {
        let mut held = held.borrow_mut();
        let Held { audits, tiles, .. } = &mut *held;
        let out = held_audit(audits, audit_id, "")?;
        let index = index_of(tiles, audit_id, || {
            export::map_tiles::SegmentIndex::build(out)
        });
        export::map_tiles::street_tile(out, index, z, x, y).map_err(error_to_js)
    })
}

/// The hotspot tile `z/x/y` of a held audit as Mapbox Vector Tile bytes: each hotspot a point
/// with its index among the document's hotspots and its weight ([`export::map_tiles`]), so the
/// map does not tile a district's hotspots itself. The points are placed on the first tile
/// asked of an audit and kept for that audit.
#[wasm_bindgen(js_name = hotspotTile)]
pub fn hotspot_tile(audit_id: u32, z: u32, x: u32, y: u32) -> Result<Vec<u8>, JsValue> {
    HELD.with(|held| {
        let mut held = held.borrow_mut();
        let Held {
            audits,
            hotspot_tiles,
            ..
        } = &mut *held;
        let out = held_audit(audits, audit_id, "")?;
        let index = index_of(hotspot_tiles, audit_id, || {
            export::map_tiles::HotspotIndex::build(out)
        });
        export::map_tiles::hotspot_tile(index, z, x, y).map_err(error_to_js)
    })
}

/// Segment `segment` of a held audit's centrelines as one GeoJSON feature (`null` when there
/// is no such segment): what a click on the map landed on, with its exact geometry.
#[wasm_bindgen(js_name = segmentFeature)]
pub fn segment_feature(audit_id: u32, segment: u32) -> Result<String, JsValue> {
    with_held(audit_id, |out| {
        let f = export::layers_geojson::centreline_feature(out, segment as usize);
        serde_json::to_string(&f).map_err(to_js)
    })
}

fn audit_doc(out: &AuditOutput, audit_id: u32, extra: Option<Value>) -> Result<String, JsValue> {
    let doc = AuditDoc {
        summary: export::summary_json(out),
        homes_csv: export::homes_csv(out),
        catchments_csv: export::catchments_csv(out),
        hotspots_csv: export::hotspots_csv(out),
        audit_id,
        qa: export::qa_geojson(&out.network.qa),
        bounds: export::layers_geojson::centrelines_bounds(out),
        street_names: export::layers_geojson::street_names_geojson(out),
        hotspots: export::hotspots_geojson(out),
        layers: LayersDoc {
            catchments: out
                .layers
                .catchments
                .iter()
                .map(|c| CatchmentDoc {
                    feature: c.feature,
                    school_id: &c.school_id,
                })
                .collect(),
            crashes: &out.layers.crashes,
            crossings: &out.layers.crossings,
            homes: &out.layers.homes,
            rail_crossings: &out.layers.rail_crossings,
            schools: &out.layers.schools,
        },
        warnings: &out.warnings,
        reaudit: extra,
        csv_metadata: export::csvw::audit_metadata().into_iter().collect(),
        core_memory_bytes: core::arch::wasm32::memory_size(0) * 65536,
    };
    exact_json(&doc)
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
    let result = HELD.with(|held| match held.borrow().audits.last() {
        Some((_, prev)) => {
            crate::scenario::reaudit::reaudit(prev, list, &mut p).map_err(error_to_js)
        }
        None => Err(to_js("run an audit before a re-audit")),
    })?;
    let (out, stats) = result;
    let core_ms = js_sys::Date::now() - t0;
    let mut extra = serde_json::to_value(stats).map_err(to_js)?;
    extra["core_ms"] = json!(core_ms);
    HELD.with(|held| held.borrow_mut().hold(out, Some(extra)))
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

/// Runs the audit and returns only its stage timings and counts as JSON (`make bench` times
/// the wasm core against the native one on the same layers without building the page's
/// documents).
#[wasm_bindgen]
pub fn audit_timings(layers_json: String, config_json: &str) -> Result<String, JsValue> {
    let noop = js_sys::Function::new_no_args("return true");
    let out = run(layers_json, config_json, &noop)?;
    let routed = out.homes.iter().filter(|h| h.shortest.is_some()).count();
    Ok(
        json!({ "timings_ms": out.timings, "homes": out.homes.len(), "routed": routed })
            .to_string(),
    )
}
