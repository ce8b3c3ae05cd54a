//! Per-layer reading choices: a layer given as a file's bytes (zipped or bare Shapefile,
//! `.osm.pbf`), the property names each layer uses (OpenStreetMap tags or catchwalk's plain
//! names, detected when not chosen), and the coordinate system of a layer whose file does not
//! say it. The CLI's `--names` and `--crs` and the page's layer options fill this.

use super::Preset;
use crate::error::{Error, LayerName, Result};

/// A layer given as files: one `.zip`, one `.osm.pbf`, a `.shp` with its sidecars (`.shx`,
/// `.dbf`, `.prj`), or a GeoJSON/CSV file as bytes. Names carry the extension that says the
/// format.
#[derive(Debug, Clone)]
pub struct LayerFile {
    pub layer: LayerName,
    /// (file name, bytes), the main file first.
    pub files: Vec<(String, Vec<u8>)>,
}

/// The per-layer choices; empty by default (every layer from its text, names detected).
#[derive(Debug, Clone, Default)]
pub struct PerLayer {
    /// Layers given as files; each replaces that layer's text.
    pub files: Vec<LayerFile>,
    /// Property names chosen for a layer (others are detected from their properties).
    pub names: Vec<(LayerName, Preset)>,
    /// Coordinate system for a layer whose file states none; `None` for every layer.
    pub crs: Vec<(Option<LayerName>, String)>,
}

impl PerLayer {
    pub fn file(&self, layer: LayerName) -> Option<&LayerFile> {
        self.files.iter().find(|f| f.layer == layer)
    }
    pub fn names(&self, layer: LayerName) -> Option<Preset> {
        self.names
            .iter()
            .find(|(l, _)| *l == layer)
            .map(|(_, p)| *p)
    }
    /// The layer's own choice, else the choice for every layer.
    pub fn crs(&self, layer: LayerName) -> Option<&str> {
        let of = |want: Option<LayerName>| {
            self.crs
                .iter()
                .find(|(l, _)| *l == want)
                .map(|(_, c)| c.as_str())
        };
        of(Some(layer)).or_else(|| of(None))
    }
}

/// The data layers by their names in options (`streets`, `crossings`, `schools`, `homes`,
/// `catchments`).
pub fn layer_named(name: &str) -> Option<LayerName> {
    Some(match name.trim().to_ascii_lowercase().as_str() {
        "streets" => LayerName::Streets,
        "crossings" => LayerName::Crossings,
        "schools" => LayerName::Schools,
        "homes" => LayerName::Homes,
        "catchments" => LayerName::Catchments,
        _ => return None,
    })
}

fn option_err(message: String) -> Error {
    Error::Config(message)
}

/// Parses a names choice: `LAYER=osm|plain`, several separated by commas
/// (`streets=osm,schools=plain`).
///
/// ```
/// use catchwalk::input::{per_layer::parse_names, Preset};
/// use catchwalk::error::LayerName;
/// let n = parse_names("streets=osm, schools=plain").unwrap();
/// assert_eq!(n, vec![(LayerName::Streets, Preset::Osm), (LayerName::Schools, Preset::Plain)]);
/// assert!(parse_names("streets=tiger").is_err());
/// ```
pub fn parse_names(text: &str) -> Result<Vec<(LayerName, Preset)>> {
    let mut out = Vec::new();
    for item in text.split(',').map(str::trim).filter(|s| !s.is_empty()) {
        let (layer, names) = item.split_once('=').ok_or_else(|| {
            option_err(format!(
                "names '{item}': write LAYER=osm or LAYER=plain, for example streets=osm"
            ))
        })?;
        let layer = layer_named(layer).ok_or_else(|| {
            option_err(format!("names '{item}': '{layer}' is not a layer (streets, crossings, schools, homes, catchments)"))
        })?;
        let preset = match names.trim().to_ascii_lowercase().as_str() {
            "osm" => Preset::Osm,
            "plain" => Preset::Plain,
            other => {
                return Err(option_err(format!(
                    "names '{item}': '{other}' is not a naming (osm: OpenStreetMap tags; plain: catchwalk's own names)"
                )))
            }
        };
        if matches!(layer, LayerName::Homes | LayerName::Catchments) && preset == Preset::Osm {
            return Err(option_err(format!(
                "names '{item}': OpenStreetMap has no {layer} layer; read {layer} with plain names or a mapping file"
            )));
        }
        out.push((layer, preset));
    }
    Ok(out)
}

/// Parses one coordinate-system choice: `LAYER=CRS` for one layer or `CRS` for every layer
/// that does not state its own (CRS: `EPSG:N`, a proj string `+proj=...`).
///
/// ```
/// use catchwalk::input::per_layer::parse_crs;
/// use catchwalk::error::LayerName;
/// assert_eq!(parse_crs("streets=EPSG:2272").unwrap(), (Some(LayerName::Streets), "EPSG:2272".into()));
/// assert_eq!(parse_crs("EPSG:32618").unwrap(), (None, "EPSG:32618".into()));
/// assert_eq!(parse_crs("+proj=utm +zone=18").unwrap().0, None);
/// ```
pub fn parse_crs(text: &str) -> Result<(Option<LayerName>, String)> {
    let t = text.trim();
    let (layer, crs) = match t.split_once('=') {
        Some((l, c)) if !t.starts_with('+') => {
            let layer = layer_named(l).ok_or_else(|| {
                option_err(format!("crs '{t}': '{l}' is not a layer (streets, crossings, schools, homes, catchments)"))
            })?;
            (Some(layer), c.trim())
        }
        _ => (None, t),
    };
    super::crs::to_wgs84(crs).map_err(|m| option_err(format!("crs '{t}': {m}")))?;
    Ok((layer, crs.to_string()))
}
