//! `catchments.csv` (one row per school), the per-home score columns of `homes.csv`, and the
//! upgrade plan (`plan.json`, `plan.csv`).

use super::csv_safe::{csv_text, SafeRow};
use super::round2;
use crate::pipeline::AuditOutput;
use crate::score::home::HomeScore;
use crate::score::plan::Plan;
use serde_json::{json, Value};

/// Score columns appended to `homes.csv`.
pub const HOME_SCORE_COLUMNS: [&str; 13] = [
    "active_minutes",
    "guideline_share",
    "energy_kcal",
    "in_walk_zone",
    "safe_route",
    "safe_network_m",
    "unsafe_reason",
    "hazardous",
    "hazard_reason",
    "longest_wait_s",
    "longest_wait_los",
    "walk_zone_m",
    "site_checks",
];

/// The values of [`HOME_SCORE_COLUMNS`] for one home (blank when it has no route).
pub fn home_score_values(s: Option<&HomeScore>) -> Vec<String> {
    match s {
        Some(s) if s.routed => vec![
            round2(s.active_minutes).to_string(),
            format!("{:.4}", s.guideline_share),
            round2(s.energy_kcal).to_string(),
            s.in_walk_zone.to_string(),
            s.safe_route.to_string(),
            s.safe_network_m
                .map(|m| round2(m).to_string())
                .unwrap_or_default(),
            s.unsafe_reason.clone(),
            s.hazardous.to_string(),
            s.hazard_reason.clone(),
            round2(s.longest_wait_s).to_string(),
            s.longest_wait_los
                .map(|l| l.as_str())
                .unwrap_or("")
                .to_string(),
            round2(s.walk_zone_m).to_string(),
            s.site_checks.join(" | "),
        ],
        Some(s) => {
            let mut v = vec![String::new(); HOME_SCORE_COLUMNS.len()];
            if let Some(x) = v.get_mut(6) {
                *x = s.unsafe_reason.clone();
            }
            v
        }
        None => vec![String::new(); HOME_SCORE_COLUMNS.len()],
    }
}

fn opt(x: Option<f64>, digits: usize) -> String {
    x.map(|v| format!("{v:.digits$}")).unwrap_or_default()
}

/// The CSV text of `catchments.csv`.
pub fn catchments_csv(out: &AuditOutput) -> String {
    let mut w = csv::Writer::from_writer(Vec::new());
    w.safe_row([
        "school_id",
        "school_name",
        "children",
        "children_routed",
        "children_in_walk_zone",
        "children_safe_route",
        "children_hazardous",
        "walk_zone_share",
        "route_ok_share",
        "safe_route_share",
        "gap",
        "mean_risk_per_trip",
        "p90_risk_per_trip",
        "mean_active_minutes",
        "minutes_per_risk_point",
        "quadrant",
        "walkable_share_threshold",
        "safe_share_threshold",
        "walk_zone_m",
        "rules",
    ]);
    for c in &out.scores.catchments {
        let Some(school) = out.layers.schools.get(c.school) else {
            continue;
        };
        w.safe_row([
            school.id.clone(),
            school.name.clone(),
            c.children.to_string(),
            c.children_routed.to_string(),
            c.children_in_walk_zone.to_string(),
            c.children_safe_route.to_string(),
            c.children_hazardous.to_string(),
            opt(c.walk_zone_share, 4),
            opt(c.route_ok_share, 4),
            opt(c.safe_route_share, 4),
            opt(c.gap, 4),
            opt(c.mean_risk_per_trip, 4),
            opt(c.p90_risk_per_trip, 4),
            opt(c.mean_active_minutes, 2),
            opt(c.minutes_per_risk_point, 2),
            c.quadrant.as_str().to_string(),
            c.walkable_share_threshold.to_string(),
            c.safe_share_threshold.to_string(),
            out.config.benefit.walk_zone_m.to_string(),
            out.config.score.rules.name.clone(),
        ]);
    }
    csv_text(w)
}

/// The per-catchment figures as JSON, for `summary.json`.
pub fn catchments_json(out: &AuditOutput) -> Value {
    let rows: Vec<Value> = out
        .scores
        .catchments
        .iter()
        .filter_map(|c| {
            let school = out.layers.schools.get(c.school)?;
            let mut v = serde_json::to_value(c).ok()?;
            if let Some(o) = v.as_object_mut() {
                o.insert("school_id".into(), json!(school.id));
                o.insert("school_name".into(), json!(school.name));
            }
            Some(v)
        })
        .collect();
    json!(rows)
}

/// The plan as JSON (`plan.json`).
pub fn plan_json(out: &AuditOutput, plan: &Plan) -> Value {
    json!({
        "caution": crate::CAUTION,
        "rules": out.config.score.rules.name,
        "plan": plan,
        "safe_route_share_before": (plan.children_routed > 0.0)
            .then(|| plan.safe_children_before / plan.children_routed),
        "safe_route_share_after": (plan.children_routed > 0.0)
            .then(|| plan.safe_children_after / plan.children_routed),
    })
}

/// The chosen upgrades as CSV (`plan.csv`).
pub fn plan_csv(plan: &Plan) -> String {
    let mut w = csv::Writer::from_writer(Vec::new());
    w.safe_row([
        "rank",
        "upgrade",
        "edge",
        "street_id",
        "street",
        "children_gained",
        "risk_reduction",
        "safe_children_after",
    ]);
    for s in &plan.steps {
        w.safe_row([
            s.rank.to_string(),
            s.upgrade.as_str().to_string(),
            s.edge.to_string(),
            s.street_id.clone(),
            s.street.clone(),
            s.children_gained.to_string(),
            format!("{:.4}", s.risk_reduction),
            s.safe_children_after.to_string(),
        ]);
    }
    csv_text(w)
}
