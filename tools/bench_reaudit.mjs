// Times a re-audit after one intervention in the wasm build under Node, on the demo town:
// the core time the page's worker spends (the `reaudit` call, core_ms measured inside it).
// Run after `make web-build`: `node tools/bench_reaudit.mjs [repeats]`.

import { readFileSync } from 'node:fs';
import { join, dirname } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const wasmDir = join(root, 'www', 'build', 'wasm');
const demo = join(root, 'sample-maps', 'demo-town');
const glue = await import(pathToFileURL(join(wasmDir, 'catchwalk.js')).href);
glue.initSync({ module: readFileSync(join(wasmDir, 'catchwalk_bg.wasm')) });

const read = (f) => readFileSync(join(demo, f), 'utf8');
const layers = JSON.stringify({
  streets: read('streets.geojson'), crossings: read('crossings.geojson'), schools: read('schools.geojson'),
  homes: read('homes.geojson'), catchments: read('catchments.geojson'), preset: 'plain',
});
const yes = () => true;
const feature = (kind, coordinates, extra = {}) => ({
  type: 'Feature', geometry: coordinates ? { type: 'Point', coordinates } : null, properties: { kind, ...extra },
});
const scenarios = {
  guard: [feature('guard', [-35.0144839, 42.0013505])],
  signal: [feature('signal', [-35.0120699, 42.0090031])],
  speed: [feature('speed', null, { street: 'ST009', speed_kmh: 30 })],
};
const repeats = Number(process.argv[2] ?? 5);
let t = performance.now();
glue.audit(layers, '', yes);
console.log(`demo town baseline audit (wasm, Node): ${(performance.now() - t).toFixed(0)} ms`);
for (const [name, list] of Object.entries(scenarios)) {
  const text = JSON.stringify({ type: 'FeatureCollection', features: list });
  const core = [];
  for (let i = 0; i < repeats; i++) {
    glue.reaudit('', yes); // back to the baseline
    const doc = JSON.parse(glue.reaudit(text, yes));
    core.push(doc.reaudit.core_ms);
    if (i === 0) console.log(`${name}: ${doc.reaudit.schools_rerouted} of ${doc.reaudit.schools} schools re-routed (full: ${doc.reaudit.full})`);
  }
  core.sort((a, b) => a - b);
  console.log(`${name}: core time per re-audit, median of ${repeats}: ${core[Math.floor(core.length / 2)].toFixed(1)} ms (min ${core[0].toFixed(1)})`);
}
