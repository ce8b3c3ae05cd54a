#!/usr/bin/env python3
"""Writes tests/corpus/: broken and odd inputs, each beside its expected outcome.

Every case starts from one tiny invented town (open ocean at lon -35, lat 42) and changes one
thing. expected.json says: the command, "error" / "warning" / "ok", which layer (and feature)
the message names, the words it must hold, the CLI's exit code, whether the wasm build runs
it too, and CSV cells that must come out as written (formula injection). Regenerate with
`python3 tools/make_corpus.py`; crate/tests/corpus.rs and tests/wasm/corpus.test.mjs run it.
"""
import copy
import json
import shutil
from pathlib import Path

OUT = Path(__file__).resolve().parent.parent / "tests" / "corpus"
W, M, E, N = [-35.0, 42.0], [-34.998, 42.0], [-34.996, 42.0], [-34.998, 42.002]


def fc(features):
    return {"type": "FeatureCollection", "features": features}


def feat(props, geom):
    return {"type": "Feature", "properties": props, "geometry": geom}


def line(*pts):
    return {"type": "LineString", "coordinates": [list(p) for p in pts]}


def point(p):
    return {"type": "Point", "coordinates": list(p)}


def square(x0, y0, x1, y1):
    return {"type": "Polygon", "coordinates": [[[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]]]}


def base():
    return {
        "streets": fc([
            feat({"id": "main-w", "name": "Main Street", "class": "local", "speed_kmh": 40}, line(W, M)),
            feat({"id": "main-e", "name": "Main Street", "class": "local", "speed_kmh": 40}, line(M, E)),
            feat({"id": "side", "name": "Side Lane", "class": "local", "speed_kmh": 30}, line(M, N)),
        ]),
        "schools": fc([feat({"id": "s1", "name": "Harbour School"}, point([-34.996, 42.0003]))]),
        "homes": fc([
            feat({"id": "h1", "children": 1}, point([-35.0, 42.0003])),
            feat({"id": "h2", "children": 2}, point([-34.9983, 42.0015])),
        ]),
    }


CASES = []


def case(name, outcome, words, layer=None, feature=None, change=None, files=None,
         command="audit", args=None, wasm=True, csv_cells=None, max_message_chars=None):
    CASES.append(dict(name=name, outcome=outcome, words=words, layer=layer, feature=feature,
                      change=change, files=files or {}, command=command, args=args or [],
                      wasm=wasm, csv_cells=csv_cells or [], max_message_chars=max_message_chars))


def set_prop(layer, i, **kv):
    def f(t):
        t[layer]["features"][i]["properties"].update(kv)
    return f


def set_geom(layer, i, geom):
    def f(t):
        t[layer]["features"][i]["geometry"] = geom
    return f


def add(layer, feature):
    def f(t):
        t.setdefault(layer, fc([]))["features"].append(feature)
    return f


def both(*fs):
    def f(t):
        for g in fs:
            g(t)
    return f


HOMES_CSV = "id,lon,lat,children\nh1,-35.0,42.0003,1\nh2,-34.9983,42.0015,2\n"

# --- empty and unreadable files -------------------------------------------------------------
case("empty-streets-file", "error", ["file is empty"], "streets", files={"streets.geojson": ""})
case("empty-schools-file", "error", ["file is empty"], "schools", files={"schools.geojson": "  \n"})
case("empty-homes-csv", "error", ["file is empty"], "homes", files={"homes.csv": ""})
case("homes-csv-header-only", "error", ["no homes"], "homes", files={"homes.csv": "id,lon,lat\n"})
case("streets-not-json", "error", ["not valid JSON"], "streets", files={"streets.geojson": "hello, this is not GeoJSON"})
case("streets-truncated-json", "error", ["not valid JSON"], "streets",
     files={"streets.geojson": '{"type":"FeatureCollection","features":[{"type":"Feature","properties":{},'})
case("streets-number-too-large", "error", ["streets"], "streets",
     files={"streets.geojson": '{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"class":"local"},"geometry":{"type":"LineString","coordinates":[[-35,42],[1e400,42]]}}]}'})
case("non-utf8-homes-csv", "error", ["not UTF-8", "line 2", "re-save it as UTF-8"], None,
     files={"homes.csv": b"id,lon,lat,name\nh1,-35.0,42.0003,Caf\xe9\n"}, wasm=False)
# --- geometry -------------------------------------------------------------------------------
case("streets-wrong-geometry", "error", ["LineString"], "streets", 1, set_geom("streets", 1, point(M)))
case("streets-null-geometry", "error", ["LineString"], "streets", 0, set_geom("streets", 0, None))
case("streets-no-features", "error", ["no usable streets"], "streets", files={"streets.geojson": json.dumps(fc([]))})
case("street-single-point", "warning", ["no part with two distinct points"], "streets", 2,
     set_geom("streets", 2, line(M, M)))
case("multilinestring-degenerate-part", "warning", ["part 1 has fewer than two distinct points"], "streets", 2,
     set_geom("streets", 2, {"type": "MultiLineString", "coordinates": [[M, N], [N, N]]}))
case("homes-polygon", "error", ["Point"], "homes", 0, set_geom("homes", 0, square(-35.0, 42.0, -34.999, 42.001)))
case("crossing-linestring", "error", ["Point"], "crossings", 0,
     add("crossings", feat({"control": "signal"}, line(W, M))))
case("home-projected", "error", ["look projected"], "homes", 1, set_geom("homes", 1, point([512000.0, 4100000.0])))
case("home-1e308", "error", ["outside any coordinate system"], "homes", 0, set_geom("homes", 0, point([1e308, 42.0])))
case("street-projected", "error", ["look projected"], "streets", 0,
     set_geom("streets", 0, line([512000.0, 4100000.0], [512100.0, 4100000.0])))
# --- required content -----------------------------------------------------------------------
case("schools-none", "error", ["no schools"], "schools", files={"schools.geojson": json.dumps(fc([]))})
case("homes-none", "error", ["no homes"], "homes", files={"homes.geojson": json.dumps(fc([]))})
case("school-duplicate-id", "error", ["used twice"], "schools", 1,
     add("schools", feat({"id": "s1", "name": "Second"}, point([-35.0, 42.0005]))))
case("school-polygon-empty", "error", ["school polygon is empty"], "schools", 0,
     set_geom("schools", 0, {"type": "Polygon", "coordinates": []}))
# --- homes reached or not ---------------------------------------------------------------------
case("home-lonlat-swapped", "warning", ["not reached", "longitude and latitude swapped"], "homes",
     change=set_geom("homes", 0, point([42.0003, -35.0])))
case("home-far-away", "warning", ["1 home(s) with 1 children were not reached", "farther than 300 m", "km away"], "homes",
     change=set_geom("homes", 0, point([-35.6, 42.0])))
case("home-disconnected", "warning", ["not reached", "no walking path"], "homes",
     change=both(add("streets", feat({"id": "island", "class": "local"}, line([-35.02, 42.01], [-35.021, 42.01]))),
                 set_geom("homes", 0, point([-35.0205, 42.0101]))))
case("school-far-away", "warning", ["not reached"], "homes",
     change=set_geom("schools", 0, point([-35.5, 42.5])))
# --- counts -----------------------------------------------------------------------------------
case("children-huge", "warning", ["4294967295 children in one home is implausible"], "homes", 0,
     both(set_prop("homes", 0, children=4294967295), set_prop("homes", 1, children=4294967295)))
case("children-zero", "warning", ["not a positive whole number"], "homes", 0, set_prop("homes", 0, children=0))
case("children-text", "warning", ["not a positive whole number"], "homes", 1, set_prop("homes", 1, children="two"))
case("children-negative", "warning", ["not a positive whole number"], "homes", 0, set_prop("homes", 0, children=-3))
case("children-fraction", "warning", ["not a positive whole number"], "homes", 0, set_prop("homes", 0, children=1.5))
# --- speeds, lanes, classes -------------------------------------------------------------------
case("speed-zero", "warning", ["speed 0 read as unknown", "local default 40 km/h"], "streets", 0,
     set_prop("streets", 0, speed_kmh=0))
case("speed-300", "warning", ["speed 300 km/h is implausible"], "streets", 1, set_prop("streets", 1, speed_kmh=300))
case("speed-text", "warning", ["cannot read a speed"], "streets", 2, set_prop("streets", 2, speed_kmh="fast"))
case("speed-negative", "warning", ["cannot read a speed"], "streets", 0, set_prop("streets", 0, speed_kmh=-30))
case("speed-mph", "ok", [], change=set_prop("streets", 0, speed_kmh="25 mph"))
case("lanes-40", "warning", ["from 1 to 32"], "streets", 0, set_prop("streets", 0, lanes=40))
case("lanes-14", "warning", ["14 lanes is implausible"], "streets", 1, set_prop("streets", 1, lanes=14))
case("lanes-zero-road", "warning", ["not a lane count"], "streets", 2, set_prop("streets", 2, lanes=0))
case("class-unknown", "warning", ["used local"], "streets", 0, set_prop("streets", 0, **{"class": "highway"}))
case("class-missing", "warning", ["no road class"], "streets", 1,
     lambda t: t["streets"]["features"][1]["properties"].pop("class"))
case("sidewalk-unknown-value", "warning", ["sidewalk"], "streets", 0, set_prop("streets", 0, sidewalk="some"))
# --- network checks ---------------------------------------------------------------------------
case("street-drawn-twice", "warning", ["drawn twice", "streets feature 0 (id main-w)"], "streets", 3,
     add("streets", feat({"id": "copy", "class": "local"}, line(M, W))))
case("street-doubles-back", "warning", ["doubles back on itself at vertex 1"], "streets", 2,
     set_geom("streets", 2, line(M, N, M, [-34.9981, 42.0001])))
case("crossing-far-away", "warning", ["crossing point(s) skipped"], "streets",
     change=add("crossings", feat({"control": "signal"}, point([-35.1, 42.1]))))
case("crossing-bad-control", "warning", ["control"], "crossings", 0,
     add("crossings", feat({"control": "lollipop"}, point(M))))
# --- catchments -------------------------------------------------------------------------------
case("catchments-overlap", "warning", ["overlaps the catchment of school 's1'"], "catchments", 1,
     both(add("schools", feat({"id": "s2", "name": "Bay School"}, point([-35.0, 42.0005]))),
          add("catchments", feat({"school": "s1"}, square(-35.01, 41.99, -34.99, 42.01))),
          add("catchments", feat({"school": "s2"}, square(-35.0, 41.99, -34.98, 42.01)))))
case("catchment-degenerate", "warning", ["empty or has no area"], "catchments", 0,
     add("catchments", feat({"school": "s1"}, {"type": "Polygon", "coordinates": [[[-35.0, 42.0], [-34.99, 42.0], [-35.0, 42.0], [-35.0, 42.0]]]})))
case("catchment-no-school", "error", ["school"], "catchments", 0,
     add("catchments", feat({"name": "North"}, square(-35.01, 41.99, -34.99, 42.01))))
case("catchment-unknown-school", "warning", ["not in the schools layer"], "catchments", 0,
     add("catchments", feat({"school": "zz"}, square(-35.01, 41.99, -34.99, 42.01))))
case("home-unknown-school", "warning", ["not in the schools layer"], "homes", 0, set_prop("homes", 0, school="zz"))
# --- names: formula injection, HTML, length ---------------------------------------------------
case("formula-injection-names", "ok", [],
     change=both(set_prop("homes", 0, id="=HYPERLINK(\"http://example.invalid\",\"x\")"),
                 set_prop("homes", 1, id="-2+3"),
                 set_prop("schools", 0, id="@SUM(A1)", name="+cmd"),
                 set_prop("streets", 0, name="=1+1"), set_prop("streets", 1, name="=1+1"),
                 set_prop("streets", 2, name="\tTab Lane")),
     csv_cells=[["homes.csv", "home_id", "'=HYPERLINK(\"http://example.invalid\",\"x\")"],
                ["homes.csv", "home_id", "'-2+3"], ["homes.csv", "school_id", "'@SUM(A1)"],
                ["catchments.csv", "school_name", "'+cmd"]])
case("html-in-names", "ok", [],
     change=both(set_prop("schools", 0, name="<img src=x onerror=\"window.__pwned=1\">School"),
                 set_prop("streets", 0, name="<b>Main</b>"), set_prop("streets", 1, name="<script>window.__pwned=2</script>")),
     csv_cells=[["catchments.csv", "school_name", "<img src=x onerror=\"window.__pwned=1\">School"]])
case("long-id", "error", ["look projected", "characters)"], "homes", 0,
     both(set_prop("homes", 0, id="x" * 20_000), set_geom("homes", 0, point([512000.0, 4100000.0]))),
     max_message_chars=2000)
case("long-street-name-warning", "warning", ["characters)"], "streets", 0,
     set_prop("streets", 0, **{"class": "y" * 20_000}), max_message_chars=2000)
case("negative-number-stays-numeric", "ok", [], change=set_prop("homes", 0, id="-3.5"),
     csv_cells=[["homes.csv", "home_id", "-3.5"]])
# --- homes as CSV -----------------------------------------------------------------------------
case("homes-csv-named-txt", "ok", [], files={"homes.txt": HOMES_CSV})
case("homes-csv-semicolon", "ok", [], files={"homes.csv": HOMES_CSV.replace(",", ";")})
case("homes-csv-bom", "ok", [], files={"homes.csv": "\ufeff" + HOMES_CSV})
case("homes-csv-blank-rows", "ok", [], files={"homes.csv": HOMES_CSV + "\n,,,\n\n"})
case("homes-csv-no-lonlat", "error", ["longitude"], "homes", files={"homes.csv": "id,east,north\nh1,-35,42\n"})
case("homes-csv-bad-coordinate", "error", ["where a coordinate belongs", "line 3 of the file"], "homes", 1,
     files={"homes.csv": "id,lon,lat\nh1,-35.0,42.0003\nh2,abc,42.0015\n"})
case("homes-csv-swapped-columns", "warning", ["longitude and latitude swapped"], "homes",
     files={"homes.csv": "id,lon,lat\nh1,42.0003,-35.0\nh2,-34.9983,42.0015\n"})
case("homes-geojson-named-json", "ok", [], files={"homes.json": None})
# --- configuration ----------------------------------------------------------------------------
for name, cfg, words in [
    ("config-negative-risk-weight", {"route": {"metres_per_risk_point": -5}}, ["route.metres_per_risk_point is -5", "from 0 to"]),
    ("config-detour-below-1", {"route": {"detour_cap": 0.5}}, ["route.detour_cap is 0.5", "from 1 to 100"]),
    ("config-walk-zone-zero", {"benefit": {"walk_zone_m": 0}}, ["benefit.walk_zone_m is 0", "greater than 0"]),
    ("config-walking-speed-negative", {"benefit": {"walking_speed_mps": -1.07}}, ["benefit.walking_speed_mps is -1.07"]),
    ("config-unknown-field", {"route": {"detour": 2}}, ["unknown field"]),
    ("config-share-over-1", {"score": {"safe_share": 1.5}}, ["score.safe_share is 1.5", "from 0 to 1"]),
    ("config-max-attach-huge", {"network": {"max_attach_m": 1e9}}, ["network.max_attach_m", "at most 5000"]),
    ("config-snap-negative", {"network": {"snap_tolerance_m": -1}}, ["network.snap_tolerance_m is -1"]),
    ("config-control-negative", {"risk": {"controls": {"signal": -0.5}}}, ["risk.controls.signal is -0.5"]),
    ("config-school-window-inverted", {"risk": {"school_windows": [{"start_min": 600, "end_min": 500}]}}, ["school_windows[0]"]),
    ("config-not-json", None, ["config"]),
]:
    files = {"config.json": json.dumps(cfg) if cfg is not None else "{route: nope"}
    case(name, "error", words, None, files=files)
# --- command line only ------------------------------------------------------------------------
case("budget-negative", "error", ["--budget -1", "whole number"], None, command="plan", args=["--budget", "-1"], wasm=False)
case("budget-text", "error", ["--budget five", "whole number"], None, command="plan", args=["--budget", "five"], wasm=False)
case("mapping-not-json", "error", ["mapping"], "mapping", files={"mapping.json": "{not json"})


def main():
    if OUT.exists():
        shutil.rmtree(OUT)
    for i, c in enumerate(CASES, 1):
        d = OUT / f"{i:02d}-{c['name']}"
        d.mkdir(parents=True)
        town = copy.deepcopy(base())
        if c["change"]:
            c["change"](town)
        files = dict(c["files"])
        homes_override = any(k.startswith("homes.") for k in files)
        for layer in ["streets", "schools", "homes", "crossings", "catchments"]:
            if layer == "homes" and homes_override:
                continue
            name = f"{layer}.geojson"
            if layer in town and name not in files:
                (d / name).write_text(json.dumps(town[layer]), encoding="utf-8")
        for name, text in files.items():
            if text is None:  # the town's own layer under another name
                text = json.dumps(town[name.split(".")[0]])
            data = text if isinstance(text, bytes) else text.encode("utf-8")
            (d / name).write_bytes(data)
        expected = {k: c[k] for k in ["command", "args", "outcome", "layer", "feature", "words", "wasm",
                                      "csv_cells", "max_message_chars"]}
        # 2: the command line itself is wrong (clap's usage errors); 1: the input is.
        expected["exit_code"] = (2 if c["args"] else 1) if c["outcome"] == "error" else 0
        (d / "expected.json").write_text(json.dumps(expected, indent=1) + "\n", encoding="utf-8")
    print(f"wrote {len(CASES)} cases to {OUT}")


if __name__ == "__main__":
    main()
