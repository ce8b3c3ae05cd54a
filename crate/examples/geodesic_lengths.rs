//! Reads `lon lat lon lat` lines on stdin and prints the geodesic distance in metres, one a
//! line, with `catchwalk::geodesy::distance_m`. The reference check
//! `tests/reference/test_geodesic.py` compares these figures with GeographicLib.
//!
//! `echo "0 0 0 1" | cargo run --release --example geodesic_lengths`

use std::io::{BufRead, Write};

fn main() {
    let stdin = std::io::stdin();
    let mut out = std::io::stdout().lock();
    for (n, line) in stdin.lock().lines().enumerate() {
        let Ok(line) = line else { break };
        let v: Vec<f64> = line
            .split_whitespace()
            .filter_map(|t| t.parse().ok())
            .collect();
        let text = match v[..] {
            [lon1, lat1, lon2, lat2] => {
                let d = catchwalk::geodesy::distance_m([lon1, lat1], [lon2, lat2]);
                let len = catchwalk::geodesy::line_length_m(&[[lon1, lat1], [lon2, lat2]]);
                format!("{d:.9} {len:.9}")
            }
            _ => format!("error: line {} is not four numbers", n + 1),
        };
        if writeln!(out, "{text}").is_err() {
            break;
        }
    }
}
