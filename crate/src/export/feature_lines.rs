//! The large GeoJSON outputs (flows, centrelines, hotspots, routes) as one FeatureCollection
//! with one compact feature per line: a third to a half the bytes of indented JSON, still
//! readable line by line, and built in blocks on every core natively.

use serde::Serialize;
use std::io::{self, Write};

/// Items per block: a few MB in memory at a time, not the whole file.
const BLOCK: usize = 2048;
/// Blocks built at once before they are written.
const BLOCKS_AT_ONCE: usize = 16;

/// Writes a FeatureCollection carrying the screening caution whose features are those `of(i)`
/// gives for `i` in `0..n` (none, one or several each), one per line, in that order. Blocks are
/// built side by side natively and joined in order, so the bytes do not depend on the thread
/// count.
///
/// ```
/// use catchwalk::export::feature_lines::write_feature_lines;
/// let mut out = Vec::new();
/// write_feature_lines(&mut out, 3, |i| (i != 1).then(|| serde_json::json!({ "n": i }))).unwrap();
/// let text = String::from_utf8(out).unwrap();
/// assert!(text.ends_with("[\n{\"n\":0},\n{\"n\":2}\n]}\n"));
/// let v: serde_json::Value = serde_json::from_str(&text).unwrap();
/// assert_eq!(v["features"].as_array().unwrap().len(), 2);
/// ```
pub fn write_feature_lines<I, F>(w: &mut dyn Write, n: usize, of: F) -> io::Result<()>
where
    F: Fn(usize) -> I + Sync,
    I: IntoIterator,
    I::Item: Serialize,
{
    write!(
        w,
        "{{\"type\":\"FeatureCollection\",\"caution\":{},\"features\":[",
        serde_json::to_string(crate::CAUTION)?
    )?;
    let block = |range: std::ops::Range<usize>| -> io::Result<Vec<u8>> {
        let mut buf = Vec::new();
        for i in range {
            for feature in of(i) {
                buf.extend_from_slice(b",\n");
                serde_json::to_writer(&mut buf, &feature)?;
            }
        }
        Ok(buf)
    };
    let mut first = true;
    let mut start = 0;
    while start < n {
        let end = n.min(start + BLOCK * BLOCKS_AT_ONCE);
        let ranges: Vec<std::ops::Range<usize>> = (start..end)
            .step_by(BLOCK)
            .map(|a| a..end.min(a + BLOCK))
            .collect();
        let parts = crate::cores::map(&ranges, |r| block(r.clone()));
        for p in parts {
            let p = p?;
            // Each feature starts ",\n"; the first of the file starts "\n".
            let body = match (first, p.first()) {
                (true, Some(_)) => p.get(1..).unwrap_or(&[]),
                _ => &p[..],
            };
            first &= p.is_empty();
            w.write_all(body)?;
        }
        start = end;
    }
    w.write_all(b"\n]}\n")
}

#[cfg(test)]
mod tests {
    use super::*;

    fn written(n: usize, of: impl Fn(usize) -> Vec<usize> + Sync) -> serde_json::Value {
        let mut out = Vec::new();
        write_feature_lines(&mut out, n, of).unwrap();
        serde_json::from_slice(&out).unwrap()
    }

    #[test]
    fn every_feature_is_written_once_in_order_across_blocks() {
        // Past two windows of blocks, some items giving none and some two features.
        let n = BLOCK * BLOCKS_AT_ONCE * 2 + 17;
        let v = written(n, |i| match i % 3 {
            0 => vec![],
            1 => vec![i],
            _ => vec![i, i],
        });
        let got: Vec<u64> = v["features"]
            .as_array()
            .unwrap()
            .iter()
            .map(|f| f.as_u64().unwrap())
            .collect();
        let want: Vec<u64> = (0..n as u64)
            .flat_map(|i| std::iter::repeat_n(i, (i % 3) as usize))
            .collect();
        assert_eq!(got, want);
        assert_eq!(v["caution"], crate::CAUTION);
        assert_eq!(v["type"], "FeatureCollection");
    }

    #[test]
    fn no_features_is_an_empty_collection() {
        assert_eq!(written(0, |_| vec![]), written(5, |_| vec![]));
        assert_eq!(written(0, |_| vec![])["features"], serde_json::json!([]));
    }

    #[test]
    fn one_feature_per_line() {
        let mut out = Vec::new();
        write_feature_lines(&mut out, 3, |i| Some(serde_json::json!({ "a": [i, i] }))).unwrap();
        let text = String::from_utf8(out).unwrap();
        let lines: Vec<&str> = text.lines().collect();
        assert_eq!(lines.len(), 5, "{text}");
        assert_eq!(lines[1], "{\"a\":[0,0]},");
        assert_eq!(lines[3], "{\"a\":[2,2]}");
    }
}
