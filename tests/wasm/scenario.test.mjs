// Scenarios through the wasm build (in Node) agree with the native CLI on the demo town: a
// re-audit with interventions gives the CLI's `audit --interventions` homes.csv, the
// comparison is the CLI's `compare`, and a project written by the wasm build is audited by
// the CLI to the same figures.

import { test } from 'node:test';
import { strict as assert } from 'node:assert';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, dirname } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { assertSameHomesCsv, cliAudit, demo } from './compare.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const wasmDir = join(root, 'www', 'build', 'wasm');
const cli = process.env.CATCHWALK_CLI ?? join(root, 'target', 'release', 'catchwalk');

async function wasmCore() {
  const glue = await import(pathToFileURL(join(wasmDir, 'catchwalk.js')).href);
  glue.initSync({ module: readFileSync(join(wasmDir, 'catchwalk_bg.wasm')) });
  return glue;
}

const read = (f) => readFileSync(join(demo, f), 'utf8');
const layers = {
  streets: read('streets.geojson'), crossings: read('crossings.geojson'), schools: read('schools.geojson'),
  homes: read('homes.geojson'), homes_format: 'geo_json', catchments: read('catchments.geojson'), preset: 'plain', mapping: null,
};
const interventions = JSON.stringify({ type: 'FeatureCollection', features: [
  { type: 'Feature', geometry: { type: 'Point', coordinates: [-35.0144839, 42.0013505] }, properties: { kind: 'guard' } },
  { type: 'Feature', geometry: null, properties: { kind: 'speed', street: 'ST009', speed_kmh: 30 } },
] });
const yes = () => true;

test('a wasm re-audit with interventions gives the CLI audit --interventions homes.csv', async () => {
  const core = await wasmCore();
  const base = JSON.parse(core.audit(JSON.stringify(layers), '', yes));
  const doc = JSON.parse(core.reaudit(interventions, yes));
  assert.ok(doc.reaudit.schools_rerouted >= 1 && doc.reaudit.schools_rerouted <= doc.reaudit.schools);
  assert.equal(doc.summary.interventions.length, 2);
  const dir = mkdtempSync(join(tmpdir(), 'catchwalk-iv-'));
  writeFileSync(join(dir, 'iv.geojson'), interventions);
  const out = cliAudit('homes.geojson', ['--interventions', join(dir, 'iv.geojson')]);
  assertSameHomesCsv(doc.homes_csv, readFileSync(join(out, 'homes.csv'), 'utf8'));
  assert.notEqual(doc.homes_csv, base.homes_csv, 'the interventions change the figures');
  // The page's comparison is the CLI's.
  const cmp = JSON.parse(core.compareAudits(base.homes_csv, doc.homes_csv));
  const before = cliAudit();
  const cmpDir = mkdtempSync(join(tmpdir(), 'catchwalk-cmp-'));
  execFileSync(cli, ['compare', before, out, '--out', cmpDir], { stdio: ['ignore', 'ignore', 'inherit'] });
  const cliCmp = JSON.parse(readFileSync(join(cmpDir, 'comparison.json'), 'utf8'));
  assert.deepEqual(cmp.homes_gained_safe_route, cliCmp.homes_gained_safe_route);
  assert.deepEqual(cmp.homes_route_changed, cliCmp.homes_route_changed);
  assert.ok(cmp.homes_route_changed.length > 0);
  // Back to the baseline.
  const back = JSON.parse(core.reaudit('', yes));
  assert.equal(back.homes_csv, base.homes_csv);
});

test('a project written by the wasm build reads back identically and the CLI audits it', async () => {
  const core = await wasmCore();
  const project = {
    layers, config: null,
    scenarios: [{ name: 'guard and slower road', interventions }],
    notes: [{ id: 'n1', at: [-35.0096559, 42.0090031], target: { on: 'point' }, checklist: { lighting: 'problem' },
      text: 'dark under the trees', photos: ['n1.jpg'], visited: null, observed: null }],
    photos: [{ name: 'n1.jpg', media_type: 'image/jpeg', bytes: Buffer.from([255, 216, 255, 224, 1, 2, 3]).toString('base64') }],
  };
  const bytes = core.projectWrite(JSON.stringify(project));
  const back = JSON.parse(core.projectRead(bytes));
  assert.deepEqual(back.scenarios, project.scenarios);
  assert.deepEqual(back.photos, project.photos);
  assert.equal(back.notes[0].checklist.lighting, 'problem');
  assert.equal(back.layers.streets, layers.streets);
  const dir = mkdtempSync(join(tmpdir(), 'catchwalk-proj-'));
  writeFileSync(join(dir, 'town.catchwalk'), bytes);
  execFileSync(cli, ['audit', '--project', join(dir, 'town.catchwalk'), '--scenario', 'guard and slower road', '--out', join(dir, 'out')],
    { stdio: ['ignore', 'ignore', 'inherit'] });
  core.audit(JSON.stringify(layers), '', yes);
  const doc = JSON.parse(core.reaudit(core.projectInterventions(JSON.stringify(back), 'guard and slower road', false), yes));
  assertSameHomesCsv(doc.homes_csv, readFileSync(join(dir, 'out', 'homes.csv'), 'utf8'));
});
