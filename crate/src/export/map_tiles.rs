//! Vector tiles (Mapbox Vector Tile 2.1) of the noded centrelines and of the hotspots, cut on
//! demand for the page's map: the worker answers each tile the map asks for, so the map never
//! holds or tiles a district's streets or hotspots as GeoJSON (about 600 MB of the tab for
//! 100 k segments, and 190-280 MB for their 34 000 hotspots, when it did).
//!
//! Tiles are addressed as web maps do (z/x/y in Web Mercator, EPSG:3857, y from the north) with
//! the usual 4 096 units across a tile; each segment carries what the map draws it by and
//! what a click needs: `segment` (its index: the worker gives the rest), `class`, `speed_kmh`.

use crate::error::Error;
use crate::input::{LonLat, RoadClass};
use crate::pipeline::AuditOutput;
use mvt::{GeomEncoder, GeomType, Tile};
use rstar::primitives::{GeomWithData, Rectangle};
use rstar::{RTree, AABB};

/// Units across a tile (the MVT specification's example value and common practice).
pub const EXTENT: u32 = 4096;
/// Units drawn beyond each edge, so that line caps and joins at an edge draw whole
/// (MapLibre's own GeoJSON tiles keep 128 of 8 192: the same share).
const BUFFER: f64 = 64.0;
/// The deepest zoom cut; the map scales this level's tiles up beyond it.
pub const MAX_ZOOM: u32 = 16;
/// The zoom from which local and service streets and foot paths are in the tiles: below it
/// (a whole district in view, an 80 m block about 5 pixels long) only arterials and
/// collectors are, as general-purpose web maps draw minor streets from about zoom 12 (common
/// practice).
pub const MINOR_FROM_ZOOM: u32 = 12;
/// The name of the street tiles' one layer (the map's style reads it as `source-layer`).
pub const LAYER: &str = "streets";
/// The name of the hotspot tiles' one layer.
pub const HOTSPOT_LAYER: &str = "hotspots";

/// The segments' bounding boxes in degrees, to find a tile's segments without a scan.
pub struct SegmentIndex {
    tree: RTree<GeomWithData<Rectangle<[f64; 2]>, u32>>,
}

impl SegmentIndex {
    /// Indexes every segment of the audit's network with finite coordinates.
    pub fn build(out: &AuditOutput) -> SegmentIndex {
        let boxes = out
            .network
            .graph
            .segments
            .iter()
            .enumerate()
            .filter_map(|(i, s)| {
                let (lo, hi) = super::geometry::line_bounds(&s.line)?;
                Some(GeomWithData::new(Rectangle::from_corners(lo, hi), i as u32))
            })
            .collect();
        SegmentIndex {
            tree: RTree::bulk_load(boxes),
        }
    }
}

/// The hotspots as the map draws them: a point each (the middle position of its line), with
/// its index among the features of [`hotspots_geojson`](super::hotspots_geojson) (the page's
/// popup reads the rest there) and its weight, children x risk over the largest.
pub struct HotspotIndex {
    tree: RTree<GeomWithData<[f64; 2], (u32, f64)>>,
}

impl HotspotIndex {
    /// Places every hotspot feature with a finite middle position.
    pub fn build(out: &AuditOutput) -> HotspotIndex {
        let features: Vec<_> = (0..out.scores.hotspots.len())
            .filter_map(|i| super::hotspots::hotspot_feature(out, i))
            .collect();
        let largest = features
            .iter()
            .map(|f| f.product())
            .fold(1e-9_f64, f64::max);
        let points = features
            .iter()
            .enumerate()
            .filter_map(|(i, f)| {
                let line = f.line();
                let p = *line.get(line.len() / 2)?;
                (p[0].is_finite() && p[1].is_finite())
                    .then(|| GeomWithData::new(p, (i as u32, f.product() / largest)))
            })
            .collect();
        HotspotIndex {
            tree: RTree::bulk_load(points),
        }
    }
}

/// Web Mercator's latitude limit (where the projected world is square).
const MAX_LAT: f64 = 85.051_128_779_806_59;

/// A point in the unit square of the Web Mercator world (x east, y south).
fn world(p: LonLat) -> (f64, f64) {
    let lat = p[1].clamp(-MAX_LAT, MAX_LAT).to_radians();
    let x = (p[0] + 180.0) / 360.0;
    let y = (1.0 - (lat.tan() + 1.0 / lat.cos()).ln() / std::f64::consts::PI) / 2.0;
    (x, y)
}

/// The longitude and latitude of a point of the unit square (inverse of [`world`]).
fn lon_lat(x: f64, y: f64) -> LonLat {
    let lat = (std::f64::consts::PI * (1.0 - 2.0 * y))
        .sinh()
        .atan()
        .to_degrees();
    [x * 360.0 - 180.0, lat]
}

fn bad_tile(z: u32, x: u32, y: u32, why: impl std::fmt::Display) -> Error {
    Error::Config(format!("map tile {z}/{x}/{y}: {why}"))
}

/// The part of the segment `a`-`b` inside the square `lo..=hi` (Liang-Barsky), if any.
fn clip_segment(
    a: (f64, f64),
    b: (f64, f64),
    lo: f64,
    hi: f64,
) -> Option<((f64, f64), (f64, f64))> {
    let (dx, dy) = (b.0 - a.0, b.1 - a.1);
    let (mut t0, mut t1) = (0.0_f64, 1.0_f64);
    for (p, q) in [
        (-dx, a.0 - lo),
        (dx, hi - a.0),
        (-dy, a.1 - lo),
        (dy, hi - a.1),
    ] {
        if p == 0.0 {
            if q < 0.0 {
                return None;
            }
        } else {
            let r = q / p;
            if p < 0.0 {
                t0 = t0.max(r);
            } else {
                t1 = t1.min(r);
            }
        }
    }
    (t0 <= t1).then_some((
        (a.0 + t0 * dx, a.1 + t0 * dy),
        (a.0 + t1 * dx, a.1 + t1 * dy),
    ))
}

/// A polyline in tile units clipped to the square `lo..=hi`: the runs inside, each with two
/// or more distinct points once rounded to whole units (what the tile can hold).
fn clipped_runs(points: &[(f64, f64)], lo: f64, hi: f64) -> Vec<Vec<(f64, f64)>> {
    let key = |p: (f64, f64)| (p.0.round() as i64, p.1.round() as i64);
    let mut runs: Vec<Vec<(f64, f64)>> = Vec::new();
    let mut run: Vec<(f64, f64)> = Vec::new();
    let mut flush = |run: &mut Vec<(f64, f64)>| {
        let distinct = run.windows(2).any(|w| key(w[0]) != key(w[1]));
        if distinct {
            runs.push(std::mem::take(run));
        }
        run.clear();
    };
    for w in points.windows(2) {
        let Some((p, q)) = clip_segment(w[0], w[1], lo, hi) else {
            flush(&mut run);
            continue;
        };
        // A run goes on while each piece starts where the last one ended (inside the square).
        if run.last().is_some_and(|l| key(*l) != key(p)) {
            flush(&mut run);
        }
        if run.is_empty() {
            run.push(p);
        }
        run.push(q);
    }
    flush(&mut run);
    runs
}

/// Where tile `z/x/y` lies: its box in degrees with the buffer, and the map from degrees to
/// its units.
struct TileFrame {
    z: u32,
    x: u32,
    y: u32,
    n: f64,
    query: AABB<[f64; 2]>,
}

impl TileFrame {
    /// Zoom past [`MAX_ZOOM`] or a tile off the grid is an error.
    fn new(z: u32, x: u32, y: u32) -> Result<TileFrame, Error> {
        if z > MAX_ZOOM {
            return Err(bad_tile(z, x, y, format!("zoom past {MAX_ZOOM}")));
        }
        let n = f64::from(1u32 << z);
        if f64::from(x) >= n || f64::from(y) >= n {
            return Err(bad_tile(z, x, y, "not on the tile grid"));
        }
        let pad = BUFFER / f64::from(EXTENT);
        let nw = lon_lat((f64::from(x) - pad) / n, (f64::from(y) - pad) / n);
        let se = lon_lat(
            (f64::from(x) + 1.0 + pad) / n,
            (f64::from(y) + 1.0 + pad) / n,
        );
        let query = AABB::from_corners([nw[0], se[1]], [se[0], nw[1]]);
        Ok(TileFrame { z, x, y, n, query })
    }

    /// A position in the tile's units (y down).
    fn units(&self, p: LonLat) -> (f64, f64) {
        let (wx, wy) = world(p);
        (
            (wx * self.n - f64::from(self.x)) * f64::from(EXTENT),
            (wy * self.n - f64::from(self.y)) * f64::from(EXTENT),
        )
    }

    fn error(&self, why: impl std::fmt::Display) -> Error {
        bad_tile(self.z, self.x, self.y, why)
    }
}

/// The hotspot tile `z/x/y` as MVT bytes: every hotspot point within the tile and its buffer,
/// with its index `i` and `weight`. Zoom past [`MAX_ZOOM`] or a tile off the grid is an error.
pub fn hotspot_tile(index: &HotspotIndex, z: u32, x: u32, y: u32) -> Result<Vec<u8>, Error> {
    let frame = TileFrame::new(z, x, y)?;
    let mut hits: Vec<([f64; 2], (u32, f64))> = index
        .tree
        .locate_in_envelope(&frame.query)
        .map(|g| (*g.geom(), g.data))
        .collect();
    // The same bytes for the same tile, whatever order the index keeps.
    hits.sort_unstable_by_key(|h| h.1 .0);
    let mut tile = Tile::new(EXTENT);
    let mut layer = tile.create_layer(HOTSPOT_LAYER);
    for (p, (i, weight)) in hits {
        let (px, py) = frame.units(p);
        let geom = GeomEncoder::new(GeomType::Point)
            .point(px, py)
            .and_then(|e| e.encode())
            .map_err(|e| frame.error(e))?;
        let mut feature = layer.into_feature(geom);
        feature.set_id(u64::from(i));
        feature.add_tag_uint("i", u64::from(i));
        feature.add_tag_double("weight", weight);
        layer = feature.into_layer();
    }
    tile.add_layer(layer).map_err(|e| frame.error(e))?;
    tile.to_bytes().map_err(|e| frame.error(e))
}

/// The street tile `z/x/y` as MVT bytes: every segment within the tile and its buffer, clipped
/// to the buffer, with its `segment`, `class` and `speed_kmh`. Zoom past [`MAX_ZOOM`] or a tile
/// off the grid is an error.
pub fn street_tile(
    out: &AuditOutput,
    index: &SegmentIndex,
    z: u32,
    x: u32,
    y: u32,
) -> Result<Vec<u8>, Error> {
    let frame = TileFrame::new(z, x, y)?;
    let mut hits: Vec<u32> = index
        .tree
        .locate_in_envelope_intersecting(&frame.query)
        .map(|g| g.data)
        .collect();
    // The same bytes for the same tile, whatever order the index keeps.
    hits.sort_unstable();
    let lo = -BUFFER;
    let hi = f64::from(EXTENT) + BUFFER;
    let mut tile = Tile::new(EXTENT);
    let mut layer = tile.create_layer(LAYER);
    for i in hits {
        let Some(seg) = out.network.graph.segments.get(i as usize) else {
            continue;
        };
        let Some(street) = out.layers.streets.get(seg.street) else {
            continue;
        };
        if z < MINOR_FROM_ZOOM
            && !matches!(street.class, RoadClass::Arterial | RoadClass::Collector)
        {
            continue;
        }
        let points: Vec<(f64, f64)> = seg
            .line
            .iter()
            .filter(|p| p[0].is_finite() && p[1].is_finite())
            .map(|p| frame.units(*p))
            .collect();
        let runs = clipped_runs(&points, lo, hi);
        if runs.is_empty() {
            continue;
        }
        let mut enc = GeomEncoder::new(GeomType::Linestring);
        for run in &runs {
            for &(px, py) in run {
                enc.add_point(px, py).map_err(|e| frame.error(e))?;
            }
            enc.complete_geom().map_err(|e| frame.error(e))?;
        }
        let geom = enc.encode().map_err(|e| frame.error(e))?;
        // A MoveTo and one LineTo at least (3 + 3 integers): a segment that clips to a point,
        // or rounds to one at this zoom, is not drawn.
        if geom.len() < 6 {
            continue;
        }
        let mut feature = layer.into_feature(geom);
        feature.set_id(u64::from(i));
        feature.add_tag_uint("segment", u64::from(i));
        feature.add_tag_string("class", street.class.as_str());
        feature.add_tag_double("speed_kmh", street.speed_kmh);
        layer = feature.into_layer();
    }
    tile.add_layer(layer).map_err(|e| frame.error(e))?;
    tile.to_bytes().map_err(|e| frame.error(e))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Web Mercator's fixed points (common practice: the equator and the prime meridian at the
    /// world square's middle, the latitude limit at its top edge) and the inverse.
    #[test]
    fn web_mercator_corners_and_inverse() {
        let (x, y) = world([0.0, 0.0]);
        assert!((x - 0.5).abs() < 1e-15 && (y - 0.5).abs() < 1e-15);
        let (_, top) = world([0.0, MAX_LAT]);
        assert!(top.abs() < 1e-9, "{top}");
        for p in [[-35.2, 41.8], [12.5, -33.9], [179.0, 60.0]] {
            let (wx, wy) = world(p);
            let q = lon_lat(wx, wy);
            assert!(
                (q[0] - p[0]).abs() < 1e-9 && (q[1] - p[1]).abs() < 1e-9,
                "{p:?} {q:?}"
            );
        }
    }

    /// Clipping keeps what is inside the square and cuts at its edges on the line itself; a
    /// line that leaves and comes back is two runs; one outside, or too short to hold two
    /// whole units, is none.
    #[test]
    fn lines_clip_to_the_buffered_tile_on_their_own_course() {
        let (lo, hi) = (0.0, 100.0);
        let runs = clipped_runs(&[(-50.0, 50.0), (150.0, 150.0)], lo, hi);
        assert_eq!(runs, vec![vec![(0.0, 75.0), (50.0, 100.0)]]);
        let runs = clipped_runs(
            &[(10.0, 10.0), (10.0, 200.0), (20.0, 200.0), (20.0, 10.0)],
            lo,
            hi,
        );
        assert_eq!(
            runs,
            vec![
                vec![(10.0, 10.0), (10.0, 100.0)],
                vec![(20.0, 100.0), (20.0, 10.0)]
            ]
        );
        assert!(clipped_runs(&[(-10.0, -10.0), (-5.0, 200.0)], lo, hi).is_empty());
        assert!(clipped_runs(&[(5.0, 5.0), (5.2, 5.1)], lo, hi).is_empty());
        assert_eq!(
            clipped_runs(&[(1.0, 1.0), (2.0, 2.0), (3.0, 2.0)], lo, hi),
            vec![vec![(1.0, 1.0), (2.0, 2.0), (3.0, 2.0)]]
        );
    }
}
