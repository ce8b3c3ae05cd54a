//! The per-route audit: lengths, crossings made and what they cross, exposure beside traffic.

use crate::input::{Device, RoadClass, SideWalk, Street};
use crate::network::{PedEdgeKind, PedGraph};
use crate::route::Route;
use serde::Serialize;
use std::collections::BTreeMap;

/// Speed bands for exposure and crossing counts (km/h): <=30, 31-50, >50 (common practice:
/// 30 km/h zones, 50 km/h urban default, faster roads).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum SpeedBand {
    Le30,
    From31To50,
    Gt50,
}

impl SpeedBand {
    pub fn of(speed_kmh: f64) -> Self {
        if speed_kmh <= 30.0 {
            SpeedBand::Le30
        } else if speed_kmh <= 50.0 {
            SpeedBand::From31To50
        } else {
            SpeedBand::Gt50
        }
    }
    pub fn as_str(self) -> &'static str {
        match self {
            SpeedBand::Le30 => "le30",
            SpeedBand::From31To50 => "31_50",
            SpeedBand::Gt50 => "gt50",
        }
    }
}

/// One crossing a route makes.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CrossingMade {
    pub edge: u32,
    pub device: Device,
    pub guarded: bool,
    pub refuge_island: bool,
    pub class: RoadClass,
    pub speed_kmh: f64,
    pub lanes: u32,
    pub midblock: bool,
    pub uncontrolled: bool,
}

/// Figures for one route.
#[derive(Debug, Clone, Default, PartialEq, Serialize)]
pub struct RouteAudit {
    /// Sum of side and path edges walked (crossings add nothing).
    pub network_m: f64,
    /// Network length plus crossing widths.
    pub walked_m: f64,
    pub crossings: Vec<CrossingMade>,
    /// Crossings with no signal, no stop sign and no crossing guard (the usual meaning of an
    /// uncontrolled crossing location; a marked crosswalk alone is uncontrolled).
    pub uncontrolled_crossings: u32,
    pub arterial_crossings: u32,
    /// Metres walked beside arterials.
    pub arterial_exposure_m: f64,
    pub along_le30_m: f64,
    pub along_31_50_m: f64,
    pub along_gt50_m: f64,
    /// Metres walked on a side with no sidewalk.
    pub no_sidewalk_m: f64,
    /// Metres walked on a side whose sidewalk the data does not state.
    pub unknown_sidewalk_m: f64,
    /// Metres on foot-only paths and steps.
    pub path_m: f64,
}

impl RouteAudit {
    /// Crossings counted by device name (`none`, `marked`, `signal`, ...).
    pub fn crossings_by_device(&self) -> BTreeMap<&'static str, u32> {
        let mut m = BTreeMap::new();
        for c in &self.crossings {
            *m.entry(device_name(c.device)).or_insert(0) += 1;
        }
        m
    }
}

pub fn device_name(d: Device) -> &'static str {
    match d {
        Device::None => "none",
        Device::Marked => "marked",
        Device::Yield => "yield",
        Device::Beacon => "beacon",
        Device::Stop => "stop",
        Device::AllWayStop => "all_way_stop",
        Device::Signal => "signal",
    }
}

/// Audits one route: walks its steps and sums what each edge contributes.
pub fn audit_route(graph: &PedGraph, streets: &[Street], route: &Route) -> RouteAudit {
    let mut a = RouteAudit::default();
    for step in &route.steps {
        let edge = &graph.edges[step.edge as usize];
        let street = &streets[graph.segments[edge.segment() as usize].street];
        match &edge.kind {
            PedEdgeKind::Crossing {
                control, midblock, ..
            } => {
                a.walked_m += edge.length_m;
                let guarded = control.guard.is_some();
                let uncontrolled = !guarded
                    && !matches!(
                        control.device,
                        Device::Signal | Device::Stop | Device::AllWayStop
                    );
                a.uncontrolled_crossings += uncontrolled as u32;
                a.arterial_crossings += (street.class == RoadClass::Arterial) as u32;
                a.crossings.push(CrossingMade {
                    edge: step.edge,
                    device: control.device,
                    guarded,
                    refuge_island: control.refuge_island,
                    class: street.class,
                    speed_kmh: street.speed_kmh,
                    lanes: street.lanes,
                    midblock: *midblock,
                    uncontrolled,
                });
            }
            PedEdgeKind::Path { .. } => {
                let m = step.share() * edge.length_m;
                a.network_m += m;
                a.walked_m += m;
                a.path_m += m;
            }
            PedEdgeKind::Side { sidewalk, .. } => {
                let m = step.share() * edge.length_m;
                a.network_m += m;
                a.walked_m += m;
                if street.class == RoadClass::Arterial {
                    a.arterial_exposure_m += m;
                }
                match SpeedBand::of(street.speed_kmh) {
                    SpeedBand::Le30 => a.along_le30_m += m,
                    SpeedBand::From31To50 => a.along_31_50_m += m,
                    SpeedBand::Gt50 => a.along_gt50_m += m,
                }
                match sidewalk {
                    SideWalk::Absent => a.no_sidewalk_m += m,
                    SideWalk::Unknown => a.unknown_sidewalk_m += m,
                    _ => {}
                }
            }
        }
    }
    a
}
