// The planner's working loop in the page, end to end in Debian's Chromium: an intervention
// added by clicking changes the figures and the comparison; a note with a photo; both survive
// a reload (IndexedDB); the project file exported, storage cleared, imported back to the
// identical state; the native CLI's audit of that project file gives the page's figures.
// Every request leaving 127.0.0.1 fails the test.

import { after, before, test } from 'node:test';
import { strict as assert } from 'node:assert';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { guardedPage, root, shots, waitAudits, openPage, closePage } from './helpers.mjs';
import { assertSameHomesCsv } from '../wasm/compare.mjs';

const cli = process.env.CATCHWALK_CLI ?? join(root, 'target', 'release', 'catchwalk');
const tmp = mkdtempSync(join(tmpdir(), 'catchwalk-loop-'));
let browser, server, base;

before(async () => ({ browser, server, base } = await openPage()));
after(() => closePage({ browser, server }));

const audits = (page) => page.evaluate(() => Number(document.body.dataset.audits ?? 0));
const state = (page) => page.evaluate(() => window.catchwalk.state());
const figures = (page) => page.evaluate(() => window.catchwalk.view().catchments);

/** Centres the map on `at` at `zoom` and waits until it has drawn. */
async function goTo(page, at, zoom = 18) {
  await page.evaluate(([c, z]) => new Promise((r) => {
    const m = window.catchwalk.map;
    m.jumpTo({ center: c, zoom: z });
    requestAnimationFrame(() => { if (m.loaded() && !m.isMoving()) m.once('idle', r) && m.triggerRepaint(); else m.once('idle', r); });
  }), [at, zoom]);
}

/** Clicks the map `dx`, `dy` pixels from its centre. */
async function clickMap(page, dx = 0, dy = 0) {
  const box = await page.locator('#map canvas').boundingBox();
  await page.mouse.click(box.x + box.width / 2 + dx, box.y + box.height / 2 + dy);
}

/** Waits for the autosave after `since` (an ISO time). */
const savedAfter = (page, since) => page.waitForFunction((t) => (document.body.dataset.saved ?? '') > t, since, { timeout: 10_000 });

/** The state without what the project format does not carry (file names, the scenario shown). */
function content(s) {
  return {
    layers: Object.fromEntries(Object.entries(s.files).map(([k, f]) => [k, f ? f.text : null])),
    preset: s.preset,
    config: JSON.parse(s.config),
    scenarios: s.scenarios,
    notes: s.notes,
    photos: s.photos,
  };
}

async function shot(page, name, tab) {
  if (tab) await page.click(`.tabs button[data-tab="${tab}"]`);
  await page.waitForTimeout(300);
  const file = join(shots, name);
  await page.screenshot({ path: file });
  return file;
}

test('scenario by clicking, comparison, a note with a photo, reload, project file round trip, CLI parity', async () => {
  const { page, leaks, errors } = await guardedPage(browser);
  await page.goto(base);
  await waitAudits(page, 1);
  const baseline = await figures(page);
  const baseCsv = await page.evaluate(() => window.catchwalk.view().homesCsv);

  // A signal on the busiest uncontrolled crossing, by clicking it.
  const spot = await page.evaluate(() => window.catchwalk.hotspots().find((h) => h.properties.kind === 'crossing' && h.properties.control === 'none'));
  assert.ok(spot, 'the demo town has an uncontrolled crossing hotspot');
  const mid = spot.geometry.coordinates[0];
  await goTo(page, mid);
  await page.selectOption('#scn-kind', 'signal');
  await page.click('#scn-arm');
  let n = await audits(page);
  await clickMap(page);
  await waitAudits(page, n + 1);
  assert.equal(await page.evaluate(() => document.body.dataset.scenario), 'Scenario 1');
  assert.equal(await page.locator('#scn-list li.iv').count(), 1);
  const re = await page.evaluate(() => window.catchwalk.view().reaudit);
  assert.ok(re && typeof re.core_ms === 'number', 'the scenario came from the core re-audit');
  console.log(`re-audit after one intervention on the demo town: ${re.core_ms.toFixed(1)} ms of core time, ${re.schools_rerouted} of ${re.schools} schools re-routed`);
  const after1 = await figures(page);
  const total = (rows, k) => rows.reduce((a, r) => a + (r[k] ?? 0), 0);
  assert.notDeepEqual(after1, baseline, 'the figures change with the signal');
  assert.ok(total(after1, 'safe') >= total(baseline, 'safe'), 'a signal gives no child a less safe route');
  assert.notEqual(await page.evaluate(() => window.catchwalk.view().homesCsv), baseCsv);

  // The comparison (the core's) against the existing network shows the change.
  await page.click('.tabs button[data-tab="cmp"]');
  await page.waitForFunction(() => window.catchwalk.comparison() !== null);
  const cmp = await page.evaluate(() => window.catchwalk.comparison());
  assert.ok(cmp.homes_route_changed.length > 0, 'some routes change');
  const gained = cmp.catchments.reduce((a, c) => a + c.children_gained_safe_route - c.children_lost_safe_route, 0);
  assert.equal(gained, total(after1, 'safe') - total(baseline, 'safe'), 'gained minus lost equals the change in safe-route children');
  assert.ok(await page.locator('#cmp-table tbody[data-school]').count() >= 1, 'a changed catchment is listed');
  // A changed home's two routes are drawn.
  await page.locator('#cmp-out .chip').first().click();
  await page.waitForSelector('#home-figures');
  assert.ok(await page.evaluate(() => window.catchwalk.comparisonRoutes()) >= 1, 'the home\'s routes before and after are drawn');
  await page.click('.tabs button[data-tab="cmp"]');
  await page.waitForTimeout(400);
  await shot(page, 'loop-compare-routes-1500.png');

  // Undo, then the intervention again: undo gives back the baseline figures exactly.
  n = await audits(page);
  await page.click('#scn-undo');
  await waitAudits(page, n + 1);
  assert.deepEqual(await figures(page), baseline, 'undo restores the existing network');
  n = await audits(page);
  await goTo(page, mid);
  await clickMap(page);
  await waitAudits(page, n + 1);
  assert.deepEqual(await figures(page), after1);
  // A lower speed on a street, clicked, in the same scenario.
  await page.selectOption('#scn-kind', 'speed');
  await page.fill('#scn-speed', '30');
  n = await audits(page);
  const street = await page.evaluate(() => {
    const seg = window.catchwalk.hotspots().find((h) => h.properties.kind !== 'crossing');
    return seg?.geometry.coordinates;
  });
  if (street) {
    const c = street[Math.floor(street.length / 2)];
    await goTo(page, Array.isArray(c[0]) ? c[0] : c);
    await clickMap(page);
    await waitAudits(page, n + 1);
    assert.equal(await page.locator('#scn-list li.iv').count(), 2);
  }
  await page.click('#scn-arm');
  await page.fill('#scn-name', 'Signal and slower street');
  await page.click('#scn-rename');

  // A note with a checklist, text and a photo made here.
  await goTo(page, mid, 17);
  await page.click('#note-arm');
  await clickMap(page, 80, 50);
  await page.waitForSelector('#note-text');
  await page.fill('#note-text', 'Parked cars hide children at the kerb; a guard was seen 07:45-08:15.');
  await page.selectOption('[data-check="parked_cars"]', 'problem');
  await page.selectOption('[data-check="kerb_ramps"]', 'ok');
  await page.fill('#note-speed', '45');
  await page.locator('#note-speed').blur();
  const png = Buffer.from(await page.evaluate(() => {
    const c = document.createElement('canvas');
    c.width = 1600; c.height = 900;
    const g = c.getContext('2d');
    g.fillStyle = '#3f8f74'; g.fillRect(0, 0, 1600, 900);
    g.fillStyle = '#f2c14e'; g.fillRect(200, 200, 600, 300);
    return c.toDataURL('image/png').split(',')[1];
  }), 'base64');
  await page.setInputFiles('#note-photo', { name: 'kerb.png', mimeType: 'image/png', buffer: png });
  await page.waitForSelector('#note-photos img');
  const dims = await page.evaluate(() => new Promise((r) => { const i = new Image(); i.onload = () => r([i.width, i.height]); i.src = document.querySelector('#note-photos img').src; }));
  assert.deepEqual(dims, [1280, 720], 'the photo is scaled to 1280 px on its long side');
  const t = new Date(Date.now() - 1).toISOString();
  await page.selectOption('#note-observed', 'guard');
  await savedAfter(page, t);
  await shot(page, 'loop-note-1500.png', 'note');

  // Notes export as GeoJSON Points in the project file's notes form.
  const [notesDl] = await Promise.all([page.waitForEvent('download'), page.click('#note-export')]);
  const notesFile = join(tmp, 'notes.geojson');
  await notesDl.saveAs(notesFile);
  const notesFc = JSON.parse(readFileSync(notesFile, 'utf8'));
  assert.equal(notesFc.features.length, 1);
  assert.equal(notesFc.features[0].geometry.type, 'Point');
  assert.deepEqual(Object.keys(notesFc.features[0].properties).sort(), ['checklist', 'id', 'observed', 'photos', 'target', 'text', 'visited']);

  // Reload: the scenario and the note come back, with the same figures.
  const before = await state(page);
  const beforeFigures = await figures(page);
  assert.equal(before.notes.length, 1);
  assert.equal(before.notes[0].checklist.observed_speed_kmh, 45);
  assert.equal(before.notes[0].checklist.parked_cars, 'problem');
  assert.deepEqual(before.notes[0].observed, { kind: 'guard', guard_hours: '07:45-08:15' });
  assert.equal(before.photos.length, 1);
  await page.reload();
  await waitAudits(page, 1);
  assert.equal(await page.evaluate(() => document.body.dataset.restored), 'yes');
  assert.deepEqual(await state(page), before, 'the reload restores the state');
  assert.deepEqual(await figures(page), beforeFigures);
  assert.match(await page.locator('#prj-saved').innerText(), /Restored the project saved on this computer/);
  await page.waitForFunction(() => window.catchwalk.comparison() !== null);
  await shot(page, 'loop-compare-1500.png', 'cmp');
  await page.locator('#scenario-card').scrollIntoViewIfNeeded();
  await shot(page, 'loop-scenario-1500.png', 'sel');

  // Export the project file, remove it from this computer, import it: the identical state.
  const file = join(tmp, 'town.catchwalk');
  const [dl] = await Promise.all([page.waitForEvent('download'), page.click('#prj-save')]);
  await dl.saveAs(file);
  page.on('dialog', (d) => d.accept());
  await Promise.all([page.waitForNavigation(), page.click('#prj-forget')]);
  await waitAudits(page, 1);
  const cleared = await state(page);
  assert.equal(cleared.scenarios.length, 0, 'storage cleared: a fresh page');
  assert.equal(cleared.notes.length, 0);
  n = await audits(page);
  await page.setInputFiles('#prj-open', file);
  await waitAudits(page, n + 1);
  n = await audits(page);
  await page.selectOption('#scn-pick', '0');
  await waitAudits(page, n + 1);
  const imported = await state(page);
  assert.deepEqual(content(imported), content(before), 'the project file gives back the identical state');
  assert.equal(imported.active, 0);
  assert.deepEqual(await figures(page), beforeFigures);

  // The CLI's audit of that file and scenario equals the page's figures.
  const out = join(tmp, 'cli-out');
  execFileSync(cli, ['audit', '--project', file, '--scenario', 'Signal and slower street', '--out', out], { stdio: ['ignore', 'ignore', 'inherit'] });
  const pageCsv = await page.evaluate(() => window.catchwalk.view().homesCsv);
  const { numeric } = assertSameHomesCsv(pageCsv, readFileSync(join(out, 'homes.csv'), 'utf8'), 0.011, 'CLI homes.csv vs the page');
  assert.ok(numeric > 1000, `compared ${numeric} figures`);

  assert.deepEqual(leaks, [], 'no request left the machine');
  assert.deepEqual(errors.filter((e) => !/favicon/.test(e)), [], 'no console errors');
});

test('a laptop screen: the project opened on another computer, scenario panel, comparison and a note', async () => {
  const { page, leaks } = await guardedPage(browser, { width: 1366, height: 768 });
  await page.goto(base);
  await waitAudits(page, 1);
  const n = await audits(page);
  await page.setInputFiles('#prj-open', join(tmp, 'town.catchwalk'));
  await waitAudits(page, n + 1);
  await page.selectOption('#scn-pick', '0');
  await waitAudits(page, n + 2);
  await page.waitForFunction(() => window.catchwalk.comparison() !== null);
  await page.locator('#scenario-card').scrollIntoViewIfNeeded();
  await shot(page, 'loop-compare-1366.png', 'cmp');
  assert.equal(await page.evaluate(() => document.scrollingElement.scrollWidth), 1366, 'nothing wider than the screen');
  await page.locator('#notes-card').scrollIntoViewIfNeeded();
  await page.locator('#note-list li').first().click();
  await shot(page, 'loop-note-1366.png', 'note');
  // A note on the signal's junction records a guard seen there; taken into the scenario it is
  // audited as an intervention marked as observed.
  const signalAt = (await state(page)).scenarios[0].interventions[0].geometry.coordinates;
  await goTo(page, signalAt, 18);
  await page.click('#note-arm');
  await clickMap(page);
  await page.waitForSelector('#note-observed');
  await page.selectOption('#note-observed', 'guard');
  let k = await audits(page);
  await page.click('#note-take');
  await waitAudits(page, k + 1);
  assert.equal(await page.locator('#scn-list li.iv.observation').count(), 1);
  assert.match(await page.locator('#scn-list li.iv.observation').innerText(), /observed on site/);
  const obs = (await state(page)).scenarios[0].interventions.at(-1).properties;
  assert.equal(obs.origin, 'observation');
  assert.match(obs.id, /^note-/);
  await shot(page, 'loop-observed-1366.png', 'note');
  k = await audits(page);
  await page.click('#scn-undo');
  await waitAudits(page, k + 1);

  // The printable report shows the scenario, the comparison (no home ids: individual homes are
  // not included) and the notes with their photo.
  await page.click('#x-report');
  await page.waitForSelector('#report:not([hidden])');
  const report = await page.locator('#report-body').innerText();
  assert.match(report, /Scenario: Signal and slower street/);
  assert.match(report, /Before and after: Signal and slower street against Existing network/);
  assert.match(report, /Site-visit notes/);
  assert.doesNotMatch(report, /H0387/, 'no home id in a report without individual homes');
  assert.equal(await page.locator('#report-body .report-photos img').count(), 1);
  await page.click('#report-close');
  // A storage refusal is said, never silent: a write that the browser refuses shows the message.
  await page.evaluate(() => { IDBObjectStore.prototype.put = function () { throw new DOMException('quota', 'QuotaExceededError'); }; });
  await page.click('.tabs button[data-tab="note"]');
  await page.fill('#note-text', 'one more line');
  await page.waitForSelector('#prj-error:not([hidden])');
  assert.match(await page.locator('#prj-error').innerText(), /storage for this page is full/);
  assert.match(await page.locator('#prj-saved').innerText(), /later changes are not kept/);
  await page.locator('#project-card').scrollIntoViewIfNeeded();
  await shot(page, 'loop-storage-refused-1366.png');
  assert.deepEqual(leaks, []);
});
