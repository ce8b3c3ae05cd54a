//! The upgrade planner's chosen upgrades as an interventions layer, so a plan can be audited,
//! edited and compared like any scenario (`catchwalk plan` writes `interventions.geojson`).

use crate::geodesy::{distance_m, LocalFrame};
use crate::input::{LonLat, SideWalk};
use crate::network::{PedEdgeKind, PedGraph, NO_CORNER};
use crate::pipeline::AuditOutput;
use crate::score::plan::{Plan, Upgrade};
use serde_json::{json, Value};

/// A point `d_m` metres from the junction along the segment's first piece (at most halfway).
fn along(graph: &PedGraph, segment: u32, junction: u32, d_m: f64) -> Option<LonLat> {
    let seg = graph.segments.get(segment as usize)?;
    let j = graph.junctions.get(junction as usize)?.at;
    let mut line = seg.line.clone();
    if seg.from != junction {
        line.reverse();
    }
    let next = *line.get(1)?;
    let len = distance_m(j, next);
    if len <= 0.0 {
        return Some(j);
    }
    let t = (d_m / len).min(0.5);
    let f = LocalFrame::new(j);
    let q = f.to_xy(next);
    Some(f.to_lonlat([q[0] * t, q[1] * t]))
}

/// Where a crossing upgrade is drawn so that it attaches as the planner applied it: on the
/// junction for a signal (it controls every leg) or a mid-block crossing; 3 m into the
/// crossed leg for a guard or refuge (one leg, as a crossings-layer point there would be).
fn control_point(graph: &PedGraph, edge: u32, up: Upgrade) -> Option<LonLat> {
    let e = graph.edges.get(edge as usize)?;
    let PedEdgeKind::Crossing {
        junction,
        segment,
        midblock,
        ..
    } = e.kind
    else {
        return None;
    };
    if e.a == NO_CORNER || e.b == NO_CORNER {
        // A doorstep crossing has no junction: a point mid-segment makes a mid-block crossing.
        let seg = graph.segments.get(segment as usize)?;
        return seg.line.get(seg.line.len() / 2).copied();
    }
    if up == Upgrade::Signal || midblock {
        return graph.junctions.get(junction as usize).map(|j| j.at);
    }
    along(graph, segment, junction, 3.0)
}

/// The plan's upgrades as a GeoJSON FeatureCollection of interventions (`origin: plan`, the
/// rank and the children gained kept as properties), in rank order. Street-wide upgrades have
/// no geometry (a Point would change only the block it is on).
///
/// ```
/// use catchwalk::score::plan::Plan;
/// # let out = catchwalk::pipeline::audit_layers(Default::default(), &Default::default(),
/// #     &mut catchwalk::pipeline::Silent).unwrap();
/// let plan = Plan { budget: 0, steps: vec![], before: vec![], after: vec![],
///     safe_children_before: 0.0, safe_children_after: 0.0, children_routed: 0.0 };
/// let fc = catchwalk::scenario::from_plan::plan_interventions(&out, &plan);
/// assert_eq!(fc["features"].as_array().map(|a| a.len()), Some(0));
/// ```
pub fn plan_interventions(out: &AuditOutput, plan: &Plan) -> Value {
    let g = &out.network.graph;
    let streets = &out.layers.streets;
    let features: Vec<Value> = plan
        .steps
        .iter()
        .filter_map(|s| {
            let e = g.edges.get(s.edge as usize)?;
            let seg = g.segments.get(e.segment() as usize)?;
            let street = streets.get(seg.street)?;
            let mut props = json!({
                "origin": "plan",
                "rank": s.rank,
                "children_gained": s.children_gained,
                "note": format!("upgrade planner, rank {}: {} on {}", s.rank, s.upgrade.as_str(), s.street),
            });
            let (kind, at) = match s.upgrade {
                Upgrade::Signal | Upgrade::Guard | Upgrade::Refuge => {
                    let kind = match s.upgrade {
                        Upgrade::Signal => "signal",
                        Upgrade::Guard => "guard",
                        _ => "refuge",
                    };
                    (kind, control_point(g, s.edge, s.upgrade))
                }
                Upgrade::SpeedReduction => {
                    props["street"] = json!(street.id);
                    props["speed_kmh"] = json!(street.speed_kmh.min(out.config.score.plan.speed_target_kmh));
                    ("speed", None) // the planner changes the whole street: no Point
                }
                Upgrade::Sidewalk => {
                    let open = |w: SideWalk| matches!(w, SideWalk::Absent | SideWalk::Unknown);
                    let side = match (open(street.left), open(street.right)) {
                        (true, false) => "left",
                        (false, true) => "right",
                        _ => "both",
                    };
                    props["street"] = json!(street.id);
                    props["side"] = json!(side);
                    ("sidewalk", None)
                }
            };
            props["kind"] = json!(kind);
            let geometry = at.map(|p| json!({"type": "Point", "coordinates": p}));
            Some(json!({"type": "Feature", "geometry": geometry, "properties": props}))
        })
        .collect();
    json!({"type": "FeatureCollection", "features": features})
}
