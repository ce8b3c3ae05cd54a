#!/usr/bin/env python3
"""Writes the invented demo town that catchwalk's examples and tests use.

The town lies in open North Atlantic water (about 35.0 W, 42.0 N) so that nobody can take it
for a real place; every name in it is made up. It is built in a local metric frame (x east,
y north, metres from the centre) and converted to WGS84 ``[lon, lat]`` once, through a shared
vertex table, so that a junction vertex is bit-identical in every street that shares it.

Standard library only, one seeded ``random.Random``, no clock: every run writes the same bytes.

    python3 tools/make_demo_town.py                 # writes sample-maps/demo-town/
    python3 tools/make_demo_town.py --out /tmp/town
"""

from __future__ import annotations

import argparse
import json
import math
import random
from pathlib import Path

SEED = 4207
LON0, LAT0 = -35.0, 42.0

# WGS84 radii of curvature at the centre latitude: metres per degree in the local frame.
_A = 6378137.0
_F = 1 / 298.257223563
_E2 = _F * (2 - _F)
_PHI = math.radians(LAT0)
_W = 1 - _E2 * math.sin(_PHI) ** 2
M_PER_DEG_LAT = _A * (1 - _E2) / _W**1.5 * math.pi / 180
M_PER_DEG_LON = _A / math.sqrt(_W) * math.cos(_PHI) * math.pi / 180

GUARD_HOURS = {
    "elementary": "07:30-08:45,14:45-15:30",
    "secondary": "07:15-08:15,14:15-15:00",
}
CONTROL_KINDS = [
    "signal",
    "all_way_stop",
    "stop",
    "marked",
    "guard",
    "refuge",
    "raised",
    "beacon",
    "none",
]
FOOT = ("path", "steps")


# ---------------------------------------------------------------- geometry (metres)


def lonlat(p):
    """Local metres -> rounded WGS84 [lon, lat]."""
    return [round(LON0 + p[0] / M_PER_DEG_LON, 7), round(LAT0 + p[1] / M_PER_DEG_LAT, 7)]


def dist(a, b):
    return math.hypot(a[0] - b[0], a[1] - b[1])


def seg_dist(p, a, b):
    dx, dy = b[0] - a[0], b[1] - a[1]
    ll = dx * dx + dy * dy
    t = 0.0 if ll == 0 else max(0.0, min(1.0, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / ll))
    return math.hypot(p[0] - a[0] - t * dx, p[1] - a[1] - t * dy)


def line_length(pts):
    return sum(dist(pts[i], pts[i + 1]) for i in range(len(pts) - 1))


def along(pts, s):
    """Point at distance s along a polyline, and the unit direction there."""
    for i in range(len(pts) - 1):
        a, b = pts[i], pts[i + 1]
        d = dist(a, b)
        if s <= d or i == len(pts) - 2:
            t = min(1.0, s / d)
            return (a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1])), (
                (b[0] - a[0]) / d,
                (b[1] - a[1]) / d,
            )
        s -= d
    raise ValueError("empty line")


def proper_cross(a, b, c, d):
    """True when segments ab and cd meet anywhere (touching counts)."""

    def orient(p, q, r):
        v = (q[0] - p[0]) * (r[1] - p[1]) - (q[1] - p[1]) * (r[0] - p[0])
        return 0 if abs(v) < 1e-9 else (1 if v > 0 else -1)

    def on(p, q, r):
        return (
            min(p[0], q[0]) - 1e-9 <= r[0] <= max(p[0], q[0]) + 1e-9
            and min(p[1], q[1]) - 1e-9 <= r[1] <= max(p[1], q[1]) + 1e-9
        )

    o1, o2, o3, o4 = orient(a, b, c), orient(a, b, d), orient(c, d, a), orient(c, d, b)
    if o1 != o2 and o3 != o4:
        return True
    return (
        (o1 == 0 and on(a, b, c))
        or (o2 == 0 and on(a, b, d))
        or (o3 == 0 and on(c, d, a))
        or (o4 == 0 and on(c, d, b))
    )


def bezier(p0, p1, p2, n):
    out = []
    for k in range(n + 1):
        t = k / n
        out.append(
            (
                (1 - t) ** 2 * p0[0] + 2 * t * (1 - t) * p1[0] + t * t * p2[0],
                (1 - t) ** 2 * p0[1] + 2 * t * (1 - t) * p1[1] + t * t * p2[1],
            )
        )
    return out


def in_ring(p, ring):
    """Even-odd point in polygon (ring of metre points, closed or not)."""
    inside = False
    n = len(ring)
    for i in range(n):
        a, b = ring[i], ring[(i + 1) % n]
        if (a[1] > p[1]) != (b[1] > p[1]):
            x = a[0] + (p[1] - a[1]) * (b[0] - a[0]) / (b[1] - a[1])
            if p[0] < x:
                inside = not inside
    return inside


# ---------------------------------------------------------------- the street network


class Town:
    """Streets as lists of vertex keys into one table: shared keys are shared vertices."""

    def __init__(self):
        self.vertex = {}  # metre key -> [lon, lat], rounded once
        self.streets = []  # {"props": {...}, "keys": [...]}

    def key(self, p):
        k = (round(p[0], 3) + 0.0, round(p[1], 3) + 0.0)
        if k not in self.vertex:
            self.vertex[k] = lonlat(k)
        return k

    def add(self, pts, cls, name=None, **extra):
        keys = []
        for p in pts:
            k = self.key(p)
            if not keys or keys[-1] != k:
                keys.append(k)
        assert len(keys) >= 2, (name, pts)
        props = {"class": cls, "oneway": False, "layer": 0}
        if cls == "arterial":
            props.update(speed_kmh=60, lanes=4, sidewalk="both")
        elif cls == "collector":
            props.update(speed_kmh=50, lanes=2, sidewalk="both")
        elif cls == "local":
            props.update(speed_kmh=30, lanes=2, sidewalk="both")
        elif cls == "service":
            props.update(speed_kmh=20, lanes=1, sidewalk="none")
        if name:
            props["name"] = name
        props.update({k: v for k, v in extra.items() if v is not None})
        self.streets.append({"props": props, "keys": keys})
        return keys

    def pts(self, i):
        return self.streets[i]["keys"]

    def cls(self, i):
        return self.streets[i]["props"]["class"]


def split_add(town, pts, cuts, cls, name, **extra):
    """Adds a polyline as several features, cut at the vertex indices in `cuts`."""
    idx = [0] + sorted(cuts) + [len(pts) - 1]
    for a, b in zip(idx, idx[1:]):
        town.add(pts[a : b + 1], cls, name, **extra)


RING = 1200.0
CHAMFER = 150.0
NW_COLS = [-1000.0, -800.0, -600.0, -400.0, -200.0]
NW_ROWS = [1000.0, 800.0, 600.0, 300.0, 150.0]
COLLECTOR_Y = 450.0
NE_COLS = [250.0, 750.0, 1000.0]
SEP_Y = 700.0  # Saffron Street, whose middle block has separately drawn sidewalks
SEP_OFF = 8.0  # sidewalk centreline offset from the road centreline
PARK = (190.0, -460.0, 710.0, 10.0)  # x0, y0, x1, y1: no homes inside


def willow_pts():
    return [
        (-75.0 * k, -550.0 - 6.25 * k + 70.0 * math.sin(3 * math.pi * k / 16)) for k in range(17)
    ]


def linden_pts():
    return [
        (75.0 * k, -750.0 - 6.25 * k - 80.0 * math.sin(2 * math.pi * k / 16)) for k in range(17)
    ]


def maple_pts():
    return bezier((0.0, -900.0), (-600.0, -900.0), (-700.0, -1200.0), 12)


def build_streets(town):
    W, L, M = willow_pts(), linden_pts(), maple_pts()
    info = {}

    # Arterial ring: a chamfered square, split at its busiest junctions.
    west_ys = [-1000.0, W[-1][1], -250.0, 0.0, 150.0, 300.0, 450.0, 600.0, 800.0, 1000.0]
    north_xs = NW_COLS + [0.0] + NE_COLS
    east_ys = [950.0, SEP_Y, 450.0, 200.0, 0.0, -250.0, -450.0, L[-1][1]]
    south_xs = [0.0, M[-1][0]]
    c = RING - CHAMFER
    ring = [(-RING, -c)] + [(-RING, y) for y in sorted(west_ys)]
    ring += [(-RING, c), (-c, RING)] + [(x, RING) for x in sorted(north_xs)]
    ring += [(c, RING), (RING, c)] + [(RING, y) for y in sorted(east_ys, reverse=True)]
    ring += [(RING, -c), (c, -RING)] + [(x, -RING) for x in sorted(south_xs, reverse=True)]
    ring += [(-c, -RING), (-RING, -c)]
    splits = [(-RING, 450.0), (0.0, RING), (RING, 450.0), (RING, -250.0), (0.0, -RING)]
    splits += [(M[-1][0], -RING), (-RING, -250.0)]
    cut = sorted(i for i, p in enumerate(ring) if p in splits)
    # rotate so the loop starts at a split vertex
    ring = ring[cut[0] : -1] + ring[: cut[0] + 1]
    cut = [i for i, p in enumerate(ring) if p in splits and 0 < i < len(ring) - 1]
    idx = [0] + cut + [len(ring) - 1]
    for a, b in zip(idx, idx[1:]):
        part = ring[a : b + 1]
        median = 3.0 if part[0] == (-RING, 450.0) and part[-1] == (0.0, RING) else None
        town.add(part, "arterial", "Kestrel Ring", median_m=median)

    # Fast road across the town (no sidewalks, a shoulder), straight between junctions so
    # that nothing nodes it under the footbridge.
    fast = dict(speed_kmh=80, lanes=2, sidewalk="none", shoulder_m=1.5, aadt=13500)
    town.add(
        [(-1500.0, -300.0), (-1350.0, -280.0), (-RING, -250.0)], "arterial", "Gannet Road", **fast
    )
    town.add([(-RING, -250.0), (-600.0, -250.0), (0.0, -250.0)], "arterial", "Gannet Road", **fast)
    town.add([(0.0, -250.0), (RING, -250.0)], "arterial", "Gannet Road", **fast)
    info["fast_mid_idx"] = len(town.streets) - 1
    town.add(
        [(RING, -250.0), (1350.0, -230.0), (1500.0, -200.0)], "arterial", "Gannet Road", **fast
    )
    info["fast_road_name"] = "Gannet Road"

    # Collectors.
    cob = [1200.0, 1000.0, 950.0, 800.0, 700.0, 600.0, 450.0, 300.0, 200.0, 150.0, 0.0]
    cob += [-250.0, -450.0, W[0][1], L[0][1], M[0][1], -RING]
    cob_pts = [(0.0, y) for y in cob]
    split_add(
        town,
        cob_pts,
        [cob.index(450.0), cob.index(-250.0), cob.index(L[0][1])],
        "collector",
        "Cobalt Road",
    )
    amb = [-RING] + NW_COLS + [0.0, 250.0, 500.0, 750.0, 1000.0, RING]
    amb_pts = [(x, COLLECTOR_Y) for x in amb]
    split_add(
        town,
        amb_pts,
        [amb.index(-600.0), amb.index(0.0), amb.index(750.0)],
        "collector",
        "Amber Road",
    )

    # North-west: the regular grid (older, 40 km/h, some one-way, mixed sidewalks).
    row_names = {
        1000.0: "Birch Street",
        800.0: "Alder Street",
        600.0: "Elm Street",
        300.0: "Hazel Street",
        150.0: "Rowan Street",
    }
    for y in NW_ROWS:
        pts = [(-RING, y)] + [(x, y) for x in NW_COLS] + [(0.0, y)]
        kw = {"speed_kmh": 40}
        if y == 150.0:
            kw = {"speed_kmh": 30, "oneway": True, "lanes": 1, "sidewalk": "left"}
        if y == 1000.0:
            split_add(town, pts, [3], "local", row_names[y], speed_kmh=40, sidewalk="unknown")
        elif y in (800.0, 300.0):
            split_add(town, pts, [3], "local", row_names[y], **kw)
        else:
            town.add(pts, "local", row_names[y], **kw)
    ash = [(-RING, 0.0)] + [(x, 0.0) for x in NW_COLS] + [(0.0, 0.0)]
    town.add(ash, "local", "Ash Street", speed_kmh=40, sidewalk="right")
    col_names = {
        -1000.0: "Wren Lane",
        -800.0: "Robin Lane",
        -600.0: "Thrush Lane",
        -400.0: "Swift Lane",
        -200.0: "Dunlin Lane",
    }
    col_ys = [RING, 1000.0, 800.0, 600.0, COLLECTOR_Y, 300.0, 150.0, 0.0]
    for x in NW_COLS:
        ys = col_ys + ([-250.0] if x == -600.0 else [])
        pts = [(x, y) for y in ys]
        if x in (-1000.0, -400.0):
            split_add(town, pts, [ys.index(COLLECTOR_Y)], "local", col_names[x], speed_kmh=40)
        elif x == -800.0:
            town.add(pts, "local", col_names[x], speed_kmh=30, sidewalk="none")
        else:
            town.add(pts, "local", col_names[x], speed_kmh=40)

    # North-east: town centre, with Saffron Street's separately drawn sidewalks.
    town.add([(x, 950.0) for x in [0.0] + NE_COLS + [RING]], "local", "Cedar Street")
    town.add(
        [(x, 200.0) for x in [0.0, 250.0, 500.0, 750.0, 1000.0, RING]], "local", "Poplar Street"
    )
    park_road = [0.0, 250.0, 300.0, 500.0, 600.0, 700.0, 750.0, 1000.0, RING]
    split_add(
        town,
        [(x, 0.0) for x in park_road],
        [park_road.index(500.0)],
        "local",
        "Park Road",
        speed_kmh=30,
    )
    town.add([(0.0, SEP_Y), (250.0, SEP_Y)], "local", "Saffron Street")
    sep_xs = [250.0, 400.0, 600.0, 750.0]
    town.add(
        [(x, SEP_Y) for x in sep_xs], "local", "Saffron Street", sidewalk="separate", speed_kmh=30
    )
    town.add([(x, SEP_Y) for x in [750.0, 1000.0, RING]], "local", "Saffron Street")
    for x, name in [(250.0, "Indigo Lane"), (750.0, "Umber Lane")]:
        ys = [0.0, 200.0, COLLECTOR_Y, SEP_Y - SEP_OFF, SEP_Y, SEP_Y + SEP_OFF, 825.0, 950.0, RING]
        split_add(town, [(x, y) for y in ys], [ys.index(SEP_Y)], "local", name)
    town.add(
        [(1000.0, y) for y in [0.0, 200.0, COLLECTOR_Y, SEP_Y, 950.0, RING]],
        "local",
        "Teal Lane",
        speed_kmh=40,
    )
    town.add(
        [(500.0, y) for y in [0.0, 200.0, COLLECTOR_Y]], "local", "Ochre Lane", sidewalk="left"
    )
    town.add([(250.0, 825.0), (750.0, 825.0)], "service", "Saffron Mews")
    for dy in (SEP_OFF, -SEP_OFF):
        town.add([(x, SEP_Y + dy) for x in sep_xs], "path", None)
    for x in (400.0, 600.0):
        town.add([(x, SEP_Y + SEP_OFF), (x, SEP_Y), (x, SEP_Y - SEP_OFF)], "path", None)
    info["sep_nodes"] = [(400.0, SEP_Y), (600.0, SEP_Y)]

    # The park straddling the fast road, with its footbridge and steps.
    hub, hub2 = (450.0, -150.0), (450.0, -350.0)
    fb_n, fb_s = (450.0, -215.0), (450.0, -285.0)
    town.add([(300.0, 0.0), (380.0, -80.0), hub], "path", "Meadow Park path")
    town.add([(600.0, 0.0), (520.0, -80.0), hub], "path", "Meadow Park path")
    town.add([(380.0, -80.0), (280.0, -130.0), (330.0, -190.0), hub], "path", None)
    town.add([hub, fb_n], "path", None)
    fb = town.add([fb_n, fb_s], "path", "Meadow Footbridge", layer=1)
    info["footbridge_idx"] = len(town.streets) - 1
    town.add([fb_s, hub2], "path", None)
    town.add([hub2, (400.0, -400.0), (350.0, -450.0)], "path", "Meadow Park path")
    town.add([hub2, (505.0, -400.0), (560.0, -450.0)], "path", "Meadow Park path")
    town.add([hub, (550.0, -140.0)], "path", None)
    town.add([(550.0, -140.0), (590.0, -132.0)], "steps", None)
    town.add([(590.0, -132.0), (690.0, -60.0), (700.0, 0.0)], "path", None)
    info["footbridge"] = fb

    # South-west suburb: curving streets, cul-de-sacs, a loop, a near-miss.
    split_add(town, W, [8], "local", "Willow Crescent", speed_kmh=40)
    heron = [
        W[4],
        (-290.0, -640.0),
        (-330.0, -760.0),
        (-450.0, -805.0),
        (-570.0, -775.0),
        (-610.0, -720.0),
        W[8],
    ]
    split_add(town, heron, [3], "local", "Heron Loop")
    town.add([W[2], (-145.0, -420.0), (-160.0, -345.0)], "local", "Juniper Close", sidewalk="right")
    town.add([W[10], (-742.0, -540.0), (-760.0, -440.0), (-755.0, -350.0)], "local", "Aspen Close")
    stem_end, top = (-985.0, -390.0), (-985.0, -340.0)
    town.add([W[13], (-980.0, -460.0), stem_end], "local", "Larch Close")
    town.add(
        [stem_end, (-963.35, -377.5), (-963.35, -352.5), top],
        "local",
        "Larch Close",
        sidewalk="none",
    )
    town.add(
        [stem_end, (-1006.65, -377.5), (-1006.65, -352.5), top],
        "local",
        "Larch Close",
        sidewalk="none",
    )
    town.add(
        [W[14], (-1045.0, -680.0), (-1060.0, -790.0)], "local", "Holly Close", sidewalk="unknown"
    )
    split_add(town, M, [6], "local", "Maple Drive", speed_kmh=40)
    town.add([M[2], (-190.0, -1000.0), (-185.0, -1090.0)], "local", "Lapwing Close")
    town.add([M[5], (-420.0, -1030.0), (-415.0, -1110.0)], "local", "Russet Close", sidewalk="none")
    # Finch Lane stops 3 m short of Maple Drive (a digitising near-miss for the QA report).
    y_t = -1000.0
    end = None
    for a, b in zip(M, M[1:]):
        if (a[1] - y_t) * (b[1] - y_t) <= 0:
            t = (y_t - a[1]) / (b[1] - a[1])
            hit = (a[0] + t * (b[0] - a[0]), y_t)
            d = dist(a, b)
            nx, ny = (b[1] - a[1]) / d, -(b[0] - a[0]) / d  # normal, pointing west-ish
            if nx > 0:
                nx, ny = -nx, -ny
            end = (hit[0] + 3.0 * nx, hit[1] + 3.0 * ny)
            break
    finch = [(-RING, -1000.0), (-1000.0, -985.0), (-800.0, -995.0), end]
    town.add(finch, "local", "Finch Lane")
    town.add([(-1000.0, -985.0), (-990.0, -920.0), (-995.0, -860.0)], "local", "Sorrel Close")
    info["near_miss_end"] = town.key(end)

    # South-east suburb.
    mx = [0.0, 150.0, 350.0, 560.0, 700.0, 900.0, 1050.0, RING]
    my = {900.0: -470.0, 1050.0: -462.0}
    meadow = [(x, my.get(x, -450.0)) for x in mx]
    split_add(town, meadow, [3], "local", "Meadow Lane", speed_kmh=40)
    split_add(town, L, [8], "local", "Linden Way", speed_kmh=40)
    town.add([(150.0, -450.0), (155.0, -540.0), (145.0, -620.0)], "local", "Thistle Close")
    town.add(
        [(1050.0, -462.0), (1060.0, -560.0), (1050.0, -640.0)],
        "local",
        "Clover Close",
        sidewalk="left",
    )
    town.add([(900.0, -470.0), (905.0, -540.0), (900.0, -600.0)], "local", "Plover Close")
    town.add([(900.0, -600.0), (900.0, -625.0)], "steps", None)
    town.add([(900.0, -625.0), L[12]], "path", "Plover cut-through")
    town.add([L[2], (145.0, -930.0), (160.0, -1050.0)], "local", "Sedge Close")
    town.add([L[4], (305.0, -760.0), (295.0, -650.0)], "local", "Ochre Close")
    town.add(
        [L[14], (1055.0, -900.0), (1040.0, -1050.0)], "local", "Teal Close", sidewalk="unknown"
    )
    curlew = [
        L[6],
        (430.0, -950.0),
        (500.0, -1050.0),
        (650.0, -1060.0),
        (770.0, -980.0),
        (765.0, -860.0),
        L[10],
    ]
    split_add(town, curlew, [3], "local", "Curlew Circle")

    # A tiny piece joined to nothing (a QA finding): a yard outside the ring.
    tiny = town.add([(1420.0, 600.0), (1445.0, 620.0), (1470.0, 640.0)], "service", "Teal Yard")
    info["tiny"] = tiny
    info["willow"], info["linden"], info["maple"] = W, L, M
    return info


def attach_attributes(town, rng, slow_near):
    """Traffic volumes and widths, drawn in feature order from the seeded generator."""
    for st in town.streets:
        p = st["props"]
        cls = p["class"]
        if cls == "arterial" and p.get("speed_kmh") == 60:
            if rng.random() < 0.9:
                p["aadt"] = rng.randrange(160, 240) * 100
            if rng.random() < 0.5:
                p["width_m"] = 14.0
        elif cls == "collector":
            if rng.random() < 0.85:
                p["aadt"] = rng.randrange(50, 90) * 100
            if rng.random() < 0.4:
                p["width_m"] = 10.5
        elif cls == "local":
            if rng.random() < 0.4:
                p["aadt"] = rng.randrange(3, 15) * 100
            if rng.random() < 0.25:
                p["width_m"] = rng.choice([6.5, 7.0, 7.5, 8.0])
        elif cls == "service":
            if rng.random() < 0.5:
                p["width_m"] = 4.0
    # Measured peak counts on streets next to schools.
    for st in town.streets:
        p = st["props"]
        if p.get("name") in slow_near:
            p["vehicles_15min"] = slow_near[p["name"]]


# ---------------------------------------------------------------- topology helpers


def junction_nodes(town):
    """Vertex key -> list of legs (street index, neighbour key) where three or more legs meet."""
    occ = {}
    for i, st in enumerate(town.streets):
        ks = st["keys"]
        for j, k in enumerate(ks):
            legs = occ.setdefault(k, [])
            if j > 0:
                legs.append((i, ks[j - 1]))
            if j < len(ks) - 1:
                legs.append((i, ks[j + 1]))
    return {k: v for k, v in occ.items() if len(v) >= 3}


def unnoded_crossings(town):
    """Pairs of streets whose segments meet away from a shared vertex (grade separations)."""
    segs = []
    for i, st in enumerate(town.streets):
        ks = st["keys"]
        for j in range(len(ks) - 1):
            segs.append((i, ks[j], ks[j + 1]))
    cell = 100.0
    grid = {}
    for n, (i, a, b) in enumerate(segs):
        for gx in range(
            int(math.floor(min(a[0], b[0]) / cell)), int(math.floor(max(a[0], b[0]) / cell)) + 1
        ):
            for gy in range(
                int(math.floor(min(a[1], b[1]) / cell)), int(math.floor(max(a[1], b[1]) / cell)) + 1
            ):
                grid.setdefault((gx, gy), []).append(n)
    found = set()
    for bucket in sorted(grid):
        items = grid[bucket]
        for x in range(len(items)):
            for y in range(x + 1, len(items)):
                s, t = segs[items[x]], segs[items[y]]
                shared = {s[1], s[2]} & {t[1], t[2]}
                if shared:
                    continue
                if proper_cross(s[1], s[2], t[1], t[2]):
                    found.add((min(s[0], t[0]), max(s[0], t[0])))
    return sorted(found)


class StreetIndex:
    """Segments bucketed on a 50 m grid for nearest-street distances."""

    def __init__(self, town, classes=None):
        self.cell = 50.0
        self.grid = {}
        for i, st in enumerate(town.streets):
            if classes and st["props"]["class"] not in classes:
                continue
            ks = st["keys"]
            for j in range(len(ks) - 1):
                a, b = ks[j], ks[j + 1]
                for gx in range(
                    int(math.floor(min(a[0], b[0]) / self.cell)),
                    int(math.floor(max(a[0], b[0]) / self.cell)) + 1,
                ):
                    for gy in range(
                        int(math.floor(min(a[1], b[1]) / self.cell)),
                        int(math.floor(max(a[1], b[1]) / self.cell)) + 1,
                    ):
                        self.grid.setdefault((gx, gy), []).append((a, b))

    def nearest(self, p, reach=1):
        gx, gy = int(math.floor(p[0] / self.cell)), int(math.floor(p[1] / self.cell))
        best = math.inf
        for dx in range(-reach, reach + 1):
            for dy in range(-reach, reach + 1):
                for a, b in self.grid.get((gx + dx, gy + dy), ()):
                    best = min(best, seg_dist(p, a, b))
        return best


# ---------------------------------------------------------------- schools and catchments


SCHOOLS = [
    # id, name, students, point (metres) or polygon
    ("S1", "Hazel Row Elementary School", "elementary", (-900.0, 700.0)),
    ("S2", "Saffron Green Elementary School", "elementary", None),
    ("S3", "Kestrel Hill Secondary School", "secondary", (-300.0, 380.0)),
    ("S4", "Heron Loop Elementary School", "elementary", (-450.0, -690.0)),
    ("S5", "Linden Fields Elementary School", "elementary", (600.0, -765.0)),
]
S2_POLY = [(320.0, 490.0), (700.0, 490.0), (700.0, 660.0), (320.0, 660.0)]
S2_ENTRANCES = [(500.0, 490.0), (650.0, 660.0)]

B = 1350.0
CATCHMENTS = [
    ("S1", [(-B, -250.0), (-400.0, -250.0), (-400.0, B), (-B, B)]),
    ("S3", [(-400.0, -250.0), (0.0, -250.0), (250.0, -250.0), (250.0, B), (-400.0, B)]),
    ("S2", [(250.0, -250.0), (B, -250.0), (B, B), (250.0, B)]),
    ("S4", [(-B, -B), (0.0, -B), (0.0, -250.0), (-400.0, -250.0), (-B, -250.0)]),
    ("S5", [(0.0, -B), (B, -B), (B, -250.0), (250.0, -250.0), (0.0, -250.0)]),
]


def school_entrances():
    out = {}
    for sid, _, _, pt in SCHOOLS:
        out[sid] = S2_ENTRANCES if pt is None else [pt]
    return out


def catchment_of(p):
    for sid, ring in CATCHMENTS:
        if in_ring(p, ring):
            return sid
    return None


def near_boundary(p, margin):
    for _, ring in CATCHMENTS:
        for i in range(len(ring)):
            if seg_dist(p, ring[i], ring[(i + 1) % len(ring)]) < margin:
                return True
    return False


# ---------------------------------------------------------------- homes


def district_density(p):
    """Share of candidate plots built on, by district (homes cluster in the suburbs)."""
    x, y = p
    if abs(x) > RING + 100 or abs(y) > RING + 100:
        return 0.0
    if y < -250:
        return 0.40  # suburbs
    if x < 0:
        return 0.25  # grid
    return 0.19  # town centre


def place_homes(town, rng):
    roads = StreetIndex(town, ("arterial", "collector", "local", "service"))
    foot = StreetIndex(town, FOOT)
    homes = []
    cell = 25.0
    taken = {}

    def clear_of_homes(p):
        gx, gy = int(math.floor(p[0] / cell)), int(math.floor(p[1] / cell))
        for dx in (-1, 0, 1):
            for dy in (-1, 0, 1):
                for q in taken.get((gx + dx, gy + dy), ()):
                    if dist(p, q) < 12.0:
                        return False
        return True

    def ok(p, own_d):
        if PARK[0] <= p[0] <= PARK[2] and PARK[1] <= p[1] <= PARK[3]:
            return False
        if 310.0 <= p[0] <= 710.0 and 480.0 <= p[1] <= 670.0:  # S2 grounds
            return False
        if near_boundary(p, 2.0):
            return False
        if any(pt is not None and dist(p, pt) < 40.0 for _, _, _, pt in SCHOOLS):
            return False
        d = roads.nearest(p)
        return (
            5.0 <= d <= 30.0 and d >= own_d - 0.01 and foot.nearest(p) >= 4.0 and clear_of_homes(p)
        )

    def put(p):
        homes.append(p)
        taken.setdefault((int(math.floor(p[0] / cell)), int(math.floor(p[1] / cell))), []).append(p)

    for st in town.streets:
        props = st["props"]
        cls = props["class"]
        if cls not in ("collector", "local") and not (
            cls == "arterial" and props.get("speed_kmh") == 60
        ):
            continue
        pts = st["keys"]
        length = line_length(pts)
        s = 20.0 + rng.random() * 20.0
        while s < length - 20.0:
            (x, y), (ux, uy) = along(pts, s)
            dens = district_density((x, y)) * (0.25 if cls == "arterial" else 1.0)
            for side in (1.0, -1.0):
                r1, r2 = rng.random(), rng.random()
                if r1 >= dens:
                    continue
                off = 8.0 + 17.0 * r2
                p = (x - uy * off * side, y + ux * off * side)
                if ok(p, off):
                    put(p)
            s += 34.0 + rng.random() * 16.0
    # A handful of farmhouses along the fast road outside the ring, outside every catchment.
    for x, side in [
        (-1470.0, 1),
        (-1420.0, -1),
        (1380.0, 1),
        (1420.0, -1),
        (1455.0, 1),
        (1490.0, -1),
    ]:
        y = (
            -300.0 + (x + 1500.0) * (20.0 / 150.0)
            if x < 0
            else -230.0 + (x - 1350.0) * (30.0 / 150.0)
        )
        p = (x, y + side * (12.0 + rng.random() * 10.0))
        assert roads.nearest(p) >= 5.0
        put(p)
    return homes


# ---------------------------------------------------------------- crossings


def build_crossings(town, rng, info):
    nodes = junction_nodes(town)
    ents = school_entrances()
    kind_of = {sid: students for sid, _, students, _ in SCHOOLS}
    crossings = []  # (metre point or vertex key, control, guard school type or None)
    vertex_used = set()
    legs_used = set()
    node_points = {}

    def road_legs(k):
        return [(i, nb) for i, nb in nodes[k] if town.cls(i) not in FOOT]

    def has_foot(k):
        return any(town.cls(i) in FOOT for i, _ in nodes[k])

    def short_leg(k):
        return any(dist(k, nb) < 20.0 for _, nb in nodes[k])

    def cls_set(k):
        return sorted({town.cls(i) for i, _ in road_legs(k)})

    def speed(i):
        return town.streets[i]["props"].get("speed_kmh", 0)

    def nearest_school(p):
        best = None
        for sid in sorted(ents):
            for e in ents[sid]:
                d = dist(p, e)
                if best is None or d < best[0]:
                    best = (d, sid)
        return best

    def fits_near_school(k, metres):
        return nearest_school(k)[0] <= metres

    plain = sorted(k for k in nodes if not has_foot(k) and not short_leg(k))

    def on_vertex(k, control):
        assert k not in vertex_used and k not in node_points, k
        vertex_used.add(k)
        node_points[k] = 1
        crossings.append((k, control, True))

    def on_leg(k, leg, control, up_m=None):
        i, nb = leg
        assert (k, nb) not in legs_used and k not in vertex_used
        legs_used.add((k, nb))
        node_points[k] = node_points.get(k, 0) + 1
        d = up_m if up_m is not None else 4.0 + rng.random() * 4.0
        L = dist(k, nb)
        p = (k[0] + (nb[0] - k[0]) * d / L, k[1] + (nb[1] - k[1]) * d / L)
        crossings.append((p, control, False))

    def pick_nodes(cands, n, control):
        cands = [k for k in cands if k not in node_points]
        rng.shuffle(cands)
        assert len(cands) >= n, (control, len(cands), n)
        for k in cands[:n]:
            on_vertex(k, control)

    def pick_legs(cands, n, control):
        """cands: list of (node, leg). At most two leg points per node."""
        cands = [
            (k, leg)
            for k, leg in cands
            if k not in vertex_used and (k, leg[1]) not in legs_used and node_points.get(k, 0) < 2
        ]
        rng.shuffle(cands)
        chosen = 0
        for k, leg in cands:
            if chosen == n:
                break
            if k in vertex_used or (k, leg[1]) in legs_used or node_points.get(k, 0) >= 2:
                continue
            on_leg(k, leg, control)
            chosen += 1
        assert chosen == n, (control, chosen, n)

    junction_pts = sorted(nodes)

    def midblock(classes, n, control, name_filter=None):
        feats = [
            i
            for i, st in enumerate(town.streets)
            if st["props"]["class"] in classes
            and st["props"].get("sidewalk") != "separate"
            and st["props"].get("speed_kmh") != 80
            and line_length(st["keys"]) >= 120.0
            and (name_filter is None or st["props"].get("name") in name_filter)
        ]
        placed, tries = 0, 0
        while placed < n:
            tries += 1
            assert tries < 5000, control
            i = rng.choice(feats)
            pts = town.pts(i)
            s = 40.0 + rng.random() * (line_length(pts) - 80.0)
            p, _ = along(pts, s)
            if min(dist(p, k) for k in junction_pts) < 40.0:
                continue
            if any(dist(p, q if not on else q) < 60.0 for q, _, on in crossings):
                continue
            crossings.append((p, control, False))
            placed += 1

    # Signals: where the ring meets the collectors and the fast road, the collectors' own
    # junctions, one grid junction by the secondary school, and the sidewalk crossing node.
    for k in [
        (0.0, RING),
        (0.0, -RING),
        (-RING, 450.0),
        (RING, 450.0),
        (-RING, -250.0),
        (0.0, -250.0),
        (0.0, 450.0),
        (0.0, 0.0),
        (-400.0, 450.0),
    ]:
        on_vertex(k, "signal")
    on_vertex(info["sep_nodes"][0], "signal")
    on_vertex((250.0, 450.0), "signal;guard")
    on_vertex(info["sep_nodes"][1], "marked;raised")
    # The fast road: a T junction and a ring junction with nothing at all.
    for k, far in [((-600.0, -250.0), (0.0, -250.0)), ((RING, -250.0), (1350.0, -230.0))]:
        leg = next(l for l in nodes[k] if l[1] == far)
        on_leg(k, leg, "none")
    midblock(["arterial"], 2, "signal")

    grid4 = [k for k in plain if len(road_legs(k)) >= 4 and cls_set(k) == ["local"]]
    near_school = [k for k in grid4 if fits_near_school(k, 300.0)]
    pick_nodes(near_school, 2, "all_way_stop;guard")
    pick_nodes(grid4, 12, "all_way_stop")

    major_minor = []
    for k in plain:
        legs = road_legs(k)
        if any(town.cls(i) in ("arterial", "collector") for i, _ in legs) and all(
            speed(i) != 80 for i, _ in legs
        ):
            major_minor += [(k, l) for l in legs if town.cls(l[0]) == "local"]
    pick_legs(major_minor, 12, "stop")

    school_legs = [
        (k, l)
        for k in plain
        if fits_near_school(k, 400.0)
        for l in road_legs(k)
        if town.cls(l[0]) in ("collector", "local")
    ]
    pick_legs(school_legs, 9, "marked;guard")
    raised_legs = [
        (k, l)
        for k in plain
        if fits_near_school(k, 600.0)
        for l in road_legs(k)
        if town.cls(l[0]) == "local"
    ]
    pick_legs(raised_legs, 5, "raised")

    ring_local = []
    for k in plain:
        legs = road_legs(k)
        if any(town.cls(i) == "local" for i, _ in legs):
            ring_local += [
                (k, l) for l in legs if town.cls(l[0]) == "arterial" and speed(l[0]) == 60
            ]
    pick_legs(ring_local, 5, "refuge")

    col_local = []
    for k in plain:
        legs = road_legs(k)
        if any(town.cls(i) == "local" for i, _ in legs):
            col_local += [(k, l) for l in legs if town.cls(l[0]) == "collector"]
    pick_legs(col_local, 6, "beacon")

    local_legs = [(k, l) for k in plain if cls_set(k) == ["local"] for l in road_legs(k)]
    pick_legs(local_legs, 8, "marked")
    pick_legs(local_legs, 10, "none")

    midblock(["arterial"], 4, "marked;refuge")
    midblock(["collector"], 3, "marked;refuge")
    midblock(["collector"], 6, "marked;beacon")
    midblock(["local"], 6, "marked;raised")
    midblock(["local", "collector"], 4, "marked")

    out = []
    for n, (p, control, on) in enumerate(crossings):
        props = {"id": "X%03d" % (n + 1), "control": control}
        coords = town.vertex[p] if on else lonlat(p)
        if "guard" in control.split(";"):
            props["guard_hours"] = GUARD_HOURS[kind_of[nearest_school(p)[1]]]
        out.append({"p": p, "coords": coords, "props": props, "on_vertex": on})
    return out


# ---------------------------------------------------------------- output


def feature(geom_type, coords, props):
    return {
        "type": "Feature",
        "geometry": {"type": geom_type, "coordinates": coords},
        "properties": props,
    }


def write_collection(path, features):
    lines = [
        json.dumps(f, sort_keys=True, separators=(",", ":"), ensure_ascii=False) for f in features
    ]
    text = '{"type":"FeatureCollection","features":[\n' + ",\n".join(lines) + "\n]}\n"
    path.write_text(text, encoding="utf-8")


def make(out_dir):
    rng = random.Random(SEED)
    town = Town()
    info = build_streets(town)
    attach_attributes(
        town,
        rng,
        {"Elm Street": 48, "Amber Road": 165, "Linden Way": 72, "Saffron Street": 90},
    )
    bad = [
        (a, b)
        for a, b in unnoded_crossings(town)
        if {a, b} != {info["footbridge_idx"], info["fast_mid_idx"]}
    ]
    assert not bad, [
        (town.streets[a]["props"].get("name"), town.streets[b]["props"].get("name")) for a, b in bad
    ]

    streets = []
    for n, st in enumerate(town.streets):
        props = dict(st["props"])
        props["id"] = "ST%03d" % (n + 1)
        streets.append(feature("LineString", [town.vertex[k] for k in st["keys"]], props))

    crossings = build_crossings(town, rng, info)

    schools = []
    for sid, name, students, pt in SCHOOLS:
        props = {"id": sid, "name": name, "students": students}
        if pt is None:
            ring = [lonlat(p) for p in S2_POLY + [S2_POLY[0]]]
            props["entrances"] = [lonlat(p) for p in S2_ENTRANCES]
            schools.append(feature("Polygon", [ring], props))
        else:
            schools.append(feature("Point", lonlat(pt), props))

    home_pts = place_homes(town, rng)
    homes = []
    ids = [sid for sid, *_ in SCHOOLS]
    elementary = [sid for sid, _, st, _ in SCHOOLS if st == "elementary"]
    inside = [n for n, p in enumerate(home_pts) if catchment_of(p) is not None]
    choice = set(rng.sample(inside, 7))
    for n, p in enumerate(home_pts):
        r = rng.random()
        children = 1 if r < 0.7 else (2 if r < 0.92 else 3)
        props = {"id": "H%04d" % (n + 1), "children": children}
        if n in choice:
            own = catchment_of(p)
            props["school"] = rng.choice(
                [s for s in (elementary if own != "S3" else ids) if s != own]
            )
        homes.append(feature("Point", lonlat(p), props))

    catchments = []
    for sid, ring in CATCHMENTS:
        catchments.append(
            feature("Polygon", [[lonlat(p) for p in ring + [ring[0]]]], {"school": sid})
        )

    out = Path(out_dir)
    out.mkdir(parents=True, exist_ok=True)
    write_collection(out / "streets.geojson", streets)
    write_collection(
        out / "crossings.geojson", [feature("Point", c["coords"], c["props"]) for c in crossings]
    )
    write_collection(out / "schools.geojson", schools)
    write_collection(out / "homes.geojson", homes)
    write_collection(out / "catchments.geojson", catchments)
    rows = ["id,lon,lat,children,school"]
    for h in homes:
        lon, lat = h["geometry"]["coordinates"]
        p = h["properties"]
        rows.append("%s,%r,%r,%d,%s" % (p["id"], lon, lat, p["children"], p.get("school", "")))
    (out / "homes.csv").write_text("\n".join(rows) + "\n", encoding="utf-8")

    stats = summarise(town, streets, crossings, schools, homes, home_pts, info)
    (out / "README.md").write_text(readme(stats), encoding="utf-8")
    return stats


def summarise(town, streets, crossings, schools, homes, home_pts, info):
    by_class = {}
    for f in streets:
        c = f["properties"]["class"]
        by_class[c] = by_class.get(c, 0) + 1
    kinds = {k: 0 for k in CONTROL_KINDS}
    for c in crossings:
        for tok in c["props"]["control"].split(";"):
            kinds[tok] += 1
    nodes = junction_nodes(town)
    mid = sum(1 for c in crossings if min(dist(c["p"], k) for k in nodes) > 30.0)
    per_catch = {}
    for p in home_pts:
        sid = catchment_of(p) or "none"
        per_catch[sid] = per_catch.get(sid, 0) + 1
    return {
        "streets": len(streets),
        "by_class": dict(sorted(by_class.items())),
        "length_km": round(sum(line_length(s["keys"]) for s in town.streets) / 1000.0, 1),
        "crossings": len(crossings),
        "kinds": kinds,
        "midblock": mid,
        "schools": len(schools),
        "homes": len(homes),
        "children": sum(h["properties"]["children"] for h in homes),
        "assigned": sum(1 for h in homes if "school" in h["properties"]),
        "per_catchment": dict(sorted(per_catch.items())),
        "junctions": len(nodes),
        "tiny_m": round(line_length(info["tiny"])),
        "footbridge_m": round(line_length(info["footbridge"])),
    }


def readme(s):
    kinds = ", ".join("%s %d" % (k, v) for k, v in s["kinds"].items())
    classes = ", ".join("%s %d" % (k, v) for k, v in s["by_class"].items())
    catch = ", ".join("%s %d" % (k, v) for k, v in s["per_catchment"].items())
    return f"""# Demo town (invented)

An invented town for trying catchwalk and for its tests. It is placed in open North Atlantic
water, around 35.0 W 42.0 N, so that it cannot be taken for a real place; every street, school
and home in it is made up, and so is every figure (speeds, volumes, counts).

Generated by `python3 tools/make_demo_town.py` (standard library only, seeded, byte-identical
on every run; `tests/reference/test_demo_town.py` checks that). Do not edit these files by
hand: change the generator and run it again.

## Files (WGS84 `[lon, lat]`, properties in the `plain` preset)

| file | what |
|---|---|
| `streets.geojson` | {s['streets']} LineStrings ({classes}), {s['length_km']} km of centreline, {s['junctions']} junction vertices |
| `crossings.geojson` | {s['crossings']} crossing points ({s['midblock']} mid-block, the rest at a junction vertex or a few metres up a leg) |
| `schools.geojson` | {s['schools']} schools (S3 secondary, the others elementary; S2 a Polygon with `entrances`) |
| `homes.geojson`, `homes.csv` | the same {s['homes']} homes with {s['children']} children; {s['assigned']} carry a `school` (school choice) |
| `catchments.geojson` | 5 catchment Polygons tiling the town without overlap |

Crossing control counts (a combined control such as `marked;guard` counts once per kind):
{kinds}.

Homes per catchment: {catch} (`none`: farmhouses outside every catchment, which go to the
nearest school by walking).

## The town, about 3 x 3 km

- **Kestrel Ring**, an arterial ring (60 km/h, 4 lanes, sidewalks both sides) with chamfered
  corners. Signals where it meets the collectors and the fast road's west end; minor-leg stops,
  refuge islands or nothing where the locals meet it. Its north-west side has a 3 m raised
  median.
- **Cobalt Road** (north-south) and **Amber Road** (east-west), collectors at 50 km/h, crossing
  at a signal in the middle of town.
- **Gannet Road**, a fast road (80 km/h, 2 lanes, no sidewalks, 1.5 m shoulder) cutting east-west
  across the south of town and on out into the country. Its T junction with Thrush Lane and its
  east ring junction have no control at all.
- **North-west grid**: a regular grid of 40 km/h locals (Birch, Alder, Elm, Hazel, Rowan, Ash
  Streets; Wren, Robin, Thrush, Swift, Dunlin Lanes), with all-way stops, a one-way street with a
  sidewalk on one side, a street with no sidewalks and one whose sidewalks are unknown. Some
  streets run through several junctions as one feature (junctions at interior vertices), others
  are split into several features.
- **Town centre** (north-east): a looser grid of 30 km/h streets. The middle block of Saffron
  Street has `sidewalk: separate`: its sidewalks are drawn as foot paths 8 m either side, joined
  to the road by short crossing paths whose middle vertex is a road vertex, with a crossing point
  exactly there (one signal, one `marked;raised`). Saffron Mews is a service lane behind it.
  Saffron Green Elementary (S2) is a Polygon with two entrances.
- **Meadow Park** straddles the fast road: foot paths, a loop, one flight of steps, and the
  **Meadow Footbridge** ({s['footbridge_m']} m, `layer: 1`) over Gannet Road. The footbridge
  shares its end vertices with the park paths on both sides and no vertex with the road beneath,
  which has no vertex there.
- **South-west and south-east suburbs**: curving 30-40 km/h streets (Willow Crescent, Maple
  Drive, Meadow Lane, Linden Way), loops (Heron Loop, Curlew Circle, a turning loop at the end of
  Larch Close), cul-de-sacs, and a pedestrian cut-through with steps from Plover Close down to
  Linden Way.

## Deliberate QA findings

- **Finch Lane** ends 3 m short of Maple Drive (a dangling end that nearly meets a street).
- **Teal Yard**, a {s['tiny_m']} m service piece outside the ring, joins nothing (a tiny disconnected
  component). No home is on it.
- Many cul-de-sac ends are true dead ends.

## Cautions

Invented data for demonstration and testing only. catchwalk is a screening tool for planning;
it does not replace a site assessment, engineering judgement, local design codes or a licensed
traffic engineer.
"""


def main():
    ap = argparse.ArgumentParser(description="Write the invented demo town's layers.")
    ap.add_argument("--out", default="sample-maps/demo-town", help="output folder")
    args = ap.parse_args()
    stats = make(args.out)
    print(json.dumps(stats, sort_keys=True))


if __name__ == "__main__":
    main()
