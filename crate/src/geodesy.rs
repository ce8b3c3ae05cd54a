//! Lengths on the WGS84 ellipsoid, and a local metric frame for spatial indexing.
//!
//! Reported lengths are geodesic (Karney's algorithm, through `geo`'s `Geodesic`); the local
//! frame is only for nearest-neighbour search and snapping, where a flat approximation over a
//! town is ample.

use crate::input::LonLat;
use geo::{Distance, Geodesic, Point};

/// Geodesic distance in metres between two `[lon, lat]` points.
///
/// ```
/// // One degree of latitude at the equator is about 110.57 km on WGS84.
/// let d = catchwalk::geodesy::distance_m([0.0, 0.0], [0.0, 1.0]);
/// assert!((d - 110_574.4).abs() < 1.0);
/// ```
pub fn distance_m(a: LonLat, b: LonLat) -> f64 {
    Geodesic.distance(Point::new(a[0], a[1]), Point::new(b[0], b[1]))
}

/// Geodesic length of a polyline in metres.
pub fn line_length_m(line: &[LonLat]) -> f64 {
    line.windows(2).map(|w| distance_m(w[0], w[1])).sum()
}

/// An equirectangular frame centred on a reference point: metres east and north.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LocalFrame {
    lon0: f64,
    lat0: f64,
    m_per_deg_lon: f64,
    m_per_deg_lat: f64,
}

impl LocalFrame {
    /// A frame whose scale is exact at `origin` (WGS84 radii of curvature).
    pub fn new(origin: LonLat) -> Self {
        let a = 6_378_137.0_f64;
        let f = 1.0 / 298.257_223_563;
        let e2 = f * (2.0 - f);
        let phi = origin[1].to_radians();
        let s = phi.sin();
        let w = (1.0 - e2 * s * s).sqrt();
        let n = a / w; // prime vertical radius
        let m = a * (1.0 - e2) / (w * w * w); // meridional radius
        LocalFrame {
            lon0: origin[0],
            lat0: origin[1],
            m_per_deg_lon: n * phi.cos() * std::f64::consts::PI / 180.0,
            m_per_deg_lat: m * std::f64::consts::PI / 180.0,
        }
    }
    /// `[lon, lat]` to `[east_m, north_m]`.
    pub fn to_xy(&self, p: LonLat) -> [f64; 2] {
        [
            (p[0] - self.lon0) * self.m_per_deg_lon,
            (p[1] - self.lat0) * self.m_per_deg_lat,
        ]
    }
    /// `[east_m, north_m]` back to `[lon, lat]`.
    pub fn to_lonlat(&self, xy: [f64; 2]) -> LonLat {
        [
            self.lon0 + xy[0] / self.m_per_deg_lon,
            self.lat0 + xy[1] / self.m_per_deg_lat,
        ]
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn local_frame_round_trips_and_matches_geodesic_over_short_distances() {
        let origin = [8.54, 47.37];
        let f = LocalFrame::new(origin);
        let p = [8.545, 47.372];
        let back = f.to_lonlat(f.to_xy(p));
        assert!((back[0] - p[0]).abs() < 1e-12 && (back[1] - p[1]).abs() < 1e-12);
        let xy = f.to_xy(p);
        let flat = (xy[0] * xy[0] + xy[1] * xy[1]).sqrt();
        let geo = distance_m(origin, p);
        assert!(
            (flat - geo).abs() / geo < 1e-3,
            "flat {flat} geodesic {geo}"
        );
    }
}
