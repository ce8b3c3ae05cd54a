// The committed corpus (tests/corpus, see tools/make_corpus.py) through the wasm build in
// Node: each case gives the outcome its expected.json names, as the command line does
// (crate/tests/corpus.rs), so the page shows the same messages.

import { test } from 'node:test';
import { strict as assert } from 'node:assert';
import { createRequire } from 'node:module';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join, dirname } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const corpus = join(root, 'tests', 'corpus');
const wasmDir = join(root, 'www', 'build', 'wasm');
const Papa = createRequire(join(root, 'www', 'package.json'))('papaparse');

async function wasmCore() {
  const glue = await import(pathToFileURL(join(wasmDir, 'catchwalk.js')).href);
  glue.initSync({ module: readFileSync(join(wasmDir, 'catchwalk_bg.wasm')) });
  return glue;
}

/** The text of a warning or error as the core's Display writes it (layer, feature, id, property). */
function located(at, message) {
  if (!at) return message;
  let s = at.layer;
  if (at.feature !== null && at.feature !== undefined) s += ` feature ${at.feature}`;
  if (at.id) s += ` (id ${at.id})`;
  if (at.property) s += `, property '${at.property}'`;
  return `${s}: ${message}`;
}

const placeOk = (at, want) => (want.layer === null || at?.layer === want.layer) && (want.feature === null || at?.feature === want.feature);

function column(csvText, name) {
  const { data } = Papa.parse(csvText, { header: true, skipEmptyLines: true });
  return data.map((r) => r[name]);
}

test('the corpus gives the expected outcome through the wasm build', async () => {
  const core = await wasmCore();
  const cases = readdirSync(corpus).filter((d) => existsSync(join(corpus, d, 'expected.json'))).sort();
  assert.ok(cases.length >= 60, `${cases.length} cases`);
  const failures = [];
  let ran = 0;
  for (const name of cases) {
    const dir = join(corpus, name);
    const want = JSON.parse(readFileSync(join(dir, 'expected.json'), 'utf8'));
    if (!want.wasm || want.command !== 'audit') continue;
    ran++;
    const read = (f) => (existsSync(join(dir, f)) ? readFileSync(join(dir, f), 'utf8') : null);
    const homesName = ['homes.geojson', 'homes.csv', 'homes.txt', 'homes.json'].find((f) => existsSync(join(dir, f)));
    const homes = read(homesName) ?? '';
    // GeoJSON or CSV by content, as the core's homes_csv::sniff_format.
    const format = /^\uFEFF?\s*[[{]/.test(homes) ? 'geo_json' : 'csv';
    const layers = JSON.stringify({
      streets: read('streets.geojson') ?? '', schools: read('schools.geojson') ?? '', homes, homes_format: format,
      crossings: read('crossings.geojson'), catchments: read('catchments.geojson'), mapping: read('mapping.json'), preset: 'plain',
    });
    let doc = null;
    let error = null;
    try {
      doc = JSON.parse(core.audit(layers, read('config.json') ?? '', () => true));
    } catch (e) {
      try { error = JSON.parse(String(e)); } catch { error = { message: String(e), at: null }; }
    }
    const hasWords = (text) => want.words.every((w) => text.includes(w));
    if (want.outcome === 'error') {
      if (!error) { failures.push(`${name}: expected an error, the audit ran`); continue; }
      const text = located(error.at, error.message.replace(/^[^:]*: /, ''));
      if (!hasWords(error.message) && !hasWords(text)) failures.push(`${name}: error '${error.message.slice(0, 300)}' lacks ${JSON.stringify(want.words)}`);
      if (error.at && !placeOk(error.at, want)) failures.push(`${name}: error at ${JSON.stringify(error.at)}`);
      if (want.max_message_chars && error.message.length > want.max_message_chars) failures.push(`${name}: error ${error.message.length} characters`);
      continue;
    }
    if (error) { failures.push(`${name}: expected ${want.outcome}, got error ${error.message.slice(0, 300)}`); continue; }
    const texts = doc.warnings.map((w) => ({ w, text: located(w.at, w.message) }));
    if (want.outcome === 'warning' && !texts.some(({ w, text }) => placeOk(w.at, want) && hasWords(text))) {
      failures.push(`${name}: no warning with ${JSON.stringify(want.words)}: ${JSON.stringify(texts.map((t) => t.text.slice(0, 200)))}`);
    }
    if (want.outcome === 'ok' && texts.length) failures.push(`${name}: expected no warning, got ${JSON.stringify(texts.map((t) => t.text))}`);
    for (const [file, col, cell] of want.csv_cells) {
      const text = { 'homes.csv': doc.homes_csv, 'catchments.csv': doc.catchments_csv, 'hotspots.csv': doc.hotspots_csv }[file];
      if (!column(text, col).includes(cell)) failures.push(`${name}: ${file} column ${col} lacks ${JSON.stringify(cell)}`);
    }
  }
  assert.ok(ran >= 60, `only ${ran} cases ran in wasm`);
  assert.deepEqual(failures, [], failures.join('\n'));
});

test('the core checks config values for the page: bounds and messages', async () => {
  const core = await wasmCore();
  const bounds = JSON.parse(core.configBounds());
  const risk = bounds.find((b) => b.field === 'route.metres_per_risk_point');
  assert.deepEqual([risk.min, risk.min_exclusive], [0, false]);
  assert.match(core.checkConfig('{"route":{"metres_per_risk_point":-5}}'), /route\.metres_per_risk_point is -5; allowed: from 0 to/);
  assert.equal(core.checkConfig(core.defaultConfig()), '');
});
