"""The invented demo town: the generator is deterministic and the committed files hold the
features the pedestrian graph must cope with.

Run: python3 -m pytest tests/reference/test_demo_town.py
"""

import csv
import json
import math
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]
TOWN = ROOT / "sample-maps" / "demo-town"
GENERATOR = ROOT / "tools" / "make_demo_town.py"
FILES = [
    "streets.geojson",
    "crossings.geojson",
    "schools.geojson",
    "homes.geojson",
    "homes.csv",
    "catchments.geojson",
    "README.md",
]
KINDS = {"signal", "all_way_stop", "stop", "marked", "guard", "refuge", "raised", "beacon", "none"}
CLASSES = {"arterial", "collector", "local", "service", "path", "steps"}
SIDEWALKS = {"both", "left", "right", "none", "unknown", "separate"}


def load(name):
    return json.loads((TOWN / name).read_text(encoding="utf-8"))["features"]


def metres(c, origin=(-35.0, 42.0)):
    """Equirectangular metres about the town centre: plenty for a 3 km town."""
    r = 6371008.8
    x = math.radians(c[0] - origin[0]) * r * math.cos(math.radians(origin[1]))
    y = math.radians(c[1] - origin[1]) * r
    return x, y


def seg_dist(p, a, b):
    dx, dy = b[0] - a[0], b[1] - a[1]
    ll = dx * dx + dy * dy
    t = 0.0 if ll == 0 else max(0.0, min(1.0, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / ll))
    return math.hypot(p[0] - a[0] - t * dx, p[1] - a[1] - t * dy)


def crosses(a, b, c, d):
    """Segments ab and cd cross properly."""

    def side(p, q, r):
        return (q[0] - p[0]) * (r[1] - p[1]) - (q[1] - p[1]) * (r[0] - p[0])

    return side(a, b, c) * side(a, b, d) < 0 and side(c, d, a) * side(c, d, b) < 0


def road_segments():
    out = []
    for s in load("streets.geojson"):
        if s["properties"]["class"] in ("path", "steps"):
            continue
        pts = [metres(c) for c in s["geometry"]["coordinates"]]
        out += list(zip(pts, pts[1:]))
    return out


def in_ring(p, ring):
    inside = False
    for a, b in zip(ring, ring[1:]):
        if (a[1] > p[1]) != (b[1] > p[1]):
            x = a[0] + (p[1] - a[1]) * (b[0] - a[0]) / (b[1] - a[1])
            if p[0] < x:
                inside = not inside
    return inside


def test_generator_is_deterministic(tmp_path):
    for run in ("a", "b"):
        subprocess.run(
            [sys.executable, str(GENERATOR), "--out", str(tmp_path / run)],
            check=True,
            capture_output=True,
        )
    for name in FILES:
        fresh = (tmp_path / "a" / name).read_bytes()
        assert fresh == (tmp_path / "b" / name).read_bytes(), f"{name} differs between runs"
        assert (
            fresh == (TOWN / name).read_bytes()
        ), f"committed {name} is stale: rerun the generator"


def test_every_control_kind_is_present_often():
    counts = {k: 0 for k in KINDS}
    for f in load("crossings.geojson"):
        assert f["geometry"]["type"] == "Point"
        tokens = f["properties"]["control"].split(";")
        for t in tokens:
            assert t in KINDS, f["properties"]
            counts[t] += 1
        if "guard" in tokens:
            hours = f["properties"]["guard_hours"]
            for window in hours.split(","):
                start, end = window.split("-")
                assert len(start) == 5 and len(end) == 5 and start < end, hours
        else:
            assert "guard_hours" not in f["properties"]
    assert all(v >= 10 for v in counts.values()), counts


def test_homes_count_and_csv_twin():
    homes = load("homes.geojson")
    assert 300 <= len(homes) <= 500
    with (TOWN / "homes.csv").open(newline="", encoding="utf-8") as fh:
        rows = list(csv.DictReader(fh))
    assert [r["id"] for r in rows] == [h["properties"]["id"] for h in homes]
    for r, h in zip(rows, homes):
        assert [float(r["lon"]), float(r["lat"])] == h["geometry"]["coordinates"]
        assert int(r["children"]) == h["properties"]["children"] in (1, 2, 3)
        assert r["school"] == h["properties"].get("school", "")
    assigned = [h for h in homes if "school" in h["properties"]]
    assert 0 < len(assigned) < len(homes) // 10


def test_homes_stand_beside_streets():
    segs = road_segments()
    for h in load("homes.geojson"):
        p = metres(h["geometry"]["coordinates"])
        d = min(seg_dist(p, a, b) for a, b in segs)
        assert 4.9 <= d <= 30.5, (h["properties"]["id"], d)


def test_crossings_lie_on_streets_at_junctions_or_mid_block():
    streets, _, degree = graph()
    junctions = [metres(v) for v, n in degree.items() if n >= 3]
    segs = road_segments()
    mid_block = 0
    for f in load("crossings.geojson"):
        p = metres(f["geometry"]["coordinates"])
        assert min(seg_dist(p, a, b) for a, b in segs) < 0.05, f["properties"]["id"]
        to_junction = min(math.dist(p, j) for j in junctions)
        assert to_junction <= 10.0 or to_junction > 30.0, (f["properties"]["id"], to_junction)
        mid_block += to_junction > 30.0
    assert 5 <= mid_block <= 40


def test_catchments_name_schools_and_do_not_overlap():
    school_ids = {f["properties"]["id"] for f in load("schools.geojson")}
    catchments = load("catchments.geojson")
    assert {c["properties"]["school"] for c in catchments} <= school_ids
    rings = [[metres(c) for c in f["geometry"]["coordinates"][0]] for f in catchments]
    outside = 0
    for h in load("homes.geojson"):
        p = metres(h["geometry"]["coordinates"])
        n = sum(in_ring(p, r) for r in rings)
        assert n <= 1, h["properties"]["id"]
        outside += n == 0
    assert 1 <= outside <= 10
    # A home with a school outside its own catchment exists (school choice).
    choice = 0
    for h in load("homes.geojson"):
        sid = h["properties"].get("school")
        if sid is None:
            continue
        assert sid in school_ids
        p = metres(h["geometry"]["coordinates"])
        own = [c["properties"]["school"] for c, r in zip(catchments, rings) if in_ring(p, r)]
        choice += own != [sid]
    assert choice >= 1


def test_catchments_tile_a_square_without_gaps():
    def area(ring):
        return 0.5 * sum(a[0] * b[1] - b[0] * a[1] for a, b in zip(ring, ring[1:]))

    rings = [
        [metres(c) for c in f["geometry"]["coordinates"][0]] for f in load("catchments.geojson")
    ]
    areas = [area(r) for r in rings]
    assert all(a > 0 for a in areas), "exterior rings run counter-clockwise (RFC 7946)"
    xs = [p[0] for r in rings for p in r]
    ys = [p[1] for r in rings for p in r]
    box = (max(xs) - min(xs)) * (max(ys) - min(ys))
    assert abs(sum(areas) - box) < 1e-6 * box


def test_no_accidental_near_coincident_vertices():
    # Distinct vertices closer than the 0.5 m snap tolerance would merge silently.
    vertices = sorted(
        {tuple(c) for s in load("streets.geojson") for c in s["geometry"]["coordinates"]}
    )
    pts = [metres(v) for v in vertices]
    cell = {}
    for n, p in enumerate(pts):
        cell.setdefault((int(p[0] // 5), int(p[1] // 5)), []).append(n)
    for (gx, gy), members in cell.items():
        for n in members:
            for dx in (-1, 0, 1):
                for dy in (-1, 0, 1):
                    for m in cell.get((gx + dx, gy + dy), ()):
                        if m > n:
                            assert math.dist(pts[n], pts[m]) >= 1.0, (vertices[n], vertices[m])


def test_footbridge_is_grade_separated_from_the_fast_road():
    streets = load("streets.geojson")
    bridges = [s for s in streets if s["properties"]["layer"] == 1]
    fast = [s for s in streets if s["properties"].get("speed_kmh") == 80]
    assert bridges and fast
    fast_vertices = {tuple(c) for s in fast for c in s["geometry"]["coordinates"]}
    for b in bridges:
        assert b["properties"]["class"] == "path"
        line = b["geometry"]["coordinates"]
        assert not fast_vertices & {tuple(c) for c in line}
        pts = [metres(c) for c in line]
        fast_segs = []
        for s in fast:
            f = [metres(c) for c in s["geometry"]["coordinates"]]
            fast_segs += list(zip(f, f[1:]))
        assert any(
            crosses(pts[i], pts[i + 1], a, b) for i in range(len(pts) - 1) for a, b in fast_segs
        ), "the footbridge passes over the fast road"
        near = min(
            seg_dist(metres(v), pts[i], pts[i + 1])
            for v in fast_vertices
            for i in range(len(pts) - 1)
        )
        assert near > 20.0, "the fast road must have no vertex under the bridge"
        for end in (line[0], line[-1]):
            others = [
                s
                for s in streets
                if s is not b
                and s["properties"]["class"] == "path"
                and end in s["geometry"]["coordinates"]
            ]
            assert others, "each bridge end is shared with an approach path"


def test_coordinates_are_wgs84_and_in_the_ocean():
    for name in (
        "streets.geojson",
        "crossings.geojson",
        "schools.geojson",
        "homes.geojson",
        "catchments.geojson",
    ):
        for f in load(name):
            stack = [f["geometry"]["coordinates"]]
            while stack:
                c = stack.pop()
                if isinstance(c[0], (int, float)):
                    assert -180 <= c[0] <= 180 and -90 <= c[1] <= 90, (name, c)
                    assert abs(c[0] + 35.0) < 0.05 and abs(c[1] - 42.0) < 0.05, (name, c)
                else:
                    stack.extend(c)


def test_street_properties_follow_the_plain_preset():
    streets = load("streets.geojson")
    ids = [s["properties"]["id"] for s in streets]
    assert len(set(ids)) == len(ids)
    for s in streets:
        p = s["properties"]
        assert (
            p["class"] in CLASSES and isinstance(p["layer"], int) and isinstance(p["oneway"], bool)
        )
        if p["class"] not in ("path", "steps"):
            assert p["sidewalk"] in SIDEWALKS and p["lanes"] >= 1 and p["speed_kmh"] > 0
    assert any(s["properties"].get("median_m", 0) >= 2.5 for s in streets)
    assert any("shoulder_m" in s["properties"] for s in streets)
    assert any("vehicles_15min" in s["properties"] for s in streets)
    assert sum(s["properties"]["class"] == "steps" for s in streets) >= 1


def graph():
    streets = load("streets.geojson")
    adj = {}
    degree = {}
    for s in streets:
        line = [tuple(c) for c in s["geometry"]["coordinates"]]
        for a, b in zip(line, line[1:]):
            adj.setdefault(a, set()).add(b)
            adj.setdefault(b, set()).add(a)
            degree[a] = degree.get(a, 0) + 1
            degree[b] = degree.get(b, 0) + 1
    return streets, adj, degree


def test_junctions_at_shared_interior_vertices_and_qa_findings():
    streets, adj, degree = graph()
    # junctions formed by a line passing through (an interior vertex shared with another line)
    interior = 0
    for s in streets:
        line = [tuple(c) for c in s["geometry"]["coordinates"]]
        interior += sum(degree[v] >= 3 for v in line[1:-1])
    assert interior >= 20
    # components: one big network plus a tiny piece
    seen, sizes = set(), []
    for v in sorted(adj):
        if v in seen:
            continue
        stack, comp = [v], 0
        seen.add(v)
        while stack:
            u = stack.pop()
            comp += 1
            for w in adj[u]:
                if w not in seen:
                    seen.add(w)
                    stack.append(w)
        sizes.append(comp)
    sizes.sort()
    assert len(sizes) == 2 and sizes[0] <= 4, sizes
    # a dangling end 2-4 m from another street's line
    segs = []
    for n, s in enumerate(streets):
        pts = [metres(c) for c in s["geometry"]["coordinates"]]
        segs += [(n, pts[i], pts[i + 1]) for i in range(len(pts) - 1)]
    near_misses = 0
    for n, s in enumerate(streets):
        for end in (s["geometry"]["coordinates"][0], s["geometry"]["coordinates"][-1]):
            if degree[tuple(end)] != 1:
                continue
            p = metres(end)
            d = min(seg_dist(p, a, b) for m, a, b in segs if m != n)
            if d < 5.0:
                assert 2.0 <= d <= 4.0, (s["properties"]["id"], d)
                near_misses += 1
    assert near_misses == 1


def test_separate_sidewalk_crossings_sit_on_shared_vertices():
    streets, _, _ = graph()
    crossings = {tuple(f["geometry"]["coordinates"]): f for f in load("crossings.geojson")}
    separate = [s for s in streets if s["properties"].get("sidewalk") == "separate"]
    assert separate
    hits = 0
    for s in separate:
        for v in s["geometry"]["coordinates"][1:-1]:
            paths = [
                o
                for o in streets
                if o["properties"]["class"] == "path" and v in o["geometry"]["coordinates"]
            ]
            if paths:
                assert tuple(v) in crossings, "a crossing node needs a control point"
                assert crossings[tuple(v)]["properties"]["control"] != "none"
                hits += 1
    assert hits >= 2


if __name__ == "__main__":
    sys.exit(pytest.main([__file__, "-q"]))
