//! Layers as planners have them: OpenStreetMap streets with the district's own school list,
//! zipped and bare Shapefiles in a projected coordinate system, GeoJSON with a `crs` member,
//! and a layer's coordinate system given by the user.

use catchwalk::error::{Error, LayerName};
use catchwalk::input::per_layer::{parse_crs, parse_names, LayerFile, PerLayer};
use catchwalk::input::{read_layers, Preset, RawLayers};
use std::io::{Cursor, Write};

fn fc(features: &[String]) -> String {
    format!(
        r#"{{"type":"FeatureCollection","features":[{}]}}"#,
        features.join(",")
    )
}
fn feat(geometry: String, props: &str) -> String {
    format!(r#"{{"type":"Feature","geometry":{geometry},"properties":{props}}}"#)
}
fn line(a: [f64; 2], b: [f64; 2]) -> String {
    format!(
        r#"{{"type":"LineString","coordinates":[[{},{}],[{},{}]]}}"#,
        a[0], a[1], b[0], b[1]
    )
}
fn point(p: [f64; 2]) -> String {
    format!(r#"{{"type":"Point","coordinates":[{},{}]}}"#, p[0], p[1])
}

/// OpenStreetMap streets (tags as osmium export writes them) and a district's own schools and
/// homes with catchwalk's plain names.
fn osm_streets_own_schools() -> RawLayers {
    RawLayers {
        streets: fc(&[
            feat(
                line([-35.0, 42.0], [-34.99, 42.0]),
                r#"{"@id":"w1","highway":"residential"}"#,
            ),
            feat(
                line([-34.995, 42.0], [-34.995, 42.005]),
                r#"{"@id":"w2","highway":"footway"}"#,
            ),
        ]),
        schools: fc(&[feat(
            point([-34.995, 42.0005]),
            r#"{"id":"S1","name":"Harbour School"}"#,
        )]),
        homes: fc(&[feat(
            point([-34.998, 41.9995]),
            r#"{"id":"h1","children":2}"#,
        )]),
        ..RawLayers::default()
    }
}

#[test]
fn osm_streets_with_the_districts_own_school_list_read_with_either_preset() {
    for preset in [Preset::Plain, Preset::Osm] {
        let mut raw = osm_streets_own_schools();
        raw.preset = preset;
        let (layers, warnings) = match read_layers(&raw) {
            Ok(x) => x,
            Err(e) => panic!("{preset:?}: {e}"),
        };
        assert_eq!(layers.streets.len(), 2);
        assert_eq!(layers.schools[0].id, "S1");
        assert_eq!(layers.schools[0].name, "Harbour School");
        // The layer that detection read otherwise than the preset is named in a warning.
        let noted = warnings
            .iter()
            .filter(|w| w.message.contains("as its properties show"));
        let layers_noted: Vec<LayerName> = noted.map(|w| w.at.layer).collect();
        let expect = match preset {
            Preset::Plain => vec![LayerName::Streets],
            Preset::Osm => vec![LayerName::Schools],
        };
        assert_eq!(layers_noted, expect, "{warnings:?}");
    }
}

#[test]
fn a_layers_names_can_be_chosen_and_a_failure_says_what_was_skipped() {
    let mut raw = osm_streets_own_schools();
    raw.per_layer.names = parse_names("schools=osm").unwrap_or_default();
    match read_layers(&raw) {
        Err(Error::Input { at, message }) => {
            assert_eq!(at.layer, LayerName::Schools);
            // The skipped features' reason is in the message itself, not only in a warning
            // that a failed run never shows.
            assert!(
                message
                    .contains("1 feature(s) were skipped: 1: features not tagged amenity=school"),
                "{message}"
            );
        }
        other => panic!("{other:?}"),
    }
    raw.per_layer.names = parse_names("streets=plain").unwrap_or_default();
    // Read as plain names the OpenStreetMap streets have no class: local by default, a warning.
    let (layers, _) = read_layers(&raw).unwrap_or_default();
    assert_eq!(layers.streets.len(), 2);
    assert!(parse_names("homes=osm").is_err());
}

const GDAL_CRS_2272: &str =
    r#""crs":{"type":"name","properties":{"name":"urn:ogc:def:crs:EPSG::2272"}}"#;

/// Streets in State Plane Pennsylvania South, US survey feet (EPSG:2272): a 1000 ft line east
/// from the false easting at the latitude of origin's northing 0.
fn feet_streets(with_crs: bool) -> String {
    let crs = if with_crs {
        format!("{GDAL_CRS_2272},")
    } else {
        String::new()
    };
    format!(
        r#"{{"type":"FeatureCollection",{crs}"features":[{}]}}"#,
        feat(
            line([1_968_500.0, 100_000.0], [1_969_500.0, 100_000.0]),
            r#"{"id":"s1","class":"local"}"#
        )
    )
}

fn near_feet_layers(streets: String) -> RawLayers {
    // The line lies near -77.75, 39.607 (100 000 ft = 30.48 km north of the origin 39.3333).
    RawLayers {
        streets,
        schools: fc(&[feat(point([-77.749, 39.6076]), r#"{"id":"S1"}"#)]),
        homes: fc(&[feat(point([-77.7495, 39.6075]), r#"{"id":"h1"}"#)]),
        ..RawLayers::default()
    }
}

#[test]
fn geojson_crs_member_or_the_users_crs_reprojects_us_survey_feet() {
    let from_member = read_layers(&near_feet_layers(feet_streets(true)));
    let mut raw = near_feet_layers(feet_streets(false));
    raw.per_layer
        .crs
        .push(parse_crs("streets=EPSG:2272").unwrap_or((None, String::new())));
    let from_option = read_layers(&raw);
    for got in [from_member, from_option] {
        let (layers, _) = match got {
            Ok(x) => x,
            Err(e) => panic!("{e}"),
        };
        let s = &layers.streets[0].line;
        assert!((s[0][0] + 77.75).abs() < 1e-9, "{s:?}");
        // 1000 US survey feet = 304.8006 m; at 39.6 N a degree of longitude is ~85.9 km.
        let dx_m = (s[1][0] - s[0][0]) * 85_900.0;
        assert!((dx_m - 304.8).abs() < 0.5, "{dx_m}");
    }
}

#[test]
fn a_projected_layer_with_no_crs_names_the_options() {
    match read_layers(&near_feet_layers(feet_streets(false))) {
        Err(e @ Error::Projected { .. }) => {
            let m = e.to_string();
            assert!(
                m.contains("--crs streets=EPSG:N") && m.contains(".prj") && m.contains("'crs'"),
                "{m}"
            );
        }
        other => panic!("{other:?}"),
    }
}

/// ESRI-style WKT (no authority codes) for UTM zone 33N on WGS84, as GIS software writes a
/// .prj.
const UTM33_PRJ: &str = r#"PROJCS["WGS_1984_UTM_Zone_33N",GEOGCS["GCS_WGS_1984",DATUM["D_WGS_1984",SPHEROID["WGS_1984",6378137.0,298.257223563]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]],PROJECTION["Transverse_Mercator"],PARAMETER["False_Easting",500000.0],PARAMETER["False_Northing",0.0],PARAMETER["Central_Meridian",15.0],PARAMETER["Scale_Factor",0.9996],PARAMETER["Latitude_Of_Origin",0.0],UNIT["Meter",1.0]]"#;

/// Writes a Shapefile of polylines (or points) with an id and class into memory parts.
fn shapefile_parts(
    lines: &[(&str, [[f64; 2]; 2])],
    points: &[(&str, [f64; 2])],
) -> Vec<(String, Vec<u8>)> {
    use shapefile::dbase::{FieldName, FieldValue, Record, TableWriterBuilder};
    static NEXT: std::sync::atomic::AtomicUsize = std::sync::atomic::AtomicUsize::new(0);
    let n = NEXT.fetch_add(1, std::sync::atomic::Ordering::SeqCst);
    let dir = std::env::temp_dir().join(format!("catchwalk-shp-{}-{n}", std::process::id()));
    let _ = std::fs::create_dir_all(&dir);
    let path = dir.join("layer.shp");
    let table = || {
        TableWriterBuilder::new()
            .add_character_field(
                FieldName::try_from("id").unwrap_or_else(|_| unreachable!()),
                20,
            )
            .add_character_field(
                FieldName::try_from("class").unwrap_or_else(|_| unreachable!()),
                20,
            )
    };
    let record = |id: &str| {
        let mut r = Record::default();
        r.insert("id".into(), FieldValue::Character(Some(id.into())));
        r.insert("class".into(), FieldValue::Character(Some("local".into())));
        r
    };
    if points.is_empty() {
        let mut w = shapefile::Writer::from_path(&path, table()).unwrap_or_else(|e| panic!("{e}"));
        for (id, [a, b]) in lines {
            let pl = shapefile::Polyline::new(vec![
                shapefile::Point::new(a[0], a[1]),
                shapefile::Point::new(b[0], b[1]),
            ]);
            w.write_shape_and_record(&pl, &record(id))
                .unwrap_or_else(|e| panic!("{e}"));
        }
    } else {
        let mut w = shapefile::Writer::from_path(&path, table()).unwrap_or_else(|e| panic!("{e}"));
        for (id, p) in points {
            w.write_shape_and_record(&shapefile::Point::new(p[0], p[1]), &record(id))
                .unwrap_or_else(|e| panic!("{e}"));
        }
    }
    let mut parts = Vec::new();
    for ext in ["shp", "shx", "dbf"] {
        let bytes = std::fs::read(path.with_extension(ext)).unwrap_or_default();
        parts.push((format!("layer.{ext}"), bytes));
    }
    parts.push(("layer.prj".into(), UTM33_PRJ.as_bytes().to_vec()));
    let _ = std::fs::remove_dir_all(&dir);
    parts
}

fn zipped(parts: &[(String, Vec<u8>)]) -> Vec<u8> {
    let mut z = zip::ZipWriter::new(Cursor::new(Vec::new()));
    let opts =
        zip::write::SimpleFileOptions::default().compression_method(zip::CompressionMethod::Stored);
    for (name, bytes) in parts {
        let _ = z.start_file(format!("roads/{name}"), opts);
        let _ = z.write_all(bytes);
    }
    z.finish().map(|c| c.into_inner()).unwrap_or_default()
}

#[test]
fn a_zipped_and_a_bare_utm_shapefile_read_like_geojson() {
    // x = 500 000 is the zone's central meridian, 15 E; y = 4 649 776.22 m is 42 N
    // (Transverse Mercator on WGS84, k0 0.9996; value from pyproj, from memory to the cm).
    let streets = shapefile_parts(
        &[("s1", [[500_000.0, 4_649_776.22], [500_300.0, 4_649_776.22]])],
        &[],
    );
    let homes = shapefile_parts(&[], &[("h1", [500_100.0, 4_649_760.0])]);
    for as_zip in [true, false] {
        let file = |layer, parts: &Vec<(String, Vec<u8>)>| LayerFile {
            layer,
            files: if as_zip {
                vec![("layer.zip".into(), zipped(parts))]
            } else {
                parts.clone()
            },
        };
        let raw = RawLayers {
            schools: fc(&[feat(point([15.0018, 42.0002]), r#"{"id":"S1"}"#)]),
            per_layer: PerLayer {
                files: vec![
                    file(LayerName::Streets, &streets),
                    file(LayerName::Homes, &homes),
                ],
                ..PerLayer::default()
            },
            ..RawLayers::default()
        };
        let (layers, _) = match read_layers(&raw) {
            Ok(x) => x,
            Err(e) => panic!("zip {as_zip}: {e}"),
        };
        let s = &layers.streets[0];
        assert_eq!(s.id, "s1");
        assert!(
            (s.line[0][0] - 15.0).abs() < 1e-9 && (s.line[0][1] - 42.0).abs() < 1e-6,
            "{:?}",
            s.line
        );
        assert_eq!(layers.homes[0].id, "h1");
        assert!(
            (layers.homes[0].at[0] - 15.0012).abs() < 1e-4,
            "{:?}",
            layers.homes[0].at
        );
    }
}

#[test]
fn a_zip_without_a_shapefile_or_dbf_is_a_clear_error() {
    let streets = shapefile_parts(
        &[("s1", [[500_000.0, 4_649_776.22], [500_300.0, 4_649_776.22]])],
        &[],
    );
    let only_shp: Vec<_> = streets
        .iter()
        .filter(|(n, _)| n.ends_with(".shp"))
        .cloned()
        .collect();
    let cases = [
        (
            zipped(&[("readme.txt".into(), b"hello".to_vec())]),
            "no .shp",
        ),
        (zipped(&only_shp), "no .dbf"),
    ];
    for (bytes, words) in cases {
        let raw = RawLayers {
            per_layer: PerLayer {
                files: vec![LayerFile {
                    layer: LayerName::Streets,
                    files: vec![("s.zip".into(), bytes)],
                }],
                ..PerLayer::default()
            },
            ..osm_streets_own_schools()
        };
        match read_layers(&raw) {
            Err(Error::Parse { layer, message }) => {
                assert_eq!(layer, LayerName::Streets);
                assert!(message.contains(words), "{message}");
            }
            other => panic!("{other:?}"),
        }
    }
}

#[test]
fn csv_homes_in_state_plane_feet_take_the_layers_crs() {
    let mut raw = near_feet_layers(feet_streets(true));
    raw.homes = "id,x,y\nh1,1968900,100050\n".into();
    raw.homes_format = catchwalk::input::HomesFormat::Csv;
    raw.per_layer
        .crs
        .push(parse_crs("homes=EPSG:2272").unwrap_or((None, String::new())));
    let (layers, _) = match read_layers(&raw) {
        Ok(x) => x,
        Err(e) => panic!("{e}"),
    };
    let [lon, lat] = layers.homes[0].at;
    // 400 ftUS (121.9 m) east of the central meridian -77.75, 100 050 ftUS north of the origin.
    assert!(
        (lon + 77.74858).abs() < 2e-4 && (lat - 39.60798).abs() < 2e-4,
        "{lon} {lat}"
    );
    // The same choice for every layer refuses the schools layer, which is in lon/lat already.
    raw.per_layer.crs = vec![parse_crs("EPSG:2272").unwrap_or((None, String::new()))];
    match read_layers(&raw) {
        Err(Error::Input { at, message }) => {
            assert_eq!(at.layer, LayerName::Schools);
            assert!(
                message.contains("looks like longitude/latitude"),
                "{message}"
            );
        }
        other => panic!("{other:?}"),
    }
}
