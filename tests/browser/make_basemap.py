"""Builds a small PMTiles archive of vector tiles over the invented demo town, for the page's
basemap test: a pond (layer "water"), two parks ("park") and a row of buildings ("building"),
all invented. Tiles are encoded by mapbox-vector-tile and packed by the pmtiles package's
writer (both from PyPI), so the page's reader is checked against an outside writer.

Usage: python3 make_basemap.py OUT.pmtiles
"""

import gzip
import math
import sys

import mapbox_vector_tile
import numpy as np
import shapely
from pmtiles.tile import Compression, TileType, zxy_to_tileid
from pmtiles.writer import Writer
from shapely.geometry import Polygon, box, mapping

WEST, SOUTH, EAST, NORTH = -35.03, 41.99, -34.97, 42.02
ZOOMS = range(12, 16)
R = 6378137.0


def merc(lon, lat):
    """Web Mercator metres (EPSG:3857) of a longitude/latitude."""
    return R * math.radians(lon), R * math.log(math.tan(math.pi / 4 + math.radians(lat) / 2))


def tile_of(lon, lat, z):
    n = 2**z
    x = int((lon + 180) / 360 * n)
    y = int((1 - math.asinh(math.tan(math.radians(lat))) / math.pi) / 2 * n)
    return x, y


def tile_bounds(x, y, z):
    """The tile's bounds in Web Mercator metres."""
    size = 2 * math.pi * R / 2**z
    minx = -math.pi * R + x * size
    maxy = math.pi * R - y * size
    return minx, maxy - size, minx + size, maxy


def lonlat_box(w, s, e, n):
    return box(w, s, e, n)


FEATURES = {
    "water": [Polygon([(-35.0135, 42.0062), (-35.0105, 42.0058), (-35.0098, 42.0075), (-35.0128, 42.0082)])],
    "park": [lonlat_box(-35.0046, 41.9981, -35.0004, 42.0010), lonlat_box(-34.9960, 42.0066, -34.9930, 42.0088)],
    "building": [lonlat_box(-35.0135 + i * 0.0012, 42.0015, -35.0128 + i * 0.0012, 42.0021) for i in range(12)],
}


def main(out):
    def to_merc(coords):
        return np.array([merc(lon, lat) for lon, lat in coords])

    merc_features = {k: [shapely.transform(g, to_merc) for g in v] for k, v in FEATURES.items()}
    tiles = []
    for z in ZOOMS:
        x0, y0 = tile_of(WEST, NORTH, z)
        x1, y1 = tile_of(EAST, SOUTH, z)
        for x in range(x0, x1 + 1):
            for y in range(y0, y1 + 1):
                bounds = tile_bounds(x, y, z)
                area = box(*bounds)
                layers = []
                for name, geoms in merc_features.items():
                    feats = [{"geometry": g.intersection(area).wkt, "properties": {"kind": name}} for g in geoms if g.intersects(area)]
                    if feats:
                        layers.append({"name": name, "features": feats})
                if layers:
                    data = mapbox_vector_tile.encode(layers, default_options={"quantize_bounds": bounds, "extents": 4096})
                    tiles.append((zxy_to_tileid(z, x, y), gzip.compress(data)))
    tiles.sort()
    with open(out, "wb") as f:
        w = Writer(f)
        for tid, data in tiles:
            w.write_tile(tid, data)
        w.finalize(
            {
                "tile_type": TileType.MVT,
                "tile_compression": Compression.GZIP,
                "min_zoom": min(ZOOMS),
                "max_zoom": max(ZOOMS),
                "min_lon_e7": int(WEST * 1e7),
                "min_lat_e7": int(SOUTH * 1e7),
                "max_lon_e7": int(EAST * 1e7),
                "max_lat_e7": int(NORTH * 1e7),
                "center_zoom": 14,
                "center_lon_e7": int((WEST + EAST) / 2 * 1e7),
                "center_lat_e7": int((SOUTH + NORTH) / 2 * 1e7),
            },
            {"vector_layers": [{"id": k, "fields": {"kind": "String"}} for k in FEATURES]},
        )
    print(f"{out}: {len(tiles)} tiles")


if __name__ == "__main__":
    main(sys.argv[1])
