// A planner's first use: the demo town, then their own district under names that say nothing,
// through the pickers and by drag-and-drop. The map must frame the new data each time the set
// of layers changes, keep the view on a re-audit, and every dropped file must land in its layer.

import { after, before, test } from 'node:test';
import { strict as assert } from 'node:assert';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { guardedPage, root, shots, waitAudits, openPage, closePage } from './helpers.mjs';
import { BOUNDS, DISTRICT_HOMES, districtFiles, writeDistrict } from './district.mjs';

let browser, server, base;
const tmp = mkdtempSync(join(tmpdir(), 'catchwalk-first-'));

before(async () => ({ browser, server, base } = await openPage()));
after(() => closePage({ browser, server }));

/** The map's view once it has stopped moving: centre, zoom and bounds. */
const viewOf = (page) => page.evaluate(() => new Promise((r) => {
  const m = window.catchwalk.map;
  const read = () => { const b = m.getBounds(); r({ center: m.getCenter().toArray(), zoom: m.getZoom(), w: b.getWest(), s: b.getSouth(), e: b.getEast(), n: b.getNorth() }); };
  if (m.isMoving()) m.once('moveend', read); else read();
}));

/** The view shows the whole of `bounds`, and the data fills a fair share of it. */
function assertFrames(v, [[w, s], [e, n]], what) {
  assert.ok(v.w <= w && v.e >= e && v.s <= s && v.n >= n, `${what}: the view ${JSON.stringify(v)} holds the data ${JSON.stringify([[w, s], [e, n]])}`);
  assert.ok((e - w) / (v.e - v.w) > 0.2 || (n - s) / (v.n - v.s) > 0.2, `${what}: the data fills the view (zoom ${v.zoom.toFixed(1)})`);
}

const status = (page) => page.locator('#status').innerText();
/** The demo town's street network's bounding box, read from its file. */
const DEMO_BOUNDS = (() => {
  const fc = JSON.parse(readFileSync(join(root, 'sample-maps', 'demo-town', 'streets.geojson'), 'utf8'));
  const pts = fc.features.flatMap((f) => f.geometry.coordinates);
  const xs = pts.map((p) => p[0]), ys = pts.map((p) => p[1]);
  return [[Math.min(...xs), Math.min(...ys)], [Math.max(...xs), Math.max(...ys)]];
})();

test('first use: the map goes to the planner\'s district, files land by content', async () => {
  const { page, leaks, errors } = await guardedPage(browser);
  const failed = [];
  page.on('response', (r) => { if (r.status() >= 400) failed.push(`${r.status()} ${r.url()}`); });
  await page.goto(base);
  await waitAudits(page, 1);
  assertFrames(await viewOf(page), DEMO_BOUNDS, 'demo town');

  // Through the pickers: each file into its layer's picker, the map follows once all are in.
  const paths = writeDistrict(tmp);
  for (const layer of ['streets', 'schools', 'homes', 'crossings', 'catchments'])
    await page.setInputFiles(`#file-${layer}`, paths[layer]);
  await page.waitForFunction((n) => document.getElementById('status').textContent.startsWith(`${n} homes`) && document.body.dataset.audit === 'done', DISTRICT_HOMES, { timeout: 60_000 });
  await page.waitForTimeout(200);
  assertFrames(await viewOf(page), BOUNDS, 'district by the pickers');
  await page.screenshot({ path: join(shots, '11-district-pickers.png') });

  // A setting that only re-audits keeps the view the planner chose.
  await page.evaluate(() => window.catchwalk.map.jumpTo({ center: [-128.4985, -38.1985], zoom: 17.5 }));
  const kept = await viewOf(page);
  let n = await page.evaluate(() => Number(document.body.dataset.audits));
  await page.locator('#set-benefit-walking_speed_mps').fill('0.9');
  await page.locator('#set-benefit-walking_speed_mps').blur();
  await waitAudits(page, n + 1);
  const after1 = await viewOf(page);
  assert.deepEqual(after1.center.map((x) => x.toFixed(6)), kept.center.map((x) => x.toFixed(6)), 'a re-audit keeps the centre');
  assert.equal(after1.zoom.toFixed(3), kept.zoom.toFixed(3), 'a re-audit keeps the zoom');

  // "Whole district" frames the data from anywhere.
  await page.click('#fit-all');
  await page.waitForTimeout(100);
  assertFrames(await viewOf(page), BOUNDS, 'whole district button');

  // The demo again: the map goes back to the demo town.
  n = await page.evaluate(() => Number(document.body.dataset.audits));
  await page.click('#demo');
  await waitAudits(page, n + 1);
  assertFrames(await viewOf(page), DEMO_BOUNDS, 'demo town reloaded');

  // Drag and drop, all five at once, under names that say nothing.
  n = await page.evaluate(() => Number(document.body.dataset.audits));
  const dt = await page.evaluateHandle((files) => {
    const d = new DataTransfer();
    for (const f of files) d.items.add(new File([f.text], f.name));
    return d;
  }, Object.values(districtFiles()));
  await page.dispatchEvent('#drop', 'drop', { dataTransfer: dt });
  await waitAudits(page, n + 1);
  await page.waitForFunction((k) => document.getElementById('status').textContent.startsWith(`${k} homes`), DISTRICT_HOMES);
  for (const [layer, f] of Object.entries(districtFiles()))
    assert.equal(await page.locator(`[data-layer="${layer}"] .fname`).innerText(), f.name, `${f.name} lands in ${layer}`);
  assert.match(await page.locator('[data-layer="homes"] .why').innerText(), /“lon” and “lat” columns/);
  assert.match(await page.locator('[data-layer="streets"] .why').innerText(), /8 lines/);
  await page.waitForTimeout(200);
  assertFrames(await viewOf(page), BOUNDS, 'district by drag-and-drop');
  // Its street names are drawn once the map is close enough.
  await page.evaluate(() => window.catchwalk.map.jumpTo({ center: [-128.4966, -38.1973], zoom: 16.5 }));
  const names = await page.evaluate(() => new Promise((r) => {
    const m = window.catchwalk.map;
    m.once('idle', () => r([...new Set(m.queryRenderedFeatures({ layers: ['street-names'] }).map((f) => f.properties.name))]));
    m.triggerRepaint();
  }));
  const district = JSON.parse(districtFiles().streets.text).features.map((f) => f.properties.name);
  assert.ok(names.length >= 2 && names.every((x) => district.includes(x)), `the district's street names: ${names.join(', ')}`);
  await page.click('#fit-all');
  await page.screenshot({ path: join(shots, '12-district-dropped.png') });

  // The planner moves a file: crossings and catchments swap, then back; each move re-audits.
  await page.selectOption('[data-layer="crossings"] select.move', 'catchments');
  assert.equal(await page.locator('[data-layer="catchments"] .fname').innerText(), 'export (3).geojson');
  assert.equal(await page.locator('[data-layer="crossings"] .fname').innerText(), 'Layer 7.geojson');
  assert.match(await page.locator('[data-layer="catchments"] .why').innerText(), /moved here by you/);
  n = await page.evaluate(() => Number(document.body.dataset.audits));
  await page.selectOption('[data-layer="catchments"] select.move', 'crossings');
  assert.equal(await page.locator('[data-layer="crossings"] .fname').innerText(), 'export (3).geojson');
  await page.waitForFunction((k) => Number(document.body.dataset.audits) > k && document.body.dataset.audit === 'done', n, { timeout: 60_000 });
  assert.match(await status(page), new RegExp(`^${DISTRICT_HOMES} homes`));

  // A binary file is placed by its extension until the core reads it; a .zip says so.
  const dt2 = await page.evaluateHandle(() => {
    const d = new DataTransfer();
    d.items.add(new File([new Uint8Array([0x50, 0x4b, 3, 4])], 'Layers.zip'));
    return d;
  });
  await page.dispatchEvent('#drop', 'drop', { dataTransfer: dt2 });
  await page.waitForFunction(() => /Could not place Layers\.zip/.test(document.getElementById('status').textContent));

  // Browsers with a window ask for /favicon.ico unless the page names its icon (headless
  // Chromium does not ask, so the check is on the page's own declaration).
  assert.match(await page.evaluate(() => document.querySelector('link[rel="icon"]')?.getAttribute('href') ?? ''), /^data:image\/svg\+xml,/);
  assert.deepEqual(failed, [], 'no request fails (no 404)');
  assert.deepEqual(leaks, [], 'no request leaves 127.0.0.1');
  assert.deepEqual(errors, [], 'no errors in the page');
  await page.context().close();
});

test('placement by content: files as municipal and OpenStreetMap exports come', async () => {
  const { page, errors } = await guardedPage(browser);
  await page.goto(base);
  await page.waitForFunction(() => window.catchwalk?.placeFile);
  const fc = (features) => JSON.stringify({ type: 'FeatureCollection', features });
  const pt = (properties, c = [-128.5, -38.2]) => ({ type: 'Feature', properties, geometry: { type: 'Point', coordinates: c } });
  const sq = (properties) => ({ type: 'Feature', properties, geometry: { type: 'Polygon', coordinates: [[[-128.5, -38.2], [-128.49, -38.2], [-128.49, -38.19], [-128.5, -38.2]]] } });
  const cases = [
    ['ways.geojson', fc([{ type: 'Feature', properties: { highway: 'residential', name: 'Kelp Row' }, geometry: { type: 'MultiLineString', coordinates: [[[-128.5, -38.2], [-128.49, -38.2]]] } }]), 'streets'],
    ['nodes.geojson', fc([pt({ highway: 'crossing', crossing: 'marked' }), pt({ highway: 'traffic_signals' })]), 'crossings'],
    ['amenity.geojson', fc([sq({ amenity: 'school', name: 'Gull Bay School' })]), 'schools'],
    ['sites.geojson', fc([pt({ name: 'Gull Bay School', id: 'G1' }), pt({ name: 'Reef School', id: 'G2' })]), 'schools'],
    ['data.geojson', fc([pt({ pupils: 2, id: 'A' }), pt({ pupils: 1, id: 'B' })]), 'homes'],
    ['zones_final.geojson', fc([sq({ school_id: 'G1' }), sq({ school_id: 'G2' })]), 'catchments'],
    ['table.csv', 'ID,Longitude,Latitude,Children\nA,-128.5,-38.2,1\n', 'homes'],
    ['list.csv', 'id,street,number\n1,Kelp Row,4\n', null],
    ['fields.json', JSON.stringify({ base: 'plain', homes: { children: 'KIDS' } }), 'mapping'],
    ['Centerlines_2024.zip', null, null],
    ['region.osm.pbf', null, 'streets'],
  ];
  for (const [name, text, layer] of cases) {
    const got = await page.evaluate(([n, t]) => window.catchwalk.placeFile(t === null ? { name: n, bytes: new Uint8Array([1, 2, 3]) } : { name: n, text: t }), [name, text]);
    assert.equal(got.layer, layer, `${name} goes to ${layer}: ${got.why}`);
  }
  assert.deepEqual(errors, []);
  await page.context().close();
});
