//! Risk of an edge, as an index in points (not a prediction of injuries).
//!
//! One point is one uncontrolled crossing of a two-lane 50 km/h street at the default local
//! volume. Crossings: [`crossing`]; walking where a side has no sidewalk: [`along`]; speed
//! curves: [`severity`]; waiting at uncontrolled crossings: [`crossing_delay`]; controls:
//! [`control`]; volumes: [`volume`]. Sources and defaults: `docs/methods.md`.

pub mod along;
pub mod control;
pub mod crossing;
pub mod crossing_delay;
pub mod severity;
pub mod volume;

use crate::input::{SideWalk, Street, TimeWindow};
use crate::network::{PedEdge, PedEdgeKind, PedGraph};
use serde::{Deserialize, Serialize};

/// Risk model settings.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct RiskConfig {
    /// Fatality-by-speed curve.
    pub curve: severity::Curve,
    pub volume: volume::VolumeConfig,
    pub controls: control::ControlFactors,
    /// When children walk to and from school; crossing guards count only inside these.
    pub school_windows: Vec<TimeWindow>,
    /// Walking speed in the HCM critical headway (3.5 ft/s = 1.07 m/s, HCM default).
    pub walk_mps: f64,
    /// Pedestrian start-up and end clearance time (3 s, HCM default; from memory).
    pub start_up_s: f64,
    /// Lane width for the reference crossing and for crossings with no width (common practice).
    pub lane_width_m: f64,
    /// The reference crossing worth one point: speed and lanes.
    pub reference_speed_kmh: f64,
    pub reference_lanes: u32,
    /// Treat sides whose sidewalk the data does not state as having none.
    pub unknown_sidewalk_is_absent: bool,
    /// A shoulder at least this wide (m) beside a side with no sidewalk...
    pub shoulder_min_m: f64,
    /// ...keeps this share of the along-street risk: FHWA Proven Safety Countermeasures,
    /// walkways: paved shoulders 71 % fewer crashes with pedestrians walking along roadways
    /// (from memory).
    pub shoulder_factor: f64,
}

impl RiskConfig {
    /// Range checks of the risk model's settings.
    pub fn validate(&self, at: &str, c: &mut crate::range::Checks) {
        self.volume.validate(&format!("{at}.volume"), c);
        self.controls.validate(&format!("{at}.controls"), c);
        for (i, w) in self.school_windows.iter().enumerate() {
            if w.start_min > w.end_min || w.end_min > 24 * 60 {
                c.problem(format!(
                    "{at}.school_windows[{i}] runs from minute {} to {}; allowed: a start before its end, within the day (0 to 1440)",
                    w.start_min, w.end_min
                ));
            }
        }
        c.above(at, "walk_mps", self.walk_mps, 0.0, 5.0);
        c.at_least(at, "start_up_s", self.start_up_s, 0.0, 60.0);
        c.above(at, "lane_width_m", self.lane_width_m, 0.0, 10.0);
        c.above(
            at,
            "reference_speed_kmh",
            self.reference_speed_kmh,
            0.0,
            200.0,
        );
        c.at_least(
            at,
            "reference_lanes",
            self.reference_lanes as f64,
            1.0,
            20.0,
        );
        c.at_least(at, "shoulder_min_m", self.shoulder_min_m, 0.0, 20.0);
        c.at_least(at, "shoulder_factor", self.shoulder_factor, 0.0, 10.0);
    }
}

impl Default for RiskConfig {
    fn default() -> Self {
        RiskConfig {
            curve: severity::Curve::default(),
            volume: volume::VolumeConfig::default(),
            controls: control::ControlFactors::default(),
            school_windows: control::default_school_windows(),
            walk_mps: 1.07,
            start_up_s: 3.0,
            lane_width_m: 3.6,
            reference_speed_kmh: 50.0,
            reference_lanes: 2,
            unknown_sidewalk_is_absent: false,
            shoulder_min_m: 1.2,
            shoulder_factor: 0.29,
        }
    }
}

/// The street an edge belongs to, if its segment and street indices are valid.
pub fn street_of<'a>(
    graph: &PedGraph,
    edge: &PedEdge,
    streets: &'a [Street],
) -> Option<&'a Street> {
    let seg = graph.segments.get(edge.segment() as usize)?;
    streets.get(seg.street)
}

/// Kerb-to-kerb width a crossing edge walks: its length, else lanes x lane width.
pub fn crossed_width_m(edge: &PedEdge, street: &Street, cfg: &RiskConfig) -> f64 {
    if edge.length_m > 0.0 && edge.length_m.is_finite() {
        edge.length_m
    } else {
        street
            .width_m
            .filter(|w| *w > 0.0)
            .unwrap_or(street.lanes.max(1) as f64 * cfg.lane_width_m)
    }
}

/// Whether a side counts as having no sidewalk for along-street risk.
pub fn lacks_sidewalk(sidewalk: SideWalk, cfg: &RiskConfig) -> bool {
    match sidewalk {
        SideWalk::Absent => true,
        SideWalk::Unknown => cfg.unknown_sidewalk_is_absent,
        SideWalk::Present | SideWalk::Separate => false,
    }
}

/// Risk points of walking the whole edge (crossings: one crossing; sides: the full length).
///
/// ```
/// let g = catchwalk::network::PedGraph::toy_path(&[100.0]);
/// let cfg = catchwalk::risk::RiskConfig::default();
/// // A foot path carries no traffic: no risk.
/// assert_eq!(catchwalk::risk::edge_risk_points(&g, &g.edges[0], &[], &cfg), 0.0);
/// ```
pub fn edge_risk_points(
    graph: &PedGraph,
    edge: &PedEdge,
    streets: &[Street],
    cfg: &RiskConfig,
) -> f64 {
    let Some(street) = street_of(graph, edge, streets) else {
        return 0.0;
    };
    if street.class.is_foot_only() {
        return 0.0;
    }
    let v15 = volume::vehicles_15min(street, &cfg.volume);
    match &edge.kind {
        PedEdgeKind::Crossing { control, .. } => crossing::crossing_points(
            &crossing::CrossingInput {
                speed_kmh: street.speed_kmh,
                width_m: crossed_width_m(edge, street, cfg),
                lanes: street.lanes,
                vehicles_15min: v15,
                control,
            },
            cfg,
        ),
        PedEdgeKind::Side { sidewalk, .. } if lacks_sidewalk(*sidewalk, cfg) => {
            let shoulder = match street.shoulder_m {
                Some(w) if w >= cfg.shoulder_min_m => cfg.shoulder_factor.clamp(0.0, 1.0),
                _ => 1.0,
            };
            shoulder
                * along::along_points_per_100m(street.speed_kmh, v15, cfg)
                * edge.length_m.max(0.0)
                / 100.0
        }
        PedEdgeKind::Side { .. } | PedEdgeKind::Path { .. } => 0.0,
    }
}

#[cfg(test)]
pub(crate) mod tests {
    use super::*;
    use crate::input::RoadClass;

    /// A straight street with the given class, speed and lanes, for unit tests.
    pub(crate) fn street(class: RoadClass, speed_kmh: f64, lanes: u32) -> Street {
        Street::new(0, class, speed_kmh, lanes, vec![[0.0, 0.0], [0.001, 0.0]])
    }

    fn one_edge(kind: PedEdgeKind, length_m: f64) -> PedGraph {
        let mut g = PedGraph::toy_path(&[length_m]);
        g.edges[0].kind = kind;
        g
    }

    #[test]
    fn reference_crossing_edge_scores_one_point() {
        let g = one_edge(
            PedEdgeKind::Crossing {
                junction: 0,
                segment: 0,
                control: crate::input::Control::UNCONTROLLED,
                midblock: false,
            },
            7.2,
        );
        let s = [street(RoadClass::Local, 50.0, 2)];
        let p = edge_risk_points(&g, &g.edges[0], &s, &RiskConfig::default());
        assert!((p - 1.0).abs() < 1e-9);
    }

    #[test]
    fn side_without_sidewalk_scores_per_100m() {
        let side = |sw| PedEdgeKind::Side {
            segment: 0,
            side: crate::network::Side::Left,
            sidewalk: sw,
        };
        let s = [street(RoadClass::Local, 50.0, 2)];
        let cfg = RiskConfig::default();
        let g = one_edge(side(SideWalk::Absent), 250.0);
        assert!((edge_risk_points(&g, &g.edges[0], &s, &cfg) - 2.5).abs() < 1e-9);
        let g = one_edge(side(SideWalk::Present), 250.0);
        assert_eq!(edge_risk_points(&g, &g.edges[0], &s, &cfg), 0.0);
        let g = one_edge(side(SideWalk::Unknown), 250.0);
        assert_eq!(edge_risk_points(&g, &g.edges[0], &s, &cfg), 0.0);
        let strict = RiskConfig {
            unknown_sidewalk_is_absent: true,
            ..cfg.clone()
        };
        assert!(edge_risk_points(&g, &g.edges[0], &s, &strict) > 0.0);
        // A 1.5 m shoulder keeps 29 % of it; a 1 m shoulder none off.
        let g = one_edge(side(SideWalk::Absent), 250.0);
        let mut s = s;
        s[0].shoulder_m = Some(1.5);
        assert!((edge_risk_points(&g, &g.edges[0], &s, &cfg) - 2.5 * 0.29).abs() < 1e-9);
        s[0].shoulder_m = Some(1.0);
        assert!((edge_risk_points(&g, &g.edges[0], &s, &cfg) - 2.5).abs() < 1e-9);
    }

    #[test]
    fn a_bad_segment_index_scores_nothing_rather_than_panicking() {
        let mut g = PedGraph::toy_path(&[10.0]);
        g.edges[0].kind = PedEdgeKind::Path { segment: 99 };
        assert_eq!(
            edge_risk_points(&g, &g.edges[0], &[], &RiskConfig::default()),
            0.0
        );
    }
}
