"""Layers as planners have them, checked against outside references:

- pyproj (PyPI; the PROJ library) transforms the same projected points to WGS84: catchwalk's
  reprojection (proj4rs with the crs-definitions EPSG table) must agree to the centimetre, for a
  State Plane zone in US survey feet (EPSG:2272, 1 ftUS = 1200/3937 m) and a metre zone (UTM).
- pyshp (PyPI) writes the demo town as a zipped Shapefile with a .prj; it must audit exactly
  like the demo town's GeoJSON (identical homes.csv).
- the real OpenStreetMap extract test.osm.pbf read directly must audit exactly like its
  `osmium export` GeoJSON (identical homes.csv), with a school list of the district's own.
"""

import csv
import io
import json
import math
import os
import pathlib
import random
import subprocess
import zipfile

import pyproj
import pytest
import shapefile  # pyshp
from geographiclib.geodesic import Geodesic

from conftest import DEMO, catchwalk_bin, run_audit


def convert(tmp, name, text_or_path, *extra):
    src = tmp / name
    if isinstance(text_or_path, str):
        src.write_text(text_or_path)
    else:
        src = text_or_path
    out = tmp / (name + ".out.geojson")
    subprocess.run([str(catchwalk_bin()), "convert", "--layer", "homes", "--in", str(src),
                    "--out", str(out), *extra], check=True, capture_output=True, text=True)
    return json.loads(out.read_text())


def grid(x0, y0, step, n=6):
    return [(x0 + i * step, y0 + j * step * 0.7) for i in range(n) for j in range(n)]


def points_fc(xy, crs=None):
    fc = {"type": "FeatureCollection", "features": [
        {"type": "Feature", "properties": {"id": f"p{k}"},
         "geometry": {"type": "Point", "coordinates": [x, y]}} for k, (x, y) in enumerate(xy)]}
    if crs:
        # As GDAL writes the member.
        fc["crs"] = {"type": "name", "properties": {"name": f"urn:ogc:def:crs:EPSG::{crs}"}}
    return json.dumps(fc)


def worst_gap_m(got, xy, epsg):
    to_wgs = pyproj.Transformer.from_crs(f"EPSG:{epsg}", "EPSG:4326", always_xy=True)
    worst = 0.0
    for f, (x, y) in zip(got["features"], xy):
        lon, lat = to_wgs.transform(x, y)
        glon, glat = f["geometry"]["coordinates"]
        worst = max(worst, Geodesic.WGS84.Inverse(lat, lon, glat, glon)["s12"])
    return worst


# State Plane Pennsylvania South (ftUS) across the zone, and UTM 18N across its width.
@pytest.mark.parametrize("epsg,xy", [
    (2272, grid(1_200_000.0, -150_000.0, 250_000.0)),
    (32618, grid(250_000.0, 4_000_000.0, 100_000.0)),
])
def test_reprojection_agrees_with_pyproj_to_the_centimetre(tmp_path, epsg, xy):
    via_member = convert(tmp_path, f"m{epsg}.geojson", points_fc(xy, epsg))
    via_option = convert(tmp_path, f"o{epsg}.geojson", points_fc(xy), "--crs", f"EPSG:{epsg}")
    for got in (via_member, via_option):
        gap = worst_gap_m(got, xy, epsg)
        print(f"EPSG:{epsg}: worst gap to pyproj {gap * 1e6:.3f} µm over {len(xy)} points")
        assert gap < 0.01, gap


def test_esri_prj_without_codes_agrees_with_pyproj(tmp_path):
    """A .prj as ESRI software writes it (WKT1_ESRI from pyproj: names, no EPSG codes)."""
    epsg = 2272
    xy = grid(1_500_000.0, 100_000.0, 60_000.0, n=4)
    base = tmp_path / "pts"
    with shapefile.Writer(str(base), shapeType=shapefile.POINT) as w:
        w.field("id", "C", 10)
        for k, (x, y) in enumerate(xy):
            w.point(x, y)
            w.record(f"p{k}")
    (tmp_path / "pts.prj").write_text(pyproj.CRS.from_epsg(epsg).to_wkt("WKT1_ESRI"))
    got = convert(tmp_path, "pts.shp", tmp_path / "pts.shp")
    gap = worst_gap_m(got, xy, epsg)
    print(f"ESRI .prj EPSG:{epsg}: worst gap to pyproj {gap * 1e6:.3f} µm")
    assert gap < 0.01, gap


def project_geometry(g, fwd):
    def walk(c):
        if c and isinstance(c[0], (int, float)):
            return list(fwd.transform(c[0], c[1]))
        return [walk(x) for x in c]
    return {"type": g["type"], "coordinates": walk(g["coordinates"])}


def write_zipped_shapefile(fc, path, epsg, prj_wkt):
    """The layer as pyshp writes it: every property a text or number field."""
    fwd = pyproj.Transformer.from_crs("EPSG:4326", f"EPSG:{epsg}", always_xy=True)
    feats = fc["features"]
    keys = sorted({k for f in feats for k in (f["properties"] or {})})
    kind = feats[0]["geometry"]["type"]
    shape_type = {"Point": shapefile.POINT, "LineString": shapefile.POLYLINE,
                  "MultiLineString": shapefile.POLYLINE, "Polygon": shapefile.POLYGON,
                  "MultiPolygon": shapefile.POLYGON}[kind]
    numeric = {k for k in keys if all(isinstance((f["properties"] or {}).get(k), (int, float))
                                      and not isinstance((f["properties"] or {}).get(k), bool)
                                      for f in feats if k in (f["properties"] or {}))}
    shp, shx, dbf = io.BytesIO(), io.BytesIO(), io.BytesIO()
    with shapefile.Writer(shp=shp, shx=shx, dbf=dbf, shapeType=shape_type) as w:
        for k in keys:
            if k in numeric:
                w.field(k[:10], "N", 18, 6)
            else:
                w.field(k[:10], "C", 80)
        for f in feats:
            g = project_geometry(f["geometry"], fwd)
            w.shape(g)
            props = f["properties"] or {}
            w.record(*[props.get(k) if k in numeric else
                       ("" if props.get(k) is None else
                        (json.dumps(props[k]) if isinstance(props[k], (list, dict, bool)) else str(props[k])))
                       for k in keys])
    with zipfile.ZipFile(path, "w", compression=zipfile.ZIP_DEFLATED) as z:
        for ext, buf in (("shp", shp), ("shx", shx), ("dbf", dbf)):
            z.writestr(f"layer.{ext}", buf.getvalue())
        z.writestr("layer.prj", prj_wkt)


def test_pyshp_shapefiles_audit_like_their_geojson(tmp_path):
    """The demo town's streets, crossings, homes and catchments as zipped Shapefiles in UTM
    zone 25N (the zone of lon -35) with ESRI-style .prj files: homes.csv identical to the
    GeoJSON audit's. dBase cuts names at 10 characters (`vehicles_15min` -> `vehicles_1`),
    as a planner's Shapefile would: a mapping file names it. Schools stay GeoJSON (the demo's
    mix points and polygons, which one Shapefile cannot hold)."""
    epsg = 32625
    prj = pyproj.CRS.from_epsg(epsg).to_wkt("WKT1_ESRI")
    layers = {}
    for name in ("streets", "crossings", "homes", "catchments"):
        fc = json.loads((DEMO / f"{name}.geojson").read_text())
        path = tmp_path / f"{name}.zip"
        write_zipped_shapefile(fc, path, epsg, prj)
        layers[name] = path
    mapping = tmp_path / "mapping.json"
    mapping.write_text(json.dumps({"streets": {"vehicles_15min": "vehicles_1"}}))
    schools = DEMO / "schools.geojson"
    geo = run_audit(tmp_path / "geo", schools=schools, **{n: DEMO / f"{n}.geojson" for n in layers})
    shp = run_audit(tmp_path / "shp", schools=schools, mapping=mapping, **layers)
    assert len(geo["homes"]) > 100 and len(shp["homes"]) == len(geo["homes"])
    assert (tmp_path / "shp" / "homes.csv").read_text() == (tmp_path / "geo" / "homes.csv").read_text()


def test_osm_pbf_audits_like_its_osmium_export(tmp_path):
    extract = os.environ.get("OSM_EXTRACT")
    if not extract or not pathlib.Path(extract).exists():
        pytest.skip("OSM_EXTRACT not set: run through `make test-reference`")
    geo = tmp_path / "extract.geojson"
    subprocess.run(["osmium", "export", extract, "-o", str(geo), "--overwrite", "-a", "id"], check=True)
    data = json.loads(geo.read_text())
    lines = [f for f in data["features"] if f["geometry"]["type"] == "LineString"
             and f["properties"].get("highway") in ("residential", "tertiary", "secondary", "unclassified")]
    rng = random.Random(11)

    def near_street():
        c = rng.choice(lines)["geometry"]["coordinates"]
        i = rng.randrange(len(c) - 1)
        t = rng.random()
        return [c[i][0] + (c[i + 1][0] - c[i][0]) * t + rng.uniform(-1e-4, 1e-4),
                c[i][1] + (c[i + 1][1] - c[i][1]) * t + rng.uniform(-0.6e-4, 0.6e-4)]

    def collection(features):
        return json.dumps({"type": "FeatureCollection", "features": features})

    # The district's own school list: plain `id`/`name`, no amenity tag (test fixtures).
    (tmp_path / "schools.geojson").write_text(collection([
        {"type": "Feature", "geometry": {"type": "Point", "coordinates": near_street()},
         "properties": {"id": f"S{k}", "name": f"Test school {k}"}} for k in range(3)]))
    (tmp_path / "homes.geojson").write_text(collection([
        {"type": "Feature", "geometry": {"type": "Point", "coordinates": near_street()},
         "properties": {"id": f"h{k}", "children": 1 + k % 3}} for k in range(300)]))
    common = dict(schools=tmp_path / "schools.geojson", homes=tmp_path / "homes.geojson")
    from_export = run_audit(tmp_path / "export", streets=geo, crossings=geo, **common)
    from_pbf = run_audit(tmp_path / "pbf", streets=extract, crossings=extract, **common)
    assert len(from_pbf["homes"]) == 300
    walked = [h for h in from_pbf["homes"] if h["shortest_network_m"]]
    assert len(walked) > 200
    assert (tmp_path / "pbf" / "homes.csv").read_text() == (tmp_path / "export" / "homes.csv").read_text()
