// The same audit through the wasm build (in Node) and the native CLI gives the same homes.csv
// on the demo town, for homes given as GeoJSON and as CSV.

import { test } from 'node:test';
import { strict as assert } from 'node:assert';
import { readFileSync } from 'node:fs';
import { join, dirname } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { assertSameHomesCsv, cliHomesCsv, demo, parseCsv } from './compare.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const wasmDir = join(root, 'www', 'build', 'wasm');

async function wasmCore() {
  const glue = await import(pathToFileURL(join(wasmDir, 'catchwalk.js')).href);
  glue.initSync({ module: readFileSync(join(wasmDir, 'catchwalk_bg.wasm')) });
  return glue;
}

function layers(homesFile, format) {
  const read = (f) => readFileSync(join(demo, f), 'utf8');
  return JSON.stringify({
    streets: read('streets.geojson'), crossings: read('crossings.geojson'), schools: read('schools.geojson'),
    homes: read(homesFile), homes_format: format, catchments: read('catchments.geojson'), preset: 'plain', mapping: null,
  });
}

test('wasm and native CLI give the same homes.csv on the demo town (GeoJSON homes)', async () => {
  const core = await wasmCore();
  const stages = new Set();
  const doc = JSON.parse(core.audit(layers('homes.geojson', 'geo_json'), '', (stage) => { stages.add(stage); return true; }));
  const expected = cliHomesCsv();
  const rows = parseCsv(expected);
  assert.equal(rows.length - 1, 390, 'the demo town has 390 homes');
  const { numeric, maxDiff } = assertSameHomesCsv(doc.homes_csv, expected);
  assert.ok(numeric > 390 * 20, `compared only ${numeric} numeric cells`);
  // Every home routed in the demo town has a shortest route length.
  const col = rows[0].indexOf('shortest_network_m');
  assert.ok(rows.slice(1).filter((r) => r[col] !== '').length > 300, 'most demo homes get a route');
  assert.ok(stages.has('routing'), `progress reported stages ${[...stages]}`);
  console.log(`# ${numeric} numeric cells equal, largest difference ${maxDiff}`);
});

test('wasm reads homes as CSV like the CLI does', async () => {
  const core = await wasmCore();
  const doc = JSON.parse(core.audit(layers('homes.csv', 'csv'), '', () => true));
  assertSameHomesCsv(doc.homes_csv, cliHomesCsv('homes.csv'));
});

test('wasm follows a config like the CLI: a slower child takes longer', async () => {
  const core = await wasmCore();
  const base = parseCsv(JSON.parse(core.audit(layers('homes.geojson', 'geo_json'), '', () => true)).homes_csv);
  const slow = parseCsv(JSON.parse(core.audit(layers('homes.geojson', 'geo_json'), JSON.stringify({ benefit: { walking_speed_mps: 0.8 } }), () => true)).homes_csv);
  const t = base[0].indexOf('walking_time_min');
  const i = base.findIndex((r, k) => k > 0 && Number(r[t]) > 5);
  assert.ok(i > 0, 'some home walks more than 5 minutes');
  assert.ok(Math.abs(Number(slow[i][t]) - Number(base[i][t]) * 1.22 / 0.8) < 0.02, `${slow[i][t]} vs ${base[i][t]}`);
});

test('wasm returns a located error for a projected streets layer', async () => {
  const core = await wasmCore();
  const bad = JSON.parse(layers('homes.geojson', 'geo_json'));
  bad.streets = JSON.stringify({ type: 'FeatureCollection', features: [{ type: 'Feature', properties: { id: 'P1', class: 'local' }, geometry: { type: 'LineString', coordinates: [[500000, 4650000], [500100, 4650000]] } }] });
  assert.throws(() => core.audit(JSON.stringify(bad), '', () => true), (e) => {
    const err = JSON.parse(String(e));
    assert.equal(err.at?.layer, 'streets');
    assert.equal(err.at?.feature, 0);
    assert.match(err.message, /WGS84/);
    return true;
  });
});
