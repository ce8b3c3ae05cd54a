//! Exports: tables as CSV, layers as GeoJSON, the summary as JSON. Each is a plain function
//! of the [`AuditOutput`](crate::pipeline::AuditOutput); writing files is the caller's job.

#[cfg(not(target_arch = "wasm32"))]
pub mod atomic;
pub mod catchments_csv;
pub mod csv_safe;
pub mod csvw;
pub mod feature_lines;
pub mod flows;
pub mod geometry;
pub mod homes_csv;
pub mod hotspots;
pub mod layers_geojson;
pub mod map_tiles;
pub mod summary;

pub use catchments_csv::{catchments_csv, plan_csv, plan_json};
pub use homes_csv::homes_csv;
pub use hotspots::{hotspots_csv, hotspots_geojson, write_hotspots_geojson};
pub use layers_geojson::{
    centrelines_geojson, qa_geojson, routes_geojson, routes_geojson_of, write_centrelines_geojson,
    write_routes_geojson,
};
pub use summary::{network_summary, summary_json};

/// Rounds metres (and other figures) for output: two decimals is centimetres.
pub(crate) fn round2(x: f64) -> f64 {
    (x * 100.0).round() / 100.0
}

/// `left`, `right` or `path`: which walkable edge a home or entrance is attached to.
pub(crate) fn edge_side(kind: &crate::network::PedEdgeKind) -> &'static str {
    use crate::network::{PedEdgeKind, Side};
    match kind {
        PedEdgeKind::Side {
            side: Side::Left, ..
        } => "left",
        PedEdgeKind::Side {
            side: Side::Right, ..
        } => "right",
        PedEdgeKind::Path { .. } => "path",
        PedEdgeKind::Crossing { .. } => "crossing",
    }
}
