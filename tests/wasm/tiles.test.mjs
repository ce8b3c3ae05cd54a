// The street tiles the page's map draws, cut by the wasm build (in Node) from the held audit of
// the demo town and read back with Mapbox's reference decoder (@mapbox/vector-tile and pbf,
// from the npm registry): every segment of the command line's centrelines.geojson is in the
// tiles with its class and speed, on its own line (below zoom 12 only the arterials and
// collectors), and a tile outside the town is empty. The hotspot tiles hold every hotspot of
// the command line's hotspots.geojson once per zoom, as a point at the middle position of its
// line, with its index among the document's hotspots and its children x risk over the largest.

import { test } from 'node:test';
import { strict as assert } from 'node:assert';
import { execFileSync } from 'node:child_process';
import { createRequire } from 'node:module';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, dirname } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { demo } from './compare.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const wasmDir = join(root, 'www', 'build', 'wasm');
const cli = process.env.CATCHWALK_CLI ?? join(root, 'target', 'release', 'catchwalk');
const www = createRequire(join(root, 'www', 'package.json'));
const { VectorTile } = await import(pathToFileURL(www.resolve('@mapbox/vector-tile')).href);
const Pbf = (await import(pathToFileURL(www.resolve('pbf')).href)).default;
const read = (f) => readFileSync(join(demo, f), 'utf8');
const layers = JSON.stringify({
  streets: read('streets.geojson'), crossings: read('crossings.geojson'), schools: read('schools.geojson'),
  homes: read('homes.geojson'), homes_format: 'geo_json',
});

/** Web Mercator tile of a point at zoom z (the usual slippy-map formulas). */
function tileOf([lon, lat], z) {
  const n = 2 ** z;
  const r = (lat * Math.PI) / 180;
  return [Math.floor(((lon + 180) / 360) * n), Math.floor(((1 - Math.log(Math.tan(r) + 1 / Math.cos(r)) / Math.PI) / 2) * n)];
}

/** Distance in metres from a point to a polyline (locally flat: a town's extent). */
function toLineM(p, line) {
  const k = Math.cos((p[1] * Math.PI) / 180) * 111_320;
  const xy = ([x, y]) => [x * k, y * 110_574];
  const [px, py] = xy(p);
  let best = Infinity;
  for (let i = 0; i + 1 < line.length; i++) {
    const [ax, ay] = xy(line[i]);
    const [bx, by] = xy(line[i + 1]);
    const dx = bx - ax, dy = by - ay;
    const t = dx || dy ? Math.max(0, Math.min(1, ((px - ax) * dx + (py - ay) * dy) / (dx * dx + dy * dy))) : 0;
    best = Math.min(best, Math.hypot(px - (ax + t * dx), py - (ay + t * dy)));
  }
  return best;
}

/** The demo town audited by the wasm build (held by it) and by the command line (its folder),
 * once for both tests. */
let both = null;
const audited = () => (both ??= audit());

async function audit() {
  const core = await import(pathToFileURL(join(wasmDir, 'catchwalk.js')).href);
  core.initSync({ module: readFileSync(join(wasmDir, 'catchwalk_bg.wasm')) });
  const doc = JSON.parse(core.audit(layers, '', () => true));
  const out = join(mkdtempSync(join(tmpdir(), 'cw-tiles-')), 'out');
  execFileSync(cli, ['audit', '--streets', join(demo, 'streets.geojson'), '--crossings', join(demo, 'crossings.geojson'),
    '--schools', join(demo, 'schools.geojson'), '--homes', join(demo, 'homes.geojson'), '--out', out], { stdio: 'pipe' });
  return { core, doc, out };
}

test('hotspot tiles hold every hotspot once, at its line\'s middle, with its index and weight', async () => {
  const { core, doc, out } = await audited();
  const file = JSON.parse(readFileSync(join(out, 'hotspots.geojson'), 'utf8')).features;
  assert.ok(file.length > 20, `${file.length} hotspots in the demo town`);
  // The document's hotspots are the file's, in its order: the tiles' index points into them.
  assert.deepEqual(doc.hotspots.features.map((f) => f.properties.edge), file.map((f) => f.properties.edge));
  const largest = Math.max(...file.map((f) => f.properties.product));
  for (const z of [9, 16]) {
    const [x0, y0] = tileOf([doc.bounds[0], doc.bounds[3]], z);
    const [x1, y1] = tileOf([doc.bounds[2], doc.bounds[1]], z);
    const unitM = (40_075_016 * Math.cos((doc.bounds[1] * Math.PI) / 180)) / 2 ** z / 4096;
    const seen = new Map();
    for (let x = x0; x <= x1; x++) {
      for (let y = y0; y <= y1; y++) {
        const layer = new VectorTile(new Pbf(core.hotspotTile(doc.audit_id, z, x, y))).layers.hotspots;
        if (!layer) continue;
        assert.equal(layer.extent, 4096);
        for (let k = 0; k < layer.length; k++) {
          const f = layer.feature(k);
          assert.equal(f.type, 1, 'a point');
          const spot = file[f.properties.i];
          assert.ok(spot, `hotspot ${f.properties.i} is in hotspots.geojson`);
          assert.ok(Math.abs(f.properties.weight - spot.properties.product / largest) < 1e-12);
          const line = spot.geometry.coordinates;
          const [lon, lat] = f.toGeoJSON(x, y, z).geometry.coordinates;
          const mid = line[Math.floor(line.length / 2)];
          const offM = toLineM([lon, lat], [mid, mid]);
          // Inside its own tile (not only in a neighbour's buffer): counted there.
          const [tx, ty] = tileOf(mid, z);
          if (tx === x && ty === y) {
            assert.ok(!seen.has(f.properties.i), `hotspot ${f.properties.i} twice at zoom ${z}`);
            seen.set(f.properties.i, offM);
          }
          assert.ok(offM <= unitM * 0.75, `zoom ${z}: hotspot ${f.properties.i} ${offM.toFixed(2)} m off (unit ${unitM.toFixed(2)} m)`);
        }
      }
    }
    assert.equal(seen.size, file.length, `every hotspot in its own zoom-${z} tile`);
  }
  assert.equal(new VectorTile(new Pbf(core.hotspotTile(doc.audit_id, 12, 0, 0))).layers.hotspots?.length ?? 0, 0);
  assert.throws(() => core.hotspotTile(doc.audit_id, 17, 0, 0), /zoom past 16/);
  assert.throws(() => core.hotspotTile(doc.audit_id + 1, 3, 0, 0), /no longer held/);
});

test('street tiles hold every segment with its class and speed, on its line', async () => {
  const { core, doc, out } = await audited();
  assert.ok(!('centrelines' in doc), 'the audit document carries no centrelines');
  const segments = JSON.parse(readFileSync(join(out, 'centrelines.geojson'), 'utf8')).features;
  const bySegment = new Map(segments.map((f) => [f.properties.segment, f]));

  // The bounds in the document are the centrelines' own.
  const xs = segments.flatMap((f) => f.geometry.coordinates.map((c) => c[0]));
  const ys = segments.flatMap((f) => f.geometry.coordinates.map((c) => c[1]));
  assert.deepEqual(doc.bounds, [Math.min(...xs), Math.min(...ys), Math.max(...xs), Math.max(...ys)]);

  for (const z of [10, 15]) {
    const [x0, y0] = tileOf([doc.bounds[0], doc.bounds[3]], z);
    const [x1, y1] = tileOf([doc.bounds[2], doc.bounds[1]], z);
    const seen = new Set();
    let worstM = 0;
    for (let x = x0; x <= x1; x++) {
      for (let y = y0; y <= y1; y++) {
        const tile = new VectorTile(new Pbf(core.streetTile(doc.audit_id, z, x, y)));
        const layer = tile.layers.streets;
        if (!layer) continue;
        assert.equal(layer.extent, 4096);
        for (let i = 0; i < layer.length; i++) {
          const f = layer.feature(i);
          const full = bySegment.get(f.properties.segment);
          assert.ok(full, `segment ${f.properties.segment} is in centrelines.geojson`);
          assert.equal(f.properties.class, full.properties.class);
          assert.equal(f.properties.speed_kmh, full.properties.speed_kmh);
          assert.equal(f.type, 2, 'a line');
          const g = f.toGeoJSON(x, y, z).geometry;
          const lines = g.type === 'LineString' ? [g.coordinates] : g.coordinates;
          for (const line of lines) {
            assert.ok(line.length >= 2);
            for (const p of line) worstM = Math.max(worstM, toLineM(p, full.geometry.coordinates));
          }
          seen.add(f.properties.segment);
        }
      }
    }
    // A tile unit is about 7 m across at zoom 10 and 0.2 m at zoom 15 here; rounding moves a vertex half a unit on each axis at most.
    const unitM = (40_075_016 * Math.cos((doc.bounds[1] * Math.PI) / 180)) / 2 ** z / 4096;
    assert.ok(worstM <= unitM * 0.75, `zoom ${z}: a vertex ${worstM.toFixed(2)} m off its segment (unit ${unitM.toFixed(2)} m)`);
    if (z === 15) assert.equal(seen.size, segments.length, 'every segment is in a zoom-15 tile');
    else {
      // Below zoom 12 only arterials and collectors: each of them, and nothing else.
      const major = segments.filter((f) => ['arterial', 'collector'].includes(f.properties.class)).map((f) => f.properties.segment);
      assert.ok(major.length > 10 && major.length < segments.length, `${major.length} major of ${segments.length}`);
      assert.deepEqual([...seen].sort((a, b) => a - b), major.sort((a, b) => a - b));
    }
  }

  // Far from the town: a valid tile with nothing in it; past zoom 16 or off the grid: an error.
  const empty = new VectorTile(new Pbf(core.streetTile(doc.audit_id, 12, 0, 0)));
  assert.equal(empty.layers.streets?.length ?? 0, 0);
  assert.throws(() => core.streetTile(doc.audit_id, 17, 0, 0), /zoom past 16/);
  assert.throws(() => core.streetTile(doc.audit_id, 3, 8, 0), /not on the tile grid/);
  assert.throws(() => core.streetTile(doc.audit_id + 1, 3, 0, 0), /no longer held/);
});
