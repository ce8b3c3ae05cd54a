//! One project file: the layers as loaded, mapping, settings (config with its rule set),
//! named scenarios (lists of interventions), site-visit notes and their photos, in a zip of
//! our own layout (`docs/project-format.md`). Written and read here, so the page and the
//! CLI share one format; [`write_project`] then [`read_project`] gives back the identical
//! [`Project`].

mod archive;
pub mod notes;

pub use archive::{read_project, write_project};

use crate::input::{HomesFormat, Preset, RawLayers};
use serde::{Deserialize, Serialize};

/// The format name and version `project.json` carries.
pub const FORMAT: &str = "catchwalk-project";
pub const VERSION: u32 = 1;

/// The layers as the planner loaded them (text, as read from their files).
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
pub struct ProjectLayers {
    pub streets: String,
    pub crossings: Option<String>,
    pub schools: String,
    pub homes: String,
    pub homes_format: HomesFormat,
    pub catchments: Option<String>,
    pub preset: Preset,
    pub mapping: Option<String>,
}

impl ProjectLayers {
    /// The layers for an audit, with a scenario's interventions (GeoJSON text) if any.
    pub fn raw(&self, interventions: Option<String>) -> RawLayers {
        RawLayers {
            streets: self.streets.clone(),
            crossings: self.crossings.clone(),
            schools: self.schools.clone(),
            homes: self.homes.clone(),
            homes_format: self.homes_format,
            catchments: self.catchments.clone(),
            preset: self.preset,
            mapping: self.mapping.clone(),
            interventions,
        }
    }
}

/// A named scenario: an interventions layer (GeoJSON text, as `--interventions` reads it).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Scenario {
    pub name: String,
    pub interventions: String,
}

/// A photo kept in the project (scaled down by the page before it is added).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Photo {
    /// File name inside the project's `photos/` folder; notes refer to it by this name.
    pub name: String,
    pub media_type: String,
    #[serde(with = "base64_bytes")]
    pub bytes: Vec<u8>,
}

/// Everything a planner made.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
pub struct Project {
    pub layers: ProjectLayers,
    /// The config (JSON, with the rule set under `score.rules`); `None`: the defaults.
    pub config: Option<serde_json::Value>,
    pub scenarios: Vec<Scenario>,
    pub notes: Vec<notes::Note>,
    pub photos: Vec<Photo>,
}

impl Project {
    /// The scenario named `name`; an error listing the names when there is none.
    pub fn scenario(&self, name: &str) -> crate::error::Result<&Scenario> {
        self.scenarios
            .iter()
            .find(|s| s.name == name)
            .ok_or_else(|| {
                let names: Vec<&str> = self.scenarios.iter().map(|s| s.name.as_str()).collect();
                crate::error::Error::Io(format!(
                    "the project has no scenario '{name}'; it has: {}",
                    if names.is_empty() {
                        "none".to_string()
                    } else {
                        names.join(", ")
                    }
                ))
            })
    }
}

impl Project {
    /// The interventions layer an audit of this project runs with: the named scenario's
    /// interventions (none without a name), then, with `observations`, the notes' observed
    /// corrections (`origin: observation`). `None` when there is nothing to apply.
    pub fn interventions(
        &self,
        scenario: Option<&str>,
        observations: bool,
    ) -> crate::error::Result<Option<String>> {
        let mut features = Vec::new();
        if let Some(name) = scenario {
            let s = self.scenario(name)?;
            let v: serde_json::Value =
                serde_json::from_str(&s.interventions).map_err(|e| crate::error::Error::Parse {
                    layer: crate::error::LayerName::Interventions,
                    message: format!("scenario '{name}': {e}"),
                })?;
            features.extend(v["features"].as_array().cloned().unwrap_or_default());
        }
        if observations {
            features.extend(notes::observed_features(&self.notes));
        }
        Ok((!features.is_empty()).then(|| {
            serde_json::json!({"type": "FeatureCollection", "features": features}).to_string()
        }))
    }
}

/// Photos travel as base64 text in the page's JSON (the zip keeps them as files).
mod base64_bytes {
    use base64::Engine;
    use serde::{Deserialize, Deserializer, Serializer};
    pub fn serialize<S: Serializer>(b: &[u8], s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(&base64::engine::general_purpose::STANDARD.encode(b))
    }
    pub fn deserialize<'de, D: Deserializer<'de>>(d: D) -> Result<Vec<u8>, D::Error> {
        let t = String::deserialize(d)?;
        base64::engine::general_purpose::STANDARD
            .decode(t.as_bytes())
            .map_err(serde::de::Error::custom)
    }
}
