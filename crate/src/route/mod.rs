//! Routes from homes to their school: the two route kinds, over one tree per school and kind.

pub mod assign;
pub mod path;
pub mod tree;

pub use path::{Route, RouteStep};

use serde::Serialize;

/// The two routes the audit computes for every home.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum RouteKind {
    /// Minimum walked length: what a child is likely to walk.
    Shortest,
    /// Minimum generalised cost (length + risk in metres), within the detour cap.
    Recommended,
    /// The shortest route that no rule of the rule set flags, if any: the safe-route test.
    Safe,
}

impl RouteKind {
    pub fn as_str(self) -> &'static str {
        match self {
            RouteKind::Shortest => "shortest",
            RouteKind::Recommended => "recommended",
            RouteKind::Safe => "safe",
        }
    }
}
