//! A W3C "CSV on the Web" metadata file beside each CSV we write (`homes.csv` ->
//! `homes.csv-metadata.json`, the default name the W3C "Model for Tabular Data and Metadata on
//! the Web" looks for). It carries the caution, each column's description, datatype and unit
//! (terms of the W3C "Metadata Vocabulary for Tabular Data": `@context`, `url`,
//! `dc:title`, `dc:description`, `tableSchema.columns` with `name`, `titles`, `datatype`;
//! units as `schema:unitText`, a common property), so the CSV itself stays plain RFC 4180.

use serde_json::{json, Value};

/// One column: name, CSVW datatype, unit (empty when none) and what it holds.
pub struct Column {
    pub name: String,
    pub datatype: &'static str,
    pub unit: &'static str,
    pub description: String,
}

fn col(name: &str, datatype: &'static str, unit: &'static str, description: &str) -> Column {
    Column {
        name: name.to_string(),
        datatype,
        unit,
        description: description.to_string(),
    }
}

/// Per-route columns of `homes.csv` (as in `homes_csv::ROUTE_COLUMNS`, plus `risk`).
fn route_columns(prefix: &str, which: &str) -> Vec<Column> {
    let d = |s: &str| format!("{s} ({which} route)");
    vec![
        col(&format!("{prefix}walked_m"), "number", "m", &d("walked length, crossing widths included")),
        col(&format!("{prefix}walking_time_min"), "number", "min", &d("walking time at the configured child's walking speed")),
        col(&format!("{prefix}crossings"), "integer", "", &d("street crossings")),
        col(&format!("{prefix}uncontrolled_crossings"), "integer", "", &d("crossings with no traffic control")),
        col(&format!("{prefix}arterial_crossings"), "integer", "", &d("crossings of arterial streets")),
        col(&format!("{prefix}arterial_exposure_m"), "number", "m", &d("length walked beside arterial streets")),
        col(&format!("{prefix}along_le30_m"), "number", "m", &d("length walked beside traffic at 30 km/h or less")),
        col(&format!("{prefix}along_31_50_m"), "number", "m", &d("length walked beside traffic at 31-50 km/h")),
        col(&format!("{prefix}along_gt50_m"), "number", "m", &d("length walked beside traffic above 50 km/h")),
        col(&format!("{prefix}no_sidewalk_m"), "number", "m", &d("length walked on sides with no sidewalk")),
        col(&format!("{prefix}risk"), "number", "risk points", &d("risk index of the route (one point = one uncontrolled crossing of a two-lane 50 km/h street at the default local volume; an index, not a prediction)")),
    ]
}

/// The columns of `homes.csv`, in order.
pub fn homes_columns() -> Vec<Column> {
    let mut c = vec![
        col(
            "home_id",
            "string",
            "",
            "the home's id from the homes layer",
        ),
        col(
            "school_id",
            "string",
            "",
            "the school the home is assigned to",
        ),
        col(
            "children",
            "integer",
            "children",
            "children living at the home",
        ),
        col(
            "assigned_by",
            "string",
            "",
            "how the school was chosen: property, catchment, nearest_by_walking or unassigned",
        ),
        col(
            "shortest_network_m",
            "number",
            "m",
            "network length of the shortest route (side edges only)",
        ),
        col(
            "recommended_network_m",
            "number",
            "m",
            "network length of the recommended route",
        ),
        col(
            "detour_ratio",
            "number",
            "",
            "recommended walked length / shortest walked length",
        ),
        col(
            "over_detour_cap",
            "boolean",
            "",
            "true when the recommended route was over the detour cap, so the shortest stands",
        ),
    ];
    c.extend(route_columns("", "recommended"));
    c.extend(route_columns("shortest_", "shortest"));
    c.extend([
        col("attach_segment", "integer", "", "street segment the home is attached to"),
        col("attach_side", "string", "", "left, right or path: the walkable edge the home is attached to"),
        col("attach_offset_m", "number", "m", "distance along the edge to the attachment point"),
        col("snap_m", "number", "m", "straight-line distance from the home to its attachment point"),
        col("active_minutes", "number", "min/day", "minutes of walking a day, two trips"),
        col("guideline_share", "number", "", "active minutes as a share of the WHO 2020 guideline for ages 5-17"),
        col("energy_kcal", "number", "kcal/day", "energy of the two daily trips"),
        col("in_walk_zone", "boolean", "", "true when the shortest route is within the walk zone"),
        col("safe_route", "boolean", "", "true when a route on which no rule fires exists within the walk zone"),
        col("safe_network_m", "number", "m", "network length of that safe route"),
        col("unsafe_reason", "string", "", "why there is no safe route (the first rule that fires, or unreachable)"),
        col("hazardous", "boolean", "", "true when a rule of the rule set marks the shortest route hazardous"),
        col("hazard_reason", "string", "", "the rule that marks it"),
        col("longest_wait_s", "number", "s", "longest average wait at an uncontrolled crossing (Highway Capacity Manual gap acceptance)"),
        col("longest_wait_los", "string", "", "its Highway Capacity Manual level of service (A-F)"),
        col("walk_zone_m", "number", "m", "the walk zone applied to this home's pupils (the rule set's distance for elementary or secondary pupils)"),
        col("site_checks", "string", "", "what the layers cannot settle and a site visit must check (unknown facts, rule conditions the data lacks), separated by ';'"),
    ]);
    c
}

/// The columns of `catchments.csv`, in order.
pub fn catchments_columns() -> Vec<Column> {
    vec![
        col("school_id", "string", "", "the school's id"),
        col("school_name", "string", "", "the school's name"),
        col("children", "integer", "children", "children assigned to the school"),
        col("children_routed", "integer", "children", "of them, children with a route"),
        col("children_in_walk_zone", "integer", "children", "routed children within the walk zone"),
        col("children_safe_route", "integer", "children", "routed children with a safe route"),
        col("children_hazardous", "integer", "children", "routed children whose shortest route a rule marks hazardous"),
        col("walk_zone_share", "number", "", "share of routed children within the walk zone"),
        col("route_ok_share", "number", "", "share of routed children whose shortest route no rule flags"),
        col("safe_route_share", "number", "", "share of routed children with a safe route"),
        col("gap", "number", "", "walk_zone_share - safe_route_share: the infrastructure deficit"),
        col("mean_risk_per_trip", "number", "risk points", "mean risk index per trip"),
        col("p90_risk_per_trip", "number", "risk points", "90th percentile of the risk index per trip"),
        col("mean_active_minutes", "number", "min/day", "mean active minutes a day"),
        col("minutes_per_risk_point", "number", "min/risk point", "benefit against risk: active minutes per risk point"),
        col("quadrant", "string", "", "walkable_and_safe, walkable_but_unsafe, far_but_safe, far_and_unsafe or no_children_routed"),
        col("walkable_share_threshold", "number", "", "walk-zone share from which a catchment counts as walkable"),
        col("safe_share_threshold", "number", "", "safe-route share from which a catchment counts as safe"),
        col("walk_zone_m", "number", "m", "the walk zone's network distance"),
        col("rules", "string", "", "the safe-route rule set"),
    ]
}

/// The columns of `hotspots.csv`, in order.
pub fn hotspots_columns() -> Vec<Column> {
    vec![
        col("rank", "integer", "", "rank by product, highest first"),
        col("edge", "integer", "", "edge of the pedestrian graph"),
        col("kind", "string", "", "crossing or side"),
        col("street_id", "string", "", "the street's id"),
        col("street", "string", "", "the street's name"),
        col("class", "string", "", "road class"),
        col(
            "control",
            "string",
            "",
            "crossings: device and features (signal+guard); sides: the sidewalk",
        ),
        col("speed_kmh", "number", "km/h", "the street's speed"),
        col("lanes", "integer", "", "the street's lanes"),
        col(
            "children",
            "number",
            "children",
            "children whose recommended route uses the edge",
        ),
        col(
            "risk",
            "number",
            "risk points",
            "risk index of the whole edge",
        ),
        col(
            "product",
            "number",
            "children x risk points",
            "children x the risk of the part each walks",
        ),
        col(
            "wait_s",
            "number",
            "s",
            "Highway Capacity Manual average wait at the crossing",
        ),
        col("los", "string", "", "its level of service (A-F)"),
        col(
            "crashes",
            "integer",
            "crashes",
            "observed crashes joined to the edge (counts only)",
        ),
        col(
            "crashes_pedestrian",
            "integer",
            "crashes",
            "of them, crashes with a pedestrian involved",
        ),
        col(
            "crashes_ksi",
            "integer",
            "crashes",
            "of them, crashes where someone was killed or seriously injured (KABCO K or A)",
        ),
    ]
}

/// The columns of `plan.csv`, in order.
pub fn plan_columns() -> Vec<Column> {
    vec![
        col(
            "rank",
            "integer",
            "",
            "order in which the planner chose the upgrade",
        ),
        col(
            "upgrade",
            "string",
            "",
            "signal, guard, refuge, speed_reduction or sidewalk",
        ),
        col("edge", "integer", "", "edge of the pedestrian graph"),
        col("street_id", "string", "", "the street's id"),
        col("street", "string", "", "the street's name"),
        col(
            "children_gained",
            "number",
            "children",
            "children who gain a safe route",
        ),
        col(
            "risk_reduction",
            "number",
            "risk points",
            "fall in the summed risk per trip",
        ),
        col(
            "safe_children_after",
            "number",
            "children",
            "children with a safe route after this step",
        ),
    ]
}

/// The metadata file's name for a CSV file's name.
///
/// ```
/// assert_eq!(catchwalk::export::csvw::metadata_name("homes.csv"), "homes.csv-metadata.json");
/// ```
pub fn metadata_name(csv_name: &str) -> String {
    format!("{csv_name}-metadata.json")
}

/// The CSVW metadata document for the CSV file `csv_name` with `columns`.
///
/// ```
/// use catchwalk::export::csvw::{csv_metadata, hotspots_columns};
/// let m = csv_metadata("hotspots.csv", "Hotspots", &hotspots_columns());
/// assert_eq!(m["url"], "hotspots.csv");
/// assert_eq!(m["tableSchema"]["columns"][0]["name"], "rank");
/// ```
pub fn csv_metadata(csv_name: &str, title: &str, columns: &[Column]) -> Value {
    let cols: Vec<Value> = columns
        .iter()
        .map(|c| {
            let mut v = json!({
                "name": c.name,
                "titles": c.name,
                "datatype": c.datatype,
                "dc:description": c.description,
            });
            if !c.unit.is_empty() {
                v["schema:unitText"] = json!(c.unit);
            }
            v
        })
        .collect();
    json!({
        "@context": "http://www.w3.org/ns/csvw",
        "url": csv_name,
        "dc:title": title,
        "dc:description": crate::CAUTION,
        "dialect": { "header": true, "encoding": "utf-8" },
        "tableSchema": { "columns": cols },
    })
}

/// The metadata of each CSV an audit writes, by CSV file name.
pub fn audit_metadata() -> Vec<(String, Value)> {
    [
        ("homes.csv", "Per-home routes and scores", homes_columns()),
        (
            "catchments.csv",
            "Per-catchment balance",
            catchments_columns(),
        ),
        (
            "hotspots.csv",
            "Crossings and sides ranked by children x risk",
            hotspots_columns(),
        ),
    ]
    .into_iter()
    .map(|(name, title, cols)| (metadata_name(name), csv_metadata(name, title, &cols)))
    .collect()
}

/// The metadata of the planner's `plan.csv`.
pub fn plan_metadata() -> (String, Value) {
    (
        metadata_name("plan.csv"),
        csv_metadata(
            "plan.csv",
            "Upgrades chosen by the planner",
            &plan_columns(),
        ),
    )
}
