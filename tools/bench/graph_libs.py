"""One shortest-path tree per school on the synthetic city's centreline graph, with igraph and
networkx (general graph libraries from PyPI), timed for `make bench`.

Usage: python3 tools/bench/graph_libs.py CITY_DIR [--networkx-trees N]
Prints JSON: seconds for igraph (every school), networkx (every school, or N trees scaled up
to every school when N is given and smaller: said so in the output), and a cross-check that
both libraries give the same distances from the first school.
"""

import csv
import json
import sys
import time
from pathlib import Path


def read_graph(city: Path):
    with open(city / "edges.csv", newline="") as f:
        rows = list(csv.DictReader(f))
    edges = [(int(r["u"]), int(r["v"])) for r in rows]
    weights = [float(r["length_m"]) for r in rows]
    with open(city / "nodes.csv", newline="") as f:
        n = sum(1 for _ in f) - 1
    with open(city / "sources.csv", newline="") as f:
        sources = [int(r["node"]) for r in csv.DictReader(f)]
    return n, edges, weights, sources


def run_igraph(n, edges, weights, sources, limit=None):
    """Times one tree per school; with `limit`, the first `limit` trees, scaled to every school."""
    import igraph

    g = igraph.Graph(n=n, edges=edges, directed=False)
    g.es["w"] = weights
    picked = sources if limit is None else sources[:limit]
    t = time.perf_counter()
    first = None
    for s in picked:
        d = g.distances(source=[s], weights="w")[0]
        if first is None:
            first = d
    return (time.perf_counter() - t) * len(sources) / max(len(picked), 1), len(picked), first


def run_networkx(n, edges, weights, sources, limit):
    import networkx as nx

    g = nx.Graph()
    g.add_nodes_from(range(n))
    for (u, v), w in zip(edges, weights):
        if not g.has_edge(u, v) or g[u][v]["w"] > w:
            g.add_edge(u, v, w=w)
    picked = sources if limit is None else sources[:limit]
    t = time.perf_counter()
    first = None
    for s in picked:
        _pred, dist = nx.dijkstra_predecessor_and_distance(g, s, weight="w")
        if first is None:
            first = dist
    secs = time.perf_counter() - t
    return secs * len(sources) / max(len(picked), 1), len(picked), first


def main():
    city = Path(sys.argv[1])
    trees = lambda flag: int(sys.argv[sys.argv.index(flag) + 1]) if flag in sys.argv else None
    n, edges, weights, sources = read_graph(city)
    ig_s, ig_trees, ig_first = run_igraph(n, edges, weights, sources, trees("--igraph-trees"))
    nx_s, nx_trees, nx_first = run_networkx(n, edges, weights, sources, trees("--networkx-trees"))
    worst = max(
        (abs(ig_first[v] - d) for v, d in nx_first.items() if ig_first[v] != float("inf")),
        default=0.0,
    )
    print(json.dumps({
        "nodes": n, "edges": len(edges), "trees": len(sources),
        "igraph_s": ig_s, "igraph_trees_timed": ig_trees,
        "networkx_s": nx_s,
        "networkx_trees_timed": nx_trees,
        "networkx_extrapolated": nx_trees < len(sources),
        "max_distance_difference_m": worst,
    }))


if __name__ == "__main__":
    main()
