// Hostile and broken input in the page (Debian's Chromium, nothing leaves 127.0.0.1): HTML in
// names is shown as text, never rendered (map pins, messages, tables, the report); CSV
// exports are header first with formula cells neutralised; an out-of-range setting is
// refused with the core's own message; a corpus case shows the core's message.

import { after, before, test } from 'node:test';
import { strict as assert } from 'node:assert';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { createRequire } from 'node:module';
import { guardedPage, root, shots, waitAudits, openPage, closePage } from './helpers.mjs';

const Papa = createRequire(join(root, 'www', 'package.json'))('papaparse');
const corpus = join(root, 'tests', 'corpus');
let browser, server, base;
/** A corpus case's folder by its name (without the NN- number). */
const caseDir = (name) => join(corpus, readdirSync(corpus).find((d) => d.replace(/^\d+-/, '') === name));

before(async () => ({ browser, server, base } = await openPage()));
after(() => closePage({ browser, server }));

const audits = (page) => page.evaluate(() => Number(document.body.dataset.audits ?? 0));
const failures = (page) => page.evaluate(() => Number(document.body.dataset.failures ?? 0));

/** Loads a corpus case's layers through the file pickers and waits for the audit. */
async function loadCase(page, name, { expectError = false } = {}) {
  const dir = caseDir(name);
  const n = await audits(page);
  const f = await failures(page);
  // Dropped together (one audit), under names that say their layer.
  const files = ['streets', 'schools', 'homes'].map((l) => [`${l}.geojson`, readFileSync(join(dir, `${l}.geojson`), 'utf8')]);
  const dt = await page.evaluateHandle((fs) => {
    const d = new DataTransfer();
    for (const [name, text] of fs) d.items.add(new File([text], name, { type: 'application/geo+json' }));
    return d;
  }, files);
  await page.dispatchEvent('#drop', 'drop', { dataTransfer: dt });
  if (expectError) await page.waitForFunction((k) => Number(document.body.dataset.failures ?? 0) > k, f);
  else await page.waitForFunction(([k, ff]) => Number(document.body.dataset.audits ?? 0) > k && Number(document.body.dataset.failures ?? 0) === ff, [n, f], { timeout: 60_000 });
}

test('HTML in names is shown as text, never rendered, in the map, messages, tables and report', async () => {
  const { page, leaks, errors } = await guardedPage(browser);
  await page.goto(base);
  await waitAudits(page, 1);
  await loadCase(page, 'html-in-names');
  const schoolName = JSON.parse(readFileSync(join(caseDir('html-in-names'), 'schools.geojson'), 'utf8')).features[0].properties.name;
  // The pin shows the name literally; no element came out of it.
  const pin = await page.locator('.school-pin .school-name').first().textContent();
  assert.equal(pin, schoolName);
  const injected = await page.evaluate(() => ({
    imgs: [...document.querySelectorAll('img')].filter((i) => i.getAttribute('src') === 'x').length,
    scripts: [...document.querySelectorAll('script')].filter((s) => s.textContent.includes('__pwned')).length,
    bold: [...document.querySelectorAll('b')].filter((b) => b.textContent === 'Main').length,
    pwned: window.__pwned ?? null,
  }));
  assert.deepEqual(injected, { imgs: 0, scripts: 0, bold: 0, pwned: null });
  await page.click('.tabs button[data-tab="table"]');
  const table = await page.locator('#catchment-table').innerText();
  assert.ok(table.includes(schoolName), 'the catchment table shows the name as text');
  // The report, too.
  await page.click('#x-report');
  await page.waitForSelector('#report:not([hidden]) .report-map');
  const report = await page.locator('#report-body').innerText();
  assert.ok(report.includes(schoolName), 'the report shows the name as text');
  assert.match(report, /homes\.csv: /, 'the report lists the exported tables and their columns');
  assert.match(report, /walked_m \(m\)/, 'with units');
  assert.equal(await page.evaluate(() => [...document.querySelectorAll('#report-body img')].filter((i) => i.getAttribute('src') === 'x').length), 0);
  assert.equal(await page.evaluate(() => window.__pwned ?? null), null);
  await page.screenshot({ path: join(shots, 'hardening-01-html-names.png') });
  assert.deepEqual(leaks, []);
  assert.deepEqual(errors.filter((e) => !/favicon/.test(e)), []);
});

test('CSV exports are header first, formula cells neutralised, numbers kept', async () => {
  const { page, leaks } = await guardedPage(browser);
  await page.goto(base);
  await waitAudits(page, 1);
  await loadCase(page, 'formula-injection-names');
  await page.click('.tabs button[data-tab="table"]').catch(() => {});
  await page.check('#include-homes');
  for (const [button, col, want] of [['#x-homes', 'home_id', "'=HYPERLINK(\"http://example.invalid\",\"x\")"], ['#x-catchments', 'school_name', "'+cmd"]]) {
    const [dl] = await Promise.all([page.waitForEvent('download'), page.click(button)]);
    const text = readFileSync(await dl.path(), 'utf8');
    const { data, meta } = Papa.parse(text, { header: true, skipEmptyLines: true });
    assert.ok(!text.startsWith('#'), 'no comment line before the header');
    assert.ok(meta.fields.includes(col), `${button}: the header is read as the header (${meta.fields.slice(0, 3)})`);
    assert.ok(data.some((r) => r[col] === want), `${button}: ${col} holds ${want}`);
    assert.ok(!data.some((r) => /^[=+@]/.test(r[col] ?? '')), `${button}: no raw formula`);
  }
  assert.deepEqual(leaks, []);
});

test('an out-of-range setting is refused with the core\'s message; a corpus case shows the core\'s message', async () => {
  const { page, leaks } = await guardedPage(browser);
  await page.goto(base);
  await waitAudits(page, 1);
  const n = await audits(page);
  const field = page.locator('#set-route-metres_per_risk_point');
  await field.fill('-5');
  await field.blur();
  await page.waitForTimeout(300);
  const msg = await field.evaluate((i) => i.validationMessage);
  assert.match(msg, /route\.metres_per_risk_point is -5; allowed: from 0 to/);
  assert.equal(await audits(page), n, 'no audit ran with the bad value');
  const walk = page.locator('#set-benefit-walk_zone_m');
  await walk.fill('0');
  await walk.blur();
  assert.match(await walk.evaluate((i) => i.validationMessage), /benefit\.walk_zone_m is 0; allowed: greater than 0/);
  // A coordinate of 1e308: the page shows the core's message, not "projected".
  await loadCase(page, 'home-1e308', { expectError: true });
  const err = await page.locator('#messages li.error').innerText();
  assert.match(err, /outside any coordinate system/);
  assert.doesNotMatch(err, /look projected/);
  // A warning case: the lane maximum is stated.
  await loadCase(page, 'lanes-40');
  assert.match(await page.locator('#messages').innerText(), /from 1 to 32/);
  assert.deepEqual(leaks, []);
});

test('a file that is not UTF-8 is refused in the page with where and what to do', async () => {
  const { page, leaks } = await guardedPage(browser);
  await page.goto(base);
  await waitAudits(page, 1);
  // A streets layer saved as Latin-1: "Rue de l'Église" with É as the single byte 0xC9.
  const text = readFileSync(join(root, 'sample-maps', 'demo-town', 'streets.geojson'), 'utf8')
    .replace('"name":"Elm Street"', '"name":"Rue de l\'\u00c9glise"');
  const latin1 = Buffer.from(text, 'latin1');
  assert.ok(latin1.includes(0xc9), 'the fixture holds a Latin-1 byte');
  await page.setInputFiles('#file-streets', { name: 'streets-latin1.geojson', mimeType: 'application/geo+json', buffer: latin1 });
  await page.waitForFunction(() => /not UTF-8/.test(document.getElementById('status')?.textContent ?? ''), null, { timeout: 20000 });
  const status = await page.locator('#status').innerText();
  assert.match(status, /streets-latin1\.geojson is not UTF-8 text \(first bad byte at line \d+, column \d+\): re-save it as UTF-8/);
  // The layer keeps its previous file: nothing silently replaced.
  assert.match(await page.locator('[data-layer="streets"] .fname').innerText(), /streets\.geojson/);
  assert.deepEqual(leaks, []);
  await page.context().close();
});
