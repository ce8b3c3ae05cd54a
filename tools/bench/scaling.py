"""`make bench-scaling`: how the whole CLI run grows, from 1 k to 1 M street segments at a fixed
density of homes (one home per two segments), and in homes alone at 100 k segments. Each row is
one `catchwalk audit` of a synthetic city (`make_city`), outputs written, timed with its peak
memory by /usr/bin/time -v, beside igraph's one-tree-per-school time on the same centreline
graph in the same run. Writes out/bench/scaling.md and scaling.json.

The growth check: time per (n log2 n) and memory per n should stay flat (or fall) as n grows in
segments; time and memory per home should stay flat as homes grow at fixed segments.

SCALING_SEGMENTS="1000,10000,100000,1000000" and SCALING_HOMES="10000,25000,50000,100000"
override the rows (SCALING_HOMES is run at 100 k segments; empty to skip).
"""

import json
import math
import os
import shutil
import subprocess
import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
from bench import OUT, ROOT, audit_city  # noqa: E402


def run(segments, homes):
    city, made, cli_s, cli_mb = audit_city(segments, homes)
    # igraph grows whole-network trees: at 1 M segments 2 000 of them take many minutes, so
    # from 500 k segments it times IGRAPH_TREES of them, scaled to every school (said so).
    libs_args = [sys.executable, ROOT / "tools/bench/graph_libs.py", city, "--networkx-trees", "1"]
    if segments >= 500_000:
        libs_args += ["--igraph-trees", os.environ.get("IGRAPH_TREES", "100")]
    libs = json.loads(subprocess.run(libs_args, check=True, capture_output=True, text=True).stdout)
    row = {"city": made, "cli_s": cli_s, "cli_peak_mb": cli_mb, "igraph_s": libs["igraph_s"],
           "igraph_trees_timed": libs["igraph_trees_timed"]}
    print(json.dumps(row), file=sys.stderr)
    # The city's files are large at 1 M segments: keep only the figures.
    shutil.rmtree(city)
    return row


def table(by_segments, by_homes):
    nlogn = lambda n: n * math.log2(n)
    scaled = lambda r: ("" if r["igraph_trees_timed"] >= r["city"]["schools"]
                        else f" (from {r['igraph_trees_timed']} trees)")
    first = by_segments[0]
    lines = [
        "# catchwalk scaling (synthetic city, `make bench-scaling`)", "",
        f"Machine: {os.cpu_count()} cores; one run each, other work on the machine not "
        "controlled. Whole `catchwalk audit` runs, outputs written. \"per n log n\" and "
        "\"per n\" are relative to the first row (1.00 = the same growth as n log2 n or n).", "",
        "## In segments (one home per two segments, one school per 250 homes)", "",
        "| segments | homes | schools | CLI (s) | peak MB | time per n log n | memory per n | "
        "igraph (s) | x igraph |",
        "|---|---|---|---|---|---|---|---|---|",
    ]
    n0, t0, m0 = first["city"]["segments"], first["cli_s"], first["cli_peak_mb"]
    for r in by_segments:
        n = r["city"]["segments"]
        lines.append(
            f"| {n} | {r['city']['homes']} | {r['city']['schools']} | {r['cli_s']:.2f} | "
            f"{r['cli_peak_mb']:.0f} | {(r['cli_s'] / nlogn(n)) / (t0 / nlogn(n0)):.2f} | "
            f"{(r['cli_peak_mb'] / n) / (m0 / n0):.2f} | {r['igraph_s']:.2f}"
            f"{scaled(r)} | "
            f"{r['cli_s'] / r['igraph_s']:.2f} |")
    if by_homes:
        h0 = by_homes[0]
        lines += ["", "## In homes (100 k segments)", "",
                  "| homes | schools | CLI (s) | peak MB | time per home | memory per home |",
                  "|---|---|---|---|---|---|"]
        for r in by_homes:
            k = r["city"]["homes"] / h0["city"]["homes"]
            lines.append(
                f"| {r['city']['homes']} | {r['city']['schools']} | {r['cli_s']:.2f} | "
                f"{r['cli_peak_mb']:.0f} | {r['cli_s'] / h0['cli_s'] / k:.2f} | "
                f"{r['cli_peak_mb'] / h0['cli_peak_mb'] / k:.2f} |")
        lines += ["", "Per home relative to the first row. The network's fixed share (reading, "
                  "noding, the graph) does not grow with homes, so these fall below 1.00."]
    lines += ["", "Screening tool for planning only (see CAUTION): figures here measure speed, "
              "not safety."]
    return "\n".join(lines) + "\n"


def main():
    segs = [int(s) for s in os.environ.get("SCALING_SEGMENTS",
                                           "1000,10000,100000,1000000").split(",") if s]
    homes = [int(s) for s in os.environ.get("SCALING_HOMES",
                                            "10000,25000,50000,100000").split(",") if s]
    OUT.mkdir(parents=True, exist_ok=True)
    # A city in both series (100 k segments, 50 k homes by default) is audited once.
    rows = {}

    def row(seg, h):
        if (seg, h) not in rows:
            rows[(seg, h)] = run(seg, h)
        return rows[(seg, h)]

    by_segments = [row(n, max(n // 2, 100)) for n in segs]
    by_homes = [row(100_000, h) for h in homes]
    (OUT / "scaling.json").write_text(json.dumps({"segments": by_segments, "homes": by_homes},
                                                 indent=1))
    md = table(by_segments, by_homes)
    (OUT / "scaling.md").write_text(md)
    print(md)


if __name__ == "__main__":
    main()
