//! Network QA: what a planner should look at before trusting the routes.

use crate::input::LonLat;
use serde::Serialize;

#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum QaKind {
    /// A street end that meets nothing (often a digitising gap).
    DanglingEnd,
    /// Two ends closer than the near-miss distance that did not join.
    NearMiss,
    /// A connected piece of the network much smaller than the main one.
    TinyComponent,
    /// A crossing point too far from any street to attach.
    UnattachedCrossing,
    /// A school that no walkable edge reaches.
    UnreachableSchool,
    /// A home that no walkable edge reaches, or that cannot reach its school.
    UnreachableHome,
}

/// One QA finding, with a point to show on the map.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct QaItem {
    pub kind: QaKind,
    pub at: LonLat,
    /// The street (or crossing, school, home) feature index it concerns, if one.
    pub feature: Option<usize>,
    pub message: String,
}

/// Network QA for one build.
#[derive(Debug, Clone, Default, PartialEq, Serialize)]
pub struct Qa {
    pub items: Vec<QaItem>,
    /// Connected components of the centreline graph.
    pub components: usize,
    /// Share of segments in the largest component.
    pub largest_component_share: f64,
}

impl Qa {
    pub fn count(&self, kind: QaKind) -> usize {
        self.items.iter().filter(|i| i.kind == kind).count()
    }

    /// One line with the QA counts a planner must see on the terminal and the page, not only
    /// in `summary.json` (crossing points skipped because no street is near, near-misses, tiny
    /// components; dangling ends are left to qa.geojson, as every cul-de-sac has one); `None`
    /// when there are none.
    pub fn headline(&self) -> Option<String> {
        let parts: Vec<String> = [
            (
                QaKind::UnattachedCrossing,
                "crossing point(s) skipped: no street near enough to attach",
            ),
            (
                QaKind::NearMiss,
                "near-miss(es) between street ends that did not join",
            ),
            (
                QaKind::TinyComponent,
                "tiny separate piece(s) of the network",
            ),
        ]
        .iter()
        .filter_map(|(k, what)| {
            let n = self.count(*k);
            (n > 0).then(|| format!("{n} {what}"))
        })
        .collect();
        (!parts.is_empty()).then(|| format!("network QA: {}; see qa.geojson", parts.join(", ")))
    }
}
