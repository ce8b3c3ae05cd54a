//! Input layers: GeoJSON (RFC 7946, WGS84) and CSV homes, read through a field mapping
//! into the validated [`model::Layers`], with feature-indexed errors and warnings.

pub mod fields;
pub mod geojson_read;
pub mod homes_csv;
pub mod mapping;
pub mod model;
pub mod presets;
mod read;
pub mod speed;
pub mod validate;
pub mod values;
pub mod warnings;

use crate::error::{Result, Warning};
use fields::{FieldTable, LayerFields};
pub use model::*;
use presets::Reader;

/// Which field-mapping preset reads the layers.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Preset {
    /// OpenStreetMap tags (`highway`, `maxspeed`, `sidewalk`, ...).
    Osm,
    /// The project's own property names (`class`, `speed_kmh`, `sidewalk`, ...).
    #[default]
    Plain,
}

/// How the homes layer is encoded.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum HomesFormat {
    #[default]
    GeoJson,
    /// CSV with `lon`/`lat` (or `lng`, `longitude`/`latitude`, `x`/`y`) columns.
    Csv,
}

/// The layers as text, as they come from files or the page.
#[derive(Debug, Clone, Default)]
pub struct RawLayers {
    pub streets: String,
    pub crossings: Option<String>,
    pub schools: String,
    pub homes: String,
    pub homes_format: HomesFormat,
    pub catchments: Option<String>,
    pub preset: Preset,
    /// A user's field-mapping file (JSON), overriding the preset.
    pub mapping: Option<String>,
    /// What-if interventions (GeoJSON), applied as an overlay (`scenario`).
    pub interventions: Option<String>,
}

/// Parses and validates every layer. Warnings do not stop the audit; errors do.
/// A mapping file's `base` replaces `preset`; layers the mapping names are read through
/// its fields with the plain rules.
pub fn read_layers(raw: &RawLayers) -> Result<(Layers, Vec<Warning>)> {
    // An optional layer given as blank text (an empty file picker) counts as absent.
    let mapping = match raw.mapping.as_deref().filter(|t| !t.trim().is_empty()) {
        Some(text) => mapping::parse_mapping(text)?,
        None => mapping::Mapping::default(),
    };
    let preset = mapping.base.unwrap_or(raw.preset);
    let fields = |layer: &str, table: FieldTable| {
        mapping
            .layer(layer)
            .cloned()
            .unwrap_or_else(|| LayerFields::plain(table))
    };
    let (street_f, crossing_f, school_f) = (
        fields("streets", fields::STREETS),
        fields("crossings", fields::CROSSINGS),
        fields("schools", fields::SCHOOLS),
    );
    // OpenStreetMap tags read the layers the mapping does not name.
    let pick = |layer: &str, f| {
        if preset == Preset::Osm && mapping.layer(layer).is_none() {
            Reader::Osm
        } else {
            Reader::Plain(f)
        }
    };
    let mut w = warnings::Warnings::default();
    let mut layers = Layers {
        streets: read::streets(&raw.streets, pick("streets", &street_f), &mut w)?,
        ..Layers::default()
    };
    if let Some(text) = raw.crossings.as_deref().filter(|t| !t.trim().is_empty()) {
        layers.crossings = read::crossings(text, pick("crossings", &crossing_f), &mut w)?;
    }
    layers.schools = read::schools(&raw.schools, pick("schools", &school_f), &school_f, &mut w)?;
    let home_f = fields("homes", fields::HOMES);
    layers.homes = match raw.homes_format {
        HomesFormat::GeoJson => read::homes(&raw.homes, &home_f, &mut w)?,
        HomesFormat::Csv => homes_csv::read_homes_csv(&raw.homes, &home_f, &mut w)?,
    };
    if let Some(text) = raw.catchments.as_deref().filter(|t| !t.trim().is_empty()) {
        layers.catchments = read::catchments(text, &fields("catchments", fields::CATCHMENTS))?;
    }
    validate::validate(&mut layers, &mut w)?;
    Ok((layers, w.finish()))
}

#[cfg(test)]
mod tests;
