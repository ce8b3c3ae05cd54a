//! Builders for unit tests.

use crate::input::{LonLat, RoadClass, SideWalk, SpeedSource, Street};

/// A two-lane 50 km/h local street with sidewalks on both sides, at grade.
pub(crate) fn street(line: Vec<LonLat>) -> Street {
    Street {
        feature: 0,
        id: "s".into(),
        name: None,
        class: RoadClass::Local,
        speed_kmh: 50.0,
        speed_source: SpeedSource::Posted,
        lanes: 2,
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
