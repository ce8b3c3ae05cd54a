//! The project zip: `project.json` (format, version, layer file names, config, scenario
//! names), the layers as loaded under `layers/`, each scenario under `scenarios/`,
//! `notes.geojson`, photos under `photos/`. Entries carry a fixed date, so the same project
//! writes the same bytes.

use super::notes::{notes_geojson, read_notes_geojson};
use super::{Photo, Project, ProjectLayers, Scenario, FORMAT, VERSION};
use crate::error::{Error, Result};
use crate::input::{HomesFormat, Preset};
use serde::{Deserialize, Serialize};
use std::io::{Cursor, Read, Write};
use zip::write::SimpleFileOptions;

/// `project.json`: what the zip holds and where.
#[derive(Debug, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
struct Manifest {
    format: String,
    version: u32,
    written_by: String,
    caution: String,
    layers: LayerFiles,
    config: Option<serde_json::Value>,
    scenarios: Vec<ScenarioEntry>,
    notes: String,
    photos: Vec<PhotoEntry>,
}

#[derive(Debug, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
struct LayerFiles {
    streets: String,
    crossings: Option<String>,
    schools: String,
    homes: String,
    homes_format: HomesFormat,
    catchments: Option<String>,
    preset: Preset,
    mapping: Option<String>,
}

#[derive(Debug, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
struct ScenarioEntry {
    name: String,
    file: String,
}

#[derive(Debug, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
struct PhotoEntry {
    name: String,
    media_type: String,
    file: String,
}

fn io(e: impl std::fmt::Display) -> Error {
    Error::Io(format!("project file: {e}"))
}

/// A photo name safe as a file name inside the zip (no folders, no `..`).
fn safe_name(name: &str) -> Result<&str> {
    if name.is_empty() || name.contains(['/', '\\']) || name == "." || name == ".." {
        return Err(Error::Io(format!(
            "project file: photo name '{name}' is not a plain file name"
        )));
    }
    Ok(name)
}

/// Writes the project as zip bytes.
///
/// ```
/// use catchwalk::project::{read_project, write_project, Project};
/// let p = Project::default();
/// let bytes = write_project(&p).unwrap();
/// assert_eq!(read_project(&bytes).unwrap(), p);
/// ```
pub fn write_project(p: &Project) -> Result<Vec<u8>> {
    let mut zip = zip::ZipWriter::new(Cursor::new(Vec::new()));
    let opts = SimpleFileOptions::default()
        .compression_method(zip::CompressionMethod::Deflated)
        .last_modified_time(zip::DateTime::default());
    let put = |zip: &mut zip::ZipWriter<Cursor<Vec<u8>>>, name: &str, bytes: &[u8]| {
        zip.start_file(name, opts).map_err(io)?;
        zip.write_all(bytes).map_err(io)
    };
    let l = &p.layers;
    let homes_file = match l.homes_format {
        HomesFormat::Csv => "layers/homes.csv",
        HomesFormat::GeoJson => "layers/homes.geojson",
    };
    let opt = |t: &Option<String>, f: &str| t.as_ref().map(|_| f.to_string());
    let manifest = Manifest {
        format: FORMAT.into(),
        version: VERSION,
        written_by: format!("catchwalk {}", env!("CARGO_PKG_VERSION")),
        caution: crate::CAUTION.into(),
        layers: LayerFiles {
            streets: "layers/streets.geojson".into(),
            crossings: opt(&l.crossings, "layers/crossings.geojson"),
            schools: "layers/schools.geojson".into(),
            homes: homes_file.into(),
            homes_format: l.homes_format,
            catchments: opt(&l.catchments, "layers/catchments.geojson"),
            preset: l.preset,
            mapping: opt(&l.mapping, "layers/mapping.json"),
        },
        config: p.config.clone(),
        scenarios: p
            .scenarios
            .iter()
            .enumerate()
            .map(|(i, s)| ScenarioEntry {
                name: s.name.clone(),
                file: format!("scenarios/{}.geojson", i + 1),
            })
            .collect(),
        notes: "notes.geojson".into(),
        photos: p
            .photos
            .iter()
            .map(|ph| {
                Ok(PhotoEntry {
                    name: ph.name.clone(),
                    media_type: ph.media_type.clone(),
                    file: format!("photos/{}", safe_name(&ph.name)?),
                })
            })
            .collect::<Result<_>>()?,
    };
    let text = serde_json::to_string_pretty(&manifest).map_err(io)?;
    put(&mut zip, "project.json", text.as_bytes())?;
    let m = &manifest.layers;
    put(&mut zip, &m.streets, l.streets.as_bytes())?;
    if let (Some(f), Some(t)) = (&m.crossings, &l.crossings) {
        put(&mut zip, f, t.as_bytes())?;
    }
    put(&mut zip, &m.schools, l.schools.as_bytes())?;
    put(&mut zip, &m.homes, l.homes.as_bytes())?;
    if let (Some(f), Some(t)) = (&m.catchments, &l.catchments) {
        put(&mut zip, f, t.as_bytes())?;
    }
    if let (Some(f), Some(t)) = (&m.mapping, &l.mapping) {
        put(&mut zip, f, t.as_bytes())?;
    }
    for (e, s) in manifest.scenarios.iter().zip(&p.scenarios) {
        put(&mut zip, &e.file, s.interventions.as_bytes())?;
    }
    let notes = serde_json::to_string_pretty(&notes_geojson(&p.notes)).map_err(io)?;
    put(&mut zip, &manifest.notes, notes.as_bytes())?;
    for (e, ph) in manifest.photos.iter().zip(&p.photos) {
        put(&mut zip, &e.file, &ph.bytes)?;
    }
    Ok(zip.finish().map_err(io)?.into_inner())
}

fn entry(zip: &mut zip::ZipArchive<Cursor<&[u8]>>, name: &str) -> Result<Vec<u8>> {
    let mut f = zip
        .by_name(name)
        .map_err(|e| Error::Io(format!("project file: no entry '{name}' ({e})")))?;
    let mut out = Vec::new();
    f.read_to_end(&mut out).map_err(io)?;
    Ok(out)
}

fn text(zip: &mut zip::ZipArchive<Cursor<&[u8]>>, name: &str) -> Result<String> {
    String::from_utf8(entry(zip, name)?)
        .map_err(|_| Error::Io(format!("project file: '{name}' is not UTF-8 text")))
}

/// Reads a project written by [`write_project`] (the page or the CLI).
pub fn read_project(bytes: &[u8]) -> Result<Project> {
    let mut zip = zip::ZipArchive::new(Cursor::new(bytes)).map_err(|e| {
        Error::Io(format!(
            "project file: not a zip ({e}); give a file saved by catchwalk"
        ))
    })?;
    let manifest: Manifest = serde_json::from_str(&text(&mut zip, "project.json")?)
        .map_err(|e| Error::Io(format!("project file: project.json: {e}")))?;
    if manifest.format != FORMAT || manifest.version > VERSION {
        return Err(Error::Io(format!(
            "project file: format '{}' version {} is not one this catchwalk reads ({FORMAT} up to version {VERSION})",
            manifest.format, manifest.version
        )));
    }
    let m = &manifest.layers;
    let mut opt = |f: &Option<String>| f.as_ref().map(|f| text(&mut zip, f)).transpose();
    let (crossings, catchments, mapping) =
        (opt(&m.crossings)?, opt(&m.catchments)?, opt(&m.mapping)?);
    let layers = ProjectLayers {
        streets: text(&mut zip, &m.streets)?,
        crossings,
        schools: text(&mut zip, &m.schools)?,
        homes: text(&mut zip, &m.homes)?,
        homes_format: m.homes_format,
        catchments,
        preset: m.preset,
        mapping,
    };
    let scenarios = manifest
        .scenarios
        .iter()
        .map(|e| {
            Ok(Scenario {
                name: e.name.clone(),
                interventions: text(&mut zip, &e.file)?,
            })
        })
        .collect::<Result<_>>()?;
    let notes = read_notes_geojson(&text(&mut zip, &manifest.notes)?)?;
    let photos = manifest
        .photos
        .iter()
        .map(|e| {
            Ok(Photo {
                name: e.name.clone(),
                media_type: e.media_type.clone(),
                bytes: entry(&mut zip, &e.file)?,
            })
        })
        .collect::<Result<_>>()?;
    Ok(Project {
        layers,
        config: manifest.config,
        scenarios,
        notes,
        photos,
    })
}
