//! Measures one full shortest-path tree on a district-sized graph: petgraph's own `dijkstra`
//! (distances in a HashMap, no predecessors) against catchwalk's `Tree` (flat arrays with
//! predecessor edges, reused buffers). This is the measurement that decided to write the tree.
//!
//! `cargo run --release --example bench_tree [side]` (default side 450: ~400 k corners).

use catchwalk::network::{Corner, Junction, PedEdge, PedEdgeKind, PedGraph, Segment};
use catchwalk::route::tree::{Source, Tree};
use std::time::Instant;

/// A square grid of corners joined by foot-path edges of 80-120 m (deterministic lengths).
fn grid(side: usize) -> PedGraph {
    let mut g = PedGraph::default();
    let id = |x: usize, y: usize| (y * side + x) as u32;
    for y in 0..side {
        for x in 0..side {
            let at = [x as f64 * 1e-3, y as f64 * 1e-3];
            g.junctions.push(Junction { at, layer: 0 });
            g.corners.push(Corner {
                junction: id(x, y),
                at,
            });
        }
    }
    let mut seed = 12345u64;
    let mut next_len = || {
        seed = seed
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        80.0 + ((seed >> 33) % 4000) as f64 / 100.0
    };
    for y in 0..side {
        for x in 0..side {
            for (dx, dy) in [(1, 0), (0, 1)] {
                let (nx, ny) = (x + dx, y + dy);
                if nx >= side || ny >= side {
                    continue;
                }
                let (a, b) = (id(x, y), id(nx, ny));
                let len = next_len();
                let s = g.segments.len() as u32;
                g.segments.push(Segment {
                    street: 0,
                    from: a,
                    to: b,
                    line: vec![],
                    length_m: len,
                });
                g.edges.push(PedEdge {
                    a,
                    b,
                    kind: PedEdgeKind::Path { segment: s },
                    length_m: len,
                });
            }
        }
    }
    g.index_topology();
    g
}

fn main() {
    let side: usize = std::env::args()
        .nth(1)
        .and_then(|s| s.parse().ok())
        .unwrap_or(450);
    let g = grid(side);
    let cost: Vec<f64> = g.edges.iter().map(|e| e.length_m).collect();
    let source = (side / 2 * side + side / 2) as u32;
    println!(
        "graph: {} corners, {} edges",
        g.corners.len(),
        g.edges.len()
    );

    let runs = 5;
    let t = Instant::now();
    let mut reached = 0;
    for _ in 0..runs {
        let d = petgraph::algo::dijkstra(
            &g.topology,
            petgraph::graph::NodeIndex::new(source as usize),
            None,
            |e| cost[*e.weight() as usize],
        );
        reached = d.len();
    }
    let pg_ms = t.elapsed().as_secs_f64() * 1000.0 / runs as f64;
    println!(
        "petgraph::algo::dijkstra (distances only): {pg_ms:.1} ms per tree, {reached} reached"
    );

    let mut tree = Tree::for_graph(&g);
    let t = Instant::now();
    for _ in 0..runs {
        tree.grow(
            &g,
            &cost,
            &[Source {
                corner: source,
                cost: 0.0,
                origin: 0,
            }],
            &[],
        );
    }
    let ours_ms = t.elapsed().as_secs_f64() * 1000.0 / runs as f64;
    let reached = tree.cost.iter().filter(|c| c.is_finite()).count();
    println!(
        "catchwalk Tree (distances + predecessors): {ours_ms:.1} ms per tree, {reached} reached"
    );
    println!("ratio petgraph / catchwalk: {:.2}", pg_ms / ours_ms);
}
