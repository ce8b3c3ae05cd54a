//! The validated model: plain data that every later stage reads and none mutates.
//! Coordinates are WGS84 `[longitude, latitude]` in degrees.

use serde::{Deserialize, Serialize};

pub type LonLat = [f64; 2];

/// Road class, as the pedestrian graph and the risk model see it.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum RoadClass {
    Arterial,
    Collector,
    Local,
    Service,
    /// Foot-only path: one edge, no traffic beside it, free to cross.
    Path,
    /// Steps: foot-only like a path.
    Steps,
}

impl RoadClass {
    /// Foot-only ways carry no traffic: a single edge, crossing them is free.
    pub fn is_foot_only(self) -> bool {
        matches!(self, RoadClass::Path | RoadClass::Steps)
    }
    pub fn as_str(self) -> &'static str {
        match self {
            RoadClass::Arterial => "arterial",
            RoadClass::Collector => "collector",
            RoadClass::Local => "local",
            RoadClass::Service => "service",
            RoadClass::Path => "path",
            RoadClass::Steps => "steps",
        }
    }
}

/// What one side of a street offers a walker.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum SideWalk {
    /// A sidewalk on this side.
    Present,
    /// No sidewalk: walkable, but beside traffic (along-street exposure).
    Absent,
    /// The data does not say.
    Unknown,
    /// The sidewalk is drawn as its own foot path: this side is not walkable itself.
    Separate,
}

/// Where a speed came from: a posted value in the data, or the class default.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum SpeedSource {
    Posted,
    ClassDefault,
}

/// One street feature (a LineString, or one part of a MultiLineString).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Street {
    /// Index of the feature in the streets layer (0-based).
    pub feature: usize,
    /// The feature's id, or its index as text.
    pub id: String,
    pub name: Option<String>,
    pub class: RoadClass,
    pub speed_kmh: f64,
    pub speed_source: SpeedSource,
    /// Through lanes in both directions together (at least 1 for a road).
    pub lanes: u32,
    /// Sidewalk on the left of the digitised direction.
    pub left: SideWalk,
    /// Sidewalk on the right of the digitised direction.
    pub right: SideWalk,
    pub oneway: bool,
    /// Vertical layer: 0 at grade, positive bridges, negative tunnels.
    pub layer: i32,
    /// Average daily traffic (vehicles per day), if the layer gives it.
    pub aadt: Option<f64>,
    /// Kerb-to-kerb width in metres, if the layer gives it.
    pub width_m: Option<f64>,
    /// Vehicles counted in the busiest 15 minutes of school travel, if measured.
    pub vehicles_15min: Option<f64>,
    /// Width of a raised median with non-mountable kerbs, if any (metres).
    pub median_m: Option<f64>,
    /// Shoulder width beside the carriageway where there is no sidewalk (metres).
    pub shoulder_m: Option<f64>,
    /// The polyline, at least two distinct points.
    pub line: Vec<LonLat>,
}

impl Street {
    /// A street built in code (tests, benchmarks): posted `speed_kmh` and `lanes`, sidewalks
    /// on both sides, at grade, every optional property absent; `id` is the feature index.
    ///
    /// ```
    /// use catchwalk::input::{RoadClass, SideWalk, Street};
    /// let s = Street::new(3, RoadClass::Local, 40.0, 2, vec![[0.0, 0.0], [0.001, 0.0]]);
    /// assert_eq!((s.id.as_str(), s.left, s.right), ("3", SideWalk::Present, SideWalk::Present));
    /// ```
    pub fn new(
        feature: usize,
        class: RoadClass,
        speed_kmh: f64,
        lanes: u32,
        line: Vec<LonLat>,
    ) -> Street {
        Street {
            feature,
            id: feature.to_string(),
            name: None,
            class,
            speed_kmh,
            speed_source: SpeedSource::Posted,
            lanes,
            left: SideWalk::Present,
            right: SideWalk::Present,
            oneway: false,
            layer: 0,
            aadt: None,
            width_m: None,
            vehicles_15min: None,
            median_m: None,
            shoulder_m: None,
            line,
        }
    }
}

/// The traffic device at a crossing, from weakest to strongest.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Device {
    /// Nothing: an uncontrolled, unmarked crossing.
    None,
    /// Marked crosswalk without further control.
    Marked,
    /// Yield (give-way) sign on the crossed leg: drivers must slow and yield but need not
    /// stop. Not a stop sign: 67 Pa. Code § 447.4(a)(2) exempts only signals and stop signs.
    Yield,
    /// Marked crosswalk with a pedestrian-activated flashing beacon.
    Beacon,
    /// Stop sign on the crossed leg (minor-leg control).
    Stop,
    /// All-way stop.
    AllWayStop,
    /// Traffic signal with pedestrian phase.
    Signal,
}

/// Minutes after midnight, [start, end).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub struct TimeWindow {
    pub start_min: u16,
    pub end_min: u16,
}

/// Everything that controls one crossing. Features combine (a marked crossing with a refuge
/// island and a guard at school times).
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct Control {
    pub device: Device,
    pub refuge_island: bool,
    pub raised: bool,
    /// An adult crossing guard; `Some(empty)` means on duty at school travel times.
    pub guard: Option<Vec<TimeWindow>>,
}

impl Control {
    pub const UNCONTROLLED: Control = Control {
        device: Device::None,
        refuge_island: false,
        raised: false,
        guard: None,
    };
    /// No device, island, raised table or guard.
    pub fn is_uncontrolled(&self) -> bool {
        self.device == Device::None && !self.refuge_island && !self.raised && self.guard.is_none()
    }
}

impl Default for Control {
    fn default() -> Self {
        Control::UNCONTROLLED
    }
}

/// How a crossing point's control spreads over the legs of the node it attaches to.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum ControlScope {
    /// Every road leg at the node (signals, all-way stops, a crossing node of separately
    /// drawn sidewalks).
    AllLegs,
    /// Only the leg nearest the point (a marked crosswalk on one arm, a minor-leg stop).
    NearestLeg,
}

/// A crossing point from the crossings layer.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct CrossingPoint {
    pub feature: usize,
    pub id: String,
    pub at: LonLat,
    pub control: Control,
    pub scope: ControlScope,
}

/// Which rows of an age-banded table apply (walking-route rules differ by age).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Students {
    #[default]
    Elementary,
    Secondary,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct School {
    pub feature: usize,
    pub id: String,
    pub name: String,
    /// Where children enter: the given entrances, else the point, else the polygon centroid.
    pub entrances: Vec<LonLat>,
    pub students: Students,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Home {
    pub feature: usize,
    pub id: String,
    pub at: LonLat,
    /// Number of children living there (the weight; default 1).
    pub children: u32,
    /// Assigned school id, if the layer gives one.
    pub school: Option<String>,
}

/// A catchment: the area a school serves. Polygons as rings of `[lon, lat]`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Catchment {
    pub feature: usize,
    pub school_id: String,
    pub area: geo::MultiPolygon<f64>,
}

/// All input layers after validation.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
pub struct Layers {
    pub streets: Vec<Street>,
    pub crossings: Vec<CrossingPoint>,
    pub schools: Vec<School>,
    pub homes: Vec<Home>,
    pub catchments: Vec<Catchment>,
    /// Rail grade crossings walkers use (from the crossings layer).
    #[serde(default)]
    pub rail_crossings: Vec<super::observed::RailCrossing>,
    /// Observed crashes (the optional crashes layer).
    #[serde(default)]
    pub crashes: Vec<super::observed::Crash>,
}
