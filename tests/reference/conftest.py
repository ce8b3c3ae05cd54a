"""Shared helpers for the reference checks: run the catchwalk CLI, read its outputs."""

import csv
import json
import os
import pathlib
import subprocess

import pytest

ROOT = pathlib.Path(__file__).resolve().parents[2]
DEMO = ROOT / "sample-maps" / "demo-town"


def catchwalk_bin() -> pathlib.Path:
    """The release CLI (`make test-reference` builds it and passes its path)."""
    env = os.environ.get("CATCHWALK_BIN")
    path = pathlib.Path(env) if env else ROOT / "target" / "release" / "catchwalk"
    if not path.exists():
        subprocess.run(
            ["cargo", "build", "--release", "--bin", "catchwalk"], cwd=ROOT, check=True
        )
    return path


def run_audit(out_dir: pathlib.Path, **layers) -> dict:
    """Runs `catchwalk audit` and returns its outputs as Python data."""
    args = [str(catchwalk_bin()), "audit", "--route-lines", "--out", str(out_dir)]
    for name, value in layers.items():
        if value is not None:
            args += [f"--{name}", str(value)]
    subprocess.run(args, check=True, capture_output=True, text=True)
    with open(out_dir / "homes.csv", newline="") as f:
        homes = list(csv.DictReader(f))
    return {
        "summary": json.loads((out_dir / "summary.json").read_text()),
        "homes": homes,
        "centrelines": json.loads((out_dir / "centrelines.geojson").read_text()),
        "routes": json.loads((out_dir / "routes.geojson").read_text()),
    }


@pytest.fixture(scope="session")
def demo_audit(tmp_path_factory):
    out = tmp_path_factory.mktemp("demo-audit")
    return run_audit(
        out,
        streets=DEMO / "streets.geojson",
        schools=DEMO / "schools.geojson",
        homes=DEMO / "homes.geojson",
        crossings=DEMO / "crossings.geojson",
        catchments=DEMO / "catchments.geojson",
    )
