//! A planner's own mapping file (JSON): which property of a municipal layer gives which
//! field, and how its values translate. Layers it names are read with the plain preset's
//! rules through the mapped fields; layers it leaves out are read by the base preset.
//!
//! ```json
//! {
//!   "base": "plain",
//!   "streets": {
//!     "id": "SEG_ID",
//!     "class": {"from": "ROADTYPE", "values": {"MAJ": "arterial", "RES": "local"}},
//!     "speed_kmh": {"from": "SPEED", "unit": "mph"},
//!     "lanes": {"from": ["NUMLANES", "LANES"], "default": 2}
//!   }
//! }
//! ```

use super::fields::{Field, LayerFields, PLAIN};
use super::values::{parse_bool, parse_class, parse_control, parse_sidewalk, parse_students};
use super::Preset;
use crate::error::{Error, LayerName, Location, Result};
use serde_json::Value;
use std::collections::BTreeMap;

/// A parsed mapping file.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Mapping {
    /// Preset for the layers the file does not name (`None`: the preset chosen elsewhere).
    pub base: Option<Preset>,
    layers: BTreeMap<&'static str, LayerFields>,
}

impl Mapping {
    /// The mapped fields of a layer (`"streets"`, ...), if the file names that layer.
    pub fn layer(&self, name: &str) -> Option<&LayerFields> {
        self.layers.get(name)
    }
}

fn err(path: &str, message: impl std::fmt::Display) -> Error {
    Error::input(
        Location::layer(LayerName::Mapping).with_property(path),
        format!("{message}; see docs/input.md for the mapping file format"),
    )
}

fn as_text(v: &Value, path: &str) -> Result<String> {
    match v {
        Value::String(s) => Ok(s.clone()),
        Value::Number(n) => Ok(n.to_string()),
        Value::Bool(b) => Ok(b.to_string()),
        _ => Err(err(path, "expected a text, number or true/false")),
    }
}

fn names(v: &Value, path: &str) -> Result<Vec<String>> {
    match v {
        Value::String(s) => Ok(vec![s.clone()]),
        Value::Array(a) => a
            .iter()
            .map(|x| match x {
                Value::String(s) => Ok(s.clone()),
                _ => Err(err(path, "'from' lists property names as texts")),
            })
            .collect(),
        _ => Err(err(path, "'from' is a property name or a list of names")),
    }
}

/// Checks a target value for a field with a fixed vocabulary.
fn check_target(layer: &str, field: &str, value: &str, path: &str) -> Result<()> {
    let ok = match (layer, field) {
        ("streets", "class") => parse_class(value).is_some(),
        ("streets", "sidewalk") => parse_sidewalk(value).is_some(),
        ("streets", "oneway") => parse_bool(value).is_some(),
        ("schools", "students") => parse_students(value).is_some(),
        ("crossings", "control") => parse_control(value).1.is_empty(),
        _ => true,
    };
    if ok {
        Ok(())
    } else {
        Err(err(
            path,
            format!("'{value}' is not a value of {layer}.{field}"),
        ))
    }
}

fn check_unit(field: &str, unit: &str, path: &str) -> Result<()> {
    let ok = match field {
        "speed_kmh" => matches!(unit, "km/h" | "kmh" | "kph" | "mph"),
        "width_m" | "median_m" | "shoulder_m" => matches!(unit, "m" | "ft"),
        _ => false,
    };
    if ok {
        Ok(())
    } else {
        Err(err(path, format!("unit '{unit}' does not apply (speed_kmh takes km/h or mph; width_m, median_m, shoulder_m take m or ft)")))
    }
}

fn field(layer: &str, name: &str, spec: &Value) -> Result<Field> {
    let path = format!("{layer}.{name}");
    let obj = match spec {
        Value::String(_) | Value::Array(_) => {
            return Ok(Field {
                from: names(spec, &path)?,
                ..Field::default()
            })
        }
        Value::Object(o) => o,
        _ => {
            return Err(err(
                &path,
                "a field is a property name, a list of names, or an object with 'from'",
            ))
        }
    };
    let mut f = Field::default();
    for (k, v) in obj {
        match k.as_str() {
            "from" => f.from = names(v, &path)?,
            "values" => {
                let Value::Object(m) = v else {
                    return Err(err(
                        &path,
                        "'values' maps source values to ours: {\"MAJ\": \"arterial\"}",
                    ));
                };
                for (src, dst) in m {
                    let dst = as_text(dst, &path)?;
                    check_target(layer, name, &dst, &path)?;
                    f.values.insert(src.clone(), dst);
                }
            }
            "unit" => {
                let u = as_text(v, &path)?;
                check_unit(name, &u, &path)?;
                f.unit = Some(u);
            }
            "default" => {
                let d = as_text(v, &path)?;
                check_target(layer, name, &d, &path)?;
                f.default = Some(d);
            }
            other => {
                return Err(err(
                    &path,
                    format!("unknown key '{other}' (use from, values, unit, default)"),
                ))
            }
        }
    }
    if f.from.is_empty() && f.default.is_none() {
        return Err(err(&path, "give 'from' (the property name) or a 'default'"));
    }
    Ok(f)
}

/// Parses a mapping file. Its errors are [`LayerName::Mapping`] errors naming the entry.
///
/// ```
/// use catchwalk::input::mapping::parse_mapping;
/// let m = parse_mapping(r#"{"streets": {"class": {"from": "RT", "values": {"R": "local"}}}}"#).unwrap();
/// assert_eq!(m.layer("streets").unwrap().get("class").from, vec!["RT".to_string()]);
/// assert!(parse_mapping(r#"{"streets": {"class": {"from": "RT", "values": {"R": "lane"}}}}"#).is_err());
/// ```
pub fn parse_mapping(text: &str) -> Result<Mapping> {
    let root: Value =
        serde_json::from_str(text.trim_start_matches('\u{feff}')).map_err(|e| Error::Parse {
            layer: LayerName::Mapping,
            message: e.to_string(),
        })?;
    let Value::Object(root) = root else {
        return Err(err("", "the mapping file is one JSON object"));
    };
    let mut m = Mapping::default();
    for (key, value) in &root {
        if key == "base" {
            m.base = Some(match value.as_str() {
                Some("plain") => Preset::Plain,
                Some("osm") => Preset::Osm,
                _ => return Err(err("base", "base is \"plain\" or \"osm\"")),
            });
            continue;
        }
        if key == "description" {
            continue;
        }
        let Some((layer, table)) = PLAIN.iter().find(|(l, _)| l == key) else {
            return Err(err(key, "unknown key (use base, description, streets, crossings, schools, homes, catchments)"));
        };
        let Value::Object(specs) = value else {
            return Err(err(
                key,
                "a layer maps field names to specs: {\"class\": \"ROADTYPE\"}",
            ));
        };
        let mut fields = LayerFields::plain(table);
        for (name, spec) in specs {
            let Some((fname, _)) = table.iter().find(|(f, _)| f == name) else {
                let allowed: Vec<&str> = table.iter().map(|(f, _)| *f).collect();
                return Err(err(
                    &format!("{key}.{name}"),
                    format!("unknown field; {layer} has {}", allowed.join(", ")),
                ));
            };
            fields.set(fname, field(layer, name, spec)?);
        }
        m.layers.insert(layer, fields);
    }
    Ok(m)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn mapping_error(text: &str) -> Option<String> {
        match parse_mapping(text) {
            Err(Error::Input { at, .. }) if at.layer == LayerName::Mapping => at.property,
            Err(Error::Parse {
                layer: LayerName::Mapping,
                ..
            }) => Some("(parse)".into()),
            _ => None,
        }
    }

    #[test]
    fn full_entry() {
        let m = parse_mapping(
            r#"{"base":"osm","description":"x","streets":{"speed_kmh":{"from":["SPD","SPEED"],"unit":"mph","default":25}}}"#,
        )
        .unwrap_or_default();
        assert_eq!(m.base, Some(Preset::Osm));
        let f = m
            .layer("streets")
            .map(|l| l.get("speed_kmh").clone())
            .unwrap_or_default();
        assert_eq!(f.from, vec!["SPD".to_string(), "SPEED".to_string()]);
        assert_eq!(
            (f.unit.as_deref(), f.default.as_deref()),
            (Some("mph"), Some("25"))
        );
        // Unmapped fields keep the plain names.
        assert_eq!(
            m.layer("streets").map(|l| l.get("lanes").from.clone()),
            Some(vec!["lanes".to_string()])
        );
        assert!(m.layer("homes").is_none());
    }

    #[test]
    fn mistakes_are_mapping_errors_naming_the_entry() {
        assert_eq!(mapping_error("{"), Some("(parse)".into()));
        assert_eq!(mapping_error("[]"), Some("".into()));
        assert_eq!(mapping_error(r#"{"base":"gis"}"#), Some("base".into()));
        assert_eq!(mapping_error(r#"{"roads":{}}"#), Some("roads".into()));
        assert_eq!(
            mapping_error(r#"{"streets":{"colour":"C"}}"#),
            Some("streets.colour".into())
        );
        assert_eq!(
            mapping_error(r#"{"streets":{"class":{"from":"T","values":{"A":"highway"}}}}"#),
            Some("streets.class".into())
        );
        assert_eq!(
            mapping_error(r#"{"streets":{"lanes":{"from":"L","unit":"mph"}}}"#),
            Some("streets.lanes".into())
        );
        assert_eq!(
            mapping_error(r#"{"streets":{"lanes":{"form":"L"}}}"#),
            Some("streets.lanes".into())
        );
        assert_eq!(
            mapping_error(r#"{"streets":{"lanes":{}}}"#),
            Some("streets.lanes".into())
        );
        assert_eq!(
            mapping_error(r#"{"crossings":{"control":{"from":"C","values":{"Z":"zebra"}}}}"#),
            Some("crossings.control".into())
        );
    }
}
