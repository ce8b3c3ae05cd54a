//! Homes as CSV: one row per home with longitude/latitude columns, read row by row.

use super::fields::LayerFields;
use super::geojson_read::check_lonlat;
use super::model::Home;
use super::presets::plain;
use super::warnings::{Ctx, Warnings};
use crate::error::{Error, LayerName, Location, Result};

/// Column-name pairs taken as longitude/latitude, in order of preference (case-insensitive).
pub const LONLAT_COLUMNS: &[(&str, &str)] = &[
    ("lon", "lat"),
    ("lng", "lat"),
    ("long", "lat"),
    ("longitude", "latitude"),
    ("x", "y"),
];

fn find(header: &[String], name: &str) -> Option<usize> {
    header
        .iter()
        .position(|h| h.trim().eq_ignore_ascii_case(name))
}

fn lonlat_columns(header: &[String], fields: &LayerFields) -> Result<(usize, usize)> {
    let (lon, lat) = (fields.get("lon"), fields.get("lat"));
    if let (Some(a), Some(b)) = (lon.from.first(), lat.from.first()) {
        return match (find(header, a), find(header, b)) {
            (Some(i), Some(j)) => Ok((i, j)),
            _ => Err(Error::input(
                Location::layer(LayerName::Homes),
                format!(
                    "the mapping names columns '{a}' and '{b}', but the CSV header has {}",
                    header.join(", ")
                ),
            )),
        };
    }
    LONLAT_COLUMNS
        .iter()
        .find_map(|(a, b)| Some((find(header, a)?, find(header, b)?)))
        .ok_or_else(|| {
            Error::input(
                Location::layer(LayerName::Homes),
                format!(
                    "no longitude/latitude columns in the CSV header ({}); name them lon and lat \
                     (or lng, longitude/latitude, x/y), in WGS84 degrees",
                    header.join(", ")
                ),
            )
        })
}

/// Reads homes from CSV text (`,` or, when the header has no comma, `;` between fields).
/// Whether homes text is GeoJSON or CSV, from its content (a CSV named `.txt`, a GeoJSON
/// named `.json`): GeoJSON starts with `{`.
///
/// ```
/// use catchwalk::input::{homes_csv::sniff_format, HomesFormat};
/// assert_eq!(sniff_format("\u{feff} {\"type\":\"FeatureCollection\"}"), HomesFormat::GeoJson);
/// assert_eq!(sniff_format("id,lon,lat\n"), HomesFormat::Csv);
/// ```
pub fn sniff_format(text: &str) -> super::HomesFormat {
    match text
        .trim_start_matches('\u{feff}')
        .trim_start()
        .chars()
        .next()
    {
        Some('{') | Some('[') => super::HomesFormat::GeoJson,
        _ => super::HomesFormat::Csv,
    }
}

/// Row `i` after the header is feature `i`. Other columns go through the homes fields
/// (`id`, `children`, `school`).
///
/// ```
/// use catchwalk::input::{homes_csv::read_homes_csv, fields::{LayerFields, HOMES}};
/// use catchwalk::input::warnings::Warnings;
/// let mut w = Warnings::default();
/// let homes = read_homes_csv("id,Lat,Lon\nh1,42.0,-35.0\n", &LayerFields::plain(HOMES), &mut w).unwrap();
/// assert_eq!(homes[0].at, [-35.0, 42.0]);
/// ```
pub fn read_homes_csv(text: &str, fields: &LayerFields, w: &mut Warnings) -> Result<Vec<Home>> {
    read_homes_csv_in(text, fields, None, w)
}

/// As [`read_homes_csv`], with the x/y columns in the coordinate system `crs` (reprojected
/// to WGS84) instead of longitude/latitude.
pub fn read_homes_csv_in(
    text: &str,
    fields: &LayerFields,
    crs: Option<&super::crs::ToWgs84>,
    w: &mut Warnings,
) -> Result<Vec<Home>> {
    let text = text.trim_start_matches('\u{feff}');
    if text.trim().is_empty() {
        return Err(Error::input(
            Location::layer(LayerName::Homes),
            "the homes CSV is empty (no header, no rows); export the homes again: a header row with lon and lat columns, then one row per home",
        ));
    }
    let first = text.lines().next().unwrap_or("");
    let delimiter = if !first.contains(',') && first.contains(';') {
        b';'
    } else {
        b','
    };
    let mut rdr = csv::ReaderBuilder::new()
        .delimiter(delimiter)
        .flexible(true)
        .from_reader(text.as_bytes());
    let bad_csv = |e: csv::Error| Error::Parse {
        layer: LayerName::Homes,
        message: format!("{e}; save the homes as CSV with a header row"),
    };
    let header: Vec<String> = rdr
        .headers()
        .map_err(bad_csv)?
        .iter()
        .map(str::to_string)
        .collect();
    let (ilon, ilat) = lonlat_columns(&header, fields)?;
    let mut out = Vec::new();
    let mut record = csv::StringRecord::new();
    let mut index = 0usize;
    while rdr.read_record(&mut record).map_err(bad_csv)? {
        if record.iter().all(|c| c.trim().is_empty()) {
            index += 1;
            continue;
        }
        let props: serde_json::Map<String, serde_json::Value> = header
            .iter()
            .zip(record.iter())
            .map(|(h, v)| {
                (
                    h.trim().to_string(),
                    serde_json::Value::String(v.to_string()),
                )
            })
            .collect();
        let id = plain::feature_id(&props, None, fields);
        let ctx = Ctx {
            layer: LayerName::Homes,
            index,
            id,
        };
        let line = record.position().map_or(index as u64 + 2, |p| p.line());
        let number = |i: usize| -> Result<f64> {
            let name = header.get(i).map_or("", |s| s.as_str());
            let cell = record.get(i).unwrap_or("").trim();
            cell.parse::<f64>().map_err(|_| {
                Error::input(
                    ctx.at_prop(name),
                    format!(
                        "'{cell}' where a coordinate belongs (feature {index} is row {index} after the header, line {line} of the file); give decimal degrees"
                    ),
                )
            })
        };
        let (x, y) = (number(ilon)?, number(ilat)?);
        let (x, y) = match crs {
            Some(t) => {
                let [lon, lat] = t.lonlat(x, y).map_err(|m| Error::input(ctx.at(), m))?;
                (lon, lat)
            }
            None => (x, y),
        };
        let at = check_lonlat(x, y, &|| ctx.at())?;
        out.push(plain::home(&ctx, at, &props, fields, w));
        index += 1;
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::input::fields::{Field, HOMES};

    fn plain() -> LayerFields {
        LayerFields::plain(HOMES)
    }

    #[test]
    fn reads_each_column_spelling() {
        for (a, b) in LONLAT_COLUMNS {
            let text = format!("{},{},children\n10.5,20.25,2\n", a.to_uppercase(), b);
            let mut w = Warnings::default();
            let homes = read_homes_csv(&text, &plain(), &mut w).unwrap_or_default();
            assert_eq!(homes.len(), 1, "{a}/{b}");
            assert_eq!(homes[0].at, [10.5, 20.25]);
            assert_eq!(homes[0].children, 2);
            assert_eq!(homes[0].id, "0");
        }
    }

    #[test]
    fn semicolons_ids_schools_and_bad_children() {
        let text = "\u{feff}id;lat;lng;school;children\na;1;2;s1;0\nb;1.5;2.5;;3\n";
        let mut w = Warnings::default();
        let homes = read_homes_csv(text, &plain(), &mut w).unwrap_or_default();
        assert_eq!(homes.len(), 2);
        assert_eq!(
            (homes[0].id.as_str(), homes[0].at, homes[0].children),
            ("a", [2.0, 1.0], 1)
        );
        assert_eq!(homes[0].school.as_deref(), Some("s1"));
        assert_eq!(homes[1].school, None);
        let w = w.finish();
        assert_eq!(w.len(), 1);
        assert_eq!(w[0].at.feature, Some(0));
        assert_eq!(w[0].at.property.as_deref(), Some("children"));
    }

    #[test]
    fn errors_name_the_row() {
        let mut w = Warnings::default();
        let r = read_homes_csv("id,lon,lat\nh7,abc,1\n", &plain(), &mut w);
        assert!(
            matches!(&r, Err(Error::Input { at, .. }) if at.id.as_deref() == Some("h7") && at.property.as_deref() == Some("lon"))
        );
        let r = read_homes_csv("id,x,y\nh8,300000,5000000\n", &plain(), &mut w);
        assert!(matches!(&r, Err(Error::Projected { at, .. }) if at.feature == Some(0)));
        let r = read_homes_csv("id,east,north\nh8,1,2\n", &plain(), &mut w);
        assert!(matches!(r, Err(Error::Input { .. })));
    }

    #[test]
    fn mapped_columns() {
        let mut f = plain();
        f.set("lon", Field::named(&["E"]));
        f.set("lat", Field::named(&["N"]));
        f.set("children", Field::named(&["KIDS"]));
        let mut w = Warnings::default();
        let homes = read_homes_csv("E,N,KIDS\n3,4,2\n", &f, &mut w).unwrap_or_default();
        assert_eq!(
            homes.first().map(|h| (h.at, h.children)),
            Some(([3.0, 4.0], 2))
        );
    }
}
