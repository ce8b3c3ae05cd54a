//! Builds the pedestrian graph of a synthetic street grid and prints how long it took.
//!
//! `cargo run --release --example bench_network [blocks_per_side]` (default 224: about
//! 100 000 segments). Every eighth block has a crossing point at a junction and every
//! eleventh one mid-block, so crossing placement and splitting are part of the figure.

use catchwalk::config::NetworkConfig;
use catchwalk::geodesy::LocalFrame;
use catchwalk::input::{Control, ControlScope, CrossingPoint, Device, Layers, RoadClass, Street};
use std::time::Instant;

fn street(feature: usize, line: Vec<[f64; 2]>) -> Street {
    Street::new(feature, RoadClass::Local, 50.0, 2, line)
}

fn main() {
    let n: usize = std::env::args()
        .nth(1)
        .and_then(|a| a.parse().ok())
        .unwrap_or(224);
    let block_m = 80.0;
    let frame = LocalFrame::new([10.0, 50.0]);
    let at = |i: usize, j: usize| frame.to_lonlat([i as f64 * block_m, j as f64 * block_m]);
    let mut layers = Layers::default();
    // One street per grid line, with a vertex at every junction and one between.
    for k in 0..=n {
        let mut we = Vec::new();
        let mut sn = Vec::new();
        for i in 0..=n {
            we.push(at(i, k));
            sn.push(at(k, i));
            if i < n {
                let mid = frame.to_lonlat([(i as f64 + 0.5) * block_m, k as f64 * block_m + 1.0]);
                we.push(mid);
            }
        }
        let f = layers.streets.len();
        layers.streets.push(street(f, we));
        layers.streets.push(street(f + 1, sn));
    }
    let signal = Control {
        device: Device::Signal,
        ..Control::UNCONTROLLED
    };
    for i in 0..n {
        for j in 0..n {
            let id = i * n + j;
            if id.is_multiple_of(8) {
                layers.crossings.push(CrossingPoint {
                    feature: layers.crossings.len(),
                    id: id.to_string(),
                    at: at(i, j),
                    control: signal.clone(),
                    scope: ControlScope::AllLegs,
                });
            } else if id.is_multiple_of(11) {
                let p = frame.to_lonlat([(i as f64 + 0.5) * block_m, j as f64 * block_m]);
                layers.crossings.push(CrossingPoint {
                    feature: layers.crossings.len(),
                    id: id.to_string(),
                    at: p,
                    control: signal.clone(),
                    scope: ControlScope::NearestLeg,
                });
            }
        }
    }
    let vertices: usize = layers.streets.iter().map(|s| s.line.len()).sum();
    let t = Instant::now();
    let net = catchwalk::network::build_network(&layers, &NetworkConfig::default());
    let ms = t.elapsed().as_secs_f64() * 1000.0;
    let g = &net.graph;
    println!(
        "grid {n}x{n}: {} streets, {vertices} vertices, {} crossing points",
        layers.streets.len(),
        layers.crossings.len()
    );
    println!(
        "built in {ms:.0} ms: {} junctions, {} segments, {} corners, {} edges ({} crossings)",
        g.junctions.len(),
        g.segments.len(),
        g.corners.len(),
        g.edges.len(),
        g.edges.iter().filter(|e| e.is_crossing()).count()
    );
    let seg_points: usize = g.segments.iter().map(|s| s.line.len()).sum();
    println!(
        "about {:.0} MB in graph arrays ({seg_points} segment points); QA: {} components, {} items",
        (g.junctions.len() * 24
            + g.segments.len() * 56
            + seg_points * 16
            + g.corners.len() * 24
            + g.edges.len() * 80) as f64
            / 1e6,
        net.qa.components,
        net.qa.items.len()
    );
    let t = Instant::now();
    let mut hits = 0;
    for i in 0..10_000 {
        let p = frame.to_lonlat([(i % 997) as f64 * 7.3, (i / 997) as f64 * 13.1 + 3.0]);
        hits += net.index.attach(g, p, 300.0).is_some() as usize;
    }
    println!(
        "10000 attachments in {:.0} ms ({hits} attached)",
        t.elapsed().as_secs_f64() * 1000.0
    );
}
