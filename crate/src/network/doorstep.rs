//! Doorstep crossings: a child may cross the street they live on (or the school stands on)
//! right at the door instead of walking to the next junction. Each road segment with a
//! walkable edge on both sides gets one such crossing, an uncontrolled mid-block crossing of
//! that street. It is not part of the graph's topology: routing uses it only at the ends of a
//! route, where a home or entrance attaches to one side of the segment.

use super::edges::crossing_width_m;
use super::{PedEdge, PedEdgeKind, PedGraph, Side, NO_CORNER};
use crate::input::{Control, Street};

/// Fills `graph.sides` and `graph.doorstep` and appends the doorstep crossing edges. Call
/// after `index_topology`.
pub fn add_doorstep_crossings(graph: &mut PedGraph, streets: &[Street], lane_width_m: f64) {
    let n = graph.segments.len();
    let mut sides = vec![[NO_CORNER; 2]; n];
    for (i, e) in graph.edges.iter().enumerate() {
        if let PedEdgeKind::Side { segment, side, .. } = e.kind {
            if let Some(slot) = sides.get_mut(segment as usize) {
                slot[(side == Side::Right) as usize] = i as u32;
            }
        }
    }
    let mut doorstep = vec![NO_CORNER; n];
    for (s, pair) in sides.iter().enumerate() {
        if pair[0] == NO_CORNER || pair[1] == NO_CORNER {
            continue;
        }
        let seg = &graph.segments[s];
        let Some(street) = streets.get(seg.street) else {
            continue;
        };
        doorstep[s] = graph.edges.len() as u32;
        graph.edges.push(PedEdge {
            a: NO_CORNER,
            b: NO_CORNER,
            kind: PedEdgeKind::Crossing {
                junction: seg.from,
                segment: s as u32,
                control: Control::UNCONTROLLED,
                midblock: true,
            },
            length_m: crossing_width_m(street, lane_width_m),
        });
    }
    graph.sides = sides;
    graph.doorstep = doorstep;
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::config::NetworkConfig;
    use crate::input::{Layers, RoadClass, SideWalk};

    fn street(class: RoadClass, right: SideWalk) -> Street {
        Street {
            right,
            ..Street::new(0, class, 40.0, 2, vec![[0.0, 0.0], [0.001, 0.0]])
        }
    }

    #[test]
    fn a_two_sided_road_gets_one_doorstep_crossing_and_a_one_sided_road_none() {
        for (right, expected) in [(SideWalk::Present, 1), (SideWalk::Separate, 0)] {
            let layers = Layers {
                streets: vec![street(RoadClass::Local, right)],
                ..Layers::default()
            };
            let net = crate::network::build_network(&layers, &NetworkConfig::default());
            let g = &net.graph;
            let found = g.doorstep.iter().filter(|&&e| e != NO_CORNER).count();
            assert_eq!(found, expected);
            if expected == 1 {
                let e = &g.edges[g.doorstep[0] as usize];
                assert!((e.length_m - 7.2).abs() < 1e-9);
                // Not in the topology: no corner lists it.
                assert!(g.neighbours(0).all(|(ei, _)| ei != g.doorstep[0]));
            }
        }
    }
}
