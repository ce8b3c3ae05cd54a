//! Field mapping: which property of a feature gives which model field, and how its values
//! translate. The plain preset is the identity mapping; a user's mapping file
//! ([`super::mapping`]) replaces single fields.

use super::geojson_read::Props;
use serde_json::Value;
use std::collections::BTreeMap;

/// Where one model field comes from.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Field {
    /// Property names tried in order; the first present, non-null, non-empty one is used.
    pub from: Vec<String>,
    /// Source value -> our value (matched exactly, then ignoring case and surrounding spaces).
    pub values: BTreeMap<String, String>,
    /// Unit of bare numbers (`km/h`, `mph`, `m`, `ft`), where the field has one.
    pub unit: Option<String>,
    /// Value used when no property is present.
    pub default: Option<String>,
}

/// A value read through a [`Field`]: the property it came from and its text after mapping.
#[derive(Debug, Clone, PartialEq)]
pub struct Got {
    pub property: String,
    pub text: String,
}

impl Field {
    /// A field read from the named properties, values as they are.
    pub fn named(names: &[&str]) -> Self {
        Field {
            from: names.iter().map(|s| s.to_string()).collect(),
            ..Field::default()
        }
    }

    /// The first present property's raw JSON value and name.
    pub fn raw<'a>(&'a self, props: &'a Props) -> Option<(&'a str, &'a Value)> {
        self.from.iter().find_map(|name| match props.get(name) {
            None | Some(Value::Null) => None,
            Some(Value::String(s)) if s.trim().is_empty() => None,
            Some(v) => Some((name.as_str(), v)),
        })
    }

    /// The value as text, translated through `values`, or the default when absent.
    ///
    /// ```
    /// use catchwalk::input::fields::Field;
    /// let mut f = Field::named(&["ROADTYPE"]);
    /// f.values.insert("RES".into(), "local".into());
    /// let props = serde_json::json!({"ROADTYPE": "res"});
    /// let got = f.text(props.as_object().unwrap()).unwrap();
    /// assert_eq!((got.property.as_str(), got.text.as_str()), ("ROADTYPE", "local"));
    /// ```
    pub fn text(&self, props: &Props) -> Option<Got> {
        let Some((name, value)) = self.raw(props) else {
            let property = self
                .from
                .first()
                .cloned()
                .unwrap_or_else(|| "(default)".into());
            return self.default.clone().map(|text| Got { property, text });
        };
        let text = match value {
            Value::String(s) => s.trim().to_string(),
            Value::Bool(b) => b.to_string(),
            other => other.to_string(),
        };
        Some(Got {
            property: name.to_string(),
            text: self.translate(text),
        })
    }

    fn translate(&self, text: String) -> String {
        if let Some(v) = self.values.get(&text) {
            return v.clone();
        }
        self.values
            .iter()
            .find(|(k, _)| k.trim().eq_ignore_ascii_case(&text))
            .map_or(text, |(_, v)| v.clone())
    }
}

/// The fields of one layer by model field name.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct LayerFields {
    fields: BTreeMap<&'static str, Field>,
}

static EMPTY: Field = Field {
    from: Vec::new(),
    values: BTreeMap::new(),
    unit: None,
    default: None,
};

impl LayerFields {
    /// The plain preset's fields for a layer: each field read from the property of its name
    /// (plus the aliases listed in [`PLAIN`]).
    pub fn plain(layer: &[(&'static str, &'static [&'static str])]) -> Self {
        LayerFields {
            fields: layer
                .iter()
                .map(|(k, names)| (*k, Field::named(names)))
                .collect(),
        }
    }
    pub fn get(&self, name: &str) -> &Field {
        self.fields.get(name).unwrap_or(&EMPTY)
    }
    /// Replaces one field (the name must be one of the layer's, see [`PLAIN`]).
    pub fn set(&mut self, name: &'static str, field: Field) {
        self.fields.insert(name, field);
    }
    /// Shorthand: the field's text.
    pub fn text(&self, name: &str, props: &Props) -> Option<Got> {
        self.get(name).text(props)
    }
}

/// Plain preset field names per layer: (model field, properties tried).
pub type FieldTable = &'static [(&'static str, &'static [&'static str])];

pub const STREETS: FieldTable = &[
    ("id", &["id"]),
    ("name", &["name"]),
    ("class", &["class"]),
    ("speed_kmh", &["speed_kmh"]),
    ("lanes", &["lanes"]),
    ("sidewalk", &["sidewalk"]),
    ("oneway", &["oneway"]),
    ("layer", &["layer"]),
    ("aadt", &["aadt"]),
    ("width_m", &["width_m"]),
    ("vehicles_15min", &["vehicles_15min"]),
    ("median_m", &["median_m"]),
    ("shoulder_m", &["shoulder_m"]),
];
pub const CROSSINGS: FieldTable = &[
    ("id", &["id"]),
    ("control", &["control"]),
    ("guard_hours", &["guard_hours"]),
];
pub const SCHOOLS: FieldTable = &[
    ("id", &["id"]),
    ("name", &["name"]),
    ("students", &["students"]),
    ("grades", &["grades"]),
    ("entrances", &["entrances"]),
];
/// `lon`/`lat` name CSV columns; empty means "detect" (see `homes_csv`).
pub const HOMES: FieldTable = &[
    ("id", &["id"]),
    ("children", &["children"]),
    ("school", &["school"]),
    ("lon", &[]),
    ("lat", &[]),
];
pub const CATCHMENTS: FieldTable = &[("school", &["school", "school_id"])];

/// Every layer's plain field table, by the layer's name in a mapping file.
pub const PLAIN: &[(&str, FieldTable)] = &[
    ("streets", STREETS),
    ("crossings", CROSSINGS),
    ("schools", SCHOOLS),
    ("homes", HOMES),
    ("catchments", CATCHMENTS),
];

#[cfg(test)]
mod tests {
    use super::*;

    fn props(v: Value) -> Props {
        v.as_object().cloned().unwrap_or_default()
    }

    #[test]
    fn reads_first_present_alias_and_skips_blank_values() {
        let f = Field::named(&["school", "school_id"]);
        let p = props(serde_json::json!({"school": " ", "school_id": 7}));
        let got = f.text(&p);
        assert_eq!(
            got.map(|g| (g.property, g.text)),
            Some(("school_id".into(), "7".into()))
        );
        assert_eq!(f.text(&props(serde_json::json!({"school": null}))), None);
    }

    #[test]
    fn default_applies_only_when_absent() {
        let mut f = Field::named(&["SPEED"]);
        f.default = Some("30".into());
        assert_eq!(
            f.text(&props(serde_json::json!({}))).map(|g| g.text),
            Some("30".into())
        );
        let got = f.text(&props(serde_json::json!({"SPEED": 45})));
        assert_eq!(got.map(|g| g.text), Some("45".into()));
    }

    #[test]
    fn unmapped_values_pass_through_for_validation() {
        let mut f = Field::named(&["T"]);
        f.values.insert("MAJ".into(), "arterial".into());
        let got = f.text(&props(serde_json::json!({"T": "XYZ"})));
        assert_eq!(got.map(|g| g.text), Some("XYZ".into()));
        let got = f.text(&props(serde_json::json!({"T": true})));
        assert_eq!(got.map(|g| g.text), Some("true".into()));
    }
}
