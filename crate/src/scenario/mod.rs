//! Scenarios: what-if interventions applied as an overlay on the layers, never an edit of
//! them.
//!
//! An intervention layer (GeoJSON, [`read::read_interventions`]) lists changes: crossing
//! controls placed exactly as crossings-layer points, a street's speed, sidewalks or closure,
//! and new foot paths. [`apply::apply_interventions`] makes a new [`Layers`] value holding
//! the change, so an audit with interventions *is* the audit of layers that already contain
//! the change, figure for figure. [`reaudit::reaudit`] re-routes only the schools whose trees
//! the change touches.

pub mod apply;
pub mod from_plan;
pub mod read;
pub mod reaudit;

use crate::input::{Control, ControlScope, Layers, LonLat};
use serde::{Deserialize, Serialize};
use std::sync::Arc;

/// Which sides of a street get a sidewalk.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum SideChoice {
    Both,
    Left,
    Right,
}

/// Where an intervention came from: a planner's own proposal, the upgrade planner, or a
/// correction observed on a site visit (shown as such in the summary and the page).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Origin {
    #[default]
    Proposal,
    Plan,
    Observation,
}

/// One change to the layers.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum Change {
    /// A crossing control at `at`, placed and attached exactly as a crossings-layer point
    /// (it combines with the controls already there: the stronger device, any island, raised
    /// table or guard).
    Control {
        at: LonLat,
        control: Control,
        scope: ControlScope,
    },
    /// The street's posted speed.
    Speed { street: String, speed_kmh: f64 },
    /// A sidewalk on one or both sides of the street.
    Sidewalk { street: String, side: SideChoice },
    /// The street is no longer walkable or crossable (a building site): it leaves the network.
    Close { street: String },
    /// A new foot path, joined to the network under the usual noding and snapping rules.
    Path { line: Vec<LonLat> },
}

/// One intervention as read from its layer.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Intervention {
    /// Index of the feature in the interventions layer (0-based).
    pub feature: usize,
    /// The feature's `id`, if it has one.
    pub id: Option<String>,
    /// The `kind` property as written (`signal`, `marked;refuge`, `speed`, ...).
    pub kind: String,
    pub change: Change,
    /// Where it is drawn: the control point, the Point given for a street change, the path's
    /// first point; `None` for a street change drawn without geometry.
    pub at: Option<LonLat>,
    pub origin: Origin,
    /// Free text (`note` property), kept for the summary and the page.
    pub note: Option<String>,
}

/// The overlay an audit ran with: the layers before the change and what was applied.
#[derive(Debug, Clone, PartialEq)]
pub struct Overlay {
    /// The layers as read, before any intervention (shared, not copied, between re-audits).
    pub base: Arc<Layers>,
    pub applied: Vec<Intervention>,
}

/// Property values of the `kind` property that are not crossing controls.
pub const STREET_KINDS: &str = "speed, sidewalk, close, path";
