//! Hotspots: every crossing and side edge that children are routed through, ranked by the
//! risk it adds to their trips (children x risk of the part they walk).

use super::home::street_label;
use super::rules::{edge_facts, EdgeFacts};
use crate::audit::device_name;
use crate::config::Config;
use crate::input::{Control, Home, Street};
use crate::network::{PedEdgeKind, PedGraph};
use crate::pipeline::HomeResult;
use crate::risk::crossing_delay::{gap_delay, Los};
use crate::risk::volume::peak_flow_per_s;
use crate::risk::{edge_risk_points, street_of};
use serde::Serialize;

/// One ranked hotspot.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Hotspot {
    pub rank: usize,
    pub edge: u32,
    /// `crossing` or `side`.
    pub kind: &'static str,
    pub street_id: String,
    pub street: String,
    pub class: &'static str,
    /// Device and features: `none`, `marked+refuge`, `signal+guard`; sides: the sidewalk.
    pub control: String,
    pub speed_kmh: f64,
    pub lanes: u32,
    /// Children whose recommended route uses the edge.
    pub children: f64,
    /// Risk points of the whole edge (one crossing, or the full side).
    pub risk: f64,
    /// Children x risk of the part each walks: the risk the edge adds per school trip.
    pub product: f64,
    /// HCM average wait at the crossing (s) and its LOS (crossings only).
    pub wait_s: Option<f64>,
    pub los: Option<Los>,
    /// Observed crashes joined to the edge (all, with a pedestrian, killed or seriously
    /// injured): beside the modelled risk, never in it. Counts, not points: safe to share.
    pub crashes: u32,
    pub crashes_pedestrian: u32,
    pub crashes_ksi: u32,
}

/// Names a control: device plus features, joined by `+`.
///
/// ```
/// use catchwalk::input::{Control, Device};
/// let c = Control { device: Device::Marked, refuge_island: true, ..Control::UNCONTROLLED };
/// assert_eq!(catchwalk::score::hotspots::control_label(&c), "marked+refuge");
/// ```
pub fn control_label(c: &Control) -> String {
    let mut parts = vec![device_name(c.device).to_string()];
    if c.refuge_island {
        parts.push("refuge".into());
    }
    if c.raised {
        parts.push("raised".into());
    }
    if c.guard.is_some() {
        parts.push("guard".into());
    }
    parts.join("+")
}

/// Ranks the edges of the recommended routes.
pub fn hotspots(
    homes: &[HomeResult],
    layer_homes: &[Home],
    graph: &PedGraph,
    streets: &[Street],
    config: &Config,
) -> Vec<Hotspot> {
    // Dense arrays over the graph's edges: a county's routes take millions of steps.
    let n = graph.edges.len();
    let recommended = || {
        homes.iter().zip(layer_homes).filter_map(|(h, home)| {
            let rec = h.recommended.as_ref()?;
            Some((home.children as f64, &rec.route.steps))
        })
    };
    // The edges walked, in the order first walked; their risk points on every core natively.
    let mut is_walked = vec![false; n];
    let mut walked: Vec<u32> = Vec::new();
    for (_, steps) in recommended() {
        for step in steps.iter() {
            if let Some(seen @ false) = is_walked.get_mut(step.edge as usize) {
                *seen = true;
                walked.push(step.edge);
            }
        }
    }
    let risks = crate::cores::map(&walked, |&e| {
        graph.edges.get(e as usize).map_or(0.0, |edge| {
            edge_risk_points(graph, edge, streets, &config.risk)
        })
    });
    let mut risk_of = vec![0.0; n];
    for (&e, r) in walked.iter().zip(risks) {
        if let Some(slot) = risk_of.get_mut(e as usize) {
            *slot = r;
        }
    }
    // Per edge (children, product), summed in home order.
    let mut acc: Vec<(f64, f64)> = vec![(0.0, 0.0); n];
    for (w, steps) in recommended() {
        for step in steps.iter() {
            let k = step.edge as usize;
            let (Some(edge), Some(&r)) = (graph.edges.get(k), risk_of.get(k)) else {
                continue;
            };
            if r <= 0.0 {
                continue;
            }
            let share = if edge.is_crossing() {
                1.0
            } else {
                step.share()
            };
            if let Some(a) = acc.get_mut(k) {
                a.0 += w;
                a.1 += w * share * r;
            }
        }
    }
    // Each walked edge's row reads that edge alone: on every core natively.
    let mut out: Vec<Hotspot> = crate::cores::map(&walked, |&e| {
        let (children, product) = acc.get(e as usize).copied()?;
        if children <= 0.0 {
            return None;
        }
        let edge = graph.edges.get(e as usize)?;
        let street = street_of(graph, edge, streets)?;
        let (kind, control) = match &edge.kind {
            PedEdgeKind::Crossing { control, .. } => ("crossing", control_label(control)),
            PedEdgeKind::Side { sidewalk, .. } => (
                "side",
                serde_json::to_value(sidewalk)
                    .ok()
                    .and_then(|v| v.as_str().map(|s| format!("sidewalk_{s}")))
                    .unwrap_or_default(),
            ),
            PedEdgeKind::Path { .. } => ("path", String::new()),
        };
        let (wait_s, los) = match edge_facts(graph, edge, streets, &config.risk) {
            Some(EdgeFacts::Crossing(f)) => {
                let d = gap_delay(
                    f.width_m,
                    f.lanes,
                    peak_flow_per_s(f.vehicles_15min),
                    config.risk.walk_mps,
                    config.risk.start_up_s,
                );
                (Some(d.average_delay_s), Some(d.los))
            }
            _ => (None, None),
        };
        Some(Hotspot {
            rank: 0,
            edge: e,
            kind,
            street_id: street.id.clone(),
            street: street_label(street),
            class: street.class.as_str(),
            control,
            speed_kmh: street.speed_kmh,
            lanes: street.lanes,
            children,
            risk: risk_of.get(e as usize).copied().unwrap_or(0.0),
            product,
            wait_s,
            los,
            crashes: 0,
            crashes_pedestrian: 0,
            crashes_ksi: 0,
        })
    })
    .into_iter()
    .flatten()
    .collect();
    out.sort_by(|a, b| b.product.total_cmp(&a.product).then(a.edge.cmp(&b.edge)));
    for (i, h) in out.iter_mut().enumerate() {
        h.rank = i + 1;
    }
    out
}
