//! Measures reading a large streets layer. `gen PATH MB` writes an invented grid of streets
//! (plain preset) of about MB megabytes; `read PATH` reads it with `read_layers` and prints
//! the counts; `whole PATH` parses it into one `geojson::FeatureCollection`, for comparison. Run under `/usr/bin/time -v` to see the peak memory.

use catchwalk::input::{read_layers, RawLayers};
use std::io::Write;

fn generate(path: &str, mb: usize) -> std::io::Result<()> {
    let mut out = std::io::BufWriter::new(std::fs::File::create(path)?);
    write!(out, r#"{{"type":"FeatureCollection","features":["#)?;
    let (mut written, mut i) = (0usize, 0usize);
    let classes = ["local", "collector", "arterial", "service", "path"];
    while written < mb * 1_000_000 {
        let (x, y) = ((i % 1000) as f64 * 0.0005, (i / 1000) as f64 * 0.0005);
        let mut coords = String::new();
        for k in 0..8 {
            let sep = if k == 0 { "" } else { "," };
            coords.push_str(&format!(
                "{sep}[{:.7},{:.7}]",
                x + k as f64 * 0.0000625,
                y + (k % 2) as f64 * 0.00001
            ));
        }
        let f = format!(
            r#"{}{{"type":"Feature","geometry":{{"type":"LineString","coordinates":[{coords}]}},"properties":{{"id":"s{i}","name":"Street {i}","class":"{}","speed_kmh":{},"lanes":2,"sidewalk":"both","oneway":"no"}}}}"#,
            if i == 0 { "" } else { "," },
            classes[i % classes.len()],
            30 + (i % 4) * 10
        );
        written += f.len();
        out.write_all(f.as_bytes())?;
        i += 1;
    }
    write!(out, "]}}")?;
    println!("wrote {i} features, {written} bytes");
    Ok(())
}

fn read(path: &str) -> Result<(), Box<dyn std::error::Error>> {
    let raw = RawLayers {
        streets: std::fs::read_to_string(path)?,
        schools: r#"{"type":"FeatureCollection","features":[{"type":"Feature","geometry":{"type":"Point","coordinates":[0.1,0.1]},"properties":{"id":"A"}}]}"#.into(),
        homes: r#"{"type":"FeatureCollection","features":[{"type":"Feature","geometry":{"type":"Point","coordinates":[0.1,0.1]},"properties":{}}]}"#.into(),
        ..RawLayers::default()
    };
    let t = std::time::Instant::now();
    let (layers, warnings) = read_layers(&raw)?;
    println!(
        "read {} streets, {} warnings in {:.2} s from {} bytes",
        layers.streets.len(),
        warnings.len(),
        t.elapsed().as_secs_f64(),
        raw.streets.len()
    );
    Ok(())
}

fn main() -> Result<(), Box<dyn std::error::Error>> {
    let args: Vec<String> = std::env::args().collect();
    match args.get(1..).unwrap_or(&[]) {
        [cmd, path, mb] if cmd == "gen" => generate(path, mb.parse()?)?,
        [cmd, path] if cmd == "read" => read(path)?,
        // For comparison: the whole layer as one geojson::FeatureCollection in memory.
        [cmd, path] if cmd == "whole" => {
            let text = std::fs::read_to_string(path)?;
            let fc: geojson::FeatureCollection = text.parse()?;
            println!("parsed {} features whole", fc.features.len());
        }
        _ => eprintln!("usage: read_big_layer gen PATH MB | read PATH | whole PATH"),
    }
    Ok(())
}
