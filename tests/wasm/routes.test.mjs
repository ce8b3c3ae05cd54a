// Route lines on demand from the wasm build (in Node), on the demo town: the audit document
// carries none; the worker's held audit answers for one home, one catchment, or every route,
// and those are the command line's `--route-lines` routes, figure for figure.

import { test } from 'node:test';
import { strict as assert } from 'node:assert';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, dirname } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { demo, parseCsv } from './compare.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const wasmDir = join(root, 'www', 'build', 'wasm');
const cli = process.env.CATCHWALK_CLI ?? join(root, 'target', 'release', 'catchwalk');
const read = (f) => readFileSync(join(demo, f), 'utf8');
const layers = JSON.stringify({
  streets: read('streets.geojson'), crossings: read('crossings.geojson'), schools: read('schools.geojson'),
  homes: read('homes.geojson'), homes_format: 'geo_json', catchments: read('catchments.geojson'),
});
const yes = () => true;
const key = (f) => `${f.properties.home_id}/${f.properties.kind}`;

test('routes come from the held audit when asked, as the CLI writes them', async () => {
  const core = await import(pathToFileURL(join(wasmDir, 'catchwalk.js')).href);
  core.initSync({ module: readFileSync(join(wasmDir, 'catchwalk_bg.wasm')) });
  const doc = JSON.parse(core.audit(layers, '', yes));
  assert.ok(!('routes' in doc), 'the audit document carries no route lines');
  assert.equal(typeof doc.audit_id, 'number');
  const [header, ...cells] = parseCsv(doc.homes_csv);
  const rows = cells.map((r) => Object.fromEntries(header.map((h, i) => [h, r[i]])));

  // Every route: the CLI's routes.geojson (--route-lines), same homes, kinds and lines.
  const out = join(mkdtempSync(join(tmpdir(), 'cw-routes-')), 'out');
  execFileSync(cli, ['audit', '--streets', join(demo, 'streets.geojson'), '--crossings', join(demo, 'crossings.geojson'),
    '--schools', join(demo, 'schools.geojson'), '--homes', join(demo, 'homes.geojson'), '--catchments', join(demo, 'catchments.geojson'),
    '--route-lines', '--out', out], { stdio: 'pipe' });
  const cliRoutes = JSON.parse(readFileSync(join(out, 'routes.geojson'), 'utf8'));
  const all = JSON.parse(core.routeLines(doc.audit_id, '{}'));
  assert.ok(/Screening tool/.test(all.caution));
  assert.equal(all.features.length, cliRoutes.features.length);
  const byKey = new Map(cliRoutes.features.map((f) => [key(f), f]));
  for (const f of all.features) {
    const c = byKey.get(key(f));
    assert.ok(c, `${key(f)} is in the CLI's routes`);
    assert.ok(Math.abs(f.properties.network_m - c.properties.network_m) < 0.01, `${key(f)}: same length`);
    assert.equal(f.geometry.coordinates.length, c.geometry.coordinates.length, `${key(f)}: same line`);
  }

  // One home: its shortest and recommended routes (and its safe one where it has one).
  const home = rows.find((r) => r.recommended_network_m !== '' && r.safe_route === 'true');
  const one = JSON.parse(core.routeLines(doc.audit_id, JSON.stringify({ homes: [home.home_id] })));
  assert.deepEqual(one.features.map((f) => f.properties.kind).sort(), ['recommended', 'safe', 'shortest']);
  assert.ok(one.features.every((f) => f.properties.home_id === home.home_id));
  assert.ok(Math.abs(one.features.find((f) => f.properties.kind === 'recommended').properties.network_m - Number(home.recommended_network_m)) < 0.01);

  // One catchment's recommended routes: one per routed home of that school.
  const school = doc.summary.schools[1].id;
  const mine = JSON.parse(core.routeLines(doc.audit_id, JSON.stringify({ school, kinds: ['recommended'] })));
  const expected = rows.filter((r) => r.school_id === school && r.recommended_network_m !== '').length;
  assert.ok(expected > 10);
  assert.equal(mine.features.length, expected);
  assert.ok(mine.features.every((f) => f.properties.kind === 'recommended' && f.properties.school_id === school));
  assert.throws(() => core.routeLines(doc.audit_id, JSON.stringify({ school: 'NO-SUCH' })), /no school with id .*NO-SUCH/);

  // A re-audit is held beside the audit it started from, until the page releases it.
  const again = JSON.parse(core.reaudit('', yes));
  assert.notEqual(again.audit_id, doc.audit_id);
  assert.equal(JSON.parse(core.routeLines(again.audit_id, '{}')).features.length, all.features.length);
  assert.equal(JSON.parse(core.routeLines(doc.audit_id, '{}')).features.length, all.features.length);
  core.releaseAudit(again.audit_id);
  assert.throws(() => core.routeLines(again.audit_id, '{}'), /no longer held/);
  core.releaseAudit(doc.audit_id); // the full audit stays: the others re-audit it
  assert.equal(JSON.parse(core.routeLines(doc.audit_id, JSON.stringify({ homes: [home.home_id] }))).features.length, 3);
});
