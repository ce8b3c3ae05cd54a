//! Typed errors and warnings. Each names the layer, the feature and the property at fault,
//! and says what to do, so a planner can fix the file without reading code.

use serde::Serialize;
use std::fmt;
use thiserror::Error;

/// Which input layer a message concerns.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum LayerName {
    Streets,
    Crossings,
    Schools,
    Homes,
    Catchments,
    Mapping,
    Config,
    /// What-if changes (`scenario`).
    Interventions,
    /// Site-visit notes (`project::notes`).
    Notes,
}

impl fmt::Display for LayerName {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let s = match self {
            LayerName::Streets => "streets",
            LayerName::Crossings => "crossings",
            LayerName::Schools => "schools",
            LayerName::Homes => "homes",
            LayerName::Catchments => "catchments",
            LayerName::Mapping => "mapping",
            LayerName::Config => "config",
            LayerName::Interventions => "interventions",
            LayerName::Notes => "notes",
        };
        f.write_str(s)
    }
}

/// Where in the input a problem sits: layer, feature index (0-based), its id if any, property.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Location {
    pub layer: LayerName,
    pub feature: Option<usize>,
    pub id: Option<String>,
    pub property: Option<String>,
}

impl Location {
    pub fn layer(layer: LayerName) -> Self {
        Location {
            layer,
            feature: None,
            id: None,
            property: None,
        }
    }
    pub fn feature(layer: LayerName, feature: usize, id: Option<String>) -> Self {
        Location {
            layer,
            feature: Some(feature),
            id,
            property: None,
        }
    }
    pub fn with_property(mut self, property: &str) -> Self {
        self.property = Some(property.to_string());
        self
    }
}

impl fmt::Display for Location {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}", self.layer)?;
        if let Some(i) = self.feature {
            write!(f, " feature {i}")?;
        }
        if let Some(id) = &self.id {
            write!(f, " (id {id})")?;
        }
        if let Some(p) = &self.property {
            write!(f, ", property '{p}'")?;
        }
        Ok(())
    }
}

/// An error stops the audit.
#[derive(Debug, Error)]
pub enum Error {
    #[error("{at}: {message}")]
    Input { at: Location, message: String },
    #[error("{at}: coordinates ({x}, {y}) look projected, not longitude/latitude; reproject the file to WGS84 (EPSG:4326) and load it again")]
    Projected { at: Location, x: f64, y: f64 },
    #[error("{layer}: not valid JSON/GeoJSON: {message}")]
    Parse { layer: LayerName, message: String },
    #[error("{0}")]
    Config(String),
    #[error("cancelled")]
    Cancelled,
    #[error("{0}")]
    Io(String),
}

impl Error {
    pub fn input(at: Location, message: impl Into<String>) -> Self {
        Error::Input {
            at,
            message: message.into(),
        }
    }
}

/// A warning does not stop the audit; it is listed with the feature it concerns.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Warning {
    pub at: Location,
    pub message: String,
}

impl fmt::Display for Warning {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}: {}", self.at, self.message)
    }
}

pub type Result<T> = std::result::Result<T, Error>;
