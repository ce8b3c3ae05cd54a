//! Streams the features of a GeoJSON FeatureCollection one at a time (the layer text is
//! parsed once and no feature is kept after it is converted), and checks coordinates.

use crate::error::{Error, LayerName, Location, Result};
use crate::input::LonLat;
use geojson::{Geometry, GeometryValue, Position};
use serde::de::{self, DeserializeSeed, Deserializer, IgnoredAny, MapAccess, SeqAccess, Visitor};
use serde::Deserialize;
use std::fmt;

/// Property map of one feature.
pub type Props = serde_json::Map<String, serde_json::Value>;

/// One feature as read: its index in the layer, GeoJSON `id` member, geometry, properties.
#[derive(Debug, Default, Deserialize)]
pub struct RawFeature {
    #[serde(default)]
    pub id: Option<serde_json::Value>,
    #[serde(default)]
    pub geometry: Option<Geometry>,
    #[serde(default)]
    pub properties: Option<Props>,
}

impl RawFeature {
    /// The GeoJSON `id` member as text (`"w123"`, `42`), if any.
    pub fn member_id(&self) -> Option<String> {
        match &self.id {
            Some(serde_json::Value::String(s)) if !s.is_empty() => Some(s.clone()),
            Some(serde_json::Value::Number(n)) => Some(n.to_string()),
            _ => None,
        }
    }
}

/// Calls `each(index, feature)` for every feature of the FeatureCollection in `text`, in order.
/// Stops at the first error `each` returns.
///
/// ```
/// use catchwalk::input::geojson_read::for_each_feature;
/// use catchwalk::error::LayerName;
/// let text = r#"{"type":"FeatureCollection","features":[
///   {"type":"Feature","geometry":{"type":"Point","coordinates":[1,2]},"properties":{"a":1}}]}"#;
/// let mut n = 0;
/// for_each_feature(text, LayerName::Homes, |_, _| { n += 1; Ok(()) }).unwrap();
/// assert_eq!(n, 1);
/// ```
pub fn for_each_feature<F>(text: &str, layer: LayerName, each: F) -> Result<()>
where
    F: FnMut(usize, RawFeature) -> Result<()>,
{
    let mut seed = CollectionSeed {
        each,
        failure: None,
        saw_type: None,
        saw_features: false,
        reading: None,
    };
    let mut de = serde_json::Deserializer::from_str(text.trim_start_matches('\u{feff}'));
    let outcome = (&mut seed).deserialize(&mut de).and_then(|_| de.end());
    if let Some(e) = seed.failure.take() {
        return Err(e);
    }
    if let Err(e) = outcome {
        let place = seed
            .reading
            .map_or(String::new(), |i| format!("feature {i}: "));
        return Err(Error::Parse {
            layer,
            message: format!(
                "{place}{e}; check that the file is GeoJSON exported as a FeatureCollection"
            ),
        });
    }
    match seed.saw_type.as_deref() {
        Some("FeatureCollection") if seed.saw_features => Ok(()),
        Some("FeatureCollection") => Err(Error::Parse {
            layer,
            message: "the FeatureCollection has no 'features' array".into(),
        }),
        Some(other) => Err(not_collection(layer, other)),
        None => Err(not_collection(layer, "no 'type'")),
    }
}

fn not_collection(layer: LayerName, found: &str) -> Error {
    Error::Parse {
        layer,
        message: format!(
            "expected a GeoJSON FeatureCollection, found {found}; export the layer as a \
             FeatureCollection (one Feature per street, crossing, school or home)"
        ),
    }
}

struct CollectionSeed<F> {
    each: F,
    failure: Option<Error>,
    saw_type: Option<String>,
    saw_features: bool,
    /// Index of the feature being parsed, while inside the `features` array.
    reading: Option<usize>,
}

impl<'de, F> DeserializeSeed<'de> for &mut CollectionSeed<F>
where
    F: FnMut(usize, RawFeature) -> Result<()>,
{
    type Value = ();
    fn deserialize<D: Deserializer<'de>>(self, d: D) -> std::result::Result<(), D::Error> {
        d.deserialize_map(self)
    }
}

impl<'de, F> Visitor<'de> for &mut CollectionSeed<F>
where
    F: FnMut(usize, RawFeature) -> Result<()>,
{
    type Value = ();
    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a GeoJSON FeatureCollection object")
    }
    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> std::result::Result<(), A::Error> {
        while let Some(key) = map.next_key::<std::borrow::Cow<'de, str>>()? {
            match key.as_ref() {
                "type" => {
                    let t: String = map.next_value()?;
                    if t != "FeatureCollection" {
                        self.saw_type = Some(t);
                        return Err(de::Error::custom("not a FeatureCollection"));
                    }
                    self.saw_type = Some(t);
                }
                "features" => {
                    self.saw_features = true;
                    map.next_value_seed(FeaturesSeed(&mut *self))?;
                }
                _ => {
                    map.next_value::<IgnoredAny>()?;
                }
            }
        }
        Ok(())
    }
}

struct FeaturesSeed<'a, F>(&'a mut CollectionSeed<F>);

impl<'de, F> DeserializeSeed<'de> for FeaturesSeed<'_, F>
where
    F: FnMut(usize, RawFeature) -> Result<()>,
{
    type Value = ();
    fn deserialize<D: Deserializer<'de>>(self, d: D) -> std::result::Result<(), D::Error> {
        d.deserialize_seq(self)
    }
}

impl<'de, F> Visitor<'de> for FeaturesSeed<'_, F>
where
    F: FnMut(usize, RawFeature) -> Result<()>,
{
    type Value = ();
    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("an array of GeoJSON Features")
    }
    fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> std::result::Result<(), A::Error> {
        let mut index = 0usize;
        self.0.reading = Some(index);
        while let Some(feature) = seq.next_element::<RawFeature>()? {
            if let Err(e) = (self.0.each)(index, feature) {
                self.0.failure = Some(e);
                return Err(de::Error::custom("stopped"));
            }
            index += 1;
            self.0.reading = Some(index);
        }
        self.0.reading = None;
        Ok(())
    }
}

/// Checks one position: finite, longitude/latitude range (else [`Error::Projected`]).
pub fn lonlat(p: &Position, at: &dyn Fn() -> Location) -> Result<LonLat> {
    let s = p.as_slice();
    let (x, y) = match s {
        [x, y, ..] => (*x, *y),
        _ => return Err(Error::input(
            at(),
            "a position has fewer than two numbers; write each position as [longitude, latitude]",
        )),
    };
    check_lonlat(x, y, at)
}

/// Checks a longitude/latitude pair given as numbers.
pub fn check_lonlat(x: f64, y: f64, at: &dyn Fn() -> Location) -> Result<LonLat> {
    if !x.is_finite() || !y.is_finite() {
        return Err(Error::input(
            at(),
            "a coordinate is not a finite number (NaN or infinite); fix or remove the feature",
        ));
    }
    // Projected systems stay within about 10^8 (metres or feet); beyond it the geometry is
    // broken, and calling it "projected" would send the planner the wrong way.
    if x.abs() > 1e9 || y.abs() > 1e9 {
        return Err(Error::input(
            at(),
            format!("coordinates ({x:e}, {y:e}) are outside any coordinate system, longitude/latitude or projected; the geometry is broken: fix or remove the feature"),
        ));
    }
    if x.abs() > 180.0 || y.abs() > 90.0 {
        return Err(Error::Projected { at: at(), x, y });
    }
    Ok([x, y])
}

/// Checks a line's positions and drops consecutive duplicates.
pub fn line(ps: &[Position], at: &dyn Fn() -> Location) -> Result<Vec<LonLat>> {
    let mut out: Vec<LonLat> = Vec::with_capacity(ps.len());
    for p in ps {
        let q = lonlat(p, at)?;
        if out.last() != Some(&q) {
            out.push(q);
        }
    }
    Ok(out)
}

fn ring(ps: &[Position], at: &dyn Fn() -> Location) -> Result<geo::LineString<f64>> {
    let mut out = Vec::with_capacity(ps.len());
    for p in ps {
        let q = lonlat(p, at)?;
        out.push(geo::Coord { x: q[0], y: q[1] });
    }
    Ok(geo::LineString::new(out))
}

fn polygon(
    rings: &[Vec<Position>],
    at: &dyn Fn() -> Location,
) -> Result<Option<geo::Polygon<f64>>> {
    let mut it = rings.iter();
    let Some(outer) = it.next() else {
        return Ok(None);
    };
    let exterior = ring(outer, at)?;
    if exterior.0.len() < 4 {
        return Ok(None);
    }
    let holes = it.map(|r| ring(r, at)).collect::<Result<Vec<_>>>()?;
    Ok(Some(geo::Polygon::new(exterior, holes)))
}

/// A Polygon or MultiPolygon geometry as a checked `MultiPolygon` (rings with fewer than four
/// positions are dropped); `None` for any other geometry type.
pub fn multipolygon(
    g: &GeometryValue,
    at: &dyn Fn() -> Location,
) -> Result<Option<geo::MultiPolygon<f64>>> {
    let parts = match g {
        GeometryValue::Polygon { coordinates } => vec![polygon(coordinates, at)?],
        GeometryValue::MultiPolygon { coordinates } => coordinates
            .iter()
            .map(|p| polygon(p, at))
            .collect::<Result<Vec<_>>>()?,
        _ => return Ok(None),
    };
    Ok(Some(geo::MultiPolygon::new(
        parts.into_iter().flatten().collect(),
    )))
}

/// The error for a geometry type that the layer does not take.
pub fn wrong_geometry(at: Location, found: &str, allowed: &str) -> Error {
    Error::input(
        at,
        format!(
            "geometry is {found}, but this layer takes {allowed}; convert or remove the feature"
        ),
    )
}

/// The type name of a feature's geometry, or "no geometry".
pub fn type_name(g: &Option<Geometry>) -> &'static str {
    g.as_ref().map_or("no geometry", |g| g.value.type_name())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn count(text: &str) -> Result<usize> {
        let mut n = 0;
        for_each_feature(text, LayerName::Streets, |_, _| {
            n += 1;
            Ok(())
        })?;
        Ok(n)
    }

    #[test]
    fn streams_features_whatever_the_key_order() {
        let t = r#"{"features":[{"type":"Feature","geometry":null,"properties":null},
            {"type":"Feature","id":"w1","geometry":{"type":"Point","coordinates":[1,2]},"properties":{}}],
            "type":"FeatureCollection"}"#;
        assert_eq!(count(t).ok(), Some(2));
    }

    #[test]
    fn refuses_what_is_not_a_feature_collection() {
        for t in [
            "not json",
            r#"{"type":"Feature","geometry":null,"properties":{}}"#,
            r#"{"features":[]}"#,
            r#"[1,2]"#,
            r#"{"type":"FeatureCollection"}"#,
        ] {
            match count(t) {
                Err(Error::Parse { layer, .. }) => assert_eq!(layer, LayerName::Streets),
                other => panic!("{t}: {other:?}"),
            }
        }
    }

    #[test]
    fn a_malformed_feature_is_named() {
        let t = r#"{"type":"FeatureCollection","features":[{"type":"Feature","geometry":null,"properties":{}},
            {"type":"Feature","geometry":{"type":"Point","coordinates":"here"},"properties":{}}]}"#;
        match count(t) {
            Err(Error::Parse { message, .. }) => {
                assert!(message.starts_with("feature 1: "), "{message}")
            }
            other => panic!("{other:?}"),
        }
    }

    #[test]
    fn stops_at_the_first_error_from_the_callback() {
        let t = r#"{"type":"FeatureCollection","features":[{"type":"Feature","geometry":null,"properties":{}},
            {"type":"Feature","geometry":null,"properties":{}}]}"#;
        let mut n = 0;
        let r = for_each_feature(t, LayerName::Homes, |i, _| {
            n += 1;
            Err(Error::input(
                Location::feature(LayerName::Homes, i, None),
                "x",
            ))
        });
        assert!(matches!(r, Err(Error::Input { .. })));
        assert_eq!(n, 1);
    }

    #[test]
    fn projected_and_non_finite_coordinates_are_errors() {
        let at = || Location::feature(LayerName::Streets, 3, Some("s3".into()));
        assert!(matches!(
            check_lonlat(512_000.0, 4_100_000.0, &at),
            Err(Error::Projected { x, .. }) if x == 512_000.0
        ));
        assert!(matches!(
            check_lonlat(f64::NAN, 1.0, &at),
            Err(Error::Input { .. })
        ));
        assert_eq!(check_lonlat(-180.0, 90.0, &at).ok(), Some([-180.0, 90.0]));
        let e = check_lonlat(1e308, 42.0, &at).unwrap_err().to_string();
        assert!(
            e.contains("outside any coordinate system") && !e.contains("look projected"),
            "{e}"
        );
    }

    #[test]
    fn line_drops_consecutive_duplicates() {
        let at = || Location::layer(LayerName::Streets);
        let ps: Vec<Position> = vec![
            [0.0, 0.0].into(),
            [0.0, 0.0].into(),
            [1.0, 0.0].into(),
            [0.0, 0.0].into(),
        ];
        assert_eq!(
            line(&ps, &at).ok(),
            Some(vec![[0.0, 0.0], [1.0, 0.0], [0.0, 0.0]])
        );
    }
}
