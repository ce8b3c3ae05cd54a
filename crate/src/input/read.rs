//! One function per layer: streams its features, checks geometry, and reads properties
//! through the layer's [`Reader`].

use super::fields::LayerFields;
use super::geojson_read::{
    for_each_feature, line, lonlat, multipolygon, type_name, wrong_geometry, RawFeature,
};
use super::model::*;
use super::presets::{osm, plain, Reader};
use super::warnings::{Ctx, Warnings};
use crate::error::{Error, LayerName, Result};
use geo::Centroid;
use geojson::GeometryValue;
use std::collections::HashSet;

fn ctx_of(layer: LayerName, index: usize, f: &RawFeature, reader: Reader) -> Ctx {
    let props = f.properties.as_ref();
    let empty = Default::default();
    let props = props.unwrap_or(&empty);
    let id = match reader {
        Reader::Plain(fields) => plain::feature_id(props, f.member_id(), fields),
        Reader::Osm => osm::feature_id(props, f.member_id()),
    };
    Ctx { layer, index, id }
}

/// Reads the streets layer; each part of a MultiLineString becomes its own [`Street`].
pub fn streets(text: &str, reader: Reader, w: &mut Warnings) -> Result<Vec<Street>> {
    let layer = LayerName::Streets;
    let mut out = Vec::new();
    for_each_feature(text, layer, |index, f| {
        let ctx = ctx_of(layer, index, &f, reader);
        let found = type_name(&f.geometry);
        let props = f.properties.unwrap_or_default();
        let parts = match f.geometry.map(|g| g.value) {
            Some(GeometryValue::LineString { coordinates }) => vec![coordinates],
            Some(GeometryValue::MultiLineString { coordinates }) => coordinates,
            _ => {
                match reader {
                    Reader::Osm => {
                        w.skip(layer, "not lines (points, polygons or no geometry) in an OpenStreetMap export");
                        return Ok(());
                    }
                    Reader::Plain(_) => {
                        return Err(wrong_geometry(
                            ctx.at(),
                            found,
                            "LineString or MultiLineString",
                        ))
                    }
                }
            }
        };
        let template = match reader {
            Reader::Plain(fields) => plain::street(&ctx, &props, fields, w),
            Reader::Osm => match osm::street(&ctx, &props, w) {
                Some(s) => s,
                None => return Ok(()),
            },
        };
        drop(props);
        let n_parts = parts.len();
        let mut kept = 0;
        for (k, part) in parts.into_iter().enumerate() {
            let pts = line(&part, &|| ctx.at())?;
            if pts.len() < 2 {
                if n_parts > 1 {
                    w.push(
                        "degenerate",
                        ctx.at(),
                        format!("part {k} has fewer than two distinct points; skipped that part"),
                    );
                }
                continue;
            }
            kept += 1;
            out.push(Street {
                line: pts,
                ..template.clone()
            });
        }
        if kept == 0 {
            w.push("degenerate", ctx.at(), "no part with two distinct points; skipped the feature (fix or delete its geometry)");
        }
        Ok(())
    })?;
    Ok(out)
}

/// Reads the crossings layer (Points). With OpenStreetMap tags, points that are no crossing
/// or traffic control are skipped quietly.
pub fn crossings(text: &str, reader: Reader, w: &mut Warnings) -> Result<Vec<CrossingPoint>> {
    let layer = LayerName::Crossings;
    let mut out = Vec::new();
    for_each_feature(text, layer, |index, f| {
        let ctx = ctx_of(layer, index, &f, reader);
        let found = type_name(&f.geometry);
        let props = f.properties.unwrap_or_default();
        let point = match f.geometry.map(|g| g.value) {
            Some(GeometryValue::Point { coordinates }) => coordinates,
            _ => match reader {
                Reader::Osm => {
                    w.skip(layer, "not points in an OpenStreetMap export");
                    return Ok(());
                }
                Reader::Plain(_) => return Err(wrong_geometry(ctx.at(), found, "Point")),
            },
        };
        if matches!(reader, Reader::Plain(_)) && props.contains_key("rail_tracks") {
            return Ok(()); // a rail crossing: read by `observed::rail_crossings`
        }
        let (control, scope) = match reader {
            Reader::Plain(fields) => plain::crossing(&ctx, &props, fields, w),
            Reader::Osm => match osm::crossing(&props) {
                Some(c) => c,
                None => {
                    w.skip(layer, "points that are no crossing or traffic control");
                    return Ok(());
                }
            },
        };
        out.push(CrossingPoint {
            feature: index,
            id: ctx.id.clone().unwrap_or_else(|| index.to_string()),
            at: lonlat(&point, &|| ctx.at())?,
            control,
            scope,
        });
        Ok(())
    })?;
    Ok(out)
}

/// Reads the schools layer: Points, or Polygons/MultiPolygons (entrances, else centroid).
/// School ids must be unique.
pub fn schools(
    text: &str,
    reader: Reader,
    fields: &LayerFields,
    w: &mut Warnings,
) -> Result<Vec<School>> {
    let layer = LayerName::Schools;
    let mut out: Vec<School> = Vec::new();
    let mut ids = HashSet::new();
    for_each_feature(text, layer, |index, f| {
        let ctx = ctx_of(layer, index, &f, reader);
        let found = type_name(&f.geometry);
        let props = f.properties.unwrap_or_default();
        if matches!(reader, Reader::Osm) && !osm::is_school(&props) {
            w.skip(
                layer,
                "features not tagged amenity=school (OpenStreetMap names read only those; for a \
                 schools file of your own choose plain names for it: --names schools=plain)",
            );
            return Ok(());
        }
        if matches!(reader, Reader::Osm) && ctx.id.is_none() {
            return Err(Error::input(
                ctx.at_prop("@id"),
                "the school has no OpenStreetMap id; export with ids (osmium export \
                 --add-unique-id=type_id) or give it an 'id' property",
            ));
        }
        let (id, mut name, mut students) = plain::school_attrs(&ctx, &props, fields, w)?;
        if let Reader::Osm = reader {
            name = osm::name(&props).unwrap_or(name);
            students = osm::students(&props);
        }
        if !ids.insert(id.clone()) {
            return Err(Error::input(
                ctx.at_prop("id"),
                format!("school id '{id}' is used twice; give every school its own id"),
            ));
        }
        let mut entrances = plain::entrances(&ctx, &props, fields, w)?;
        let at = || ctx.at();
        match f.geometry.map(|g| g.value) {
            Some(GeometryValue::Point { coordinates }) => {
                let p = lonlat(&coordinates, &at)?;
                if entrances.is_empty() {
                    entrances.push(p);
                }
            }
            Some(g @ (GeometryValue::Polygon { .. } | GeometryValue::MultiPolygon { .. })) => {
                let area = multipolygon(&g, &at)?.unwrap_or_else(|| geo::MultiPolygon::new(vec![]));
                if entrances.is_empty() {
                    match area.centroid() {
                        Some(c) => entrances.push([c.x(), c.y()]),
                        None => {
                            return Err(Error::input(
                                at(),
                                "the school polygon is empty; draw the school grounds or give it a Point",
                            ))
                        }
                    }
                }
            }
            _ => {
                return Err(wrong_geometry(
                    at(),
                    found,
                    "Point, Polygon or MultiPolygon",
                ))
            }
        }
        out.push(School {
            feature: index,
            id,
            name,
            entrances,
            students,
        });
        Ok(())
    })?;
    Ok(out)
}

/// Reads a GeoJSON homes layer (Points).
pub fn homes(text: &str, fields: &LayerFields, w: &mut Warnings) -> Result<Vec<Home>> {
    let layer = LayerName::Homes;
    let reader = Reader::Plain(fields);
    let mut out = Vec::new();
    for_each_feature(text, layer, |index, f| {
        let ctx = ctx_of(layer, index, &f, reader);
        let found = type_name(&f.geometry);
        let props = f.properties.unwrap_or_default();
        let at = match f.geometry.map(|g| g.value) {
            Some(GeometryValue::Point { coordinates }) => lonlat(&coordinates, &|| ctx.at())?,
            _ => return Err(wrong_geometry(ctx.at(), found, "Point")),
        };
        out.push(plain::home(&ctx, at, &props, fields, w));
        Ok(())
    })?;
    Ok(out)
}

/// Reads the catchments layer (Polygons/MultiPolygons, each naming its school).
pub fn catchments(text: &str, fields: &LayerFields) -> Result<Vec<Catchment>> {
    let layer = LayerName::Catchments;
    let reader = Reader::Plain(fields);
    let mut out = Vec::new();
    for_each_feature(text, layer, |index, f| {
        let ctx = ctx_of(layer, index, &f, reader);
        let found = type_name(&f.geometry);
        let props = f.properties.unwrap_or_default();
        let school_id = plain::catchment_school(&ctx, &props, fields)?;
        let area = match f.geometry.map(|g| g.value) {
            Some(g) => multipolygon(&g, &|| ctx.at())?,
            None => None,
        };
        let Some(area) = area else {
            return Err(wrong_geometry(ctx.at(), found, "Polygon or MultiPolygon"));
        };
        out.push(Catchment {
            feature: index,
            school_id,
            area,
        });
        Ok(())
    })?;
    Ok(out)
}
