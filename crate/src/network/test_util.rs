//! Builders for unit tests.

use crate::input::{LonLat, RoadClass, Street};

/// A two-lane 50 km/h local street with sidewalks on both sides, at grade.
pub(crate) fn street(line: Vec<LonLat>) -> Street {
    Street::new(0, RoadClass::Local, 50.0, 2, line)
}
