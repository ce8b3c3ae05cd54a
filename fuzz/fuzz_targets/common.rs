//! Shared by the fuzz targets: one input becomes the layers of an audit. The first byte
//! chooses the preset, the homes format and whether a mapping is given; the rest is split at
//! 0xFF bytes into streets, schools, homes, crossings, catchments, mapping, interventions and
//! crashes text (seeds are
//! written that way by `tools/fuzz_seeds.py`).

use catchwalk::input::{HomesFormat, Preset, RawLayers};

pub fn layers(data: &[u8]) -> Option<RawLayers> {
    let (&flags, rest) = data.split_first()?;
    let mut parts = rest.split(|&b| b == 0xFF).map(|p| String::from_utf8_lossy(p).into_owned());
    let mut next = || parts.next().unwrap_or_default();
    let streets = next();
    let schools = next();
    let homes = next();
    let crossings = next();
    let catchments = next();
    let mapping = next();
    // The optional layers added later (interventions, crashes) follow, when present.
    let interventions = Some(next()).filter(|t| !t.is_empty());
    let crashes = Some(next()).filter(|t| !t.is_empty());
    Some(RawLayers {
        streets,
        schools,
        homes,
        homes_format: if flags & 1 == 1 { HomesFormat::Csv } else { HomesFormat::GeoJson },
        crossings: Some(crossings),
        catchments: Some(catchments),
        preset: if flags & 2 == 2 { Preset::Osm } else { Preset::Plain },
        mapping: (flags & 4 == 4).then_some(mapping),
        interventions,
        crashes,
        ..RawLayers::default()
    })
}
