"""Reference check: catchwalk's geodesic lengths against GeographicLib.

Source of the reference: GeographicLib (C. F. F. Karney, "Algorithms for geodesics",
Journal of Geodesy 87, 43-55, 2013), Python package `geographiclib` on PyPI, using
`Geodesic.WGS84.Inverse(lat1, lon1, lat2, lon2)["s12"]`.

The coordinates are approximate positions of well-known public landmarks (from memory; their
exactness does not matter, only that they are realistic inputs from 1 m to about 1000 km, at
low, middle and high latitudes and across the antimeridian).

Run from the repository root:  pytest tests/reference/test_geodesic.py
It builds and runs `cargo run --release --example geodesic_lengths` (set CARGO_TARGET_DIR as
usual), or uses the binary named by the environment variable GEODESIC_LENGTHS_BIN.
"""

import os
import pathlib
import subprocess

import pytest
from geographiclib.geodesic import Geodesic

ROOT = pathlib.Path(__file__).resolve().parents[2]

# (name, lon1, lat1, lon2, lat2)
PAIRS = [
    ("Eiffel Tower, 1 m north", 2.2945, 48.8584, 2.2945, 48.858409),
    ("Eiffel Tower, about 10 m east", 2.2945, 48.8584, 2.29464, 48.8584),
    ("Big Ben to Westminster Abbey", -0.1246, 51.5007, -0.1273, 51.4994),
    ("Brandenburg Gate to Reichstag", 13.3777, 52.5163, 13.3761, 52.5186),
    ("Sydney Opera House to Harbour Bridge", 151.2153, -33.8568, 151.2108, -33.8523),
    ("Eiffel Tower to Arc de Triomphe", 2.2945, 48.8584, 2.2950, 48.8738),
    ("Eiffel Tower to Louvre", 2.2945, 48.8584, 2.3376, 48.8606),
    ("Colosseum to St Peter's Basilica", 12.4922, 41.8902, 12.4534, 41.9022),
    ("Christ the Redeemer to Sugarloaf", -43.2105, -22.9519, -43.1566, -22.9492),
    ("Statue of Liberty to Empire State Building", -74.0445, 40.6892, -73.9857, 40.7484),
    ("Equator monument to Quito cathedral", -78.4558, -0.0022, -78.5127, -0.2203),
    ("Table Mountain to Cape of Good Hope", 18.4039, -33.9628, 18.4730, -34.3568),
    ("Tokyo Tower to Mount Fuji", 139.7454, 35.6586, 138.7274, 35.3606),
    ("Hallgrimskirkja to Akureyri church", -21.9266, 64.1417, -18.0903, 65.6795),
    ("North Cape to Tromso cathedral", 25.7837, 71.1710, 18.9553, 69.6489),
    ("Big Ben to Eiffel Tower", -0.1246, 51.5007, 2.2945, 48.8584),
    ("Golden Gate Bridge to Hollywood Sign", -122.4783, 37.8199, -118.3217, 34.1341),
    ("Colosseum to Sagrada Familia", 12.4922, 41.8902, 2.1744, 41.4036),
    ("Brandenburg Gate to Eiffel Tower", 13.3777, 52.5163, 2.2945, 48.8584),
    ("Across the antimeridian east of Suva", 179.9995, -18.1416, -179.9995, -18.1416),
]


def rust_lengths(pairs):
    text = "".join(f"{a} {b} {c} {d}\n" for _, a, b, c, d in pairs)
    binary = os.environ.get("GEODESIC_LENGTHS_BIN")
    cmd = [binary] if binary else [
        "cargo", "run", "--release", "--quiet", "--example", "geodesic_lengths",
    ]
    out = subprocess.run(
        cmd, input=text, capture_output=True, text=True, cwd=ROOT, check=True
    ).stdout
    rows = [line.split() for line in out.strip().splitlines()]
    return [(float(r[0]), float(r[1])) for r in rows]


@pytest.fixture(scope="module")
def computed():
    return rust_lengths(PAIRS)


@pytest.mark.parametrize("i", range(len(PAIRS)), ids=[p[0] for p in PAIRS])
def test_distance_matches_geographiclib(computed, i):
    _, lon1, lat1, lon2, lat2 = PAIRS[i]
    ref = Geodesic.WGS84.Inverse(lat1, lon1, lat2, lon2)["s12"]
    distance, segment = computed[i]
    tol = max(1e-3, 1e-9 * ref)
    assert abs(distance - ref) <= tol, (distance, ref)
    assert abs(segment - ref) <= tol, (segment, ref)


def test_pairs_span_one_metre_to_a_thousand_kilometres():
    refs = [Geodesic.WGS84.Inverse(b, a, d, c)["s12"] for _, a, b, c, d in PAIRS]
    assert min(refs) < 2.0
    assert max(refs) > 800_000.0
