//! A deterministic synthetic city for benchmarks: a street grid with arterial rings and
//! radials, collectors, cul-de-sacs, diagonal foot paths, signals and all-way stops, schools and
//! homes. Invented data in open ocean (lon -36, lat 43), for measurement only.
//!
//! Besides the layers (GeoJSON streets, crossings and schools, CSV homes) it writes the
//! centreline graph for other libraries: `nodes.csv` (id, lon, lat), `edges.csv` (u, v,
//! length_m, geodesic on WGS84 like catchwalk's) and `sources.csv` (school id, node: the
//! centreline junction nearest the school's entrance).

use catchwalk::geodesy::distance_m;
use serde_json::{json, Value};
use std::collections::HashMap;
use std::fmt::Write as _;

/// About 100 m in latitude, 81 m in longitude at 43 degrees.
const STEP: f64 = 0.0011;
const ORIGIN: [f64; 2] = [-36.0, 43.0];

/// The city as files (name, contents) and its size.
#[allow(dead_code)] // the sizes are read by make_city, not by the tests that share this file
pub struct City {
    pub files: Vec<(&'static str, String)>,
    pub segments: usize,
    pub homes: usize,
    pub schools: usize,
    pub nodes: usize,
}

/// A fixed-seed generator (a 64-bit linear congruential step; Knuth's MMIX constants).
struct Lcg(u64);
impl Lcg {
    fn next(&mut self) -> f64 {
        self.0 = self
            .0
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (self.0 >> 11) as f64 / (1u64 << 53) as f64
    }
}

/// A block's deterministic hash (which blocks get a cul-de-sac or a foot path).
fn block_hash(x: usize, y: usize) -> u64 {
    let mut h = (x as u64).wrapping_mul(0x9E37_79B9_7F4A_7C15)
        ^ (y as u64).wrapping_mul(0xC2B2_AE3D_27D4_EB4F);
    h ^= h >> 29;
    h.wrapping_mul(0xBF58_476D_1CE4_E5B9) >> 32
}

fn at(x: f64, y: f64) -> [f64; 2] {
    let r = |v: f64| (v * 1e7).round() / 1e7; // 1 cm: the precision the data has
    [r(ORIGIN[0] + x * STEP), r(ORIGIN[1] + y * STEP * 0.74)]
}

/// A city of about `segments` street segments, `homes` homes and `schools` schools (0: one
/// per 250 homes, at least 2).
pub fn city(segments: usize, homes: usize, schools: usize) -> City {
    // A side x side grid has 2 side (side - 1) segments; extras add about 8 %.
    let side = (((segments as f64) / 2.16).sqrt().ceil() as usize).max(4);
    let centre = side / 2;
    let ring = |x: usize, y: usize| {
        let d = x.abs_diff(centre).max(y.abs_diff(centre));
        d > 0 && d.is_multiple_of(12)
    };
    let mut streets = Vec::new();
    let mut crossings = Vec::new();
    let mut node_id: HashMap<(i64, i64), usize> = HashMap::new();
    let mut nodes: Vec<[f64; 2]> = Vec::new();
    let mut edges = String::from("u,v,length_m\n");
    let mut node = |p: [f64; 2], nodes: &mut Vec<[f64; 2]>| -> usize {
        let key = ((p[0] * 1e7).round() as i64, (p[1] * 1e7).round() as i64);
        *node_id.entry(key).or_insert_with(|| {
            nodes.push(p);
            nodes.len() - 1
        })
    };
    let mut add = |class: &str,
                   speed: u32,
                   lanes: u32,
                   sidewalk: &str,
                   a: [f64; 2],
                   b: [f64; 2],
                   streets: &mut Vec<Value>,
                   nodes: &mut Vec<[f64; 2]>,
                   edges: &mut String| {
        let id = streets.len();
        streets.push(json!({"type": "Feature", "geometry": {"type": "LineString", "coordinates": [a, b]},
            "properties": {"id": format!("ST{id}"), "class": class, "speed_kmh": speed, "lanes": lanes,
                "sidewalk": sidewalk, "name": format!("{class} {id}")}}));
        let (u, v) = (node(a, nodes), node(b, nodes));
        let _ = writeln!(edges, "{u},{v},{:.3}", distance_m(a, b));
    };
    for y in 0..side {
        for x in 0..side {
            for (dx, dy) in [(1usize, 0usize), (0, 1)] {
                if x + dx >= side || y + dy >= side {
                    continue;
                }
                // A segment is on a ring when both its ends are; radials run through the centre.
                let on_ring = ring(x, y) && ring(x + dx, y + dy);
                let radial = (dx == 1 && y == centre) || (dy == 1 && x == centre);
                let collector = if dx == 1 { y % 6 == 3 } else { x % 6 == 3 };
                let (class, speed, lanes) = if on_ring || radial {
                    ("arterial", 60, 4)
                } else if collector {
                    ("collector", 50, 2)
                } else {
                    ("local", 40, 2)
                };
                let h = block_hash(x * 2 + dx, y * 2 + dy);
                let sidewalk = match h % 10 {
                    0 => "none",
                    1 => "left",
                    _ => "both",
                };
                add(
                    class,
                    speed,
                    lanes,
                    sidewalk,
                    at(x as f64, y as f64),
                    at((x + dx) as f64, (y + dy) as f64),
                    &mut streets,
                    &mut nodes,
                    &mut edges,
                );
            }
            let arterial_here = ring(x, y) || x == centre || y == centre;
            let both = (ring(x, y) && (x == centre || y == centre)) || (x == centre && y == centre);
            let control = if both || (arterial_here && (x % 6 == 3 || y % 6 == 3)) {
                Some("signal")
            } else if x % 6 == 3 && y % 6 == 3 {
                Some("all_way_stop")
            } else if arterial_here && block_hash(x, y).is_multiple_of(4) {
                Some("marked")
            } else {
                None
            };
            if let Some(c) = control {
                crossings.push(json!({"type": "Feature", "geometry": {"type": "Point", "coordinates": at(x as f64, y as f64)},
                    "properties": {"id": format!("X{}", crossings.len()), "control": c}}));
            }
            // Inside the block to the north-east: a cul-de-sac or a diagonal foot path.
            if x + 1 < side && y + 1 < side {
                let h = block_hash(x, y);
                if h % 11 == 3 {
                    add(
                        "local",
                        30,
                        2,
                        "both",
                        at(x as f64, y as f64),
                        at(x as f64 + 0.45, y as f64 + 0.4),
                        &mut streets,
                        &mut nodes,
                        &mut edges,
                    );
                } else if h % 13 == 5 {
                    add(
                        "path",
                        0,
                        0,
                        "unknown",
                        at(x as f64, y as f64),
                        at((x + 1) as f64, (y + 1) as f64),
                        &mut streets,
                        &mut nodes,
                        &mut edges,
                    );
                }
            }
        }
    }
    let n_schools = if schools == 0 {
        (homes / 250).max(2)
    } else {
        schools
    };
    let mut rnd = Lcg(20_261_202);
    let span = (side - 1) as f64;
    let mut school_feats = Vec::new();
    let mut sources = String::from("school,node\n");
    for s in 0..n_schools {
        let (x, y) = (
            (rnd.next() * (span - 1.0)).floor(),
            (rnd.next() * (span - 1.0)).floor(),
        );
        let entrance = at(x + 0.3, y + 0.02);
        school_feats.push(
            json!({"type": "Feature", "geometry": {"type": "Point", "coordinates": entrance},
            "properties": {"id": format!("S{s}"), "name": format!("School {s}"),
                "students": if s % 5 == 4 { "secondary" } else { "elementary" }}}),
        );
        let junction = node(at(x, y), &mut nodes);
        let _ = writeln!(sources, "S{s},{junction}");
    }
    let mut homes_csv = String::from("id,lon,lat,children,school\n");
    for h in 0..homes {
        let p = at(rnd.next() * span, rnd.next() * span);
        let children = 1 + (rnd.next() * 2.2) as u32;
        let _ = writeln!(homes_csv, "H{h},{:.7},{:.7},{children},", p[0], p[1]);
    }
    let mut nodes_csv = String::from("id,lon,lat\n");
    for (i, p) in nodes.iter().enumerate() {
        let _ = writeln!(nodes_csv, "{i},{:.7},{:.7}", p[0], p[1]);
    }
    let collection =
        |f: Vec<Value>| json!({"type": "FeatureCollection", "features": f}).to_string();
    City {
        segments: streets.len(),
        homes,
        schools: n_schools,
        nodes: nodes.len(),
        files: vec![
            ("streets.geojson", collection(streets)),
            ("crossings.geojson", collection(crossings)),
            ("schools.geojson", collection(school_feats)),
            ("homes.csv", homes_csv),
            ("nodes.csv", nodes_csv),
            ("edges.csv", edges),
            ("sources.csv", sources),
        ],
    }
}
