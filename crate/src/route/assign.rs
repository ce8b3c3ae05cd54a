//! Which school each home goes to: its own `school` property, else the catchment that
//! contains it, else the nearest school by walking distance (one multi-source search).

use super::path::{entrance_sources, route_to_school};
use super::tree::Tree;
use crate::input::{Catchment, Home, School};
use crate::network::{Attachment, PedGraph};
use geo::{Contains, Point};
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
    let mut out: Vec<Assignment> = homes
        .iter()
        .map(|h| {
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
        })
        .collect();
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
    let mut tree = Tree::for_graph(graph);
    tree.grow(
        graph,
        walk_cost,
        &entrance_sources(graph, walk_cost, &flat),
        &[],
    );
    for (i, a) in out.iter_mut().enumerate() {
        if a.school.is_some() {
            continue;
        }
        if let Some(att) = &home_att[i] {
            if let Some(r) = route_to_school(graph, &tree, walk_cost, att, &flat) {
                *a = Assignment {
                    school: Some(flat_school[r.entrance as usize]),
                    by: AssignedBy::NearestByWalking,
                };
            }
        }
    }
    out
}
