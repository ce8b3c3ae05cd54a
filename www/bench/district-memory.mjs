// Where the tab's memory goes with a district loaded: the renderer's resident memory sampled
// every 0.5 s through an audit of the district `district-page.mjs` wrote (run that first), with
// one map source or layer left out at a time, and optionally a Chromium trace or a sampling heap
// profile of the page's thread. A profiling aid beside the benchmark, not a test.
// Usage: [BLOCK=hotspots,homes] [HIDE=layer,...] [TRACE=1] [HEAPPROF=1] node www/bench/district-memory.mjs
//   BLOCK: sources whose data never reaches the map; HIDE: layers hidden before the audit;
//   TRACE: /tmp/catchwalk-trace.json (devtools timeline and V8 samples of every thread);
//   HEAPPROF: /tmp/catchwalk-heap.json (live allocations of the page's thread by call stack).
// Prints the samples, when the results showed and the map went idle, and the peak.

import { existsSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { guardedPage, launch } from '../../tests/browser/helpers.mjs';
import { rendererMemory } from './renderer.mjs';
import { serve } from '../serve.mjs';

const here = dirname(fileURLToPath(import.meta.url));
const dir = join(here, '..', 'build', 'bench', 'district');
if (!existsSync(join(dir, 'streets.geojson'))) throw new Error('run node www/bench/district-page.mjs first: it writes the district');
const list = (v) => (v ?? '').split(',').filter(Boolean);
const block = list(process.env.BLOCK);
const hide = list(process.env.HIDE);

/** Resident memory (MB) of the largest of Chromium's renderer processes (the tab). */
const rendererMb = () => rendererMemory('VmRSS').mb;

const t0 = Date.now();
let peak = 0;
const log = (what) => {
  const mb = rendererMb();
  peak = Math.max(peak, mb);
  console.log(`${((Date.now() - t0) / 1000).toFixed(1)} s  ${mb} MB  ${what}`);
};
const sampler = setInterval(() => log(''), 500);
const server = await serve(join(here, '..', 'build'), 0);
const browser = await launch();
try {
  const { page } = await guardedPage(browser, { width: 1500, height: 900 });
  await page.goto(`http://127.0.0.1:${server.address().port}/`);
  await page.waitForFunction(() => Number(document.body.dataset.audits ?? 0) >= 1, null, { timeout: 60_000 });
  log('demo town shown');
  await page.evaluate(({ block, hide }) => {
    const m = window.catchwalk.map;
    for (const h of hide) m.setLayoutProperty(h, 'visibility', 'none');
    for (const b of block) { const s = m.getSource(b); s.setData = () => s; }
  }, { block, hide });
  for (const k of ['catchments', 'crossings']) if (await page.locator(`[data-layer="${k}"] button.link`).count()) await page.click(`[data-layer="${k}"] button.link`);
  const cdp = await page.context().newCDPSession(page);
  if (process.env.HEAPPROF) await cdp.send('HeapProfiler.startSampling', { samplingInterval: 65536 });
  if (process.env.TRACE) {
    await browser.startTracing(page, { path: '/tmp/catchwalk-trace.json',
      categories: ['devtools.timeline', 'disabled-by-default-devtools.timeline', 'v8.execute', 'disabled-by-default-v8.cpu_profiler'] });
  }
  const t = Date.now();
  for (const k of ['streets', 'crossings', 'schools', 'homes']) await page.setInputFiles(`#file-${k}`, join(dir, `${k}.geojson`));
  log('files chosen');
  await page.waitForFunction(() => Number(document.body.dataset.audits) >= 2, null, { timeout: 600_000, polling: 100 });
  log(`results shown after ${Date.now() - t} ms (${await page.textContent('#audit-time')})`);
  // Resolve with nothing: handing the event back would make Playwright serialise the map.
  await page.evaluate(() => new Promise((ok) => window.catchwalk.map.once('idle', () => ok())));
  log(`map idle after ${Date.now() - t} ms`);
  if (process.env.TRACE) await browser.stopTracing();
  await page.waitForTimeout(3000);
  if (process.env.HEAPPROF) {
    await cdp.send('HeapProfiler.collectGarbage');
    const { profile } = await cdp.send('HeapProfiler.getSamplingProfile');
    writeFileSync('/tmp/catchwalk-heap.json', JSON.stringify(profile));
  }
  const heap = await page.evaluate(() => Math.round(performance.memory.usedJSHeapSize / 2 ** 20));
  log(`at rest: page heap ${heap} MB; renderer peak ${peak} MB`);
} finally {
  clearInterval(sampler);
  await browser.close();
  server.close();
}
