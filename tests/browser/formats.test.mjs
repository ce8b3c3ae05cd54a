// End to end: a zipped Shapefile (the demo town's streets in UTM 25N with an ESRI .prj,
// written by pyshp: tests/wasm/fixtures) loads in the served page by the picker and by a drop,
// converted by the core in the worker, and the audit runs on it.

import { after, before, test } from 'node:test';
import { strict as assert } from 'node:assert';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { guardedPage, root, waitAudits, openPage, closePage } from './helpers.mjs';

let browser, server, base;
const zip = join(root, 'tests', 'wasm', 'fixtures', 'demo-streets-utm25n.zip');

before(async () => ({ browser, server, base } = await openPage()));
after(() => closePage({ browser, server }));

const audits = (page) => page.evaluate(() => Number(document.body.dataset.audits ?? 0));

test('a zipped projected Shapefile loads by picker and by drop', async () => {
  const { page, leaks, errors } = await guardedPage(browser);
  await page.goto(base);
  await waitAudits(page, 1);
  let n = await audits(page);
  await page.setInputFiles('#file-streets', zip);
  await waitAudits(page, n + 1);
  assert.match(await page.locator('#status').innerText(), /390 homes, 545 children, 5 schools/);
  assert.match(await page.locator('[data-layer="streets"] .fname').innerText(), /demo-streets-utm25n\.zip/);

  n = await audits(page);
  const dt = await page.evaluateHandle((bytes) => {
    const d = new DataTransfer();
    d.items.add(new File([new Uint8Array(bytes)], 'district-streets.zip', { type: 'application/zip' }));
    return d;
  }, [...readFileSync(zip)]);
  await page.dispatchEvent('#drop', 'drop', { dataTransfer: dt });
  await waitAudits(page, n + 1);
  assert.match(await page.locator('[data-layer="streets"] .fname').innerText(), /district-streets\.zip/);
  assert.match(await page.locator('#status').innerText(), /390 homes/);
  assert.deepEqual(leaks, [], 'no request leaves 127.0.0.1');
  assert.deepEqual(errors, [], 'no errors in the page');
  await page.context().close();
});
