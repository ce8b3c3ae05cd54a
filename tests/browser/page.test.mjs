// End to end: the served page and the single-file build, driven in Debian's Chromium.
// Every test fails on any request that leaves 127.0.0.1.

import { after, before, test } from 'node:test';
import { strict as assert } from 'node:assert';
import { readFileSync, writeFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { guardedPage, launch, root, shots, waitAudits } from './helpers.mjs';
import { serve } from '../../www/serve.mjs';
import { assertSameHomesCsv, cliAudit, cliPlan, parseCsv } from '../wasm/compare.mjs';

let browser, server, base, cliCsv, cliDir;
const demo = join(root, 'sample-maps', 'demo-town');
const tmp = mkdtempSync(join(tmpdir(), 'catchwalk-page-'));

before(async () => {
  server = await serve(join(root, 'www', 'build'), 0);
  base = `http://127.0.0.1:${server.address().port}/`;
  browser = await launch();
  cliDir = cliAudit();
  cliCsv = readFileSync(join(cliDir, 'homes.csv'), 'utf8');
});
after(async () => {
  await browser?.close();
  server?.close();
});

const cliRows = () => {
  const rows = parseCsv(cliCsv);
  return new Map(rows.slice(1).map((r) => [r[0], Object.fromEntries(rows[0].map((h, i) => [h, r[i]]))]));
};

/** Centres the map on a home at a close zoom and clicks it; returns the figures table as text rows. */
async function clickHome(page, id) {
  const at = await page.evaluate((hid) => {
    const cw = window.catchwalk;
    const h = cw.homes().find((x) => x.id === hid);
    cw.map.jumpTo({ center: h.at, zoom: 18 });
    return h.at;
  }, id);
  assert.ok(at, `home ${id} is on the page`);
  await page.evaluate(() => new Promise((r) => { const m = window.catchwalk.map; if (m.loaded() && !m.isMoving()) requestAnimationFrame(() => m.once('idle', r) && m.triggerRepaint()); else m.once('idle', r); }));
  const box = await page.locator('#map canvas').boundingBox();
  await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
  await page.waitForSelector('#home-figures');
  return figures(page);
}

async function figures(page) {
  return page.$$eval('#home-figures tbody tr', (trs) => Object.fromEntries(trs.map((tr) => {
    const cells = [...tr.querySelectorAll('th,td')].map((c) => c.textContent);
    return [cells[0], { shortest: cells[1], recommended: cells[2] }];
  })));
}

/** Waits for the map to finish moving and drawing. */
const mapIdle = (page) => page.evaluate(() => new Promise((r) => {
  const m = window.catchwalk.map;
  if (!m.isMoving() && m.loaded()) requestAnimationFrame(() => r());
  else m.once('idle', () => r());
}));

const audits = (page) => page.evaluate(() => Number(document.body.dataset.audits ?? 0));

/** Types a value into a setting and leaves the field, as a planner does. */
async function setValue(page, selector, value) {
  await page.locator(selector).fill(value);
  await page.locator(selector).blur();
}

const metres = (s) => Number(String(s).replace(/[^0-9.]/g, ''));

test('served page: demo town, a home, CSV export, settings, a user file, cancel', async () => {
  const { page, leaks, errors } = await guardedPage(browser);
  await page.goto(base);
  await waitAudits(page, 1);
  const status = await page.locator('#status').innerText();
  assert.match(status, /390 homes, 545 children, 5 schools/);
  console.log(`# first audit of the demo town in the page: ${await page.evaluate(() => document.body.dataset.auditMs)} ms (core ${await page.evaluate(() => document.body.dataset.coreMs)} ms)`);
  await page.screenshot({ path: join(shots, '01-demo-town.png') });

  // A listed problem zooms the map to the feature it concerns.
  const c0 = await page.evaluate(() => window.catchwalk.map.getCenter().toArray());
  const moved = page.evaluate(() => new Promise((r) => window.catchwalk.map.once('moveend', r)));
  await page.click('#messages li.zoomable >> nth=0');
  await moved;
  const c1 = await page.evaluate(() => window.catchwalk.map.getCenter().toArray());
  assert.notDeepEqual(c1, c0, 'the map moved to the problem');

  // A home with a route that crosses something: its figures match the CLI's homes.csv row.
  const rows = cliRows();
  const pick = [...rows.values()].find((r) => Number(r.crossings) >= 2 && Number(r.shortest_network_m) > 400 && Number(r.children) >= 1);
  assert.ok(pick, 'the demo town has a home with crossings');
  const fig = await clickHome(page, pick.home_id);
  assert.equal(metres(fig['Network length'].shortest), Math.round(Number(pick.shortest_network_m)));
  assert.equal(metres(fig['Network length'].recommended), Math.round(Number(pick.recommended_network_m)));
  assert.equal(Number(fig['Crossings'].recommended), Number(pick.crossings));
  assert.equal(Number(fig['Uncontrolled crossings'].recommended), Number(pick.uncontrolled_crossings));
  assert.equal(Number(fig['Walking time'].shortest.replace(' min', '')), Number(Number(pick.shortest_walking_time_min).toFixed(1)));
  const drawn = await page.evaluate(() => window.catchwalk.map.getSource('sel-routes')._data?.features?.length ?? window.catchwalk.map.querySourceFeatures('sel-routes').length);
  assert.ok(drawn >= 1, 'the routes are drawn');
  await page.waitForTimeout(350);
  await mapIdle(page);
  await page.screenshot({ path: join(shots, '02-home-routes.png') });

  // Export homes CSV (individual homes ticked) and compare with the CLI's.
  assert.ok(await page.locator('#x-homes').isDisabled(), 'homes CSV needs the tick');
  await page.check('#include-homes');
  const [dl] = await Promise.all([page.waitForEvent('download'), page.click('#x-homes')]);
  const exported = readFileSync(await dl.path(), 'utf8');
  const { numeric } = assertSameHomesCsv(exported, cliCsv, 1e-9);
  assert.ok(numeric > 390 * 20);
  // Every home's routes (ticked): the worker writes them when asked; the audit document has none.
  const [dlr] = await Promise.all([page.waitForEvent('download'), page.click('#x-routes')]);
  const perHome = JSON.parse(readFileSync(await dlr.path(), 'utf8'));
  const lengthsBy = (kind) => new Map(perHome.features.filter((f) => f.properties.kind === kind).map((f) => [f.properties.home_id, f.properties.network_m]));
  const recommended = lengthsBy('recommended');
  assert.equal(recommended.size, [...rows.values()].filter((r) => r.recommended_network_m !== '').length, 'one recommended route per routed home');
  for (const r of rows.values()) if (r.recommended_network_m !== '') assert.ok(Math.abs(recommended.get(r.home_id) - Number(r.recommended_network_m)) < 0.01, `home ${r.home_id}: the exported route is the CLI's`);
  assert.ok(perHome.features.every((f) => f.geometry.type === 'LineString' && f.geometry.coordinates.length >= 2), 'each route is a line');
  assert.ok(/Screening tool/.test(perHome.caution));
  assert.ok(!(await page.evaluate(() => window.catchwalk.view().docKeys)).includes('routes'), 'the audit document carries no route lines');
  // The catchment and hotspot tables are the command line's, figure for figure.
  for (const [button, file] of [['#x-catchments', 'catchments.csv'], ['#x-hotspots-csv', 'hotspots.csv']]) {
    const [d] = await Promise.all([page.waitForEvent('download'), page.click(button)]);
    const got = readFileSync(await d.path(), 'utf8');
    assert.ok(got.startsWith('school_id,') || got.startsWith('rank,'), `${file} opens with its header`);
    assertSameHomesCsv(got, readFileSync(join(cliDir, file), 'utf8'), 1e-9, file);
    assert.ok(parseCsv(got).length > 5, `${file} has rows`);
  }
  // The upgrade planner chooses the command line's upgrades, in the same order.
  await page.fill('#plan-budget', '3');
  await page.click('#plan-run');
  await page.waitForSelector('#plan-summary');
  const planned = await page.evaluate(() => window.catchwalkPlan.plan);
  const expectedPlan = cliPlan(3).plan;
  assert.deepEqual(planned.steps.map((s) => [s.upgrade, s.edge, s.children_gained]), expectedPlan.steps.map((s) => [s.upgrade, s.edge, s.children_gained]));
  assert.ok(planned.safe_children_after >= planned.safe_children_before);
  assert.equal(await page.locator('#plan-table tbody tr').count(), expectedPlan.steps.length);
  await page.screenshot({ path: join(shots, '10-upgrade-plan.png') });
  // Shared routes export has no home in it.
  await page.uncheck('#include-homes');
  const [dl2] = await Promise.all([page.waitForEvent('download'), page.click('#x-routes')]);
  const shared = JSON.parse(readFileSync(await dl2.path(), 'utf8'));
  assert.equal(shared.features.length, 5, 'one feature per catchment');
  assert.ok(shared.features.every((f) => !('home_id' in f.properties)), 'no home ids in the shared export');
  assert.ok(/Screening tool/.test(shared.caution));

  // A slower walking speed: the same home's walking time moves by 1.22 / 0.8 (the default
  // walking speed, 4.0 ft/s); re-audit timing.
  const before = Number(fig['Walking time'].recommended.replace(' min', ''));
  let n = await audits(page);
  await setValue(page, '#set-benefit-walking_speed_mps', '0.8');
  await waitAudits(page, n + 1);
  const fig2 = await figures(page);
  const afterMin = Number(fig2['Walking time'].recommended.replace(' min', ''));
  assert.ok(Math.abs(afterMin - (before * 1.22) / 0.8) <= 0.1, `walking time ${before} -> ${afterMin}`);
  const reauditMs = Number(await page.evaluate(() => document.body.dataset.auditMs));
  console.log(`# re-audit of the demo town in the page: ${reauditMs} ms (core ${await page.evaluate(() => document.body.dataset.coreMs)} ms)`);
  assert.ok(reauditMs < 1000, `re-audit took ${reauditMs} ms`);

  // A smaller walk zone: fewer children in it, the table moves.
  const zoneBefore = await page.evaluate(() => window.catchwalk.homes().filter((h) => h.status !== 'beyond').length);
  n = await audits(page);
  await setValue(page, '#set-benefit-walk_zone_m', '500');
  await waitAudits(page, n + 1);
  const zoneAfter = await page.evaluate(() => window.catchwalk.homes().filter((h) => h.status !== 'beyond').length);
  assert.ok(zoneAfter < zoneBefore, `homes inside the walk zone ${zoneBefore} -> ${zoneAfter}`);

  // Catchment table, a catchment selected, charts.
  await page.click('.tabs button[data-tab="table"]');
  await page.click('#catchment-table tbody tr:first-child');
  await page.waitForSelector('#catchment-figures');
  await page.waitForTimeout(350);
  await mapIdle(page);
  await page.screenshot({ path: join(shots, '03-catchment.png') });
  await page.click('.tabs button[data-tab="table"]');
  await page.click('#catchment-table th[data-key="children"]');
  const kids = await page.$$eval('#catchment-table tbody tr td:nth-child(2)', (tds) => tds.map((t) => Number(t.textContent)));
  assert.deepEqual(kids, [...kids].sort((a, b) => b - a), 'sorted by children, most first');
  await page.screenshot({ path: join(shots, '04-table.png') });
  await page.click('.tabs button[data-tab="charts"]');
  await page.screenshot({ path: join(shots, '05-charts.png') });

  // A user file by the picker: 40 of the demo homes.
  const homes = JSON.parse(readFileSync(join(demo, 'homes.geojson'), 'utf8'));
  homes.features = homes.features.slice(0, 40);
  const mine = join(tmp, 'my-homes.geojson');
  writeFileSync(mine, JSON.stringify(homes));
  n = await audits(page);
  await page.setInputFiles('#file-homes', mine);
  await waitAudits(page, n + 1);
  assert.match(await page.locator('#status').innerText(), /^40 homes/);
  assert.match(await page.locator('[data-layer="homes"] .fname').innerText(), /my-homes\.geojson/);

  // Drag and drop: a file named for its layer lands in that layer.
  n = await audits(page);
  const dt = await page.evaluateHandle((text) => {
    const d = new DataTransfer();
    d.items.add(new File([text], 'district-schools.geojson', { type: 'application/geo+json' }));
    return d;
  }, readFileSync(join(demo, 'schools.geojson'), 'utf8'));
  await page.dispatchEvent('#drop', 'drop', { dataTransfer: dt });
  await waitAudits(page, n + 1);
  assert.match(await page.locator('[data-layer="schools"] .fname').innerText(), /district-schools\.geojson/);

  // A projected streets file: the error names the layer and feature.
  const bad = join(tmp, 'projected-streets.geojson');
  writeFileSync(bad, JSON.stringify({ type: 'FeatureCollection', features: [{ type: 'Feature', properties: { id: 'P1', class: 'local' }, geometry: { type: 'LineString', coordinates: [[500000, 4650000], [500100, 4650000]] } }] }));
  const failures = await page.evaluate(() => Number(document.body.dataset.failures ?? 0));
  await page.setInputFiles('#file-streets', bad);
  await page.waitForFunction((f) => Number(document.body.dataset.failures ?? 0) > f, failures);
  const err = await page.locator('#messages li.error').innerText();
  assert.match(err, /reproject/i);
  assert.match(err, /streets · feature 0/);
  await page.screenshot({ path: join(shots, '06-error.png') });

  // Cancel: an audit started and cancelled at once stops; the next one runs.
  n = await audits(page);
  await page.setInputFiles('#file-streets', join(demo, 'streets.geojson'));
  await waitAudits(page, n + 1);
  await page.evaluate(() => { document.getElementById('run').click(); document.getElementById('cancel').click(); });
  await page.waitForFunction(() => document.body.dataset.audit === 'cancelled');
  n = await audits(page);
  await page.click('#run');
  await waitAudits(page, n + 1);
  assert.match(await page.locator('#status').innerText(), /^40 homes/);

  // The printable report.
  await page.selectOption('#report-scope', { index: 1 });
  await page.click('#x-report');
  await page.waitForSelector('#report:not([hidden]) .report-map');
  await page.screenshot({ path: join(shots, '07-report-screen.png') });
  const report = await page.locator('#report-body').innerText();
  assert.match(report, /Catchment of/);
  assert.match(report, /Screening tool/);
  assert.match(report, /Sources/);
  assert.match(report, /shows no single home/, 'a shared report leaves homes out');
  assert.equal(await page.evaluate(() => window.catchwalk.map.getLayoutProperty('homes-pt', 'visibility')), 'visible', 'homes shown again on the page');
  await page.emulateMedia({ media: 'print' });
  await page.screenshot({ path: join(shots, '08-report-print.png'), fullPage: true });

  assert.deepEqual(leaks, [], 'no request leaves 127.0.0.1');
  assert.deepEqual(errors, [], 'no errors in the page');
  await page.context().close();
});

test('single-file build opens from file:// and audits the demo town', async () => {
  const { page, leaks, errors } = await guardedPage(browser);
  await page.goto(pathToFileURL(join(root, 'dist', 'catchwalk.html')).href);
  await page.waitForFunction(() => document.body.dataset.audit === 'idle');
  await page.click('#demo');
  await waitAudits(page, 1);
  assert.match(await page.locator('#status').innerText(), /390 homes, 545 children, 5 schools/);
  const rows = cliRows();
  const pick = [...rows.values()].find((r) => Number(r.crossings) >= 1 && r.shortest_network_m !== '');
  const fig = await clickHome(page, pick.home_id);
  assert.equal(metres(fig['Network length'].shortest), Math.round(Number(pick.shortest_network_m)));
  await page.waitForTimeout(350);
  await mapIdle(page);
  await page.screenshot({ path: join(shots, '09-single-file.png') });
  assert.deepEqual(leaks, [], 'no request leaves the machine');
  assert.deepEqual(errors, [], 'no errors in the page');
  await page.context().close();
});
