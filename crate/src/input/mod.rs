//! Input layers: GeoJSON (RFC 7946, WGS84) and CSV homes, read through a field mapping
//! into the validated [`model::Layers`], with feature-indexed errors and warnings.

pub mod crs;
pub mod fields;
pub mod geojson_read;
pub mod homes_csv;
pub mod mapping;
pub mod model;
pub mod observed;
pub mod pbf;
pub mod per_layer;
pub mod plausible;
pub mod prepare;
pub mod presets;
mod read;
pub mod shapefile;
pub mod speed;
pub mod text;
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
    /// Observed crashes (Points; see [`observed`]), optional.
    pub crashes: Option<String>,
    pub preset: Preset,
    /// A user's field-mapping file (JSON), overriding the preset.
    pub mapping: Option<String>,
    /// What-if interventions (GeoJSON), applied as an overlay (`scenario`).
    pub interventions: Option<String>,
    /// Layers given as files (Shapefile, `.osm.pbf`), names and coordinate systems by layer.
    pub per_layer: per_layer::PerLayer,
}

/// The demo town's streets, crossings, schools and homes as read, for the unit tests that
/// check a table or a drawing against the live functions on real-looking data.
#[cfg(test)]
pub(crate) fn demo_town_layers() -> Layers {
    let demo = |f: &str| {
        std::fs::read_to_string(format!("../sample-maps/demo-town/{f}")).unwrap_or_default()
    };
    let raw = RawLayers {
        streets: demo("streets.geojson"),
        crossings: Some(demo("crossings.geojson")),
        schools: demo("schools.geojson"),
        homes: demo("homes.geojson"),
        homes_format: HomesFormat::GeoJson,
        ..Default::default()
    };
    read_layers(&raw).expect("demo town reads").0
}

/// Parses and validates every layer. Warnings do not stop the audit; errors do.
/// Each layer's property names: the layer's choice in `per_layer.names`, else plain names
/// through the mapping file's fields when it names the layer, else OpenStreetMap tags for an
/// `.osm.pbf`, else detected from the layer's properties ([`prepare::detect_names`]), else
/// the mapping's `base` or `preset`.
pub fn read_layers(raw: &RawLayers) -> Result<(Layers, Vec<Warning>)> {
    use crate::error::{LayerName as L, Location};
    use prepare::{FileFormat, Prepared};
    // An optional layer given as blank text (an empty file picker) counts as absent.
    let mapping = match raw.mapping.as_deref().filter(|t| !t.trim().is_empty()) {
        Some(text) => mapping::parse_mapping(text)?,
        None => mapping::Mapping::default(),
    };
    let preset = mapping.base.unwrap_or(raw.preset);
    let per = &raw.per_layer;
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
    let gj = FileFormat::GeoJson;
    let mut w = warnings::Warnings::default();
    let names = |layer: L, p: &Prepared, w: &mut warnings::Warnings| -> Preset {
        if let Some(n) = per.names(layer) {
            return n;
        }
        if mapping.layer(&layer.to_string()).is_some() {
            return Preset::Plain;
        }
        if p.from_osm {
            return Preset::Osm;
        }
        match prepare::detect_names(&p.text, layer) {
            Some(found) => {
                if found != preset {
                    let (what, other) = match found {
                        Preset::Osm => ("OpenStreetMap tags", "plain"),
                        Preset::Plain => ("catchwalk's plain names", "osm"),
                    };
                    w.push(
                        "names",
                        Location::layer(layer),
                        format!("read with {what}, as its properties show; to read it otherwise choose this layer's names ({layer}={other})"),
                    );
                }
                found
            }
            None => preset,
        }
    };
    for (layer, text) in [
        (crate::error::LayerName::Streets, &raw.streets),
        (crate::error::LayerName::Schools, &raw.schools),
        (crate::error::LayerName::Homes, &raw.homes),
    ] {
        // A layer given as a file (Shapefile, .osm.pbf) has no text of its own.
        if per.file(layer).is_none() && text.trim_start_matches('\u{feff}').trim().is_empty() {
            return Err(crate::error::Error::input(
                crate::error::Location::layer(layer),
                "the file is empty (0 bytes or only blank space); load the layer's file with its features",
            ));
        }
    }
    let reader = |p: Preset, f| match p {
        Preset::Osm => Reader::Osm,
        Preset::Plain => Reader::Plain(f),
    };
    let streets = prepare::prepare(L::Streets, &raw.streets, gj, per)?;
    let n = names(L::Streets, &streets, &mut w);
    let mut layers = Layers {
        streets: read::streets(&streets.text, reader(n, &street_f), &mut w)?,
        ..Layers::default()
    };
    drop(streets);
    if let Some(text) = optional(per, L::Crossings, &raw.crossings) {
        let p = prepare::prepare(L::Crossings, text, gj, per)?;
        let n = names(L::Crossings, &p, &mut w);
        layers.crossings = read::crossings(&p.text, reader(n, &crossing_f), &mut w)?;
        layers.rail_crossings = observed::rail_crossings(&p.text, n == Preset::Osm, &mut w)?;
    }
    if let Some(text) = raw.crashes.as_deref().filter(|t| !t.trim().is_empty()) {
        layers.crashes = observed::crashes(text, &mut w)?;
    }
    let schools = prepare::prepare(L::Schools, &raw.schools, gj, per)?;
    let n = names(L::Schools, &schools, &mut w);
    layers.schools = read::schools(&schools.text, reader(n, &school_f), &school_f, &mut w)?;
    let home_f = fields("homes", fields::HOMES);
    let homes_format = match raw.homes_format {
        HomesFormat::Csv => FileFormat::Csv,
        HomesFormat::GeoJson => gj,
    };
    let homes = prepare::prepare(L::Homes, &raw.homes, homes_format, per)?;
    layers.homes = match homes.format {
        FileFormat::Csv => {
            let t = match per.crs(L::Homes) {
                Some(c) => {
                    let mut t = crs::to_wgs84(c).map_err(|m| {
                        crate::error::Error::input(
                            Location::layer(L::Homes).with_property("crs"),
                            m,
                        )
                    })?;
                    t.refuse_lonlat = true;
                    Some(t)
                }
                None => None,
            };
            homes_csv::read_homes_csv_in(
                &homes.text,
                &home_f,
                t.as_ref().filter(|t| !t.is_wgs84),
                &mut w,
            )?
        }
        _ => read::homes(&homes.text, &home_f, &mut w)?,
    };
    if let Some(text) = optional(per, L::Catchments, &raw.catchments) {
        let p = prepare::prepare(L::Catchments, text, gj, per)?;
        layers.catchments = read::catchments(&p.text, &fields("catchments", fields::CATCHMENTS))?;
    }
    validate::validate(&mut layers, &mut w)?;
    plausible::check(&mut layers, &mut w);
    Ok((layers, w.finish()))
}

/// An optional layer's text: absent when blank (an empty file picker) unless given as a file.
fn optional<'a>(
    per: &per_layer::PerLayer,
    layer: crate::error::LayerName,
    text: &'a Option<String>,
) -> Option<&'a str> {
    match text.as_deref().filter(|t| !t.trim().is_empty()) {
        Some(t) => Some(t),
        None if per.file(layer).is_some() => Some(""),
        None => None,
    }
}

#[cfg(test)]
mod tests;
