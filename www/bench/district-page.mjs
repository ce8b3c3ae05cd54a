// Times the page on an invented district: a street grid of about 100 000 segments, schools
// and homes, loaded through the file pickers of the served page in Debian's Chromium.
// Usage: node www/bench/district-page.mjs [grid_side=224] [homes=5000] [schools=10]
// Prints the page's audit time (core and page), the map's draw time, the time to show one
// home's and one catchment's routes (asked of the worker), and the peak memory of Chromium's
// renderer processes (the tab and its worker) read from /proc.

import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { guardedPage, launch } from '../../tests/browser/helpers.mjs';
import { rendererMemory } from './renderer.mjs';
import { serve } from '../serve.mjs';

const here = dirname(fileURLToPath(import.meta.url));
const dir = join(here, '..', 'build', 'bench', 'district');
mkdirSync(dir, { recursive: true });
const side = Number(process.argv[2] ?? 224);
const nHomes = Number(process.argv[3] ?? 5000);
const nSchools = Number(process.argv[4] ?? 10);
const step = 0.001; // about 110 m north-south, 80 m east-west at 42 N
const at = (i, j) => [-35.2 + j * step, 41.8 + i * step];

// Streets: every grid line split at every junction; every 8th line a collector at 50 km/h,
// every 32nd an arterial at 60 km/h with four lanes, the rest 30 km/h locals.
const streets = [];
for (let i = 0; i < side; i++)
  for (let j = 0; j + 1 < side; j++) {
    for (const [a, b, k] of [[at(i, j), at(i, j + 1), i], [at(j, i), at(j + 1, i), i]]) {
      const cls = k % 32 === 0 ? 'arterial' : k % 8 === 0 ? 'collector' : 'local';
      streets.push({ type: 'Feature', geometry: { type: 'LineString', coordinates: [a, b] },
        properties: { id: `G${streets.length}`, class: cls, speed_kmh: cls === 'arterial' ? 60 : cls === 'collector' ? 50 : 30, lanes: cls === 'arterial' ? 4 : 2, sidewalk: 'both' } });
    }
  }
let seed = 7;
const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
const crossings = [];
for (let i = 0; i < side; i += 8)
  for (let j = 0; j < side; j += 8)
    crossings.push({ type: 'Feature', geometry: { type: 'Point', coordinates: at(i, j) }, properties: { id: `X${crossings.length}`, control: (i + j) % 32 === 0 ? 'signal' : 'all_way_stop' } });
const schools = [];
for (let s = 0; s < nSchools; s++)
  schools.push({ type: 'Feature', geometry: { type: 'Point', coordinates: at(Math.floor(rnd() * side) + 0.3, Math.floor(rnd() * side) + 0.3) }, properties: { id: `S${s}`, name: `School ${s}` } });
const homes = [];
for (let h = 0; h < nHomes; h++)
  homes.push({ type: 'Feature', geometry: { type: 'Point', coordinates: at(rnd() * (side - 1), rnd() * (side - 1)) }, properties: { id: `H${h}`, children: 1 + Math.floor(rnd() * 2) } });
const fc = (features) => JSON.stringify({ type: 'FeatureCollection', features });
for (const [k, f] of Object.entries({ streets, crossings, schools, homes })) writeFileSync(join(dir, `${k}.geojson`), fc(f));

/** Peak resident memory (VmHWM, MB) of the largest of Chromium's renderer processes (the
 * tab; its workers are threads in it), and how many renderer processes there were. */
function rendererPeakMb() {
  const { mb, processes } = rendererMemory('VmHWM');
  return `${mb} (largest of ${processes})`;
}

const server = await serve(join(here, '..', 'build'), 0);
const browser = await launch();
try {
  const { page, leaks } = await guardedPage(browser, { width: 1500, height: 900 });
  await page.goto(`http://127.0.0.1:${server.address().port}/`);
  await page.waitForFunction(() => Number(document.body.dataset.audits ?? 0) >= 1, null, { timeout: 60_000 });
  for (const k of ['catchments', 'crossings']) if (await page.locator(`[data-layer="${k}"] button.link`).count()) await page.click(`[data-layer="${k}"] button.link`);
  for (const k of ['streets', 'crossings', 'schools', 'homes']) await page.setInputFiles(`#file-${k}`, join(dir, `${k}.geojson`));
  await page.waitForFunction((n) => document.getElementById('status')?.textContent?.startsWith(`${n} homes`), nHomes, { timeout: 600_000 });
  const r = await page.evaluate(() => ({ total: Number(document.body.dataset.auditMs), core: Number(document.body.dataset.coreMs),
    mainHeapMb: Math.round(performance.memory.usedJSHeapSize / 2 ** 20), coreMb: Math.round((window.catchwalk.view().summary && window.catchwalk.coreMemory()) / 2 ** 20) }));
  const t0 = Date.now();
  await page.evaluate(() => new Promise((ok) => window.catchwalk.map.once('idle', () => ok())));
  const mapIdle = Date.now() - t0;
  // One home's routes, then one catchment's, asked of the worker and drawn.
  const drawn = () => page.evaluate(() => Number(document.body.dataset.routesDrawn ?? -1));
  const t1 = Date.now();
  await page.evaluate(() => window.catchwalk.select('home', 'H17'));
  await page.waitForFunction(() => document.body.dataset.routesDrawn !== undefined, null, { timeout: 60_000 });
  const homeMs = Date.now() - t1;
  const homeRoutes = await drawn();
  // A second home, once the map has settled from the first.
  await page.evaluate(() => new Promise((ok) => window.catchwalk.map.once('idle', () => ok())));
  const t3 = Date.now();
  await page.evaluate(() => window.catchwalk.select('home', 'H18'));
  await page.waitForFunction(() => document.body.dataset.routesDrawn !== undefined, null, { timeout: 60_000 });
  const home2Ms = Date.now() - t3;
  const t2 = Date.now();
  await page.evaluate(() => window.catchwalk.select('catchment', 'S3'));
  await page.waitForFunction(() => document.body.dataset.routesDrawn !== undefined, null, { timeout: 60_000 })
    .catch(async (e) => { throw new Error(`${e.message}; selection: ${await page.textContent('#selection')}`); });
  const schoolMs = Date.now() - t2;
  console.log(JSON.stringify({ segments: streets.length, homes: nHomes, schools: nSchools, page_audit_ms: r.total, core_ms: r.core, map_idle_after_ms: mapIdle,
    home_routes_ms: homeMs, home_routes: homeRoutes, second_home_routes_ms: home2Ms, catchment_routes_ms: schoolMs, catchment_routes: await drawn(), renderer_peak_mb: rendererPeakMb(), page_js_heap_mb: r.mainHeapMb, worker_wasm_mb: r.coreMb, outside_requests: leaks.length }));
} finally {
  await browser.close();
  server.close();
}
