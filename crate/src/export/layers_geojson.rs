//! GeoJSON exports: routes, network QA, and the noded centrelines (for checks and the map).

use super::feature_lines::write_feature_lines;
use super::geometry::route_line;
use super::round2;
use crate::input::LonLat;
use crate::network::crossing_width_m;
use crate::network::qa::Qa;
use crate::pipeline::{AuditOutput, AuditedRoute};
use serde::Serialize;
use serde_json::{json, Value};
use std::collections::BTreeMap;
use std::io::{self, Write};

fn collection(features: Vec<Value>) -> Value {
    json!({ "type": "FeatureCollection", "caution": crate::CAUTION, "features": features })
}

/// A GeoJSON FeatureCollection of typed features: serialised straight to text, without an
/// intermediate `Value` per coordinate (a district has millions of route points).
#[derive(Debug, Serialize)]
pub struct Collection<P> {
    #[serde(rename = "type")]
    kind: &'static str,
    caution: &'static str,
    pub features: Vec<Feature<P>>,
}

/// A LineString feature with typed properties.
#[derive(Debug, Serialize)]
pub struct Feature<P> {
    #[serde(rename = "type")]
    kind: &'static str,
    pub geometry: LineString,
    pub properties: P,
}

#[derive(Debug, Serialize)]
pub struct LineString {
    #[serde(rename = "type")]
    kind: &'static str,
    pub coordinates: Vec<LonLat>,
}

fn feature<P>(coordinates: Vec<LonLat>, properties: P) -> Feature<P> {
    Feature {
        kind: "Feature",
        geometry: LineString {
            kind: "LineString",
            coordinates,
        },
        properties,
    }
}

fn typed_collection<P>(features: Vec<Feature<P>>) -> Collection<P> {
    Collection {
        kind: "FeatureCollection",
        caution: crate::CAUTION,
        features,
    }
}

/// The figures of one route, as `routes.geojson` carries them.
#[derive(Debug, Serialize)]
pub struct RouteProps<'a> {
    pub home_id: &'a str,
    pub school_id: Option<&'a str>,
    pub children: u32,
    pub kind: &'static str,
    pub network_m: f64,
    pub walked_m: f64,
    pub walking_time_min: f64,
    pub crossings: usize,
    pub crossings_by_device: BTreeMap<&'static str, u32>,
    pub uncontrolled_crossings: u32,
    pub arterial_crossings: u32,
    pub arterial_exposure_m: f64,
    pub along_le30_m: f64,
    pub along_31_50_m: f64,
    pub along_gt50_m: f64,
    pub no_sidewalk_m: f64,
    pub risk: f64,
    pub over_detour_cap: bool,
    /// The home's verdict, on its recommended route only.
    #[serde(flatten, skip_serializing_if = "Option::is_none")]
    pub verdict: Option<RouteVerdict<'a>>,
}

/// The safe-route verdict carried by a recommended route.
#[derive(Debug, Serialize)]
pub struct RouteVerdict<'a> {
    pub safe_route: bool,
    pub safe_network_m: Option<f64>,
    pub unsafe_reason: &'a str,
    pub hazardous: bool,
    pub hazard_reason: &'a str,
    /// What a site visit must settle (rules that need a fact the layers lack).
    pub site_checks: &'a [String],
}

/// A LineString with coordinates rounded to 7 decimals (about 1 cm): routes are drawings,
/// and full precision would double the size of a district's routes file.
fn drawn(coords: Vec<LonLat>) -> Vec<LonLat> {
    let r = |x: f64| (x * 1e7).round() / 1e7;
    coords.into_iter().map(|p| [r(p[0]), r(p[1])]).collect()
}

fn route_feature<'a>(
    out: &'a AuditOutput,
    home: usize,
    r: &AuditedRoute,
    over_cap: bool,
) -> Feature<RouteProps<'a>> {
    let h = &out.homes[home];
    let a = &r.audit;
    let verdict = match (r.kind, out.scores.homes.get(home)) {
        (crate::route::RouteKind::Recommended, Some(sc)) => Some(RouteVerdict {
            safe_route: sc.safe_route,
            safe_network_m: sc.safe_network_m.map(round2),
            unsafe_reason: &sc.unsafe_reason,
            hazardous: sc.hazardous,
            hazard_reason: &sc.hazard_reason,
            site_checks: &sc.site_checks,
        }),
        _ => None,
    };
    let props = RouteProps {
        home_id: &out.layers.homes[home].id,
        school_id: h
            .assignment
            .school
            .and_then(|s| out.layers.schools.get(s))
            .map(|s| s.id.as_str()),
        children: out.layers.homes[home].children,
        kind: r.kind.as_str(),
        network_m: round2(a.network_m),
        walked_m: round2(a.walked_m),
        walking_time_min: round2(a.walked_m / out.config.benefit.walking_speed_mps / 60.0),
        crossings: a.crossings.len(),
        crossings_by_device: a.crossings_by_device(),
        uncontrolled_crossings: a.uncontrolled_crossings,
        arterial_crossings: a.arterial_crossings,
        arterial_exposure_m: round2(a.arterial_exposure_m),
        along_le30_m: round2(a.along_le30_m),
        along_31_50_m: round2(a.along_31_50_m),
        along_gt50_m: round2(a.along_gt50_m),
        no_sidewalk_m: round2(a.no_sidewalk_m),
        risk: (r.risk * 1e4).round() / 1e4,
        over_detour_cap: over_cap,
        verdict,
    };
    feature(drawn(route_line(&out.network.graph, &r.route.steps)), props)
}

/// One LineString per home and route kind (shortest, recommended, and the safe route where
/// one exists), with the route's figures. Personal data: homes are individual here, so this
/// export stays on the planner's machine.
pub fn routes_geojson(out: &AuditOutput) -> Collection<RouteProps<'_>> {
    routes_geojson_of(out, |_| true, |_| true)
}

/// The routes of the homes `home` keeps (by index), of the kinds `kind` keeps, in the order
/// of [`routes_geojson`]: the page asks its worker for one home's or one catchment's routes.
pub fn routes_geojson_of(
    out: &AuditOutput,
    home: impl Fn(usize) -> bool,
    kind: impl Fn(crate::route::RouteKind) -> bool,
) -> Collection<RouteProps<'_>> {
    let mut features = Vec::new();
    for (i, h) in out.homes.iter().enumerate().filter(|(i, _)| home(*i)) {
        let three = [
            (&h.shortest, false),
            (&h.recommended, h.over_detour_cap),
            (&h.safe, false),
        ];
        for (r, over_cap) in three {
            if let Some(r) = r.as_ref().filter(|r| kind(r.kind)) {
                features.push(route_feature(out, i, r, over_cap));
            }
        }
    }
    typed_collection(features)
}

/// `routes.geojson`: the features of [`routes_geojson`], one per line, streaming (a
/// district's routes never sit whole in memory).
pub fn write_routes_geojson(out: &AuditOutput, w: &mut dyn Write) -> io::Result<()> {
    write_feature_lines(w, out.homes.len(), |i| {
        let Some(h) = out.homes.get(i) else {
            return Vec::new();
        };
        [
            (&h.shortest, false),
            (&h.recommended, h.over_detour_cap),
            (&h.safe, false),
        ]
        .into_iter()
        .filter_map(|(r, over_cap)| r.as_ref().map(|r| route_feature(out, i, r, over_cap)))
        .collect::<Vec<_>>()
    })
}

/// Network QA findings as points.
pub fn qa_geojson(qa: &Qa) -> Value {
    let features = qa
        .items
        .iter()
        .map(|q| {
            json!({
                "type": "Feature",
                "geometry": { "type": "Point", "coordinates": q.at },
                "properties": { "kind": q.kind, "feature": q.feature, "message": q.message },
            })
        })
        .collect();
    collection(features)
}

/// One centreline segment's properties in `centrelines.geojson`.
#[derive(Debug, Serialize)]
pub struct SegmentProps<'a> {
    pub segment: usize,
    pub from: u32,
    pub to: u32,
    pub length_m: f64,
    pub street_id: &'a str,
    pub class: &'static str,
    pub speed_kmh: f64,
    pub lanes: u32,
    pub layer: i32,
    pub crossing_width_m: f64,
}

/// The noded centreline graph: one LineString per segment with its end junctions and
/// geodesic length, so an outside graph library can recompute shortest paths.
pub fn centrelines_geojson(out: &AuditOutput) -> Collection<SegmentProps<'_>> {
    let features = (0..out.network.graph.segments.len())
        .filter_map(|i| centreline_feature(out, i))
        .collect();
    typed_collection(features)
}

/// `centrelines.geojson`: the features of [`centrelines_geojson`], one per line, streaming.
pub fn write_centrelines_geojson(out: &AuditOutput, w: &mut dyn Write) -> io::Result<()> {
    write_feature_lines(w, out.network.graph.segments.len(), |i| {
        centreline_feature(out, i)
    })
}

/// Segment `i` of the noded centrelines as its feature in [`centrelines_geojson`] (`None` past
/// the last segment): the page asks the worker for the one segment a click landed on.
pub fn centreline_feature(out: &AuditOutput, i: usize) -> Option<Feature<SegmentProps<'_>>> {
    let s = out.network.graph.segments.get(i)?;
    let st = out.layers.streets.get(s.street)?;
    Some(feature(
        s.line.clone(),
        SegmentProps {
            segment: i,
            from: s.from,
            to: s.to,
            length_m: s.length_m,
            street_id: &st.id,
            class: st.class.as_str(),
            speed_kmh: st.speed_kmh,
            lanes: st.lanes,
            layer: st.layer,
            crossing_width_m: crossing_width_m(&out.config.network, st),
        },
    ))
}

/// The west, south, east and north bounds of the noded centrelines in degrees (`None` for no
/// segments): what the page fits the map to without holding every segment.
pub fn centrelines_bounds(out: &AuditOutput) -> Option<[f64; 4]> {
    out.network
        .graph
        .segments
        .iter()
        .filter_map(|s| super::geometry::line_bounds(&s.line))
        .map(|(lo, hi)| [lo[0], lo[1], hi[0], hi[1]])
        .reduce(|b, c| {
            [
                b[0].min(c[0]),
                b[1].min(c[1]),
                b[2].max(c[2]),
                b[3].max(c[3]),
            ]
        })
}

/// A street's name, to label it on the map and find it by.
#[derive(Debug, Serialize)]
pub struct NameProps<'a> {
    pub name: &'a str,
}

/// Every named street (each part of a MultiLineString) as drawn in the streets layer, with its
/// name as the streets layer gives it (after the preset or mapping file, trimmed).
pub fn street_names_geojson(out: &AuditOutput) -> Collection<NameProps<'_>> {
    let features = out
        .layers
        .streets
        .iter()
        .filter_map(|st| {
            let name = st
                .name
                .as_deref()
                .map(str::trim)
                .filter(|n| !n.is_empty())?;
            Some(feature(st.line.clone(), NameProps { name }))
        })
        .collect();
    typed_collection(features)
}
