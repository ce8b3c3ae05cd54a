//! Coordinate systems as files state them: an EPSG code (`EPSG:2272`, the GeoJSON `crs`
//! member as GDAL writes it), a Shapefile's `.prj` (WKT), or a proj string; positions are
//! reprojected to WGS84 longitude/latitude with `proj4rs` (pure Rust, builds for wasm).
//! EPSG definitions come from `crs-definitions`; WKT without an EPSG code is turned into a
//! proj string by `proj4wkt`.

use crate::error::{Error, LayerName, Location, Result};
use proj4rs::Proj;
use serde_json::Value;

/// A source coordinate system and WGS84, ready to transform positions.
pub struct ToWgs84 {
    from: Proj,
    to: Proj,
    /// How the coordinate system was named (for messages).
    pub label: String,
    /// True when the source is already geographic WGS84 (nothing to do).
    pub is_wgs84: bool,
    /// Refuse positions that already look like longitude/latitude (set for a coordinate
    /// system the user chose rather than the file stated, so that `--crs` given for every
    /// layer cannot move a WGS84 layer silently).
    pub refuse_lonlat: bool,
}

impl std::fmt::Debug for ToWgs84 {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "ToWgs84({})", self.label)
    }
}

const WGS84: &str = "+proj=longlat +datum=WGS84 +no_defs";

/// The EPSG code a GeoJSON `crs` name or a user's text gives: `EPSG:2272`,
/// `urn:ogc:def:crs:EPSG::2272`, `EPSG::2272`; `OGC:CRS84` (and `urn:ogc:def:crs:OGC:1.3:CRS84`)
/// is 4326.
///
/// ```
/// use catchwalk::input::crs::epsg_code;
/// assert_eq!(epsg_code("urn:ogc:def:crs:EPSG::2272"), Some(2272));
/// assert_eq!(epsg_code("EPSG:32633"), Some(32633));
/// assert_eq!(epsg_code("urn:ogc:def:crs:OGC:1.3:CRS84"), Some(4326));
/// assert_eq!(epsg_code("nonsense"), None);
/// ```
pub fn epsg_code(name: &str) -> Option<u32> {
    let n = name.trim();
    if n.to_ascii_uppercase().ends_with("CRS84") {
        return Some(4326);
    }
    let upper = n.to_ascii_uppercase();
    let at = upper.rfind("EPSG:")?;
    let rest = upper.get(at + 5..)?.trim_start_matches(':');
    // `urn:ogc:def:crs:EPSG:8.8:2272` carries a version between the colons.
    let code = rest.rsplit(':').next()?;
    code.trim().parse().ok()
}

/// Builds the transform from a coordinate system given as an EPSG code, a proj string
/// (`+proj=...`) or WKT (a `.prj` file's text). `Err` says why in words.
///
/// ```
/// use catchwalk::input::crs::to_wgs84;
/// let t = to_wgs84("EPSG:32618").unwrap();
/// let [lon, lat] = t.lonlat(500_000.0, 4_649_776.22).unwrap();
/// assert!((lon + 75.0).abs() < 1e-9 && (lat - 42.0).abs() < 1e-6);
/// ```
pub fn to_wgs84(text: &str) -> std::result::Result<ToWgs84, String> {
    let t = text.trim().trim_start_matches('\u{feff}');
    if t.is_empty() {
        return Err("the coordinate system is empty".into());
    }
    let (proj_string, label) = if t.starts_with('+') {
        (t.to_string(), t.to_string())
    } else if let Some(code) = wkt_epsg(t).or_else(|| epsg_code(t).filter(|_| !is_wkt(t))) {
        (epsg_proj(code)?, format!("EPSG:{code}"))
    } else if is_wkt(t) {
        let s = proj4wkt::wkt_to_projstring(t).map_err(|e| {
            format!("the WKT coordinate system could not be read ({e}); give the EPSG code instead")
        })?;
        let name = wkt_name(t).unwrap_or("WKT");
        (s, name.to_string())
    } else {
        return Err(format!(
            "'{}' is not a coordinate system catchwalk knows; write EPSG:N (for example \
             EPSG:2272), a proj string (+proj=...) or WKT",
            shorten(t)
        ));
    };
    let from = Proj::from_proj_string(&proj_string)
        .map_err(|e| format!("the coordinate system {label} cannot be used ({e})"))?;
    let to = Proj::from_proj_string(WGS84).map_err(|e| e.to_string())?;
    let is_wgs84 = from.is_latlong() && label == "EPSG:4326";
    Ok(ToWgs84 {
        from,
        to,
        label,
        is_wgs84,
        refuse_lonlat: false,
    })
}

fn shorten(t: &str) -> String {
    let s: String = t.chars().take(60).collect();
    if s.len() < t.len() {
        format!("{s}...")
    } else {
        s
    }
}

fn epsg_proj(code: u32) -> std::result::Result<String, String> {
    u16::try_from(code)
        .ok()
        .and_then(crs_definitions::from_code)
        .map(|d| d.proj4.to_string())
        .ok_or_else(|| {
            format!("EPSG:{code} is not among the coordinate systems catchwalk knows; give a proj string (+proj=...) or reproject the file to WGS84")
        })
}

fn is_wkt(t: &str) -> bool {
    let u = t.to_ascii_uppercase();
    [
        "PROJCS[",
        "GEOGCS[",
        "PROJCRS[",
        "GEOGCRS[",
        "COMPD_CS[",
        "COMPOUNDCRS[",
    ]
    .iter()
    .any(|k| u.starts_with(k))
}

/// The name of a WKT coordinate system (its first quoted text).
fn wkt_name(t: &str) -> Option<&str> {
    let start = t.find('"')? + 1;
    let len = t.get(start..)?.find('"')?;
    t.get(start..start + len)
}

/// The EPSG code of the whole WKT coordinate system: its last (outermost) authority, which
/// for a PROJCS follows every inner one (`AUTHORITY["EPSG","2272"]]` or WKT2
/// `ID["EPSG",2272]]` at the end).
fn wkt_epsg(t: &str) -> Option<u32> {
    let u = t.to_ascii_uppercase();
    let tail = u.trim_end();
    let tail = tail.strip_suffix(']')?;
    let at = tail.rfind("AUTHORITY[").or_else(|| tail.rfind("ID["))?;
    let inner = tail.get(at..)?;
    // Only the outermost element: nothing but its own closing bracket may follow it.
    let close = inner.find(']')?;
    if inner.get(close + 1..)?.trim().is_empty() {
        let body = inner.get(inner.find('[')? + 1..close)?;
        let mut parts = body.split(',').map(|p| p.trim().trim_matches('"'));
        if parts.next()? == "EPSG" {
            return parts.next()?.parse().ok();
        }
    }
    None
}

impl ToWgs84 {
    /// One position to WGS84 `[longitude, latitude]` in degrees.
    pub fn lonlat(&self, x: f64, y: f64) -> std::result::Result<[f64; 2], String> {
        if !x.is_finite() || !y.is_finite() {
            return Err("a coordinate is not a finite number".into());
        }
        if self.refuse_lonlat && !self.from.is_latlong() && x.abs() <= 180.0 && y.abs() <= 90.0 {
            return Err(format!(
                "({x}, {y}) looks like longitude/latitude already, not {}; leave this layer out of the coordinate-system choice (give --crs LAYER=... for the projected layers only)",
                self.label
            ));
        }
        let mut p = if self.from.is_latlong() {
            (x.to_radians(), y.to_radians(), 0.0)
        } else {
            (x, y, 0.0)
        };
        proj4rs::transform::transform(&self.from, &self.to, &mut p)
            .map_err(|e| format!("({x}, {y}) cannot be reprojected from {}: {e}", self.label))?;
        let (lon, lat) = (p.0.to_degrees(), p.1.to_degrees());
        if !lon.is_finite() || !lat.is_finite() || lon.abs() > 180.0 || lat.abs() > 90.0 {
            return Err(format!(
                "({x}, {y}) falls outside the earth in {}; check that this is the file's coordinate system",
                self.label
            ));
        }
        Ok([lon, lat])
    }

    /// Reprojects every position of a GeoJSON geometry's `coordinates` (nested arrays) in
    /// place; `at` names the feature for an error.
    pub fn geometry(&self, g: &mut Value, at: &dyn Fn() -> Location) -> Result<()> {
        if let Some(gs) = g.get_mut("geometries").and_then(Value::as_array_mut) {
            for g in gs {
                self.geometry(g, at)?;
            }
        }
        match g.get_mut("coordinates") {
            Some(c) => self.positions(c, at),
            None => Ok(()),
        }
    }

    fn positions(&self, c: &mut Value, at: &dyn Fn() -> Location) -> Result<()> {
        let Some(items) = c.as_array_mut() else {
            return Ok(());
        };
        let xy = match items.as_slice() {
            [Value::Number(x), Value::Number(y), ..] => x.as_f64().zip(y.as_f64()),
            _ => None,
        };
        if let Some((x, y)) = xy {
            let [lon, lat] = self.lonlat(x, y).map_err(|m| Error::input(at(), m))?;
            items.truncate(2);
            if let (Some(a), Some(b)) = (number(lon), number(lat)) {
                items.clear();
                items.push(a);
                items.push(b);
            }
            return Ok(());
        }
        for item in items {
            self.positions(item, at)?;
        }
        Ok(())
    }
}

fn number(v: f64) -> Option<Value> {
    serde_json::Number::from_f64(v).map(Value::Number)
}

/// The coordinate system a GeoJSON FeatureCollection's top-level `crs` member names, as
/// GDAL writes it (`{"type":"name","properties":{"name":"urn:ogc:def:crs:EPSG::2272"}}`).
pub fn geojson_crs_name(collection: &Value) -> Option<String> {
    let crs = collection.get("crs")?;
    crs.pointer("/properties/name")
        .and_then(Value::as_str)
        .map(String::from)
        .or_else(|| {
            // The older linked/EPSG forms: {"type":"EPSG","properties":{"code":2272}}.
            crs.pointer("/properties/code")
                .and_then(Value::as_u64)
                .map(|c| format!("EPSG:{c}"))
        })
}

/// Reprojects a GeoJSON layer to WGS84 when its `crs` member (or, when it has none,
/// `given`: the user's choice for this layer) names a coordinate system other than WGS84.
/// Returns `None` when the text needs no change. The `crs` member is dropped from the result
/// (RFC 7946 removed it).
pub fn reproject_geojson(
    text: &str,
    given: Option<&str>,
    layer: LayerName,
) -> Result<Option<String>> {
    // A layer without a `crs` member and no user choice is read as it is (the common case,
    // no second parse).
    if given.is_none() && !text.contains("\"crs\"") {
        return Ok(None);
    }
    let mut doc: Value = match serde_json::from_str(text.trim_start_matches('\u{feff}')) {
        Ok(v) => v,
        // The streaming reader gives the located parse error.
        Err(_) => return Ok(None),
    };
    let stated = geojson_crs_name(&doc);
    let Some(name) = stated.as_deref().or(given) else {
        return Ok(None);
    };
    let at_crs = || Location::layer(layer).with_property("crs");
    let mut t = to_wgs84(name).map_err(|m| Error::input(at_crs(), m))?;
    t.refuse_lonlat = stated.is_none();
    if let Some(o) = doc.as_object_mut() {
        o.remove("crs");
    }
    if !t.is_wgs84 {
        if let Some(fs) = doc.get_mut("features").and_then(Value::as_array_mut) {
            for (i, f) in fs.iter_mut().enumerate() {
                if let Some(g) = f.get_mut("geometry") {
                    t.geometry(g, &|| Location::feature(layer, i, None))?;
                }
            }
        }
    }
    serde_json::to_string(&doc)
        .map(Some)
        .map_err(|e| Error::Io(e.to_string()))
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(300))]
        /// No text makes the coordinate-system readers panic: random text, and WKT or proj
        /// string openings followed by random text.
        #[test]
        fn random_crs_text_never_panics(t in ".{0,120}") {
            for s in [t.clone(), format!("PROJCS[{t}"), format!("+proj={t}"), format!("EPSG:{t}")] {
                let _ = epsg_code(&s);
                if let Ok(c) = to_wgs84(&s) {
                    let _ = c.lonlat(1.0e5, 1.0e5);
                }
            }
        }
    }

    #[test]
    fn names_of_crs_as_files_write_them() {
        assert_eq!(epsg_code("EPSG::2272"), Some(2272));
        assert_eq!(epsg_code("urn:ogc:def:crs:EPSG:8.8:2272"), Some(2272));
        assert_eq!(epsg_code("epsg:4326"), Some(4326));
        assert_eq!(epsg_code("CRS84"), Some(4326));
        assert_eq!(epsg_code(""), None);
    }

    /// EPSG:2272 as the EPSG dataset writes it in WKT1 (with its authorities).
    const SPS_FEET_WKT: &str = concat!(
        r#"PROJCS["NAD83 / Pennsylvania South (ftUS)",GEOGCS["NAD83",DATUM["North_American_Datum_1983","#,
        r#"SPHEROID["GRS 1980",6378137,298.257222101,AUTHORITY["EPSG","7019"]],AUTHORITY["EPSG","6269"]],"#,
        r#"PRIMEM["Greenwich",0],UNIT["degree",0.0174532925199433],AUTHORITY["EPSG","4269"]],"#,
        r#"PROJECTION["Lambert_Conformal_Conic_2SP"],PARAMETER["standard_parallel_1",40.96666666666667],"#,
        r#"PARAMETER["standard_parallel_2",39.93333333333333],PARAMETER["latitude_of_origin",39.33333333333334],"#,
        r#"PARAMETER["central_meridian",-77.75],PARAMETER["false_easting",1968500],PARAMETER["false_northing",0],"#,
        r#"UNIT["US survey foot",0.3048006096012192,AUTHORITY["EPSG","9003"]],AXIS["X",EAST],AXIS["Y",NORTH],"#,
        r#"AUTHORITY["EPSG","2272"]]"#
    );

    /// The same zone written without authorities (as ESRI software writes a .prj) is read
    /// through its parameters and lands on the same place as the EPSG code.
    #[test]
    fn wkt_without_a_code_reads_its_parameters() {
        let bare = SPS_FEET_WKT
            .replace(r#",AUTHORITY["EPSG","2272"]"#, "")
            .replace(r#",AUTHORITY["EPSG","9003"]"#, "");
        let a = to_wgs84(&bare).and_then(|t| t.lonlat(2_000_000.0, 200_000.0));
        let b = to_wgs84("EPSG:2272").and_then(|t| t.lonlat(2_000_000.0, 200_000.0));
        let (a, b) = (a.unwrap_or_default(), b.unwrap_or([9.0, 9.0]));
        assert!(
            (a[0] - b[0]).abs() < 1e-9 && (a[1] - b[1]).abs() < 1e-9,
            "{a:?} {b:?}"
        );
    }

    #[test]
    fn the_outermost_wkt_authority_is_the_code() {
        assert_eq!(wkt_epsg(SPS_FEET_WKT), Some(2272));
        assert_eq!(
            wkt_epsg(r#"PROJCS["x",GEOGCS["NAD83",AUTHORITY["EPSG","4269"]],UNIT["m",1]]"#),
            None
        );
    }

    /// State Plane Pennsylvania South (US survey feet): the false easting 600 000 m is
    /// 1 968 500 US survey feet (1200/3937 m each), on the central meridian -77.75 at the
    /// latitude of origin 39.3333 (EPSG:2272 parameters, from the EPSG dataset).
    #[test]
    fn state_plane_us_feet_origin_lands_on_the_zone_origin() {
        let t = to_wgs84("EPSG:2272").ok();
        let p = t.as_ref().and_then(|t| t.lonlat(1_968_500.0, 0.0).ok());
        let [lon, lat] = p.unwrap_or([0.0, 0.0]);
        assert!((lon + 77.75).abs() < 1e-9, "{lon}");
        assert!((lat - 39.333_333_333_333_34).abs() < 1e-9, "{lat}");
    }

    #[test]
    fn a_geojson_crs_member_reprojects_and_is_dropped() {
        let text = r#"{"type":"FeatureCollection","crs":{"type":"name","properties":{"name":"urn:ogc:def:crs:EPSG::2272"}},
          "features":[{"type":"Feature","properties":{},"geometry":{"type":"LineString","coordinates":[[1968500,0],[1968500,3280.8333]]}}]}"#;
        let out = reproject_geojson(text, None, LayerName::Streets)
            .ok()
            .flatten();
        let v: Value = serde_json::from_str(out.as_deref().unwrap_or("null")).unwrap_or_default();
        assert!(v.get("crs").is_none());
        let lon = v
            .pointer("/features/0/geometry/coordinates/1/0")
            .and_then(Value::as_f64);
        assert!(lon.is_some_and(|l| (l + 77.75).abs() < 1e-6), "{lon:?}");
        // 1000 m north of the origin is about 0.009 degrees of latitude.
        let lat = v
            .pointer("/features/0/geometry/coordinates/1/1")
            .and_then(Value::as_f64);
        assert!(lat.is_some_and(|l| (l - 39.3423).abs() < 1e-3), "{lat:?}");
    }

    #[test]
    fn unknown_or_broken_crs_is_a_located_error() {
        let text = r#"{"type":"FeatureCollection","crs":{"type":"name","properties":{"name":"EPSG:999999"}},"features":[]}"#;
        match reproject_geojson(text, None, LayerName::Homes) {
            Err(Error::Input { at, message }) => {
                assert_eq!(at.property.as_deref(), Some("crs"));
                assert!(message.contains("EPSG:999999"), "{message}");
            }
            other => panic!("{other:?}"),
        }
        assert!(to_wgs84("PROJCS[broken").is_err());
        assert!(to_wgs84("+proj=nonesuch").is_err());
    }

    #[test]
    fn a_chosen_crs_refuses_a_layer_already_in_lonlat() {
        let text = r#"{"type":"FeatureCollection","features":[{"type":"Feature","properties":{},"geometry":{"type":"Point","coordinates":[-77.7,40.1]}}]}"#;
        match reproject_geojson(text, Some("EPSG:2272"), LayerName::Schools) {
            Err(Error::Input { at, message }) => {
                assert_eq!((at.layer, at.feature), (LayerName::Schools, Some(0)));
                assert!(
                    message.contains("looks like longitude/latitude"),
                    "{message}"
                );
            }
            other => panic!("{other:?}"),
        }
    }

    #[test]
    fn no_crs_and_no_choice_leaves_the_text_alone() {
        let text = r#"{"type":"FeatureCollection","features":[]}"#;
        assert!(matches!(
            reproject_geojson(text, None, LayerName::Streets),
            Ok(None)
        ));
    }
}
