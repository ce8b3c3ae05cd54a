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

/// With a Point, the street change applies only where it is drawn: the block (the piece
/// between two junctions) of the street nearest the point. The street is cut there into up to
/// three parts with the same id and feature, as a streets layer holding the three pieces
/// would be read; returns the index of the block's part. Cutting at junctions keeps the
/// network's shape: the cuts are junctions already.
fn cut_out_block(
    layers: &mut Layers,
    iv: &Intervention,
    found: &[usize],
    p: LonLat,
    cfg: &NetworkConfig,
) -> Result<usize> {
    let nearest = found
        .iter()
        .map(|&i| (i, distance_to_line_m(p, &layers.streets[i].line)))
        .min_by(|a, b| a.1.total_cmp(&b.1))
        .map(|x| x.0);
    let Some(i) = nearest else {
        return Err(Error::input(located(iv), "no street to change"));
    };
    let frame = crate::network::attach::frame_over(
        layers.streets.iter().flat_map(|s| s.line.iter().copied()),
    )
    .unwrap_or_else(|| LocalFrame::new([0.0, 0.0]));
    let tol = if cfg.snap_tolerance_m.is_finite() && cfg.snap_tolerance_m >= 0.0 {
        cfg.snap_tolerance_m
    } else {
        0.0
    };
    let noded = crate::network::noding::node_streets(&layers.streets, tol, &frame);
    let pieces: Vec<&crate::network::Segment> =
        noded.segments.iter().filter(|s| s.street == i).collect();
    let mut line: Vec<LonLat> = Vec::new();
    for &q in &layers.streets[i].line {
        if line.last() != Some(&q) {
            line.push(q);
        }
    }
    // Vertex ranges of the pieces along the street's own line.
    let mut ranges = Vec::with_capacity(pieces.len());
    let mut at = 0usize;
    for piece in &pieces {
        let n = piece.line.len().saturating_sub(1);
        ranges.push((at, at + n));
        at += n;
    }
    let cannot = || {
        Error::input(
            located(iv),
            format!(
                "cannot find the block of street '{}' the Point is on (the street folds back                  on itself); give no geometry to change the whole street",
                layers.streets[i].id
            ),
        )
    };
    if pieces.is_empty() || at + 1 != line.len() {
        return Err(cannot());
    }
    let (a, b) = pieces
        .iter()
        .zip(&ranges)
        .map(|(piece, r)| (*r, distance_to_line_m(p, &piece.line)))
        .min_by(|x, y| x.1.total_cmp(&y.1))
        .map(|x| x.0)
        .ok_or_else(cannot)?;
    let (Some(before), Some(block), Some(after)) = (line.get(..=a), line.get(a..=b), line.get(b..))
    else {
        return Err(cannot());
    };
    let part = |l: &[LonLat]| Street {
        line: l.to_vec(),
        ..layers.streets[i].clone()
    };
    let mut parts = Vec::new();
    if a > 0 {
        parts.push(part(before));
    }
    let block_at = i + parts.len();
    parts.push(part(block));
    if b + 1 < line.len() {
        parts.push(part(after));
    }
    layers.streets.splice(i..=i, parts);
    Ok(block_at)
}

/// The streets a street change applies to: every part of the street, or with a Point only
/// the block it is drawn on.
fn targets(
    layers: &mut Layers,
    iv: &Intervention,
    id: &str,
    cfg: &NetworkConfig,
) -> Result<Vec<usize>> {
    let found = streets_with(layers, iv, id, cfg)?;
    match iv.at {
        Some(p) => Ok(vec![cut_out_block(layers, iv, &found, p, cfg)?]),
        None => Ok(found),
    }
}

/// The layers with `list` applied, in order. Crossing controls join the crossings layer after
/// its own points (feature numbers continue its numbering), new paths join the streets layer
/// after its own features, read as a streets feature `{"class": "path"}` would be. A street
/// change without geometry applies to the whole street (all its parts); with a Point (within
/// `network.crossing_attach_m` of the street) only to the block it is drawn on.
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
                for i in targets(&mut layers, iv, street, cfg)? {
                    let s = &mut layers.streets[i];
                    s.speed_kmh = *speed_kmh;
                    s.speed_source = SpeedSource::Posted;
                }
            }
            Change::Sidewalk { street, side } => {
                for i in targets(&mut layers, iv, street, cfg)? {
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
                let gone = targets(&mut layers, iv, street, cfg)?;
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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::input::RoadClass;
    use crate::scenario::Origin;

    /// A street of three blocks (cross streets meet it at its inner vertices).
    fn three_blocks() -> Layers {
        let mut l = Layers::default();
        let main = Street {
            id: "main".into(),
            left: SideWalk::Absent,
            right: SideWalk::Absent,
            ..Street::new(
                0,
                RoadClass::Local,
                40.0,
                2,
                vec![[0.0, 0.0], [0.001, 0.0], [0.002, 0.0], [0.003, 0.0]],
            )
        };
        l.streets.push(main);
        for (k, x) in [0.001, 0.002].into_iter().enumerate() {
            l.streets.push(Street::new(
                k + 1,
                RoadClass::Local,
                40.0,
                2,
                vec![[x, -0.001], [x, 0.0], [x, 0.001]],
            ));
        }
        l
    }

    fn sidewalk(at: Option<LonLat>) -> Intervention {
        Intervention {
            feature: 0,
            id: None,
            kind: "sidewalk".into(),
            change: Change::Sidewalk {
                street: "main".into(),
                side: SideChoice::Left,
            },
            at,
            origin: Origin::Proposal,
            note: None,
        }
    }

    #[test]
    fn a_point_changes_only_the_block_it_is_drawn_on() {
        let base = three_blocks();
        let cfg = NetworkConfig::default();
        let out = apply_interventions(&base, &[sidewalk(Some([0.0015, 0.00003]))], &cfg)
            .unwrap_or_default();
        let main: Vec<&Street> = out.streets.iter().filter(|s| s.id == "main").collect();
        assert_eq!(main.len(), 3);
        let lefts: Vec<SideWalk> = main.iter().map(|s| s.left).collect();
        assert_eq!(
            lefts,
            [SideWalk::Absent, SideWalk::Present, SideWalk::Absent]
        );
        assert_eq!(main[1].line, vec![[0.001, 0.0], [0.002, 0.0]]);
        // Without geometry: the whole street.
        let out = apply_interventions(&base, &[sidewalk(None)], &cfg).unwrap_or_default();
        assert!(out
            .streets
            .iter()
            .filter(|s| s.id == "main")
            .all(|s| s.left == SideWalk::Present));
        assert_eq!(
            base.streets[0].left,
            SideWalk::Absent,
            "the input is untouched"
        );
    }
}
