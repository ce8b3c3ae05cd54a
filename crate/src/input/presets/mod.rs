//! Field-mapping presets: how a layer's properties become model fields.

pub mod osm;
pub mod plain;

use crate::input::fields::LayerFields;

/// How one layer's properties are read.
#[derive(Debug, Clone, Copy)]
pub enum Reader<'a> {
    /// The plain preset, or a mapping file's fields over it.
    Plain(&'a LayerFields),
    /// OpenStreetMap tags.
    Osm,
}
