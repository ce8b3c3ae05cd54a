"""`make bench`: the synthetic city at several scales, each audited by the native CLI (outputs
written, peak memory by /usr/bin/time -v), stage by stage natively (bench_stages), by the wasm
core in Node, and one shortest-path tree per school with igraph and networkx on the same
centreline graph and sources, in the same run. Writes out/bench/bench.md and bench.json.

Scales: BENCH_SCALES="segments:homes,..." (default 1000:100,10000:5000,100000:50000,
200000:100000). networkx grows at most BENCH_NX_TREES trees (default 20) at 50 k segments and
above and is scaled up to every school (said so in the table).
"""

import json
import os
import re
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
TARGET = Path(os.environ.get("CARGO_TARGET_DIR", ROOT / "target"))
OUT = ROOT / "out" / "bench"
CLI = TARGET / "release" / "catchwalk"
EXAMPLES = TARGET / "release" / "examples"
WASM = OUT / "wasm"


def timed(cmd, env=None):
    """Runs cmd under /usr/bin/time -v: (stdout, wall seconds, peak RSS MB)."""
    t = time.perf_counter()
    p = subprocess.run(["/usr/bin/time", "-v", *map(str, cmd)], capture_output=True, text=True,
                       env=None if env is None else {**os.environ, **env})
    wall = time.perf_counter() - t
    if p.returncode != 0:
        sys.exit(f"failed: {' '.join(map(str, cmd))}\n{p.stderr[-2000:]}")
    rss = re.search(r"Maximum resident set size \(kbytes\): (\d+)", p.stderr)
    return p.stdout, wall, (int(rss.group(1)) / 1024 if rss else float("nan"))


def audit_city(segments, homes):
    """Writes the synthetic city and audits it with the CLI: (folder, make_city's figures,
    wall seconds, peak MB)."""
    city = OUT / f"city-{segments}-{homes}"
    made = json.loads(subprocess.run([EXAMPLES / "make_city", str(segments), str(homes), city],
                                     check=True, capture_output=True, text=True).stdout)
    layers = ["--streets", city / "streets.geojson", "--crossings", city / "crossings.geojson",
              "--schools", city / "schools.geojson", "--homes", city / "homes.csv"]
    _, cli_s, cli_mb = timed([CLI, "audit", *layers, "--out", city / "audit"])
    return city, made, cli_s, cli_mb


def scale(segments, homes, nx_trees, wasm):
    city, made, cli_s, cli_mb = audit_city(segments, homes)
    out_mb = sum(f.stat().st_size for f in (city / "audit").iterdir()) / 1e6
    stages_out, _, stages_mb = timed([EXAMPLES / "bench_stages", city])
    stages = json.loads(stages_out)
    # The same natively on one thread: the wasm build has one, so this compares the code alone.
    one_out, _, _ = timed([EXAMPLES / "bench_stages", city], env={"RAYON_NUM_THREADS": "1"})
    libs_args = [sys.executable, ROOT / "tools/bench/graph_libs.py", city]
    if segments >= 50_000:
        libs_args += ["--networkx-trees", str(nx_trees)]
    libs = json.loads(subprocess.run(libs_args, check=True, capture_output=True, text=True).stdout)
    row = {"city": made, "cli_s": cli_s, "cli_peak_mb": cli_mb, "outputs_mb": out_mb,
           "stages": stages, "stages_one_thread": json.loads(one_out),
           "stages_peak_mb": stages_mb, "libs": libs}
    if wasm:
        w_out, _, w_mb = timed(["node", ROOT / "tools/bench/wasm_core.mjs", WASM, city])
        row["wasm"] = json.loads(w_out)
        row["wasm_peak_mb"] = w_mb
    return row


def table(rows):
    ig = lambda r: r["libs"]["igraph_s"]
    lines = [
        "# catchwalk benchmark (synthetic city, `make bench`)", "",
        f"Machine: {os.cpu_count()} cores; one run, other work on the machine not controlled. "
        "igraph and networkx: one shortest-path tree per school on the same centreline graph "
        "(`edges.csv`) from the same school junctions (`sources.csv`); catchwalk grows three trees "
        "per school (shortest, recommended, safe) on the side-of-street graph, audits every "
        "route and scores. Ratios are against igraph in the same run.", "",
        "| segments | homes | schools | CLI run, outputs written (s) | x igraph | CLI peak MB | "
        "outputs MB | native core (s) | native, 1 thread (s) | wasm core (s) | wasm / native | "
        "wasm / 1 thread | igraph (s) | networkx (s) |",
        "|---|---|---|---|---|---|---|---|---|---|---|---|---|---|",
    ]
    for r in rows:
        c, l = r["city"], r["libs"]
        # Native core like the wasm figure: reading the layers plus the audit.
        core_of = lambda st: (st["core_ms"] + dict(st["stages_ms"])["read"]) / 1000
        core, one = core_of(r["stages"]), core_of(r["stages_one_thread"])
        w = r.get("wasm")
        wasm_s = w["timings_ms"]["total_ms"] / 1000 if w else None
        nx = f"{l['networkx_s']:.2f}" + (f" (from {l['networkx_trees_timed']} trees)"
                                          if l["networkx_extrapolated"] else "")
        lines.append(
            f"| {c['segments']} | {c['homes']} | {c['schools']} | {r['cli_s']:.2f} | "
            f"{r['cli_s'] / ig(r):.2f} | {r['cli_peak_mb']:.0f} | {r['outputs_mb']:.0f} | "
            f"{core:.2f} | {one:.2f} | {'-' if wasm_s is None else f'{wasm_s:.2f}'} | "
            f"{'-' if wasm_s is None else f'{wasm_s / core:.2f}'} | "
            f"{'-' if wasm_s is None else f'{wasm_s / one:.2f}'} | {ig(r):.2f} | {nx} |")
    lines += ["", "## Stages (native, ms; the largest city)", "", "| stage | ms | x igraph |",
              "|---|---|---|"]
    big = rows[-1]
    for name, ms in big["stages"]["stages_ms"]:
        lines.append(f"| {name} | {ms:.1f} | {ms / 1000 / ig(big):.3f} |")
    lines += ["", "Check: igraph and networkx agree on every distance from the first school "
              f"(largest difference {max(r['libs']['max_distance_difference_m'] for r in rows):.3g} m).",
              "", "Screening tool for planning only (see CAUTION): figures here measure speed, not safety."]
    return "\n".join(lines) + "\n"


def main():
    spec = os.environ.get("BENCH_SCALES", "1000:100,10000:5000,100000:50000,200000:100000")
    scales = [tuple(map(int, s.split(":"))) for s in spec.split(",") if s]
    nx_trees = int(os.environ.get("BENCH_NX_TREES", "20"))
    wasm = (WASM / "catchwalk_bg.wasm").exists()
    OUT.mkdir(parents=True, exist_ok=True)
    rows = []
    for seg, homes in scales:
        print(f"bench: {seg} segments, {homes} homes", file=sys.stderr)
        rows.append(scale(seg, homes, nx_trees, wasm))
    (OUT / "bench.json").write_text(json.dumps(rows, indent=1))
    md = table(rows)
    (OUT / "bench.md").write_text(md)
    print(md)


if __name__ == "__main__":
    main()
