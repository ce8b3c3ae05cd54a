//! OpenStreetMap `.osm.pbf` extracts read directly with the `osmpbf` crate, into the GeoJSON
//! FeatureCollection that `osmium export --attributes id` writes for the same file, so an
//! extract and its export give the same network and routes: tagged nodes become Points, tagged
//! ways LineStrings (closed ways tagged `amenity=school` also a Polygon, for the schools
//! layer), each with its tags as properties and `@id` as the OpenStreetMap id. Relations
//! (multipolygons) are not read.

use crate::error::{Error, LayerName, Result};
use osmpbf::{Element, ElementReader};
use serde_json::{json, Map, Value};
use std::collections::HashMap;
use std::io::Cursor;

/// A position in 1e-7 degrees, as the file stores it.
type Decimicro = (i32, i32);

fn degrees(v: i32) -> Value {
    // Division of the stored integer gives the same double as parsing osmium's 7-decimal text.
    serde_json::Number::from_f64(f64::from(v) / 1e7).map_or(Value::Null, Value::Number)
}

fn position(p: Decimicro) -> Value {
    json!([degrees(p.0), degrees(p.1)])
}

fn tags<'a>(it: impl Iterator<Item = (&'a str, &'a str)>, id: i64) -> Map<String, Value> {
    let mut m = Map::new();
    m.insert("@id".into(), json!(id));
    for (k, v) in it {
        m.insert(k.to_string(), Value::String(v.to_string()));
    }
    m
}

/// An `.osm.pbf` file as a GeoJSON FeatureCollection (text), in the file's order of nodes
/// then ways.
///
/// ```
/// use catchwalk::input::pbf::read_pbf;
/// assert!(read_pbf(b"not a pbf", catchwalk::error::LayerName::Streets).is_err());
/// ```
pub fn read_pbf(bytes: &[u8], layer: LayerName) -> Result<String> {
    let mut nodes: HashMap<i64, Decimicro> = HashMap::new();
    let mut points = Vec::new();
    let mut ways: Vec<(i64, Vec<i64>, Map<String, Value>)> = Vec::new();
    let mut node = |id: i64, lon: i32, lat: i32, props: Map<String, Value>| {
        nodes.insert(id, (lon, lat));
        // osmium export leaves out untagged nodes (`@id` alone is no tag).
        if props.len() > 1 {
            points.push(json!({"type": "Feature", "geometry": {"type": "Point",
                "coordinates": position((lon, lat))}, "properties": props}));
        }
    };
    ElementReader::new(Cursor::new(bytes))
        .for_each(|e| match e {
            Element::Node(n) => node(
                n.id(),
                n.decimicro_lon(),
                n.decimicro_lat(),
                tags(n.tags(), n.id()),
            ),
            Element::DenseNode(n) => node(
                n.id(),
                n.decimicro_lon(),
                n.decimicro_lat(),
                tags(n.tags(), n.id()),
            ),
            Element::Way(w) => {
                let t = tags(w.tags(), w.id());
                if t.len() > 1 {
                    ways.push((w.id(), w.refs().collect(), t));
                }
            }
            Element::Relation(_) => {}
        })
        .map_err(|e| Error::Parse {
            layer,
            message: format!(
                "not a readable OpenStreetMap .osm.pbf ({e}); download the extract again or \
                 export it to GeoJSON with osmium"
            ),
        })?;
    let mut features = points;
    for (_, refs, props) in ways {
        // A way with a node outside the extract is left out whole, as osmium export does.
        let Some(line) = refs
            .iter()
            .map(|r| nodes.get(r).copied())
            .collect::<Option<Vec<Decimicro>>>()
        else {
            continue;
        };
        let mut distinct = line.clone();
        distinct.dedup();
        if distinct.len() < 2 {
            continue;
        }
        let closed = line.len() >= 4 && line.first() == line.last();
        let school = props.get("amenity").and_then(Value::as_str) == Some("school");
        let coords: Vec<Value> = line.iter().map(|p| position(*p)).collect();
        if closed && school {
            features.push(json!({"type": "Feature", "geometry": {"type": "Polygon",
                "coordinates": [coords.clone()]}, "properties": props.clone()}));
        }
        features.push(json!({"type": "Feature", "geometry": {"type": "LineString",
            "coordinates": coords}, "properties": props}));
    }
    serde_json::to_string(&json!({"type": "FeatureCollection", "features": features}))
        .map_err(|e| Error::Io(e.to_string()))
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(200))]
        /// No bytes make the reader panic, random or a valid blob header length then noise.
        #[test]
        fn random_bytes_never_panic(bytes in proptest::collection::vec(any::<u8>(), 0..600)) {
            let _ = read_pbf(&bytes, LayerName::Streets);
            let mut framed = vec![0, 0, 0, 13, 10, 9];
            framed.extend_from_slice(b"OSMHeader");
            framed.extend_from_slice(&bytes);
            let _ = read_pbf(&framed, LayerName::Streets);
        }
    }

    #[test]
    fn an_empty_file_is_an_empty_collection() {
        let out = read_pbf(&[], LayerName::Streets);
        assert_eq!(
            out.ok().as_deref(),
            Some(r#"{"features":[],"type":"FeatureCollection"}"#)
        );
    }
}
