// Measures how long MapLibre GL JS and Leaflet (canvas) take to draw ~100 000 street segments
// in Debian's Chromium, to choose the page's map library. Usage: node www/bench/map-library.mjs
// Prints one JSON line per library (median of 3 runs): first draw, a zoom-in redraw, a pan
// redraw, and the longest task that blocked the page's main thread (a frozen page).

import * as esbuild from 'esbuild';
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { launch, guardedPage } from '../../tests/browser/helpers.mjs';
import { serve } from '../serve.mjs';

const here = dirname(fileURLToPath(import.meta.url));
const dir = join(here, '..', 'build', 'bench');
mkdirSync(dir, { recursive: true });

// A grid of two-point segments around 35 W 42 N (open water): 224 rows and 224 columns split
// at every vertex give 2 * 224 * 223 = 99 904 segments.
const n = 224, step = 0.0004, features = [];
for (let i = 0; i < n; i++)
  for (let j = 0; j + 1 < n; j++) {
    const a = [-35.05 + j * step, 41.96 + i * step], b = [-35.05 + (j + 1) * step, 41.96 + i * step];
    const c = [-35.05 + i * step, 41.96 + j * step], d = [-35.05 + i * step, 41.96 + (j + 1) * step];
    const speed = (i + j) % 3 === 0 ? 50 : 30;
    features.push({ type: 'Feature', geometry: { type: 'LineString', coordinates: [a, b] }, properties: { speed_kmh: speed } });
    features.push({ type: 'Feature', geometry: { type: 'LineString', coordinates: [c, d] }, properties: { speed_kmh: speed } });
  }
writeFileSync(join(dir, 'grid.json'), JSON.stringify({ type: 'FeatureCollection', features }));

const libs = {
  maplibre: { entry: 'maplibre.js', css: '../../node_modules/maplibre-gl/dist/maplibre-gl.css' },
  leaflet: { entry: 'leaflet.js', css: '../../node_modules/leaflet/dist/leaflet.css' },
};
for (const [name, lib] of Object.entries(libs)) {
  await esbuild.build({ entryPoints: [join(here, lib.entry)], bundle: true, minify: true, format: 'iife', outfile: join(dir, `${name}.js`), logLevel: 'warning' });
  writeFileSync(join(dir, `${name}.html`), `<!doctype html><meta charset="utf-8"><style>html,body,#map{margin:0;width:100%;height:100%}</style><div id="map"></div><script src="${name}.js"></script>`);
}

const server = await serve(dir, 0);
const base = `http://127.0.0.1:${server.address().port}`;
const browser = await launch();
const med = (xs) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
try {
  for (const name of Object.keys(libs)) {
    const runs = [];
    for (let k = 0; k < 3; k++) {
      const { page, context, leaks } = await guardedPage(browser, { width: 1280, height: 800 });
      await page.goto(`${base}/${name}.html`);
      const r = await page.evaluate(async () => {
        const fc = await (await fetch('grid.json')).json();
        return window.runBench(fc);
      });
      if (leaks.length) throw new Error(`outside requests: ${leaks}`);
      runs.push(r);
      await context.close();
    }
    console.log(JSON.stringify({ library: name, segments: features.length, first_draw_ms: Math.round(med(runs.map((r) => r.first_ms))), zoom_redraw_ms: Math.round(med(runs.map((r) => r.zoom_ms))), pan_redraw_ms: Math.round(med(runs.map((r) => r.pan_ms))), longest_main_thread_task_ms: Math.round(med(runs.map((r) => r.longest_task_ms))) }));
  }
} finally {
  await browser.close();
  server.close();
}
