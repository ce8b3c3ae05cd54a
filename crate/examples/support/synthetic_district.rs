//! A synthetic district for the benchmarks: a street grid with arterials every tenth street,
//! signals where arterials meet, schools and homes placed by a fixed-seed generator.
//! Invented data, for measurement only.

use catchwalk::pipeline::{Progress, Stage};
use std::time::Instant;

/// A wall clock for the audit's timings; reports nothing.
pub struct Clock(pub Instant);
impl Progress for Clock {
    fn report(&mut self, _: Stage, _: usize, _: usize) -> bool {
        true
    }
    fn now_ms(&self) -> f64 {
        self.0.elapsed().as_secs_f64() * 1000.0
    }
}

/// The `i`-th command-line argument as a number, else `default`.
pub fn arg(i: usize, default: usize) -> usize {
    std::env::args()
        .nth(i)
        .and_then(|s| s.parse().ok())
        .unwrap_or(default)
}

use catchwalk::input::{
    Control, ControlScope, CrossingPoint, Device, Home, Layers, RoadClass, School, SideWalk,
    Street, Students,
};

fn street(id: usize, class: RoadClass, line: Vec<[f64; 2]>) -> Street {
    let (speed, lanes) = match class {
        RoadClass::Arterial => (60.0, 4),
        _ => (40.0, 2),
    };
    let mut s = Street::new(id, class, speed, lanes, line);
    if id.is_multiple_of(7) {
        s.right = SideWalk::Absent;
    }
    s
}

/// A `side x side` grid of junctions (about `2 side^2` segments), `n_schools` schools and
/// `n_homes` homes.
pub fn district(side: usize, n_homes: usize, n_schools: usize) -> Layers {
    let step = 0.0012; // ~100 m in latitude, ~88 m in longitude at 42 degrees
    let at = |x: usize, y: usize| [-35.0 + x as f64 * step, 42.0 + y as f64 * step * 0.75];
    let mut layers = Layers::default();
    for y in 0..side {
        for x in 0..side {
            for (dx, dy) in [(1usize, 0usize), (0, 1)] {
                if x + dx >= side || y + dy >= side {
                    continue;
                }
                let arterial = if dx == 1 {
                    y.is_multiple_of(10)
                } else {
                    x.is_multiple_of(10)
                };
                let class = if arterial {
                    RoadClass::Arterial
                } else {
                    RoadClass::Local
                };
                let id = layers.streets.len();
                layers
                    .streets
                    .push(street(id, class, vec![at(x, y), at(x + dx, y + dy)]));
            }
            if x.is_multiple_of(10) && y.is_multiple_of(10) {
                layers.crossings.push(CrossingPoint {
                    feature: layers.crossings.len(),
                    id: format!("c{x}_{y}"),
                    at: at(x, y),
                    control: Control {
                        device: Device::Signal,
                        ..Control::UNCONTROLLED
                    },
                    scope: ControlScope::AllLegs,
                });
            }
        }
    }
    let mut seed = 99u64;
    let mut rnd = || {
        seed = seed
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (seed >> 11) as f64 / (1u64 << 53) as f64
    };
    for s in 0..n_schools {
        let (x, y) = (
            (rnd() * (side - 1) as f64) as usize,
            (rnd() * (side - 1) as f64) as usize,
        );
        let p = at(x, y);
        layers.schools.push(School {
            feature: s,
            id: format!("S{s}"),
            name: format!("School {s}"),
            entrances: vec![[p[0] + step * 0.3, p[1] + 0.00005]],
            students: Students::Elementary,
        });
    }
    for h in 0..n_homes {
        let span = (side - 1) as f64 * step;
        layers.homes.push(Home {
            feature: h,
            id: format!("h{h}"),
            at: [-35.0 + rnd() * span, 42.0 + rnd() * span * 0.75],
            children: 1,
            school: None,
        });
    }
    layers
}
