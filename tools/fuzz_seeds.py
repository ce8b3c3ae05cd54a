#!/usr/bin/env python3
"""Writes fuzz seeds (fuzz/seeds/, not committed) from the demo town and tests/corpus, and
fuzz/seeds-shapefile/ and fuzz/seeds-pbf/ for the binary readers.

Each seed: one flags byte (1: homes are CSV, 2: osm preset, 4: a mapping is given), then
streets, schools, homes, crossings, catchments and mapping text separated by 0xFF bytes,
as fuzz/fuzz_targets/common.rs reads them.
"""
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
OUT = ROOT / "fuzz" / "seeds"


def seed(d, homes_name):
    parts = []
    for name in ["streets.geojson", "schools.geojson", homes_name, "crossings.geojson", "catchments.geojson", "mapping.json"]:
        p = d / name
        parts.append(p.read_bytes() if p.is_file() else b"")
    flags = (1 if not homes_name.endswith("geojson") else 0) | (4 if (d / "mapping.json").is_file() else 0)
    return bytes([flags]) + b"\xff".join(parts)


def main():
    OUT.mkdir(parents=True, exist_ok=True)
    n = 0
    demo = ROOT / "sample-maps" / "demo-town"
    for homes in ["homes.geojson", "homes.csv"]:
        (OUT / f"demo-{homes}").write_bytes(seed(demo, homes))
        n += 1
    for d in sorted((ROOT / "tests" / "corpus").iterdir()):
        homes = next((h for h in ["homes.geojson", "homes.csv", "homes.txt", "homes.json"] if (d / h).is_file()), "homes.geojson")
        data = seed(d, homes)
        if len(data) <= 64 * 1024:
            (OUT / d.name).write_bytes(data)
            n += 1
    print(f"wrote {n} seeds to {OUT}", file=sys.stderr)
    # Binary readers get seeds of their own format: a zipped Shapefile fixture, and the
    # OpenStreetMap extract the Makefile fetches (when it is there).
    for target, files in [
        ("shapefile", [ROOT / "tests" / "wasm" / "fixtures" / "demo-streets-utm25n.zip"]),
        ("pbf", [ROOT / ".cache" / "osm" / "test.osm.pbf"]),
    ]:
        out = ROOT / "fuzz" / f"seeds-{target}"
        out.mkdir(parents=True, exist_ok=True)
        for f in files:
            if f.is_file():
                (out / f.name).write_bytes(f.read_bytes())
        print(f"wrote {len(list(out.iterdir()))} seeds to {out}", file=sys.stderr)


if __name__ == "__main__":
    main()
