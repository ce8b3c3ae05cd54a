//! Turns each layer as given (text, or a file's bytes) into WGS84 GeoJSON or CSV text for the
//! layer readers, and decides which property names each layer uses.

use super::geojson_read::for_each_feature;
use super::per_layer::{LayerFile, PerLayer};
use super::{crs, pbf, shapefile, Preset};
use crate::error::{Error, LayerName, Result};
use std::borrow::Cow;

/// A file's format, by its extension (then its first bytes).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FileFormat {
    Zip,
    Shp,
    Pbf,
    Csv,
    GeoJson,
}

/// The format of a file by its name and first bytes.
///
/// ```
/// use catchwalk::input::prepare::{format_of, FileFormat};
/// assert_eq!(format_of("roads.ZIP", b""), FileFormat::Zip);
/// assert_eq!(format_of("area.osm.pbf", b""), FileFormat::Pbf);
/// assert_eq!(format_of("upload", b"PK\x03\x04rest"), FileFormat::Zip);
/// assert_eq!(format_of("homes.csv", b"lon,lat"), FileFormat::Csv);
/// ```
pub fn format_of(name: &str, bytes: &[u8]) -> FileFormat {
    let n = name.to_ascii_lowercase();
    if n.ends_with(".zip") || bytes.starts_with(b"PK\x03\x04") {
        FileFormat::Zip
    } else if n.ends_with(".pbf") || bytes.get(4..15) == Some(&b"\x0a\x09OSMHeader"[..]) {
        FileFormat::Pbf
    } else if n.ends_with(".shp") || bytes.starts_with(&[0, 0, 0x27, 0x0a]) {
        FileFormat::Shp
    } else if n.ends_with(".csv") {
        FileFormat::Csv
    } else {
        FileFormat::GeoJson
    }
}

/// One layer's text, ready for its reader, and whether it came from OpenStreetMap data.
#[derive(Debug)]
pub struct Prepared<'a> {
    pub text: Cow<'a, str>,
    pub format: FileFormat,
    /// The layer came from an `.osm.pbf`: its properties are OpenStreetMap tags.
    pub from_osm: bool,
}

/// A layer given as files, as WGS84 text (GeoJSON, or CSV for a CSV file).
///
/// ```
/// use catchwalk::input::{per_layer::LayerFile, prepare::file_text};
/// use catchwalk::error::LayerName;
/// let f = LayerFile { layer: LayerName::Streets, files: vec![("s.zip".into(), b"PK\x03\x04".to_vec())] };
/// assert!(file_text(&f, None).is_err());
/// ```
pub fn file_text(file: &LayerFile, crs_given: Option<&str>) -> Result<(String, FileFormat)> {
    let layer = file.layer;
    let Some((name, bytes)) = file.files.first() else {
        return Err(Error::Parse {
            layer,
            message: "no file was given".into(),
        });
    };
    let format = format_of(name, bytes);
    let text = match format {
        FileFormat::Zip => shapefile::read_zip(bytes, crs_given, layer)?,
        FileFormat::Pbf => pbf::read_pbf(bytes, layer)?,
        FileFormat::Shp => {
            let side = |ext: &str| {
                file.files
                    .iter()
                    .find(|(n, _)| n.to_ascii_lowercase().ends_with(ext))
                    .map(|(_, b)| b.clone())
            };
            let parts = shapefile::ShapefileParts {
                shp: bytes.clone(),
                shx: side(".shx"),
                dbf: side(".dbf"),
                prj: side(".prj").map(|b| String::from_utf8_lossy(&b).into_owned()),
            };
            shapefile::read_parts(&parts, crs_given, layer)?
        }
        FileFormat::Csv | FileFormat::GeoJson => {
            String::from_utf8(bytes.clone()).map_err(|e| Error::Parse {
                layer,
                message: format!(
                    "{name} is not UTF-8 text (byte {}); re-save it as UTF-8",
                    e.utf8_error().valid_up_to()
                ),
            })?
        }
    };
    Ok((text, format))
}

/// A layer file in any format (Shapefile, `.osm.pbf`, GeoJSON with or without a `crs`
/// member) as WGS84 GeoJSON text, as the audit reads it. `crs` is the coordinate system for a
/// file that states none.
///
/// ```
/// use catchwalk::input::{per_layer::LayerFile, prepare::layer_geojson};
/// use catchwalk::error::LayerName;
/// let text = r#"{"type":"FeatureCollection","features":[{"type":"Feature","properties":{},
///   "geometry":{"type":"Point","coordinates":[500000,4649776.22]}}]}"#;
/// let f = LayerFile { layer: LayerName::Homes, files: vec![("h.geojson".into(), text.into())] };
/// let out: serde_json::Value = serde_json::from_str(&layer_geojson(&f, Some("EPSG:32633")).unwrap()).unwrap();
/// let lon = out["features"][0]["geometry"]["coordinates"][0].as_f64().unwrap();
/// let lat = out["features"][0]["geometry"]["coordinates"][1].as_f64().unwrap();
/// assert!((lon - 15.0).abs() < 1e-9 && (lat - 42.0).abs() < 1e-6);
/// ```
pub fn layer_geojson(file: &LayerFile, crs_given: Option<&str>) -> Result<String> {
    let (text, format) = file_text(file, crs_given)?;
    match format {
        FileFormat::GeoJson => {
            Ok(crs::reproject_geojson(&text, crs_given, file.layer)?.unwrap_or(text))
        }
        FileFormat::Csv => Err(Error::Parse {
            layer: file.layer,
            message: "a CSV file is read as homes as it is; give a GeoJSON, Shapefile or .osm.pbf"
                .into(),
        }),
        _ => Ok(text),
    }
}

/// A layer's text from its file (if given) or its text, reprojected to WGS84 when a GeoJSON
/// layer's `crs` member or the user's choice names another coordinate system.
pub fn prepare<'a>(
    layer: LayerName,
    text: &'a str,
    text_format: FileFormat,
    per_layer: &PerLayer,
) -> Result<Prepared<'a>> {
    let given = per_layer.crs(layer);
    let (text, format, from_osm): (Cow<'a, str>, FileFormat, bool) = match per_layer.file(layer) {
        Some(f) => {
            let (t, format) = file_text(f, given)?;
            // Shapefiles were reprojected from their .prj (or the choice) already.
            let done = matches!(format, FileFormat::Zip | FileFormat::Shp | FileFormat::Pbf);
            if done {
                return Ok(Prepared {
                    text: Cow::Owned(t),
                    format: FileFormat::GeoJson,
                    from_osm: format == FileFormat::Pbf,
                });
            }
            (Cow::Owned(t), format, false)
        }
        None => (Cow::Borrowed(text), text_format, false),
    };
    if format == FileFormat::Csv {
        return Ok(Prepared {
            text,
            format,
            from_osm,
        });
    }
    let text = match crs::reproject_geojson(&text, given, layer)? {
        Some(t) => Cow::Owned(t),
        None => text,
    };
    Ok(Prepared {
        text,
        format,
        from_osm,
    })
}

/// How many features are looked at to tell a layer's property names.
pub const DETECT_FEATURES: usize = 500;

/// Tells a layer's property names from its first features: OpenStreetMap tags (`highway`
/// on streets; `highway`/`crossing`/`railway` on crossings; `amenity` on schools) when no
/// feature carries the plain names' marker (`class`, `control`; `id`/`name` without
/// `amenity` on schools), plain names for the reverse. `None` when the properties do not
/// tell (both markers, or neither).
///
/// ```
/// use catchwalk::input::{prepare::detect_names, Preset};
/// use catchwalk::error::LayerName;
/// let osm = r#"{"type":"FeatureCollection","features":[{"type":"Feature","geometry":null,"properties":{"highway":"residential"}}]}"#;
/// assert_eq!(detect_names(osm, LayerName::Streets), Some(Preset::Osm));
/// let own = r#"{"type":"FeatureCollection","features":[{"type":"Feature","geometry":null,"properties":{"id":"s1","name":"North"}}]}"#;
/// assert_eq!(detect_names(own, LayerName::Schools), Some(Preset::Plain));
/// ```
pub fn detect_names(text: &str, layer: LayerName) -> Option<Preset> {
    let (osm_keys, plain_keys): (&[&str], &[&str]) = match layer {
        LayerName::Streets => (&["highway"], &["class"]),
        LayerName::Crossings => (&["highway", "crossing", "railway"], &["control"]),
        LayerName::Schools => (&["amenity"], &[]),
        _ => return Some(Preset::Plain),
    };
    let (mut osm, mut plain, mut named) = (false, false, false);
    let _ = for_each_feature(text, layer, |i, f| {
        if let Some(p) = &f.properties {
            osm |= osm_keys.iter().any(|k| p.contains_key(*k));
            plain |= plain_keys.iter().any(|k| p.contains_key(*k));
            named |= p.contains_key("id") || p.contains_key("name");
        }
        if i + 1 >= DETECT_FEATURES {
            // Enough seen: stop reading the layer.
            return Err(Error::Cancelled);
        }
        Ok(())
    });
    match (osm, plain) {
        (true, false) => Some(Preset::Osm),
        (false, true) => Some(Preset::Plain),
        (false, false) if layer == LayerName::Schools && named => Some(Preset::Plain),
        // Both kinds, or neither: the preset decides.
        _ => None,
    }
}
