// Times the wasm core (the page's build, in Node) on a city written by `make_city`:
// node tools/bench/wasm_core.mjs WASM_DIR CITY_DIR -> JSON {wall_ms, timings_ms, routed, wasm_mb}
// (wasm_mb: the wasm memory after the audit, which only grows: the core's peak).
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';

const [wasmDir, city] = process.argv.slice(2);
const glue = await import(pathToFileURL(join(wasmDir, 'catchwalk.js')).href);
const exports = glue.initSync({ module: readFileSync(join(wasmDir, 'catchwalk_bg.wasm')) });
const read = (f) => readFileSync(join(city, f), 'utf8');
const layers = JSON.stringify({
  streets: read('streets.geojson'), crossings: read('crossings.geojson'), schools: read('schools.geojson'),
  homes: read('homes.csv'), homes_format: 'csv', catchments: null, preset: 'plain', mapping: null,
});
const t = performance.now();
const doc = JSON.parse(glue.audit_timings(layers, ''));
doc.wall_ms = performance.now() - t;
doc.wasm_mb = exports.memory.buffer.byteLength / 2 ** 20;
console.log(JSON.stringify(doc));
