//! Before and after: two audits' `homes.csv` compared per catchment, so a batch run (two
//! output folders, `catchwalk compare`) and the page (two audits in memory) agree.
//!
//! A home's route counts as changed when any figure of its recommended route differs
//! (network and walked length, crossings, uncontrolled and arterial crossings, exposure,
//! risk): `homes.csv` holds the figures, not the geometry, and a route with identical figures
//! exposes the child identically.

use crate::error::{Error, Result};
use crate::export::csv_safe::SafeRow;
use serde::Serialize;
use std::collections::{BTreeMap, HashMap};

/// Columns that describe a home's recommended route.
const ROUTE_COLUMNS: [&str; 9] = [
    "recommended_network_m",
    "walked_m",
    "crossings",
    "uncontrolled_crossings",
    "arterial_crossings",
    "arterial_exposure_m",
    "no_sidewalk_m",
    "risk",
    "school_id",
];

/// One catchment's figures in one audit.
#[derive(Debug, Clone, Default, PartialEq, Serialize)]
pub struct CatchmentFigures {
    pub children: f64,
    pub children_in_walk_zone: f64,
    pub children_safe_route: f64,
    pub children_hazardous: f64,
    /// Mean risk points per trip over routed children.
    pub mean_risk_per_trip: Option<f64>,
    /// Mean daily active minutes over routed children.
    pub mean_active_minutes: Option<f64>,
}

/// One catchment before and after.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CatchmentChange {
    pub school_id: String,
    pub before: CatchmentFigures,
    pub after: CatchmentFigures,
    /// Children whose home's route changed.
    pub children_route_changed: f64,
    pub children_gained_safe_route: f64,
    pub children_lost_safe_route: f64,
}

/// The whole comparison.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Comparison {
    pub caution: &'static str,
    pub catchments: Vec<CatchmentChange>,
    /// Home ids whose route changed (ids only, no locations).
    pub homes_route_changed: Vec<String>,
    pub homes_gained_safe_route: Vec<String>,
    pub homes_lost_safe_route: Vec<String>,
    /// Home ids in only one of the two audits.
    pub homes_only_before: Vec<String>,
    pub homes_only_after: Vec<String>,
}

struct Row {
    fields: HashMap<String, String>,
}

impl Row {
    fn get(&self, k: &str) -> &str {
        self.fields.get(k).map(|s| s.as_str()).unwrap_or("")
    }
    fn num(&self, k: &str) -> Option<f64> {
        self.get(k).parse().ok()
    }
    fn yes(&self, k: &str) -> bool {
        matches!(self.get(k), "true" | "1" | "yes")
    }
}

fn read(text: &str, which: &str) -> Result<Vec<Row>> {
    let mut r = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(text.as_bytes());
    let header: Vec<String> = r
        .headers()
        .map_err(|e| Error::Io(format!("{which} homes.csv: {e}")))?
        .iter()
        .map(String::from)
        .collect();
    for need in [
        "home_id",
        "school_id",
        "children",
        "safe_route",
        "in_walk_zone",
    ] {
        if !header.iter().any(|h| h == need) {
            return Err(Error::Io(format!(
                "{which} homes.csv has no '{need}' column; give a homes.csv written by catchwalk audit"
            )));
        }
    }
    let mut out = Vec::new();
    for rec in r.records() {
        let rec = rec.map_err(|e| Error::Io(format!("{which} homes.csv: {e}")))?;
        let fields = header
            .iter()
            .cloned()
            .zip(rec.iter().map(String::from))
            .collect();
        out.push(Row { fields });
    }
    Ok(out)
}

fn figures(rows: &[&Row]) -> CatchmentFigures {
    let mut f = CatchmentFigures::default();
    let (mut risk, mut active, mut routed) = (0.0, 0.0, 0.0);
    for r in rows {
        let w = r.num("children").unwrap_or(0.0);
        f.children += w;
        if r.yes("in_walk_zone") {
            f.children_in_walk_zone += w;
        }
        if r.yes("safe_route") {
            f.children_safe_route += w;
        }
        if r.yes("hazardous") {
            f.children_hazardous += w;
        }
        if let Some(x) = r.num("risk") {
            routed += w;
            risk += w * x;
            active += w * r.num("active_minutes").unwrap_or(0.0);
        }
    }
    if routed > 0.0 {
        f.mean_risk_per_trip = Some(risk / routed);
        f.mean_active_minutes = Some(active / routed);
    }
    f
}

/// Compares two audits' `homes.csv` (as `catchwalk audit` writes it; the caution comment line
/// is skipped). Homes match by `home_id`; catchments by `school_id`.
///
/// ```
/// let csv = "home_id,school_id,children,in_walk_zone,safe_route,hazardous,risk,active_minutes\n\
///            h1,A,2,true,false,true,1.5,20\n";
/// let better = csv.replace("true,false,true,1.5", "true,true,false,0.5");
/// let c = catchwalk::compare::compare_homes(csv, &better).unwrap();
/// assert_eq!(c.catchments[0].children_gained_safe_route, 2.0);
/// assert_eq!(c.homes_route_changed, vec!["h1".to_string()]);
/// ```
pub fn compare_homes(before_csv: &str, after_csv: &str) -> Result<Comparison> {
    let before = read(before_csv, "before")?;
    let after = read(after_csv, "after")?;
    let by_id: HashMap<&str, &Row> = after.iter().map(|r| (r.get("home_id"), r)).collect();
    let before_ids: HashMap<&str, &Row> = before.iter().map(|r| (r.get("home_id"), r)).collect();
    let mut schools: BTreeMap<String, (Vec<&Row>, Vec<&Row>)> = BTreeMap::new();
    for r in &before {
        schools
            .entry(r.get("school_id").into())
            .or_default()
            .0
            .push(r);
    }
    for r in &after {
        schools
            .entry(r.get("school_id").into())
            .or_default()
            .1
            .push(r);
    }
    let mut changed = Vec::new();
    let mut gained = Vec::new();
    let mut lost = Vec::new();
    let mut per_school: HashMap<String, [f64; 3]> = HashMap::new();
    for b in &before {
        let id = b.get("home_id");
        let Some(a) = by_id.get(id) else { continue };
        let w = b.num("children").unwrap_or(0.0);
        let slot = per_school.entry(b.get("school_id").into()).or_default();
        if ROUTE_COLUMNS.iter().any(|c| b.get(c) != a.get(c)) {
            changed.push(id.to_string());
            slot[0] += w;
        }
        match (b.yes("safe_route"), a.yes("safe_route")) {
            (false, true) => {
                gained.push(id.to_string());
                slot[1] += w;
            }
            (true, false) => {
                lost.push(id.to_string());
                slot[2] += w;
            }
            _ => {}
        }
    }
    let catchments = schools
        .into_iter()
        .map(|(school_id, (b, a))| {
            let d = per_school.get(&school_id).copied().unwrap_or_default();
            CatchmentChange {
                before: figures(&b),
                after: figures(&a),
                children_route_changed: d[0],
                children_gained_safe_route: d[1],
                children_lost_safe_route: d[2],
                school_id,
            }
        })
        .collect();
    Ok(Comparison {
        caution: crate::CAUTION,
        catchments,
        homes_route_changed: changed,
        homes_gained_safe_route: gained,
        homes_lost_safe_route: lost,
        homes_only_before: before
            .iter()
            .map(|r| r.get("home_id"))
            .filter(|id| !by_id.contains_key(id))
            .map(String::from)
            .collect(),
        homes_only_after: after
            .iter()
            .map(|r| r.get("home_id"))
            .filter(|id| !before_ids.contains_key(id))
            .map(String::from)
            .collect(),
    })
}

fn opt(x: Option<f64>) -> String {
    x.map(|v| format!("{v:.4}")).unwrap_or_default()
}

/// The per-catchment comparison as CSV (`comparison.csv`; aggregates only, shareable).
pub fn comparison_csv(c: &Comparison) -> String {
    let mut w = csv::Writer::from_writer(Vec::new());
    let mut header = vec!["school_id".to_string()];
    for f in [
        "children",
        "children_in_walk_zone",
        "children_safe_route",
        "children_hazardous",
        "mean_risk_per_trip",
        "mean_active_minutes",
    ] {
        header.push(format!("{f}_before"));
        header.push(format!("{f}_after"));
    }
    header.extend(
        [
            "children_route_changed",
            "children_gained_safe_route",
            "children_lost_safe_route",
        ]
        .map(String::from),
    );
    w.safe_row(&header);
    for k in &c.catchments {
        let (b, a) = (&k.before, &k.after);
        w.safe_row([
            k.school_id.clone(),
            b.children.to_string(),
            a.children.to_string(),
            b.children_in_walk_zone.to_string(),
            a.children_in_walk_zone.to_string(),
            b.children_safe_route.to_string(),
            a.children_safe_route.to_string(),
            b.children_hazardous.to_string(),
            a.children_hazardous.to_string(),
            opt(b.mean_risk_per_trip),
            opt(a.mean_risk_per_trip),
            opt(b.mean_active_minutes),
            opt(a.mean_active_minutes),
            k.children_route_changed.to_string(),
            k.children_gained_safe_route.to_string(),
            k.children_lost_safe_route.to_string(),
        ]);
    }
    crate::export::csv_safe::csv_text(w)
}

/// The CSV on the Web metadata of `comparison.csv` (columns, units, caution), by file name.
pub fn comparison_metadata() -> (String, serde_json::Value) {
    use crate::export::csvw::{csv_metadata, metadata_name, Column};
    let column = |name: String, datatype: &'static str, unit: &'static str, d: String| Column {
        name,
        datatype,
        unit,
        description: d,
    };
    let mut cols = vec![column(
        "school_id".into(),
        "string",
        "",
        "the catchment's school".into(),
    )];
    for (f, datatype, unit, what) in [
        (
            "children",
            "number",
            "children",
            "children in the catchment",
        ),
        (
            "children_in_walk_zone",
            "number",
            "children",
            "children in the walk zone",
        ),
        (
            "children_safe_route",
            "number",
            "children",
            "children with a safe route",
        ),
        (
            "children_hazardous",
            "number",
            "children",
            "children on hazardous routes",
        ),
        (
            "mean_risk_per_trip",
            "number",
            "risk points",
            "mean risk per trip",
        ),
        (
            "mean_active_minutes",
            "number",
            "min",
            "mean active minutes a day",
        ),
    ] {
        for when in ["before", "after"] {
            cols.push(column(
                format!("{f}_{when}"),
                datatype,
                unit,
                format!("{what}, {when} the change"),
            ));
        }
    }
    for (f, what) in [
        (
            "children_route_changed",
            "children whose recommended route changed",
        ),
        (
            "children_gained_safe_route",
            "children who gained a safe route",
        ),
        ("children_lost_safe_route", "children who lost a safe route"),
    ] {
        cols.push(column(f.into(), "number", "children", what.into()));
    }
    (
        metadata_name("comparison.csv"),
        csv_metadata("comparison.csv", "Before and after, per catchment", &cols),
    )
}
