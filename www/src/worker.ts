// The audit worker: holds the wasm core, runs audits off the page's thread, reports progress.

import init, * as core from '../build/wasm/catchwalk.js';
import type { FromWorker, ToWorker } from './types';

const post = (m: FromWorker) => (self as unknown as Worker).postMessage(m);

let lastPost = 0;

self.onmessage = async (ev: MessageEvent<ToWorker>) => {
  const msg = ev.data;
  if (msg.type === 'init') {
    await init({ module_or_path: msg.module });
    // Rule sets come with cores that score routes; older cores have none.
    const extra = core as unknown as Record<string, unknown>;
    const ruleSets: Record<string, string> = {};
    if (typeof extra['ruleSetNames'] === 'function' && typeof extra['ruleSet'] === 'function') {
      for (const name of (extra['ruleSetNames'] as () => string[])()) ruleSets[name] = (extra['ruleSet'] as (n: string) => string)(name);
    }
    // The allowed range of every setting, from the core's own check (older cores have none).
    const bounds = typeof extra['configBounds'] === 'function' ? (extra['configBounds'] as () => string)() : '[]';
    post({ type: 'ready', defaultConfig: core.defaultConfig(), caution: core.caution(), ruleSets, configBounds: bounds });
    return;
  }
  if (msg.type === 'convert') {
    // A binary layer file (zipped Shapefile, .osm.pbf) to GeoJSON text, by the core.
    try {
      const doc = (core as unknown as { layerToGeojson: (l: string, n: string, b: Uint8Array, c: string) => string })
        .layerToGeojson(msg.layer, msg.name, new Uint8Array(msg.bytes), msg.crs);
      post({ type: 'done', id: msg.id, doc, ms: 0 });
    } catch (e) {
      post({ type: 'failed', id: msg.id, error: String(e) });
    }
    return;
  }
  if (msg.type === 'write_project') {
    try {
      const bytes = core.projectWrite(msg.project);
      post({ type: 'done', id: msg.id, doc: '', ms: 0, bytes });
    } catch (e) { post({ type: 'failed', id: msg.id, error: String(e) }); }
    return;
  }
  if (msg.type === 'routes') {
    // Route lines of one held audit: a home's, a catchment's, or (an export) all of them.
    try {
      const doc = core.routeLines(msg.audit, msg.query);
      post({ type: 'done', id: msg.id, doc, ms: 0 });
    } catch (e) { post({ type: 'failed', id: msg.id, error: String(e) }); }
    return;
  }
  if (msg.type === 'segment') {
    // One segment of a held audit's centrelines (what a click landed on), exact geometry.
    try {
      post({ type: 'done', id: msg.id, doc: core.segmentFeature(msg.audit, msg.segment), ms: 0 });
    } catch (e) { post({ type: 'failed', id: msg.id, error: String(e) }); }
    return;
  }
  if (msg.type === 'tile') {
    // One street or hotspot tile of a held audit for the map (Mapbox Vector Tile bytes),
    // handed over.
    try {
      const cut = msg.layer === 'hotspots' ? core.hotspotTile : core.streetTile;
      const bytes = cut(msg.audit, msg.z, msg.x, msg.y);
      (self as unknown as Worker).postMessage({ type: 'done', id: msg.id, doc: '', ms: 0, bytes } satisfies FromWorker, [bytes.buffer]);
    } catch (e) { post({ type: 'failed', id: msg.id, error: String(e) }); }
    return;
  }
  if (msg.type === 'release') {
    core.releaseAudit(msg.audit);
    post({ type: 'done', id: msg.id, doc: '', ms: 0 });
    return;
  }
  if (msg.type === 'read_project' || msg.type === 'compare') {
    const t0 = performance.now();
    try {
      const doc = msg.type === 'compare' ? core.compareAudits(msg.before, msg.after) : core.projectRead(msg.bytes);
      post({ type: 'done', id: msg.id, doc, ms: performance.now() - t0 });
    } catch (e) { post({ type: 'failed', id: msg.id, error: String(e) }); }
    return;
  }
  if (msg.type === 'audit' || msg.type === 'plan' || msg.type === 'reaudit') {
    const t0 = performance.now();
    const progress = (stage: string, done: number, total: number): boolean => {
      const now = performance.now();
      // Keep messages few: every stage change and at most one per 50 ms.
      if (done === 0 || done === total || now - lastPost > 50) {
        lastPost = now;
        post({ type: 'progress', id: msg.id, stage, done, total });
      }
      return true;
    };
    try {
      const doc = msg.type === 'reaudit' ? core.reaudit(msg.interventions, progress) : msg.type === 'plan'
        ? (core as unknown as { plan: (l: string, c: string, b: number, p: typeof progress) => string }).plan(msg.layers, msg.config, msg.budget, progress)
        : core.audit(msg.layers, msg.config, progress);
      post({ type: 'done', id: msg.id, doc, ms: performance.now() - t0 });
    } catch (e) {
      post({ type: 'failed', id: msg.id, error: String(e) });
    }
  }
};
