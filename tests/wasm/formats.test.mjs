// Binary layers in the page's core: the wasm build's layerToGeojson gives the same WGS84
// GeoJSON as the native `catchwalk convert` (numbers to 1e-12 degrees: libm differs), for a
// zipped Shapefile in UTM 25N (the demo town's streets written by pyshp, tests/wasm/fixtures)
// and for the OpenStreetMap extract
// test.osm.pbf (when `make test-reference` has fetched it into .cache/osm).

import { test } from 'node:test';
import { strict as assert } from 'node:assert';
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { demo } from './compare.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const wasmDir = join(root, 'www', 'build', 'wasm');
const cli = process.env.CATCHWALK_CLI ?? join(root, 'target', 'release', 'catchwalk');

async function wasmCore() {
  const glue = await import(pathToFileURL(join(wasmDir, 'catchwalk.js')).href);
  glue.initSync({ module: readFileSync(join(wasmDir, 'catchwalk_bg.wasm')) });
  return glue;
}

function nativeConvert(file) {
  const out = join(mkdtempSync(join(tmpdir(), 'catchwalk-convert-')), 'out.geojson');
  execFileSync(cli, ['convert', '--layer', 'streets', '--in', file, '--out', out]);
  return JSON.parse(readFileSync(out, 'utf8'));
}

/** Deep equality, numbers within `tol` (wasm and native libm may differ in the last digit of
 * a reprojected coordinate: 1e-12 degrees is 0.1 micrometre). Returns the largest difference. */
function assertClose(a, b, tol = 1e-12, path = '') {
  if (typeof a === 'number' && typeof b === 'number') {
    assert.ok(Math.abs(a - b) <= tol, `${path}: ${a} vs ${b}`);
    return Math.abs(a - b);
  }
  if (a === null || b === null || typeof a !== 'object' || typeof b !== 'object') {
    assert.deepEqual(a, b, path);
    return 0;
  }
  const keys = new Set([...Object.keys(a), ...Object.keys(b)]);
  let worst = 0;
  for (const k of keys) worst = Math.max(worst, assertClose(a[k], b[k], tol, `${path}/${k}`));
  return worst;
}

function sameAsNative(core, file) {
  const text = core.layerToGeojson('streets', basename(file), readFileSync(file), '');
  const got = JSON.parse(text);
  const worst = assertClose(got, nativeConvert(file));
  console.log(`# ${basename(file)}: wasm and native conversions differ by at most ${worst} degrees`);
  return got;
}

test('a zipped Shapefile converts in wasm as in the CLI (to 1e-12 degrees), back to the demo town', async () => {
  const core = await wasmCore();
  const got = sameAsNative(core, join(root, 'tests', 'wasm', 'fixtures', 'demo-streets-utm25n.zip'));
  const original = JSON.parse(readFileSync(join(demo, 'streets.geojson'), 'utf8'));
  assert.equal(got.features.length, original.features.length);
  // UTM 25N back to WGS84 lands on the demo town's own coordinates (to 1e-7 degrees, ~1 cm).
  const a = got.features[0].geometry.coordinates[0][0];
  const b = original.features[0].geometry.coordinates[0];
  assert.ok(Math.abs(a[0] - b[0]) < 1e-7 && Math.abs(a[1] - b[1]) < 1e-7, `${a} vs ${b}`);
});

test('an .osm.pbf converts in wasm exactly as in the CLI', async (t) => {
  const pbf = process.env.OSM_EXTRACT ?? join(root, '.cache', 'osm', 'test.osm.pbf');
  if (!existsSync(pbf)) return t.skip('test.osm.pbf not fetched (make test-reference fetches it)');
  const core = await wasmCore();
  const got = sameAsNative(core, pbf);
  assert.ok(got.features.filter((f) => f.geometry.type === 'LineString').length > 2000);
});

test('the page names a layer\'s property names and CRS; bad choices are errors', async () => {
  const core = await wasmCore();
  const read = (f) => readFileSync(join(demo, f), 'utf8');
  const layers = (extra) => JSON.stringify({
    streets: read('streets.geojson'), schools: read('schools.geojson'), homes: read('homes.geojson'), ...extra,
  });
  const doc = JSON.parse(core.audit(layers({ names: { schools: 'plain', streets: 'plain' } }), '', () => true));
  assert.ok(doc.summary.homes > 300);
  assert.throws(() => core.audit(layers({ names: { streets: 'tiger' } }), '', () => true), /not a naming/);
  assert.throws(() => core.audit(layers({ crs: { streets: 'EPSG:999999' } }), '', () => true), /EPSG:999999/);
  // The demo town is in lon/lat: a projected CRS chosen for it is refused, not applied.
  assert.throws(() => core.audit(layers({ crs: { all: 'EPSG:32625' } }), '', () => true), /longitude\/latitude already/);
});
