//! Homes the audit could not route, counted with their children and the reason, so the
//! terminal and the page say it in words instead of a table of dashes: farther than
//! `network.max_attach_m` from any walkable street (with the distance to the nearest one,
//! and whether longitude and latitude look swapped), or no walking path to the school.

use crate::pipeline::AuditOutput;
use serde::Serialize;

/// One home that was not reached.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct UnreachedHome {
    pub feature: usize,
    pub id: String,
    pub children: u32,
    /// `too_far` (from any walkable street) or `no_path` (to its school).
    pub reason: &'static str,
    /// Straight-line distance to the nearest walkable street (m), for `too_far`.
    pub nearest_street_m: Option<f64>,
    /// With longitude and latitude swapped the home would lie on the network.
    pub likely_swapped: bool,
}

/// All homes not reached, with totals.
#[derive(Debug, Clone, Default, PartialEq, Serialize)]
pub struct Unreached {
    pub homes: usize,
    pub children: u64,
    pub too_far: usize,
    pub no_path: usize,
    pub likely_swapped: usize,
    pub list: Vec<UnreachedHome>,
}

/// The homes of `out` with no shortest route, and why.
pub fn unreached(out: &AuditOutput) -> Unreached {
    let g = &out.network.graph;
    let idx = &out.network.index;
    let max_m = out.config.network.max_attach_m;
    let mut u = Unreached::default();
    for (h, home) in out.homes.iter().zip(&out.layers.homes) {
        if h.shortest.is_some() {
            continue;
        }
        let item = if h.attachment.is_none() {
            let nearest = idx.attach(g, home.at, f64::INFINITY).map(|a| a.snap_m);
            let [x, y] = home.at;
            let swapped =
                (y.abs() <= 180.0 && x.abs() <= 90.0) && idx.attach(g, [y, x], max_m).is_some();
            u.too_far += 1;
            u.likely_swapped += usize::from(swapped);
            UnreachedHome {
                feature: home.feature,
                id: home.id.clone(),
                children: home.children,
                reason: "too_far",
                nearest_street_m: nearest,
                likely_swapped: swapped,
            }
        } else {
            u.no_path += 1;
            UnreachedHome {
                feature: home.feature,
                id: home.id.clone(),
                children: home.children,
                reason: "no_path",
                nearest_street_m: None,
                likely_swapped: false,
            }
        };
        u.homes += 1;
        u.children += u64::from(home.children);
        u.list.push(item);
    }
    u
}

fn distance(m: f64) -> String {
    if m >= 10_000.0 {
        format!("{:.0} km", m / 1000.0)
    } else if m >= 1000.0 {
        format!("{:.1} km", m / 1000.0)
    } else {
        format!("{m:.0} m")
    }
}

/// The sentence the terminal and the page show; `None` when every home was reached.
///
/// ```
/// use catchwalk::score::unreached::{describe, Unreached};
/// assert_eq!(describe(&Unreached::default(), 300.0), None);
/// ```
pub fn describe(u: &Unreached, max_attach_m: f64) -> Option<String> {
    if u.homes == 0 {
        return None;
    }
    let mut parts = Vec::new();
    if u.too_far > 0 {
        let d: Vec<f64> = u.list.iter().filter_map(|h| h.nearest_street_m).collect();
        let lo = d.iter().copied().fold(f64::INFINITY, f64::min);
        let hi = d.iter().copied().fold(0.0, f64::max);
        let range = if d.is_empty() {
            String::new()
        } else if (hi - lo) < 1.0 {
            format!(" (the nearest street is {} away)", distance(lo))
        } else {
            format!(
                " (nearest street {} to {} away)",
                distance(lo),
                distance(hi)
            )
        };
        parts.push(format!(
            "{} farther than {max_attach_m} m from any walkable street{range}",
            u.too_far
        ));
        if u.likely_swapped > 0 {
            parts.push(format!(
                "{} of them would lie on the network with longitude and latitude swapped: check the column order (lon first, then lat)",
                u.likely_swapped
            ));
        }
    }
    if u.no_path > 0 {
        parts.push(format!(
            "{} with no walking path to their school (a separate piece of the network)",
            u.no_path
        ));
    }
    let first: Vec<&str> = u.list.iter().take(5).map(|h| h.id.as_str()).collect();
    Some(format!(
        "{} home(s) with {} children were not reached: {}; first: {}. They are in qa.geojson and left out of the figures",
        u.homes,
        u.children,
        parts.join("; "),
        first.join(", ")
    ))
}
