//! `homes.csv`: one row per home. Crossing and exposure columns describe the recommended
//! route; the same set prefixed `shortest_` describes the shortest route.

use super::csv_safe::rows_text;
use super::edge_side;
use super::round2;
use crate::audit::RouteAudit;
use crate::pipeline::{AuditOutput, AuditedRoute};

/// Figures that appear once per route kind.
const ROUTE_COLUMNS: [&str; 10] = [
    "walked_m",
    "walking_time_min",
    "crossings",
    "uncontrolled_crossings",
    "arterial_crossings",
    "arterial_exposure_m",
    "along_le30_m",
    "along_31_50_m",
    "along_gt50_m",
    "no_sidewalk_m",
];

fn route_values(r: Option<&AuditedRoute>, speed_mps: f64) -> Vec<String> {
    match r {
        None => vec![String::new(); ROUTE_COLUMNS.len() + 1],
        Some(r) => {
            let a: &RouteAudit = &r.audit;
            vec![
                round2(a.walked_m).to_string(),
                round2(a.walked_m / speed_mps / 60.0).to_string(),
                a.crossings.len().to_string(),
                a.uncontrolled_crossings.to_string(),
                a.arterial_crossings.to_string(),
                round2(a.arterial_exposure_m).to_string(),
                round2(a.along_le30_m).to_string(),
                round2(a.along_31_50_m).to_string(),
                round2(a.along_gt50_m).to_string(),
                round2(a.no_sidewalk_m).to_string(),
                format!("{:.4}", r.risk),
            ]
        }
    }
}

/// The CSV text of `homes.csv`.
pub fn homes_csv(out: &AuditOutput) -> String {
    let mut header: Vec<String> = [
        "home_id",
        "school_id",
        "children",
        "assigned_by",
        "shortest_network_m",
        "recommended_network_m",
        "detour_ratio",
        "over_detour_cap",
    ]
    .iter()
    .map(|s| s.to_string())
    .collect();
    header.extend(ROUTE_COLUMNS.iter().map(|c| c.to_string()));
    header.push("risk".into());
    header.extend(ROUTE_COLUMNS.iter().map(|c| format!("shortest_{c}")));
    header.push("shortest_risk".into());
    header.extend(["attach_segment", "attach_side", "attach_offset_m", "snap_m"].map(String::from));
    header.extend(super::catchments_csv::HOME_SCORE_COLUMNS.map(String::from));
    let speed = out.config.benefit.walking_speed_mps;
    let g = &out.network.graph;
    let row = |i: usize| {
        let h = &out.homes[i];
        let home = &out.layers.homes[i];
        let school = h
            .assignment
            .school
            .map(|s| out.layers.schools[s].id.clone())
            .unwrap_or_default();
        let net = |r: Option<&AuditedRoute>| {
            r.map(|r| round2(r.audit.network_m).to_string())
                .unwrap_or_default()
        };
        let mut row = vec![
            home.id.clone(),
            school,
            home.children.to_string(),
            serde_json::to_value(h.assignment.by)
                .ok()
                .and_then(|v| v.as_str().map(String::from))
                .unwrap_or_default(),
            net(h.shortest.as_ref()),
            net(h.recommended.as_ref()),
            h.detour_ratio()
                .map(|d| format!("{d:.4}"))
                .unwrap_or_default(),
            h.over_detour_cap.to_string(),
        ];
        row.extend(route_values(h.recommended.as_ref(), speed));
        row.extend(route_values(h.shortest.as_ref(), speed));
        match &h.attachment {
            Some(a) => {
                let e = &g.edges[a.edge as usize];
                row.push(e.segment().to_string());
                row.push(edge_side(&e.kind).to_string());
                row.push(format!("{:.3}", a.offset_m));
                row.push(round2(a.snap_m).to_string());
            }
            None => row.extend([String::new(), String::new(), String::new(), String::new()]),
        }
        row.extend(super::catchments_csv::home_score_values(
            out.scores.homes.get(i),
        ));
        row
    };
    rows_text(&header, out.homes.len(), row)
}
