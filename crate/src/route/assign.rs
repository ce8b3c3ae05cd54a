//! Which school each home goes to: its own `school` property, else the catchment that
//! contains it, else the nearest school by walking distance (one multi-source search).

use super::path::{entrance_sources, route_to_school_among};
use super::tree::Tree;
use crate::input::{Catchment, Home, School};
use crate::network::{Attachment, PedGraph};
use geo::{Contains, Point};
use rustc_hash::FxHashMap;
use serde::Serialize;
use std::collections::HashMap;

/// How a home's school was decided.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum AssignedBy {
    Property,
    Catchment,
    NearestByWalking,
    /// No school could be assigned (unreachable home, or no school reachable).
    Unassigned,
}

/// A home's school (index into the schools) and how it was chosen.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct Assignment {
    pub school: Option<usize>,
    pub by: AssignedBy,
}

/// Assigns every home. `home_att[i]` and `school_att[s]` are the attachments (`None` when the
/// feature is too far from any walkable edge); `walk_cost` are walked-length edge costs.
pub fn assign_schools(
    graph: &PedGraph,
    walk_cost: &[f64],
    homes: &[Home],
    home_att: &[Option<Attachment>],
    schools: &[School],
    school_att: &[Vec<Attachment>],
    catchments: &[Catchment],
) -> Vec<Assignment> {
    let by_id: HashMap<&str, usize> = schools
        .iter()
        .enumerate()
        .map(|(i, s)| (s.id.as_str(), i))
        .collect();
    // Each home on its own (a point in polygon test per catchment): on every core natively.
    let out: Vec<Assignment> = crate::cores::map(homes, |h| {
        if let Some(&s) = h.school.as_deref().and_then(|id| by_id.get(id)) {
            return Assignment {
                school: Some(s),
                by: AssignedBy::Property,
            };
        }
        let p = Point::new(h.at[0], h.at[1]);
        for c in catchments {
            if let Some(&s) = by_id.get(c.school_id.as_str()) {
                if c.area.contains(&p) {
                    return Assignment {
                        school: Some(s),
                        by: AssignedBy::Catchment,
                    };
                }
            }
        }
        Assignment {
            school: None,
            by: AssignedBy::Unassigned,
        }
    });
    if out.iter().all(|a| a.school.is_some()) {
        return out;
    }
    // One multi-source search from every entrance of every school; the origin tag is the
    // index into a flat list of entrances, mapped back to its school.
    let mut flat: Vec<Attachment> = Vec::new();
    let mut flat_school: Vec<usize> = Vec::new();
    for (s, atts) in school_att.iter().enumerate() {
        for a in atts {
            flat.push(*a);
            flat_school.push(s);
        }
    }
    if flat.is_empty() {
        return out;
    }
    // The entrances on each street segment: the only ones a home on that segment can walk to
    // straight along its own edge (`route_to_school_among`).
    let mut on_segment: FxHashMap<u32, Vec<usize>> = FxHashMap::default();
    for (k, a) in flat.iter().enumerate() {
        if let Some(e) = graph.edges.get(a.edge as usize) {
            on_segment.entry(e.segment()).or_default().push(k);
        }
    }
    let mut tree = Tree::for_graph(graph);
    tree.grow(
        graph,
        walk_cost,
        &entrance_sources(graph, walk_cost, &flat),
        &[],
    );
    // Each home reads the one tree: on every core natively, in home order.
    crate::cores::map_range(out.len(), |i| {
        let a = out[i];
        if a.school.is_some() {
            return a;
        }
        let Some(att) = home_att.get(i).and_then(Option::as_ref) else {
            return a;
        };
        let same_segment = graph
            .edges
            .get(att.edge as usize)
            .and_then(|e| on_segment.get(&e.segment()))
            .map_or(&[][..], |v| v.as_slice());
        let near = same_segment.iter().copied();
        match route_to_school_among(graph, &tree, walk_cost, att, &flat, near) {
            Some(r) => Assignment {
                school: flat_school.get(r.entrance as usize).copied(),
                by: AssignedBy::NearestByWalking,
            },
            None => a,
        }
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::input::Students;

    fn at(edge: u32, offset_m: f64) -> Attachment {
        Attachment {
            edge,
            offset_m,
            at: [0.0, 0.0],
            snap_m: 0.0,
        }
    }

    fn school(id: &str) -> School {
        School {
            feature: 0,
            id: id.into(),
            name: id.into(),
            entrances: vec![[0.0, 0.0]],
            students: Students::default(),
        }
    }

    #[test]
    fn nearest_school_counts_a_walk_along_the_homes_own_edge() {
        // Corners 0-1-2, edges of 100 m. The home is 50 m along edge 0; school B's entrance
        // 10 m along the same edge (40 m straight along it, 60 m by corner 0); school A's
        // 5 m past corner 1 (55 m). B is nearest only by the walk straight along edge 0.
        let g = PedGraph::toy_path(&[100.0, 100.0]);
        let cost = [100.0, 100.0];
        let home = Home {
            feature: 0,
            id: "h".into(),
            at: [0.0, 0.0],
            children: 1,
            school: None,
        };
        let schools = [school("A"), school("B"), school("C")];
        // C has no entrance on the network: it must not upset the entrance numbering.
        let school_att = [vec![at(1, 5.0)], vec![at(0, 10.0)], vec![]];
        let got = assign_schools(
            &g,
            &cost,
            &[home.clone(), home],
            &[Some(at(0, 50.0)), Some(at(1, 20.0))],
            &schools,
            &school_att,
            &[],
        );
        assert_eq!(got[0].school, Some(1));
        assert_eq!(got[0].by, AssignedBy::NearestByWalking);
        // The second home, 20 m along edge 1, walks 15 m straight along it to A.
        assert_eq!(got[1].school, Some(0));
    }
}
