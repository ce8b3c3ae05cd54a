//! Reads the interventions layer: GeoJSON features with a `kind` property.

use super::{Change, Intervention, Origin, SideChoice, STREET_KINDS};
use crate::error::{Error, LayerName, Location, Result};
use crate::input::geojson_read::{for_each_feature, line, lonlat, type_name, Props};
use crate::input::values::{parse_control, parse_guard_hours, scope_of};
use geojson::GeometryValue;

fn text(props: &Props, key: &str) -> Option<String> {
    match props.get(key)? {
        serde_json::Value::String(s) if !s.trim().is_empty() => Some(s.trim().to_string()),
        serde_json::Value::Number(n) => Some(n.to_string()),
        _ => None,
    }
}

/// Reads every intervention of the layer, in order. An unknown `kind`, a missing `street`
/// or a geometry of the wrong type is an error naming the feature.
///
/// ```
/// use catchwalk::scenario::{read::read_interventions, Change};
/// let text = r#"{"type":"FeatureCollection","features":[{"type":"Feature",
///   "geometry":null,"properties":{"kind":"speed","street":"s1","speed_kmh":30}}]}"#;
/// let list = read_interventions(text).unwrap();
/// assert!(matches!(&list[0].change, Change::Speed { street, speed_kmh } if street == "s1" && *speed_kmh == 30.0));
/// ```
pub fn read_interventions(text_in: &str) -> Result<Vec<Intervention>> {
    let layer = LayerName::Interventions;
    let mut out = Vec::new();
    for_each_feature(text_in, layer, |index, f| {
        let props = f.properties.clone().unwrap_or_default();
        let id = text(&props, "id").or_else(|| f.member_id());
        let here = || Location::feature(layer, index, id.clone());
        let prop = |p: &str| here().with_property(p);
        let Some(kind) = text(&props, "kind") else {
            return Err(Error::input(
                prop("kind"),
                format!("no kind given; give one of: {CONTROL_VALUES_NO_NONE}, {STREET_KINDS}"),
            ));
        };
        let origin = match text(&props, "origin").as_deref() {
            None | Some("proposal") => Origin::Proposal,
            Some("plan") => Origin::Plan,
            Some("observation") => Origin::Observation,
            Some(other) => {
                return Err(Error::input(
                    prop("origin"),
                    format!("unknown origin '{other}'; give proposal, plan or observation"),
                ))
            }
        };
        let found = type_name(&f.geometry);
        let geometry = f.geometry.map(|g| g.value);
        let point = match &geometry {
            Some(GeometryValue::Point { coordinates }) => Some(lonlat(coordinates, &here)?),
            _ => None,
        };
        let street = || {
            text(&props, "street").ok_or_else(|| {
                Error::input(
                    prop("street"),
                    format!("a '{kind}' intervention needs the street id it changes"),
                )
            })
        };
        let street_geometry = || {
            match &geometry {
            None | Some(GeometryValue::Point { .. }) => Ok(()),
            _ => Err(Error::input(
                here(),
                format!("a '{kind}' intervention is a Point on the street or has no geometry; found {found}"),
            )),
        }
        };
        let change = match kind.to_ascii_lowercase().as_str() {
            "speed" => {
                street_geometry()?;
                let speed_kmh = props
                    .get("speed_kmh")
                    .and_then(|v| v.as_f64())
                    .filter(|v| v.is_finite() && *v > 0.0 && *v <= 200.0)
                    .ok_or_else(|| {
                        Error::input(
                            prop("speed_kmh"),
                            "a speed intervention needs speed_kmh, a number of km/h above 0",
                        )
                    })?;
                Change::Speed {
                    street: street()?,
                    speed_kmh,
                }
            }
            "sidewalk" => {
                street_geometry()?;
                let side = match text(&props, "side").as_deref().unwrap_or("both") {
                    "both" => SideChoice::Both,
                    "left" => SideChoice::Left,
                    "right" => SideChoice::Right,
                    other => {
                        return Err(Error::input(
                            prop("side"),
                            format!("unknown side '{other}'; give both, left or right (of the street's digitised direction)"),
                        ))
                    }
                };
                Change::Sidewalk {
                    street: street()?,
                    side,
                }
            }
            "close" => {
                street_geometry()?;
                Change::Close { street: street()? }
            }
            "path" => match &geometry {
                Some(GeometryValue::LineString { coordinates }) => {
                    let pts = line(coordinates, &here)?;
                    if pts.len() < 2 {
                        return Err(Error::input(
                            here(),
                            "the path has fewer than two distinct points; draw it again",
                        ));
                    }
                    Change::Path { line: pts }
                }
                _ => {
                    return Err(Error::input(
                        here(),
                        format!("a path intervention is a LineString; found {found}"),
                    ))
                }
            },
            _ => {
                let (mut control, unknown) = parse_control(&kind);
                if !unknown.is_empty() || control.is_uncontrolled() {
                    return Err(Error::input(
                        prop("kind"),
                        format!(
                            "unknown kind '{kind}'; give one of: {CONTROL_VALUES_NO_NONE} (a crossing control, a Point), or {STREET_KINDS}"
                        ),
                    ));
                }
                if let Some(hours) = text(&props, "guard_hours") {
                    control.guard = Some(parse_guard_hours(&hours).map_err(|bad| {
                        Error::input(
                            prop("guard_hours"),
                            format!("cannot read the time window '{bad}'; write windows like 07:30-08:45,14:45-15:30"),
                        )
                    })?);
                }
                let Some(at) = point else {
                    return Err(Error::input(
                        here(),
                        format!("a crossing control ('{kind}') is a Point on the crossing; found {found}"),
                    ));
                };
                Change::Control {
                    at,
                    scope: scope_of(control.device),
                    control,
                }
            }
        };
        let at = match &change {
            Change::Path { line } => line.first().copied(),
            _ => point,
        };
        out.push(Intervention {
            feature: index,
            id: id.clone(),
            kind,
            change,
            at,
            origin,
            note: text(&props, "note"),
        });
        Ok(())
    })?;
    Ok(out)
}

/// The crossing-control values an intervention can take (the crossings layer's, but `none`).
const CONTROL_VALUES_NO_NONE: &str =
    "signal, all_way_stop, stop, yield, marked, guard, refuge, raised, beacon (join several with ';')";

#[cfg(test)]
mod tests {
    use super::*;

    fn one(props: &str, geometry: &str) -> Result<Vec<Intervention>> {
        read_interventions(&format!(
            r#"{{"type":"FeatureCollection","features":[{{"type":"Feature","geometry":{geometry},"properties":{props}}}]}}"#
        ))
    }

    #[test]
    fn reads_controls_with_the_crossings_vocabulary() {
        let pt = r#"{"type":"Point","coordinates":[-35.0,42.0]}"#;
        let r = one(r#"{"kind":"guard","guard_hours":"07:45-08:15"}"#, pt).unwrap();
        let Change::Control { control, .. } = &r[0].change else {
            panic!("not a control")
        };
        assert_eq!(control.guard.as_ref().map(|g| g.len()), Some(1));
        let r = one(r#"{"kind":"marked;refuge"}"#, pt).unwrap();
        assert!(matches!(&r[0].change, Change::Control { control, .. } if control.refuge_island));
    }

    #[test]
    fn errors_name_the_feature_and_property() {
        let pt = r#"{"type":"Point","coordinates":[-35.0,42.0]}"#;
        let e = one(r#"{"kind":"bridge","id":"x7"}"#, pt)
            .unwrap_err()
            .to_string();
        assert!(
            e.contains("interventions feature 0 (id x7), property 'kind'"),
            "{e}"
        );
        let e = one(r#"{"kind":"speed","street":"a"}"#, "null")
            .unwrap_err()
            .to_string();
        assert!(e.contains("speed_kmh"), "{e}");
        let e = one(r#"{"kind":"signal"}"#, "null").unwrap_err().to_string();
        assert!(e.contains("Point"), "{e}");
        let e = one(r#"{"kind":"sidewalk","street":"a","side":"top"}"#, "null")
            .unwrap_err()
            .to_string();
        assert!(e.contains("'side'"), "{e}");
        let e = one(r#"{"kind":"path"}"#, pt).unwrap_err().to_string();
        assert!(e.contains("LineString"), "{e}");
    }
}
