//! Shapefiles as GIS departments send them: a `.zip` holding `.shp`, `.shx`, `.dbf` and
//! `.prj`, or the bare files side by side. Read with the `shapefile` and `zip` crates into a
//! GeoJSON FeatureCollection (WGS84, reprojected from the `.prj` when it names another
//! coordinate system), which the layer readers then take like any GeoJSON layer.

use super::crs;
use crate::error::{Error, LayerName, Location, Result};
use serde_json::{json, Map, Value};
use std::io::{Cursor, Read};

/// The files of one Shapefile, by part.
#[derive(Debug, Default, Clone)]
pub struct ShapefileParts {
    pub shp: Vec<u8>,
    pub shx: Option<Vec<u8>>,
    pub dbf: Option<Vec<u8>>,
    /// The `.prj` text (WKT), if the Shapefile has one.
    pub prj: Option<String>,
}

fn parse_err(layer: LayerName, message: impl Into<String>) -> Error {
    Error::Parse {
        layer,
        message: message.into(),
    }
}

/// The Shapefile parts inside a `.zip` (the first `.shp` found, and its sidecars by the same
/// stem, in any folder of the archive).
///
/// ```
/// let err = catchwalk::input::shapefile::unzip(b"not a zip", catchwalk::error::LayerName::Streets);
/// assert!(err.is_err());
/// ```
pub fn unzip(bytes: &[u8], layer: LayerName) -> Result<ShapefileParts> {
    let mut archive = zip::ZipArchive::new(Cursor::new(bytes)).map_err(|e| {
        parse_err(
            layer,
            format!(
                "not a readable .zip ({e}); zip the Shapefile's .shp, .shx, .dbf and .prj together"
            ),
        )
    })?;
    let names: Vec<String> = archive
        .file_names()
        .filter_map(|n| n.ok().map(|n| n.into_owned()))
        .collect();
    let shps: Vec<&String> = names
        .iter()
        .filter(|n| n.to_ascii_lowercase().ends_with(".shp") && !n.contains("__MACOSX"))
        .collect();
    let shp_name = match shps.as_slice() {
        [one] => (*one).clone(),
        [] => return Err(parse_err(
            layer,
            "the .zip holds no .shp file; zip the Shapefile's .shp, .shx, .dbf and .prj together",
        )),
        many => {
            return Err(parse_err(
                layer,
                format!(
                    "the .zip holds {} Shapefiles ({}); zip one layer per file",
                    many.len(),
                    many.iter()
                        .map(|s| s.as_str())
                        .collect::<Vec<_>>()
                        .join(", ")
                ),
            ))
        }
    };
    let stem = shp_name
        .get(..shp_name.len().saturating_sub(4))
        .unwrap_or("")
        .to_string();
    let mut take = |ext: &str| -> Result<Option<Vec<u8>>> {
        let Some(name) = names.iter().find(|n| {
            n.len() == stem.len() + 4
                && n.get(..stem.len()) == Some(stem.as_str())
                && n.to_ascii_lowercase().ends_with(ext)
        }) else {
            return Ok(None);
        };
        let mut file = archive
            .by_name(name)
            .map_err(|e| parse_err(layer, format!("{name} in the .zip cannot be read ({e})")))?;
        let mut out = Vec::new();
        file.read_to_end(&mut out)
            .map_err(|e| parse_err(layer, format!("{name} in the .zip cannot be read ({e})")))?;
        Ok(Some(out))
    };
    let shp = take(".shp")?.unwrap_or_default();
    let shx = take(".shx")?;
    let dbf = take(".dbf")?;
    let prj = take(".prj")?.map(|b| String::from_utf8_lossy(&b).into_owned());
    Ok(ShapefileParts { shp, shx, dbf, prj })
}

/// A zipped Shapefile as a WGS84 GeoJSON FeatureCollection (text).
///
/// ```
/// use catchwalk::input::shapefile::read_zip;
/// assert!(read_zip(&[0x50, 0x4b, 3, 4, 0], None, catchwalk::error::LayerName::Streets).is_err());
/// ```
pub fn read_zip(bytes: &[u8], crs: Option<&str>, layer: LayerName) -> Result<String> {
    read_parts(&unzip(bytes, layer)?, crs, layer)
}

/// A Shapefile's parts as a WGS84 GeoJSON FeatureCollection (text). The `.prj` gives the
/// coordinate system; `crs` (the user's choice) is used when there is no `.prj`. Without
/// either, coordinates are taken as longitude/latitude (and a projected file is refused
/// when the layer is read).
pub fn read_parts(parts: &ShapefileParts, crs: Option<&str>, layer: LayerName) -> Result<String> {
    let Some(dbf) = parts.dbf.as_deref() else {
        return Err(parse_err(
            layer,
            "the Shapefile has no .dbf (its attribute table); give the .shp together with its .dbf, .shx and .prj",
        ));
    };
    let stated = parts.prj.as_deref().filter(|p| !p.trim().is_empty());
    let transform = match stated.or(crs) {
        Some(text) => {
            let prop = if stated.is_some() { ".prj" } else { "crs" };
            let mut t = crs::to_wgs84(text)
                .map_err(|m| Error::input(Location::layer(layer).with_property(prop), m))?;
            t.refuse_lonlat = stated.is_none();
            (!t.is_wgs84).then_some(t)
        }
        None => None,
    };
    let bad = |e: shapefile::Error| {
        parse_err(
            layer,
            format!("the Shapefile cannot be read ({e}); re-export it from the GIS"),
        )
    };
    let shapes = match parts.shx.as_deref() {
        Some(shx) => shapefile::ShapeReader::with_shx(Cursor::new(&parts.shp), Cursor::new(shx)),
        None => shapefile::ShapeReader::new(Cursor::new(&parts.shp)),
    }
    .map_err(bad)?;
    let records = shapefile::dbase::Reader::new(Cursor::new(dbf)).map_err(|e| {
        parse_err(
            layer,
            format!("the .dbf cannot be read ({e}); re-export the Shapefile"),
        )
    })?;
    let mut reader = shapefile::Reader::new(shapes, records);
    let mut features = Vec::new();
    for (index, item) in reader.iter_shapes_and_records().enumerate() {
        let at = || Location::feature(layer, index, None);
        let (shape, record) = item.map_err(|e| {
            parse_err(
                layer,
                format!("feature {index}: {e}; re-export the Shapefile"),
            )
        })?;
        let geometry = match shape {
            shapefile::Shape::NullShape => Value::Null,
            shape => {
                let g = geo::Geometry::<f64>::try_from(shape).map_err(|e| {
                    Error::input(
                        at(),
                        format!("the shape cannot be read ({e}); fix or delete it in the GIS"),
                    )
                })?;
                let mut g =
                    serde_json::to_value(geojson::Geometry::new(geojson::GeometryValue::from(&g)))
                        .map_err(|e| Error::input(at(), e.to_string()))?;
                if let Some(t) = &transform {
                    t.geometry(&mut g, &at)?;
                }
                g
            }
        };
        let properties: Map<String, Value> = record
            .into_iter()
            .map(|(k, v)| (k, field_value(v)))
            .collect();
        features.push(json!({"type": "Feature", "geometry": geometry, "properties": properties}));
    }
    serde_json::to_string(&json!({"type": "FeatureCollection", "features": features}))
        .map_err(|e| Error::Io(e.to_string()))
}

/// A dBase value as JSON: text, number (whole numbers without a fraction), true/false,
/// a date as YYYY-MM-DD, blank as null.
fn field_value(v: shapefile::dbase::FieldValue) -> Value {
    use shapefile::dbase::FieldValue as F;
    let num = |x: f64| {
        if x.fract() == 0.0 && x.abs() < 9.0e15 {
            json!(x as i64)
        } else {
            serde_json::Number::from_f64(x).map_or(Value::Null, Value::Number)
        }
    };
    match v {
        F::Character(s) => s.map_or(Value::Null, |s| Value::String(s.trim().to_string())),
        F::Memo(s) => Value::String(s),
        F::Numeric(x) => x.map_or(Value::Null, num),
        F::Float(x) => x.map_or(Value::Null, |x| num(f64::from(x))),
        F::Double(x) | F::Currency(x) => num(x),
        F::Integer(i) => json!(i),
        F::Logical(b) => b.map_or(Value::Null, Value::Bool),
        F::Date(d) => d.map_or(Value::Null, |d| {
            Value::String(format!("{:04}-{:02}-{:02}", d.year(), d.month(), d.day()))
        }),
        F::DateTime(d) => {
            let d = d.date();
            Value::String(format!("{:04}-{:02}-{:02}", d.year(), d.month(), d.day()))
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(200))]
        /// No bytes make the readers panic: random bytes, and a zip header followed by noise.
        #[test]
        fn random_bytes_never_panic(bytes in proptest::collection::vec(any::<u8>(), 0..600)) {
            let _ = read_zip(&bytes, None, LayerName::Streets);
            let mut z = b"PK\x03\x04".to_vec();
            z.extend_from_slice(&bytes);
            let _ = read_zip(&z, None, LayerName::Streets);
            let parts = ShapefileParts { shp: bytes.clone(), dbf: Some(bytes.clone()), shx: None, prj: None };
            let _ = read_parts(&parts, None, LayerName::Streets);
        }
    }
}
