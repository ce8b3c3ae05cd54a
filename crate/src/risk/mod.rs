//! Risk of an edge, as an index in points (not a prediction of injuries).
//!
//! Interim model until the published methods land: one point per uncontrolled crossing of a
//! two-lane 50 km/h street, scaled by speed band and lanes. Replaced by the severity-curve model.

use crate::input::{Device, Street};
use crate::network::{PedEdge, PedEdgeKind, PedGraph};
use serde::{Deserialize, Serialize};

/// Risk model settings.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct RiskConfig {}

/// Risk points of walking the whole edge (crossings: one crossing; sides: the full length).
pub fn edge_risk_points(
    graph: &PedGraph,
    edge: &PedEdge,
    streets: &[Street],
    cfg: &RiskConfig,
) -> f64 {
    let _ = cfg;
    let street = &streets[graph.segments[edge.segment() as usize].street];
    if street.class.is_foot_only() {
        return 0.0;
    }
    let band = if street.speed_kmh <= 30.0 {
        0.2
    } else if street.speed_kmh <= 50.0 {
        1.0
    } else {
        3.0
    };
    match &edge.kind {
        PedEdgeKind::Crossing { control, .. } => {
            let device = match control.device {
                Device::Signal | Device::AllWayStop => 0.2,
                Device::Stop => 0.4,
                Device::Beacon => 0.6,
                Device::Marked => 0.9,
                Device::None => 1.0,
            };
            let guard = if control.guard.is_some() { 0.3 } else { 1.0 };
            band * device * guard * (street.lanes.max(1) as f64 / 2.0)
        }
        PedEdgeKind::Side { sidewalk, .. } => match sidewalk {
            crate::input::SideWalk::Absent => band * edge.length_m / 100.0,
            _ => 0.0,
        },
        PedEdgeKind::Path { .. } => 0.0,
    }
}
