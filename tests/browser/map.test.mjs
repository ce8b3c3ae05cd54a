// A map a planner can find their way on: street names read back from the map at zoom 16, the
// find box, a basemap archive the test builds itself (pmtiles + mapbox-vector-tile from PyPI),
// a laptop screen, the report's scale bar and north arrow; no request leaves 127.0.0.1.

import { after, before, test } from 'node:test';
import { strict as assert } from 'node:assert';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { guardedPage, root, shots, waitAudits, openPage, closePage } from './helpers.mjs';

let browser, server, base;
const tmp = mkdtempSync(join(tmpdir(), 'catchwalk-map-'));
const demo = join(root, 'sample-maps', 'demo-town');
const demoStreets = JSON.parse(readFileSync(join(demo, 'streets.geojson'), 'utf8'));
const STREET_NAMES = new Set(demoStreets.features.map((f) => f.properties.name).filter(Boolean));

before(async () => ({ browser, server, base } = await openPage()));
after(() => closePage({ browser, server }));

const idle = (page) => page.evaluate(() => new Promise((r) => {
  const m = window.catchwalk.map;
  const done = () => requestAnimationFrame(() => r());
  if (!m.isMoving() && m.loaded() && m.areTilesLoaded()) { m.once('idle', done); m.triggerRepaint(); } else m.once('idle', done);
}));
const center = (page) => page.evaluate(() => window.catchwalk.map.getCenter().toArray());
const near = ([a, b], [c, d], tol) => Math.abs(a - c) < tol && Math.abs(b - d) < tol;

/** Haversine distance in metres (sphere of radius 6371008.8 m, the IUGG mean radius). */
function haversineM([lon1, lat1], [lon2, lat2]) {
  const r = (x) => (x * Math.PI) / 180;
  const a = Math.sin(r(lat2 - lat1) / 2) ** 2 + Math.cos(r(lat1)) * Math.cos(r(lat2)) * Math.sin(r(lon2 - lon1) / 2) ** 2;
  return 2 * 6371008.8 * Math.asin(Math.sqrt(a));
}

async function find(page, typed, pick) {
  await page.locator('#find').fill('');
  await page.locator('#find').pressSequentially(typed);
  await page.waitForSelector('#find-list:not([hidden]) li[role="option"]');
  const options = await page.locator('#find-list li[role="option"]').allInnerTexts();
  assert.ok(options.some((o) => o.includes(pick)), `suggestions for “${typed}” hold “${pick}”: ${options.join(' | ')}`);
  // Arrow keys to the option, Enter to pick: the box works by keyboard.
  const at = options.findIndex((o) => o.includes(pick));
  for (let i = 0; i < at; i++) await page.keyboard.press('ArrowDown');
  const moved = page.evaluate(() => new Promise((r) => window.catchwalk.map.once('moveend', r)));
  await page.keyboard.press('Enter');
  await moved;
  return options;
}

test('street names, the find box, an offline basemap, the report\'s scale bar and north arrow', async () => {
  const { page, leaks, errors } = await guardedPage(browser);
  await page.goto(base);
  await waitAudits(page, 1);

  // Street names at zoom 16 on the demo town, read back from the map's label layer.
  await page.evaluate(() => window.catchwalk.map.jumpTo({ center: [-35.0, 42.003], zoom: 16 }));
  await idle(page);
  const labels = await page.evaluate(() => [...new Set(window.catchwalk.map.queryRenderedFeatures({ layers: ['street-names'] }).map((f) => f.properties.name))]);
  assert.ok(labels.length >= 3, `street names drawn at zoom 16: ${labels.join(', ')}`);
  for (const n of labels) assert.ok(STREET_NAMES.has(n), `“${n}” is a street of the demo town`);
  await page.screenshot({ path: join(shots, '13-street-names-z16.png') });
  // At the whole-town view the names are left out (they would not fit).
  await page.evaluate(() => window.catchwalk.map.jumpTo({ center: [-35.0, 42.003], zoom: 13 }));
  await idle(page);
  assert.equal(await page.evaluate(() => window.catchwalk.map.queryRenderedFeatures({ layers: ['street-names'] }).length), 0, 'no names at zoom 13');

  // The find box: a street, a school, a home and a crossing; the map goes there each time.
  const street = [...STREET_NAMES][3];
  const c0 = await center(page);
  await find(page, street.slice(0, 5), street);
  const lines = demoStreets.features.filter((f) => f.properties.name === street).flatMap((f) => f.geometry.coordinates);
  const xs = lines.map((p) => p[0]), ys = lines.map((p) => p[1]);
  const mid = [(Math.min(...xs) + Math.max(...xs)) / 2, (Math.min(...ys) + Math.max(...ys)) / 2];
  const c1 = await center(page);
  assert.ok(!near(c1, c0, 1e-6), 'the map moved');
  assert.ok(near(c1, mid, 0.002), `the map centres on ${street}: ${c1} against ${mid}`);
  assert.equal(await page.locator('#selection h3').innerText(), street);
  await idle(page);
  assert.ok(await page.evaluate(() => window.catchwalk.map.queryRenderedFeatures({ layers: ['found-line'] }).length) > 0, 'the street is marked');

  const schools = JSON.parse(readFileSync(join(demo, 'schools.geojson'), 'utf8')).features;
  const school = schools[0].properties;
  await find(page, school.name.split(' ')[1], school.name);
  await page.waitForSelector('#catchment-figures');
  assert.ok(near(await center(page), schools[0].geometry.coordinates, 0.003), 'the map centres on the school');

  const homes = await page.evaluate(() => window.catchwalk.homes());
  const home = homes[17];
  await find(page, home.id, home.id);
  await page.waitForSelector('#home-figures');
  const crossings = JSON.parse(readFileSync(join(demo, 'crossings.geojson'), 'utf8')).features;
  const x = crossings[5];
  await find(page, x.properties.id, x.properties.id);
  assert.ok(near(await center(page), x.geometry.coordinates, 0.0005), 'the map centres on the crossing');
  assert.match(await page.locator('#selection h3').innerText(), new RegExp(`Crossing ${x.properties.id}`));
  await idle(page);
  await page.screenshot({ path: join(shots, '14-find-crossing.png') });

  // A basemap archive the test builds itself; it loads from the file and draws under our layers.
  const archive = join(tmp, 'our-area.pmtiles');
  execFileSync(process.env.PYTHON ?? 'python3', [join(root, 'tests', 'browser', 'make_basemap.py'), archive], { stdio: 'pipe' });
  await page.setInputFiles('#file-basemap', archive);
  await page.waitForFunction(() => document.body.dataset.basemap);
  assert.equal(await page.evaluate(() => document.body.dataset.basemap), 'vector', await page.locator('#basemap-info').innerText());
  assert.match(await page.locator('#basemap-info').innerText(), /water, park, building/);
  await page.evaluate(() => window.catchwalk.map.jumpTo({ center: [-35.006, 42.004], zoom: 15 }));
  await idle(page);
  const drawn = await page.evaluate(() => {
    const m = window.catchwalk.map;
    const ids = m.getStyle().layers.map((l) => l.id);
    const base = ids.filter((id) => id.startsWith('base-'));
    const kinds = new Set(m.queryRenderedFeatures({ layers: base }).map((f) => f.sourceLayer));
    return { kinds: [...kinds], under: base.every((id) => ids.indexOf(id) < ids.indexOf('catchments-fill')) };
  });
  assert.deepEqual(drawn.kinds.sort(), ['building', 'park', 'water'], 'every basemap layer draws');
  assert.ok(drawn.under, 'the basemap lies under every audit layer');
  await page.screenshot({ path: join(shots, '15-basemap.png') });
  await page.click('#basemap-clear');
  assert.equal(await page.evaluate(() => window.catchwalk.map.getStyle().layers.filter((l) => l.id.startsWith('base-')).length), 0, 'the basemap is removed');

  // The printed report's map carries a scale bar true to the map and a north arrow.
  await page.click('#x-report');
  await page.waitForSelector('#report:not([hidden]) .report-map');
  const scale = await page.evaluate(() => {
    const m = window.catchwalk.map;
    const c = m.project(m.getCenter());
    return { bar: window.catchwalk.scaleBar(), a: m.unproject([c.x - 50, c.y]).toArray(), b: m.unproject([c.x + 50, c.y]).toArray() };
  });
  const mPerPx = haversineM(scale.a, scale.b) / 100;
  assert.ok(scale.bar.metres > 0, 'the report map has a scale bar');
  assert.ok(Math.abs(scale.bar.px * mPerPx - scale.bar.metres) / scale.bar.metres < 0.02,
    `the bar of ${scale.bar.px.toFixed(1)} px stands for ${scale.bar.metres} m; the map gives ${(scale.bar.px * mPerPx).toFixed(1)} m`);
  await page.screenshot({ path: join(shots, '16-report-scale.png') });

  assert.deepEqual(leaks, [], 'no request leaves 127.0.0.1');
  assert.deepEqual(errors, [], 'no errors in the page');
  await page.context().close();
});

test('a laptop screen (1366 x 768): the legend starts folded and the town is in view', async () => {
  const { page, leaks, errors } = await guardedPage(browser, { width: 1366, height: 768 });
  await page.goto(base);
  await waitAudits(page, 1);
  assert.ok(await page.evaluate(() => document.getElementById('legend').classList.contains('folded')), 'the legend is folded');
  await page.screenshot({ path: join(shots, '17-laptop-1366-first-view.png') });
  const v = await page.evaluate(() => { const b = window.catchwalk.map.getBounds(); return [b.getWest(), b.getSouth(), b.getEast(), b.getNorth()]; });
  const pts = demoStreets.features.flatMap((f) => f.geometry.coordinates);
  for (const [lon, lat] of pts) assert.ok(lon >= v[0] && lon <= v[2] && lat >= v[1] && lat <= v[3], `the whole town is in view (${lon}, ${lat})`);
  // Nothing sticks out of the window: the page fits without scrolling sideways.
  assert.ok(await page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth), 'no sideways scroll');
  // By keyboard: Tab reaches the find box, Enter on a suggestion picks it.
  await page.locator('#find').focus();
  await page.keyboard.type('Hazel');
  await page.waitForSelector('#find-list li[role="option"]');
  await page.keyboard.press('Enter');
  await page.waitForSelector('#catchment-figures');
  await page.waitForTimeout(400);
  await page.screenshot({ path: join(shots, '17-laptop-1366-find-school.png') });
  await page.click('#legend-toggle');
  await page.screenshot({ path: join(shots, '18-laptop-legend-open.png') });
  assert.deepEqual(leaks, [], 'no request leaves 127.0.0.1');
  assert.deepEqual(errors, [], 'no errors in the page');
  await page.context().close();
});

test('single-file build: street names from the inlined glyphs', async () => {
  const { page, leaks, errors } = await guardedPage(browser);
  await page.goto(pathToFileURL(join(root, 'dist', 'catchwalk.html')).href);
  await page.waitForFunction(() => document.body.dataset.audit === 'idle');
  await page.click('#demo');
  await waitAudits(page, 1);
  await page.evaluate(() => window.catchwalk.map.jumpTo({ center: [-35.0, 42.003], zoom: 16 }));
  await idle(page);
  const labels = await page.evaluate(() => [...new Set(window.catchwalk.map.queryRenderedFeatures({ layers: ['street-names'] }).map((f) => f.properties.name))]);
  assert.ok(labels.length >= 3 && labels.every((n) => STREET_NAMES.has(n)), `street names drawn from the single file: ${labels.join(', ')}`);
  assert.deepEqual(leaks, [], 'no request leaves the machine');
  assert.deepEqual(errors, [], 'no errors in the page');
  await page.context().close();
});

test('hotspots drawn from the worker\'s tiles: each one sized by its weight, a click opens its popup; a home\'s figures fit a laptop', async () => {
  const { page, leaks, errors } = await guardedPage(browser, { width: 1366, height: 768 });
  await page.goto(base);
  await page.waitForFunction(() => document.body.dataset.audit === 'idle');
  await page.click('#demo');
  await waitAudits(page, 1);
  await idle(page);
  // The whole town in view: every hotspot of the view is drawn once, with its index and weight.
  const { spots, drawn } = await page.evaluate(() => ({
    spots: window.catchwalk.hotspots(),
    drawn: window.catchwalk.map.queryRenderedFeatures({ layers: ['hotspots'] }).map((f) => f.properties),
  }));
  const all = await page.evaluate(() => window.catchwalk.hotspotCount());
  assert.ok(all > 20, `${all} hotspots in the demo town`);
  const ids = new Set(drawn.map((p) => p.i));
  assert.equal(ids.size, all, 'every hotspot is drawn (from the tiles)');
  const top = drawn.find((p) => p.i === 0);
  assert.equal(top.weight, 1, 'the largest has weight 1');
  // The largest, clicked at its line's middle: the popup is that of the hotspot drawn on top
  // there, read from the view by the index the tile carries.
  const line = spots[0].geometry.coordinates;
  const mid = line[Math.floor(line.length / 2)];
  await page.evaluate((mid) => window.catchwalk.map.jumpTo({ center: mid, zoom: 17 }), mid);
  await idle(page);
  const pt = await page.evaluate((mid) => window.catchwalk.map.project(mid), mid);
  const under = await page.evaluate((pt) => window.catchwalk.map.queryRenderedFeatures([pt.x, pt.y], { layers: ['hotspots'] }).map((f) => f.properties.i), pt);
  assert.ok(under.includes(0), `the largest hotspot is drawn at its place (${under})`);
  const shown = await page.evaluate((i) => window.catchwalk.hotspot(i), under[0]);
  const box = await page.locator('#map').boundingBox();
  await page.mouse.click(box.x + pt.x, box.y + pt.y);
  const popup = await page.locator('.maplibregl-popup').innerText();
  assert.match(popup, new RegExp(`Hotspot: #${shown.rank} `), popup);
  assert.ok(popup.includes(shown.street), popup);
  await page.screenshot({ path: join(shots, '19-laptop-hotspot-popup.png') });
  // At 1366 px a home's three routes fit the panel: the last column ends inside it.
  const homeId = (await page.evaluate(() => window.catchwalk.homes()))[5].id;
  await page.evaluate((id) => window.catchwalk.select('home', id), homeId);
  await page.waitForSelector('#home-figures');
  const fit = await page.evaluate(() => {
    const panel = document.querySelector('#selection').getBoundingClientRect();
    const cells = [...document.querySelectorAll('#home-figures th, #home-figures td')].map((c) => c.getBoundingClientRect().right);
    return { panel: panel.right, last: Math.max(...cells) };
  });
  assert.ok(fit.last <= fit.panel + 0.5, `the home's figures end at ${fit.last} px, the panel at ${fit.panel} px`);
  assert.deepEqual(leaks, [], 'no request leaves 127.0.0.1');
  assert.deepEqual(errors, [], 'no errors in the page');
  await page.context().close();
});
