//! `summary.json`: network figures, QA counts, per-school figures, timings.

use super::{edge_side, round2};
use crate::input::Layers;
use crate::network::qa::Qa;
use crate::network::qa::QaKind;
use crate::network::{PedEdgeKind, PedGraph};
use crate::pipeline::AuditOutput;
use crate::score::catchment::weighted_mean as mean;
use serde_json::{json, Value};

/// The summary document.
pub fn summary_json(out: &AuditOutput) -> Value {
    let g = &out.network.graph;
    let qa = &out.network.qa;
    let walk_zone = out.config.benefit.walk_zone_m;
    let by_school = crate::pipeline::homes_by_school(&out.homes, out.layers.schools.len());
    let schools: Vec<Value> = out
        .layers
        .schools
        .iter()
        .zip(&by_school)
        .enumerate()
        .map(|(s, (school, of_school))| {
            let members: Vec<_> = of_school
                .iter()
                .filter_map(|&i| Some((i, out.homes.get(i)?)))
                .collect();
            // u64: a sum of u32 counts cannot overflow it (three homes of 4294967295
            // children wrapped a u32 total).
            let children: u64 = members
                .iter()
                .map(|(i, _)| u64::from(out.layers.homes[*i].children))
                .sum();
            let routed: Vec<(f64, f64, f64, f64)> = members
                .iter()
                .filter_map(|(i, h)| {
                    let w = out.layers.homes[*i].children as f64;
                    h.recommended
                        .as_ref()
                        .zip(h.shortest.as_ref())
                        .map(|(r, sh)| {
                            (
                                sh.audit.network_m,
                                r.audit.uncontrolled_crossings as f64,
                                r.risk,
                                w,
                            )
                        })
                })
                .collect();
            // The rule set's walk zone for this school's pupils, else the benefit setting.
            let zone_m = out
                .config
                .score
                .rules
                .walk_zone_for(school.students, walk_zone);
            let in_zone: f64 = routed.iter().filter(|r| r.0 <= zone_m).map(|r| r.3).sum();
            let len: Vec<(f64, f64)> = routed.iter().map(|r| (r.0, r.3)).collect();
            let unc: Vec<(f64, f64)> = routed.iter().map(|r| (r.1, r.3)).collect();
            let risk: Vec<(f64, f64)> = routed.iter().map(|r| (r.2, r.3)).collect();
            json!({
                "id": school.id,
                "name": school.name,
                "homes": members.len(),
                "children": children,
                "children_routed": routed.iter().map(|r| r.3).sum::<f64>(),
                "children_in_walk_zone": in_zone,
                "walk_zone_m": zone_m,
                "mean_shortest_network_m": mean(&len).map(round2),
                "mean_uncontrolled_crossings": mean(&unc).map(round2),
                "mean_risk_per_trip": mean(&risk).map(|x| (x * 1e4).round() / 1e4),
                "entrances": out.school_att[s].iter().map(|a| {
                    let e = &g.edges[a.edge as usize];
                    json!({ "segment": e.segment(), "side": edge_side(&e.kind),
                            "offset_m": a.offset_m, "snap_m": round2(a.snap_m) })
                }).collect::<Vec<_>>(),
            })
        })
        .collect();
    let mut doc = network_summary(&out.layers, g, qa);
    let extra = json!({
        "warnings": out.warnings.len(),
        "unreached": crate::score::unreached::unreached(out),
        "homes": out.layers.homes.len(),
        "children": out.layers.homes.iter().map(|h| u64::from(h.children)).sum::<u64>(),
        "walk_zone_m": walk_zone,
        "schools": schools,
        "catchments": super::catchments_csv::catchments_json(out),
        "children_on_hazardous_routes": out.scores.catchments.iter().map(|c| c.children_hazardous).sum::<f64>(),
        "top_hotspots": out.scores.hotspots.iter().take(10).collect::<Vec<_>>(),
        "rules": { "name": out.config.score.rules.name, "title": out.config.score.rules.title },
        "timings_ms": out.timings,
        "config": out.config,
        "interventions": crate::scenario::reaudit::applied(out),
    });
    if let (Some(d), Some(e)) = (doc.as_object_mut(), extra.as_object()) {
        d.extend(e.clone());
    }
    doc
}

/// Network figures and QA counts (shared by `audit` and `check`).
pub fn network_summary(layers: &Layers, g: &PedGraph, qa: &Qa) -> Value {
    let count = |f: &dyn Fn(&PedEdgeKind) -> bool| g.corner_edges().filter(|e| f(&e.kind)).count();
    json!({
        "caution": crate::CAUTION,
        "network": {
            "streets": layers.streets.len(),
            "junctions": g.junctions.len(),
            "segments": g.segments.len(),
            "corners": g.corners.len(),
            "side_edges": count(&|k| matches!(k, PedEdgeKind::Side { .. })),
            "path_edges": count(&|k| matches!(k, PedEdgeKind::Path { .. })),
            "crossing_edges": count(&|k| matches!(k, PedEdgeKind::Crossing { .. })),
            "midblock_crossings": count(&|k| matches!(k, PedEdgeKind::Crossing { midblock: true, .. })),
            "length_km": round2(g.segments.iter().map(|s| s.length_m).sum::<f64>() / 1000.0),
            "doorstep_crossings": g.edges.iter().filter(|e| PedGraph::is_doorstep(e)).count(),
            "crossing_points": layers.crossings.len(),
        },
        "qa": {
            "components": qa.components,
            "largest_component_share": qa.largest_component_share,
            "dangling_ends": qa.count(QaKind::DanglingEnd),
            "near_misses": qa.count(QaKind::NearMiss),
            "tiny_components": qa.count(QaKind::TinyComponent),
            "unattached_crossings": qa.count(QaKind::UnattachedCrossing),
            "unreachable_schools": qa.count(QaKind::UnreachableSchool),
            "unreachable_homes": qa.count(QaKind::UnreachableHome),
        },
    })
}
