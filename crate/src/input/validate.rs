//! Checks across layers, once each layer is read: required layers not empty, ids unique,
//! homes' and catchments' school ids known.

use super::model::Layers;
use super::warnings::Warnings;
use crate::error::{Error, LayerName, Location, Result};
use std::collections::{HashMap, HashSet};

/// Validates the layers in place: unknown school ids on homes are dropped with a warning
/// (the home is then assigned by catchment or nearest school).
pub fn validate(layers: &mut Layers, w: &mut Warnings) -> Result<()> {
    let empty = |layer: LayerName, what: &str| {
        let skipped = w.skipped_in(layer);
        let note = if skipped > 0 {
            format!(
                " ({skipped} feature(s) were skipped: {})",
                w.skipped_reasons(layer)
            )
        } else {
            String::new()
        };
        Err(Error::input(
            Location::layer(layer),
            format!("the layer has no {what}{note}; load a layer with at least one"),
        ))
    };
    if layers.streets.is_empty() {
        return empty(LayerName::Streets, "usable streets");
    }
    if layers.schools.is_empty() {
        return empty(LayerName::Schools, "schools");
    }
    if layers.homes.is_empty() {
        return empty(LayerName::Homes, "homes");
    }
    duplicates(
        LayerName::Streets,
        layers.streets.iter().map(|s| (s.feature, s.id.as_str())),
        w,
    );
    duplicates(
        LayerName::Crossings,
        layers.crossings.iter().map(|c| (c.feature, c.id.as_str())),
        w,
    );
    duplicates(
        LayerName::Homes,
        layers.homes.iter().map(|h| (h.feature, h.id.as_str())),
        w,
    );
    let schools: HashSet<&str> = layers.schools.iter().map(|s| s.id.as_str()).collect();
    for home in &mut layers.homes {
        if let Some(id) = home.school.as_deref() {
            if !schools.contains(id) {
                w.push(
                    "school",
                    Location::feature(LayerName::Homes, home.feature, Some(home.id.clone())).with_property("school"),
                    format!("names school '{id}', which is not in the schools layer; the home goes to its catchment or nearest school"),
                );
                home.school = None;
            }
        }
    }
    for c in &layers.catchments {
        if !schools.contains(c.school_id.as_str()) {
            w.push(
                "school",
                Location::feature(LayerName::Catchments, c.feature, None).with_property("school"),
                format!("names school '{}', which is not in the schools layer; the catchment is ignored", c.school_id),
            );
        }
    }
    Ok(())
}

/// Warns once per id used by more than one feature (parts of one feature share its id).
fn duplicates<'a>(
    layer: LayerName,
    items: impl Iterator<Item = (usize, &'a str)>,
    w: &mut Warnings,
) {
    let mut first: HashMap<&str, usize> = HashMap::new();
    let mut warned: HashSet<&str> = HashSet::new();
    for (feature, id) in items {
        match first.get(id) {
            Some(&f) if f != feature && warned.insert(id) => w.push(
                "duplicate_id",
                Location::feature(layer, feature, Some(id.to_string())).with_property("id"),
                format!("id '{id}' is also used by feature {f}; give each feature its own id so messages and exports can tell them apart"),
            ),
            Some(_) => {}
            None => {
                first.insert(id, feature);
            }
        }
    }
}
