"""The CSVs open anywhere: Python's csv module (the standard library's RFC 4180 reader) reads
the header as the header, every row has the header's width, and each CSV's W3C CSV on the Web
metadata file ("Metadata Vocabulary for Tabular Data", W3C Recommendation 2015) lists exactly
its columns, in order, with the caution. Formula-like text cells come out neutralised."""

import csv
import json
import pathlib
import shutil
import subprocess

from conftest import DEMO, catchwalk_bin

TABLES = ["homes.csv", "catchments.csv", "hotspots.csv"]


def audit(out, **layers):
    args = [str(catchwalk_bin()), "audit", "--out", str(out)]
    for k, v in layers.items():
        args += [f"--{k}", str(v)]
    return subprocess.run(args, capture_output=True, text=True)


def test_header_first_and_metadata_matches(tmp_path):
    out = tmp_path / "out"
    r = audit(out, streets=DEMO / "streets.geojson", schools=DEMO / "schools.geojson",
              homes=DEMO / "homes.geojson", crossings=DEMO / "crossings.geojson",
              catchments=DEMO / "catchments.geojson")
    assert r.returncode == 0, r.stderr
    for name in TABLES:
        text = (out / name).read_text(encoding="utf-8")
        assert not text.startswith("#"), f"{name} has a line before its header"
        rows = list(csv.reader(text.splitlines()))
        header, body = rows[0], rows[1:]
        assert body, f"{name} has rows"
        assert all(len(r) == len(header) for r in body), f"{name}: ragged rows"
        assert csv.Sniffer().has_header(text[:20000]), f"{name}: the sniffer sees no header"
        meta = json.loads((out / f"{name}-metadata.json").read_text(encoding="utf-8"))
        assert meta["@context"] == "http://www.w3.org/ns/csvw"
        assert meta["url"] == name
        assert "Screening tool" in meta["dc:description"]
        cols = meta["tableSchema"]["columns"]
        assert [c["name"] for c in cols] == header, f"{name}: metadata columns differ from the header"
        assert all(c["datatype"] in {"string", "number", "integer", "boolean"} for c in cols)
        assert all(c["dc:description"] for c in cols)
        # Numeric columns hold numbers (or are blank).
        for i, c in enumerate(cols):
            if c["datatype"] in {"number", "integer"}:
                for row in body:
                    if row[i] != "":
                        float(row[i])


def test_formula_cells_are_neutralised_and_a_failed_run_keeps_the_old_outputs(tmp_path):
    corpus = pathlib.Path(__file__).resolve().parents[1] / "corpus"
    case = next(d for d in corpus.iterdir() if d.name.endswith("formula-injection-names"))
    out = tmp_path / "out"
    r = audit(out, streets=case / "streets.geojson", schools=case / "schools.geojson", homes=case / "homes.geojson")
    assert r.returncode == 0, r.stderr
    with open(out / "homes.csv", newline="", encoding="utf-8") as f:
        ids = [row["home_id"] for row in csv.DictReader(f)]
    assert "'=HYPERLINK(\"http://example.invalid\",\"x\")" in ids
    assert all(not i.startswith(("=", "+", "@")) for i in ids)
    before = {p.name: p.read_bytes() for p in out.iterdir()}
    # A failing run (projected homes) leaves the folder exactly as it was.
    bad = next(d for d in corpus.iterdir() if d.name.endswith("home-projected"))
    r = audit(out, streets=bad / "streets.geojson", schools=bad / "schools.geojson", homes=bad / "homes.geojson")
    assert r.returncode == 1
    assert {p.name: p.read_bytes() for p in out.iterdir()} == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out"], "no temporary folder left behind"
    shutil.rmtree(out)
