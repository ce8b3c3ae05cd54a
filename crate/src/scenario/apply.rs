//! Applies interventions to the layers: a new [`Layers`] value, the input left as it was.

use super::{Change, Intervention, Overlay, SideChoice};
use crate::config::NetworkConfig;
use crate::error::{Error, LayerName, Location, Result};
use crate::geodesy::LocalFrame;
use crate::input::fields::{LayerFields, STREETS};
use crate::input::presets::plain;
use crate::input::warnings::{Ctx, Warnings};
use crate::input::{CrossingPoint, Layers, LonLat, SideWalk, SpeedSource, Street};
use crate::network::qa::QaKind;
use crate::network::Network;
use std::sync::Arc;

fn located(iv: &Intervention) -> Location {
    Location::feature(LayerName::Interventions, iv.feature, iv.id.clone())
}

/// Metres from `p` to the nearest point of `line` (a local flat frame: ample over a street).
fn distance_to_line_m(p: LonLat, line: &[LonLat]) -> f64 {
    let frame = LocalFrame::new(p);
    let xy: Vec<[f64; 2]> = line.iter().map(|&q| frame.to_xy(q)).collect();
    let mut best = f64::INFINITY;
    for w in xy.windows(2) {
        let (a, b) = (w[0], w[1]);
        let d = [b[0] - a[0], b[1] - a[1]];
        let len2 = d[0] * d[0] + d[1] * d[1];
        let t = if len2 > 0.0 {
            ((-a[0]) * d[0] + (-a[1]) * d[1]) / len2
        } else {
            0.0
        };
        let t = t.clamp(0.0, 1.0);
        let q = [a[0] + t * d[0], a[1] + t * d[1]];
        best = best.min((q[0] * q[0] + q[1] * q[1]).sqrt());
    }
    best
}

/// The indices of the streets with id `id` (every part of a MultiLineString shares it); an
/// error naming the intervention when there is none, or when its Point is not on the street.
fn streets_with(
    layers: &Layers,
    iv: &Intervention,
    id: &str,
    cfg: &NetworkConfig,
) -> Result<Vec<usize>> {
    let found: Vec<usize> = (0..layers.streets.len())
        .filter(|&i| layers.streets[i].id == id)
        .collect();
    if found.is_empty() {
        return Err(Error::input(
            located(iv).with_property("street"),
            format!(
                "no street with id '{id}' in the streets layer (or an earlier intervention \
                 closed it); give the id of a street as the streets layer has it"
            ),
        ));
    }
    if let Some(p) = iv.at {
        let d = found
            .iter()
            .map(|&i| distance_to_line_m(p, &layers.streets[i].line))
            .fold(f64::INFINITY, f64::min);
        if d > cfg.crossing_attach_m {
            return Err(Error::input(
                located(iv),
                format!(
                    "the Point is {d:.0} m from street '{id}' (more than {} m); draw it on the \
                     street it changes or give it no geometry",
                    cfg.crossing_attach_m
                ),
            ));
        }
    }
    Ok(found)
}

/// The layers with `list` applied, in order. Crossing controls join the crossings layer after
/// its own points (feature numbers continue its numbering), new paths join the streets layer
/// after its own features, read as a streets feature `{"class": "path"}` would be. A street
/// change applies to the whole street feature (all its parts); a Point only locates it and
/// must lie on it (within `network.crossing_attach_m`).
///
/// ```
/// use catchwalk::config::NetworkConfig;
/// use catchwalk::input::{Layers, RoadClass, Street};
/// use catchwalk::scenario::{apply::apply_interventions, Change, Intervention, Origin};
/// let mut base = Layers::default();
/// base.streets.push(Street::new(0, RoadClass::Local, 50.0, 2, vec![[0.0, 0.0], [0.001, 0.0]]));
/// let iv = Intervention { feature: 0, id: None, kind: "speed".into(), at: None,
///     origin: Origin::Proposal, note: None,
///     change: Change::Speed { street: "0".into(), speed_kmh: 30.0 } };
/// let changed = apply_interventions(&base, &[iv], &NetworkConfig::default()).unwrap();
/// assert_eq!((base.streets[0].speed_kmh, changed.streets[0].speed_kmh), (50.0, 30.0));
/// ```
pub fn apply_interventions(
    base: &Layers,
    list: &[Intervention],
    cfg: &NetworkConfig,
) -> Result<Layers> {
    let mut layers = base.clone();
    let mut next_crossing = base.crossings.iter().map(|c| c.feature + 1).max();
    let mut next_street = base.streets.iter().map(|s| s.feature + 1).max();
    for iv in list {
        match &iv.change {
            Change::Control { at, control, scope } => {
                let feature = next_crossing.unwrap_or(0);
                next_crossing = Some(feature + 1);
                layers.crossings.push(CrossingPoint {
                    feature,
                    id: iv.id.clone().unwrap_or_else(|| feature.to_string()),
                    at: *at,
                    control: control.clone(),
                    scope: *scope,
                });
            }
            Change::Speed { street, speed_kmh } => {
                for i in streets_with(&layers, iv, street, cfg)? {
                    let s = &mut layers.streets[i];
                    s.speed_kmh = *speed_kmh;
                    s.speed_source = SpeedSource::Posted;
                }
            }
            Change::Sidewalk { street, side } => {
                for i in streets_with(&layers, iv, street, cfg)? {
                    let s = &mut layers.streets[i];
                    if matches!(side, SideChoice::Both | SideChoice::Left) {
                        s.left = SideWalk::Present;
                    }
                    if matches!(side, SideChoice::Both | SideChoice::Right) {
                        s.right = SideWalk::Present;
                    }
                }
            }
            Change::Close { street } => {
                let gone = streets_with(&layers, iv, street, cfg)?;
                let mut k = 0;
                layers.streets.retain(|_| {
                    let keep = !gone.contains(&k);
                    k += 1;
                    keep
                });
            }
            Change::Path { line } => {
                let feature = next_street.unwrap_or(0);
                next_street = Some(feature + 1);
                let ctx = Ctx {
                    layer: LayerName::Streets,
                    index: feature,
                    id: iv.id.clone(),
                };
                let mut props = serde_json::Map::new();
                props.insert("class".into(), "path".into());
                let mut w = Warnings::default();
                let template: Street =
                    plain::street(&ctx, &props, &LayerFields::plain(STREETS), &mut w);
                layers.streets.push(Street {
                    feature,
                    id: iv.id.clone().unwrap_or_else(|| feature.to_string()),
                    line: line.clone(),
                    ..template
                });
            }
        }
    }
    Ok(layers)
}

/// Refuses an overlay whose crossing control attached to nothing (network QA lists it as an
/// unattached crossing): an error naming the intervention feature.
pub fn check_controls_attached(network: &Network, overlay: &Overlay) -> Result<()> {
    let first = overlay.base.crossings.iter().map(|c| c.feature + 1).max();
    let first = first.unwrap_or(0);
    let controls: Vec<&Intervention> = overlay
        .applied
        .iter()
        .filter(|iv| matches!(iv.change, Change::Control { .. }))
        .collect();
    for item in &network.qa.items {
        if item.kind != QaKind::UnattachedCrossing {
            continue;
        }
        let Some(k) = item.feature.and_then(|f| f.checked_sub(first)) else {
            continue;
        };
        if let Some(iv) = controls.get(k) {
            return Err(Error::input(
                located(iv),
                format!(
                    "the '{}' control attaches to no street ({}); move it onto the crossing it controls",
                    iv.kind, item.message
                ),
            ));
        }
    }
    Ok(())
}

/// The overlay for `list` on `base`: the changed layers and the record of what was applied.
pub fn overlay(
    base: Arc<Layers>,
    list: Vec<Intervention>,
    cfg: &NetworkConfig,
) -> Result<(Layers, Overlay)> {
    let layers = apply_interventions(&base, &list, cfg)?;
    Ok((
        layers,
        Overlay {
            base,
            applied: list,
        },
    ))
}
