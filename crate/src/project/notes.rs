//! Site-visit notes: on a crossing, a street side or a point, with a checklist of our own,
//! free text, photo references, and optionally an observed correction the audit can take as
//! an intervention (marked as coming from an observation).

use crate::error::Result;
use crate::input::LonLat;
use crate::scenario::{Intervention, Origin};
use serde::{Deserialize, Serialize};
use serde_json::{json, Value};

/// What a note is on.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "on", rename_all = "snake_case")]
pub enum NoteTarget {
    /// A crossing (its id in the crossings layer, if it has one there).
    Crossing {
        crossing: Option<String>,
    },
    /// One side of a street (left/right of its digitised direction).
    StreetSide {
        street: String,
        side: String,
    },
    Point,
}

/// One checklist answer.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Check {
    #[default]
    NotChecked,
    Ok,
    Problem,
}

/// The site-visit checklist (our own list of what a visit settles that the layers cannot).
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct Checklist {
    pub sight_lines: Check,
    pub kerb_ramps: Check,
    /// Enough time to cross (signal phase, gap in traffic).
    pub crossing_time: Check,
    /// Parked cars block the view or the crossing.
    pub parked_cars: Check,
    pub sidewalk_condition: Check,
    pub lighting: Check,
    /// Driver speed observed, km/h (a rough reading, not a survey).
    pub observed_speed_kmh: Option<f64>,
    pub crossing_guard_seen: Option<bool>,
}

/// A site-visit note.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Note {
    pub id: String,
    pub at: LonLat,
    pub target: NoteTarget,
    pub checklist: Checklist,
    pub text: String,
    /// Names of photos in the project's `photos/` folder.
    pub photos: Vec<String>,
    /// ISO 8601 date and time of the visit, as the page records it.
    pub visited: Option<String>,
    /// An observed correction, as an intervention's properties (`kind`, `street`, ...), at
    /// the note's point.
    pub observed: Option<serde_json::Map<String, Value>>,
}

/// Notes as a GeoJSON FeatureCollection (Points; every note field a property), for export.
pub fn notes_geojson(notes: &[Note]) -> Value {
    let features: Vec<Value> = notes
        .iter()
        .map(|n| {
            let mut props = serde_json::to_value(n).unwrap_or(Value::Null);
            if let Some(o) = props.as_object_mut() {
                o.remove("at");
            }
            json!({"type": "Feature", "geometry": {"type": "Point", "coordinates": n.at}, "properties": props})
        })
        .collect();
    json!({"type": "FeatureCollection", "features": features})
}

/// Reads notes back from [`notes_geojson`]'s collection.
pub fn read_notes_geojson(text: &str) -> Result<Vec<Note>> {
    let layer = crate::error::LayerName::Notes;
    let mut out = Vec::new();
    crate::input::geojson_read::for_each_feature(text, layer, |i, f| {
        let at = match f.geometry.map(|g| g.value) {
            Some(geojson::GeometryValue::Point { coordinates }) => {
                crate::input::geojson_read::lonlat(&coordinates, &|| {
                    crate::error::Location::feature(layer, i, None)
                })?
            }
            _ => {
                return Err(crate::error::Error::Io(format!(
                    "notes feature {i}: a note is a Point"
                )))
            }
        };
        let mut props = Value::Object(f.properties.unwrap_or_default());
        props["at"] = json!(at);
        let note: Note = serde_json::from_value(props)
            .map_err(|e| crate::error::Error::Io(format!("notes feature {i}: {e}")))?;
        out.push(note);
        Ok(())
    })?;
    Ok(out)
}

/// The observed corrections of `notes` as interventions-layer features (`origin:
/// observation`, id `note-<id>`, the note's point as the geometry; a `path` correction carries
/// its `line`).
pub fn observed_features(notes: &[Note]) -> Vec<Value> {
    notes
        .iter()
        .filter_map(|n| {
            let mut props = n.observed.clone()?;
            props.insert("origin".into(), json!("observation"));
            props.insert("id".into(), json!(format!("note-{}", n.id)));
            props.entry("note").or_insert_with(|| json!(n.text));
            let geometry = match props.get("kind").and_then(|k| k.as_str()) {
                Some("path") => props
                    .remove("line")
                    .map(|l| json!({"type": "LineString", "coordinates": l})),
                _ => Some(json!({"type": "Point", "coordinates": n.at})),
            };
            Some(json!({"type": "Feature", "geometry": geometry, "properties": props}))
        })
        .collect()
}

/// The observed corrections of `notes` as interventions (`origin: observation`), read as an
/// interventions layer would be.
pub fn observed_interventions(notes: &[Note]) -> Result<Vec<Intervention>> {
    let fc = json!({"type": "FeatureCollection", "features": observed_features(notes)});
    let mut list = crate::scenario::read::read_interventions(&fc.to_string())?;
    for iv in &mut list {
        iv.origin = Origin::Observation;
    }
    Ok(list)
}
