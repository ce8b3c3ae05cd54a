# The page: the core in WebAssembly, the bundled page, the single-file build, their tests.
# Included by the root Makefile (`-include www/web.mk`).

WEB_SERVE := 1
WEB_TEST := 1

WEB_TARGET_DIR := $(or $(CARGO_TARGET_DIR),target)
WEB_WASM := $(WEB_TARGET_DIR)/wasm32-unknown-unknown/release-wasm/catchwalk.wasm
WEB_CLI := $(WEB_TARGET_DIR)/release/catchwalk
# The wasm-bindgen CLI must match the crate's version exactly: read it from Cargo.lock.
WBG_VERSION := $(shell awk '/^name = "wasm-bindgen"$$/ { getline; gsub(/"/, "", $$3); print $$3; exit }' Cargo.lock)
WEB_PORT := $(or $(PORT),8000)

# Label glyphs: SDF ranges rendered from a font in Debian's packages by tools/glyphs (the
# pbf_font_tools crate). Only these ranges are built (Basic Latin and Latin-1, Latin
# Extended-A/B, general punctuation); see www/README.md for their size.
WEB_FONT := /usr/share/fonts/truetype/dejavu/DejaVuSans.ttf
WEB_GLYPH_STARTS := 0 256 8192
WEB_GLYPH_TOOL := $(WEB_TARGET_DIR)/glyphs-tool/release/catchwalk-glyphs

.PHONY: web-setup web-build web-serve web-test web-glyphs

web-setup:
	@rustup target list --installed 2>/dev/null | grep -qx wasm32-unknown-unknown || rustup target add wasm32-unknown-unknown
	@if [ "$$(wasm-bindgen --version 2>/dev/null)" != "wasm-bindgen $(WBG_VERSION)" ]; then \
	  echo "installing wasm-bindgen-cli $(WBG_VERSION)"; cargo install wasm-bindgen-cli --version =$(WBG_VERSION); fi
	@if [ ! -f www/node_modules/.package-lock.json ] || [ www/package-lock.json -nt www/node_modules/.package-lock.json ]; then \
	  cd www && npm ci; fi
	@[ -x /usr/bin/chromium ] || (apt-get update && apt-get install -y chromium)
	@[ -f $(WEB_FONT) ] || (apt-get update && apt-get install -y fonts-dejavu-core)

web-glyphs: web-setup
	cargo build --release --locked --manifest-path tools/glyphs/Cargo.toml --target-dir $(WEB_TARGET_DIR)/glyphs-tool
	rm -rf www/build/glyphs
	$(WEB_GLYPH_TOOL) $(WEB_FONT) www/build/glyphs $(WEB_GLYPH_STARTS)

# Type-checks the page against the wasm bindings' declarations, then bundles it.
web-build: web-setup web-glyphs
	cargo build --lib --target wasm32-unknown-unknown --profile release-wasm -p catchwalk
	rm -rf www/build/wasm
	wasm-bindgen --target web --out-dir www/build/wasm --out-name catchwalk $(WEB_WASM)
	cd www && npx tsc --noEmit -p .
	node www/build.mjs

web-serve: web-build
	node www/serve.mjs www/build $(WEB_PORT)

web-test: web-build
	cargo build --release -p catchwalk --bin catchwalk
	@$(PYTHON) -c "import pmtiles, mapbox_vector_tile" 2>/dev/null || \
		$(PYTHON) -m pip install -q --disable-pip-version-check -r tests/browser/requirements.txt
	CATCHWALK_CLI=$(abspath $(WEB_CLI)) node --test tests/wasm/ tests/browser/
