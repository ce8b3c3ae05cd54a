//! `hotspots.geojson` and `hotspots.csv`: crossings and sides ranked by children x risk.
//! Edges, not homes: safe to share.

use super::csv_safe::rows_text;
use super::feature_lines::write_feature_lines;
use super::geometry::edge_line;
use super::round2;
use crate::pipeline::AuditOutput;
use serde::Serialize;

/// One hotspot's properties, keys in the order the former `json!` map wrote them
/// (alphabetical), so the file is unchanged byte for byte.
#[derive(Debug, Serialize)]
pub struct HotspotProps<'a> {
    children: f64,
    class: &'static str,
    control: &'a str,
    crashes: u32,
    crashes_ksi: u32,
    crashes_pedestrian: u32,
    edge: u32,
    kind: &'static str,
    lanes: u32,
    los: Option<&'static str>,
    product: f64,
    rank: usize,
    risk: f64,
    speed_kmh: f64,
    street: &'a str,
    street_id: &'a str,
    wait_s: Option<f64>,
}

#[derive(Debug, Serialize)]
pub struct HotspotFeature<'a> {
    geometry: HotspotLine,
    properties: HotspotProps<'a>,
    #[serde(rename = "type")]
    kind: &'static str,
}

impl HotspotFeature<'_> {
    /// Children x risk as the feature carries it (rounded to four decimals).
    pub fn product(&self) -> f64 {
        self.properties.product
    }
    /// The crossing's or side's line.
    pub fn line(&self) -> &[crate::input::LonLat] {
        &self.geometry.coordinates
    }
}

#[derive(Debug, Serialize)]
pub struct HotspotLine {
    coordinates: Vec<crate::input::LonLat>,
    #[serde(rename = "type")]
    kind: &'static str,
}

/// The hotspots layer: typed features serialised straight to text (a district has hundreds
/// of thousands; a `Value` per coordinate took seconds).
#[derive(Debug, Serialize)]
pub struct HotspotCollection<'a> {
    caution: &'static str,
    features: Vec<HotspotFeature<'a>>,
    #[serde(rename = "type")]
    kind: &'static str,
}

/// Hotspot `i` (in rank order) as a LineString (the crossing or the side) with its figures;
/// `None` past the last or for an edge the network does not have.
pub fn hotspot_feature(out: &AuditOutput, i: usize) -> Option<HotspotFeature<'_>> {
    let g = &out.network.graph;
    let h = out.scores.hotspots.get(i)?;
    if h.edge as usize >= g.edges.len() {
        return None;
    }
    Some(HotspotFeature {
        geometry: HotspotLine {
            coordinates: edge_line(g, h.edge),
            kind: "LineString",
        },
        properties: HotspotProps {
            children: h.children,
            class: h.class,
            control: &h.control,
            crashes: h.crashes,
            crashes_ksi: h.crashes_ksi,
            crashes_pedestrian: h.crashes_pedestrian,
            edge: h.edge,
            kind: h.kind,
            lanes: h.lanes,
            los: h.los.map(|l| l.as_str()),
            product: (h.product * 1e4).round() / 1e4,
            rank: h.rank,
            risk: (h.risk * 1e4).round() / 1e4,
            speed_kmh: h.speed_kmh,
            street: &h.street,
            street_id: &h.street_id,
            wait_s: h.wait_s.map(round2),
        },
        kind: "Feature",
    })
}

/// Every hotspot as [`hotspot_feature`], in one collection (the page's audit document).
pub fn hotspots_geojson(out: &AuditOutput) -> HotspotCollection<'_> {
    HotspotCollection {
        caution: crate::CAUTION,
        features: (0..out.scores.hotspots.len())
            .filter_map(|i| hotspot_feature(out, i))
            .collect(),
        kind: "FeatureCollection",
    }
}

/// `hotspots.geojson`: the features of [`hotspots_geojson`], one per line, streaming.
pub fn write_hotspots_geojson(
    out: &AuditOutput,
    w: &mut dyn std::io::Write,
) -> std::io::Result<()> {
    write_feature_lines(w, out.scores.hotspots.len(), |i| hotspot_feature(out, i))
}

/// Hotspots as CSV, ranked.
pub fn hotspots_csv(out: &AuditOutput) -> String {
    let header = [
        "rank",
        "edge",
        "kind",
        "street_id",
        "street",
        "class",
        "control",
        "speed_kmh",
        "lanes",
        "children",
        "risk",
        "product",
        "wait_s",
        "los",
        "crashes",
        "crashes_pedestrian",
        "crashes_ksi",
    ]
    .map(String::from);
    let hot = &out.scores.hotspots;
    rows_text(&header, hot.len(), |i| {
        let h = &hot[i];
        vec![
            h.rank.to_string(),
            h.edge.to_string(),
            h.kind.to_string(),
            h.street_id.clone(),
            h.street.clone(),
            h.class.to_string(),
            h.control.clone(),
            h.speed_kmh.to_string(),
            h.lanes.to_string(),
            h.children.to_string(),
            format!("{:.4}", h.risk),
            format!("{:.4}", h.product),
            h.wait_s.map(|x| round2(x).to_string()).unwrap_or_default(),
            h.los.map(|l| l.as_str().to_string()).unwrap_or_default(),
            h.crashes.to_string(),
            h.crashes_pedestrian.to_string(),
            h.crashes_ksi.to_string(),
        ]
    })
}
