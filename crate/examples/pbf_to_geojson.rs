//! Writes an `.osm.pbf` as the GeoJSON the core reads it as (for comparing with `osmium export`).
fn main() {
    let path = std::env::args().nth(1).unwrap_or_default();
    let bytes = std::fs::read(&path).unwrap_or_default();
    match catchwalk::input::pbf::read_pbf(&bytes, catchwalk::error::LayerName::Streets) {
        Ok(t) => println!("{t}"),
        Err(e) => eprintln!("{e}"),
    }
}
