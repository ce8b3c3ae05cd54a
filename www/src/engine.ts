// The page's side of the audit worker: starts it, hands it the compiled core, runs audits,
// and cancels by terminating the worker and starting a fresh one.

import type { Feature, FeatureCollection, FromWorker, RouteProps, TileLayer, ToWorker } from './types';

/** What the build inlines into the single-file page (absent when served as files). */
export interface Inline {
  wasm: string;
  worker: string;
  demo: Record<string, string>;
  /** Label glyph ranges ("0-255" -> base64 PBF), built from a font at build time. */
  glyphs?: Record<string, string>;
}

declare global {
  interface Window {
    CATCHWALK_INLINE?: Inline;
  }
}

export interface Progress {
  stage: string;
  done: number;
  total: number;
}

export interface AuditResult {
  docText: string;
  ms: number;
  bytes?: Uint8Array;
}

function base64ToBytes(b64: string): Uint8Array {
  const bin = atob(b64);
  const out = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
  return out;
}

async function loadModule(): Promise<WebAssembly.Module> {
  const inline = window.CATCHWALK_INLINE;
  if (inline) return WebAssembly.compile(base64ToBytes(inline.wasm) as BufferSource);
  const r = await fetch('wasm/catchwalk_bg.wasm');
  if (!r.ok) throw new Error(`cannot load the audit core (wasm/catchwalk_bg.wasm: ${r.status})`);
  return WebAssembly.compile(await r.arrayBuffer());
}

function workerUrl(): string {
  const inline = window.CATCHWALK_INLINE;
  if (inline) return URL.createObjectURL(new Blob([inline.worker], { type: 'text/javascript' }));
  return 'worker.js';
}

/** File names the core reads as bytes (zipped Shapefile, OpenStreetMap .osm.pbf). */
/** A text file's bytes as UTF-8; a file in another encoding is refused with where its first
 * bad byte is and what to do (the browser would otherwise replace the bytes without a word). */
export function utf8Text(name: string, bytes: ArrayBuffer): string {
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    const loose = new TextDecoder('utf-8').decode(bytes);
    const bad = Math.max(0, loose.indexOf('\uFFFD'));
    const before = loose.slice(0, bad);
    const line = before.split('\n').length;
    const column = bad - before.lastIndexOf('\n');
    throw new Error(`${name} is not UTF-8 text (first bad byte at line ${line}, column ${column}): re-save it as UTF-8 (in a spreadsheet or GIS: "UTF-8" encoding) and load it again`);
  }
}

export function isBinaryLayer(name: string): boolean {
  return /\.(zip|pbf)$/i.test(name);
}

/** Which routes to draw: `homes` (ids), or a `school`'s homes, of the `kinds` given. */
export interface RouteQuery {
  homes?: string[];
  school?: string;
  kinds?: ('shortest' | 'recommended' | 'safe')[];
}

export class Engine {
  private worker: Worker | null = null;
  private module: WebAssembly.Module | null = null;
  private ready: Promise<void> | null = null;
  private nextId = 1;
  private pending = new Map<
    number,
    { resolve: (r: AuditResult) => void; reject: (e: Error) => void; onProgress: (p: Progress) => void }
  >();
  defaultConfig = '{}';
  caution = '';
  ruleSets: Record<string, string> = {};
  configBounds = '[]';

  /** Starts (or restarts) the worker; resolves once the core is loaded in it. */
  start(): Promise<void> {
    this.ready = (async () => {
      if (!this.module) this.module = await loadModule();
      const w = new Worker(workerUrl());
      this.worker = w;
      await new Promise<void>((resolve, reject) => {
        w.onerror = (e) => reject(new Error(`the audit worker failed to start: ${e.message}`));
        w.onmessage = (ev: MessageEvent<FromWorker>) => {
          const m = ev.data;
          if (m.type === 'ready') {
            this.defaultConfig = m.defaultConfig;
            this.caution = m.caution;
            this.ruleSets = m.ruleSets;
            this.configBounds = m.configBounds ?? '[]';
            w.onmessage = (e2: MessageEvent<FromWorker>) => this.receive(e2.data);
            resolve();
          }
        };
        const init: ToWorker = { type: 'init', module: this.module as WebAssembly.Module };
        w.postMessage(init);
      });
    })();
    return this.ready;
  }

  private receive(m: FromWorker) {
    if (m.type === 'ready') return;
    const p = this.pending.get(m.id);
    if (!p) return;
    if (m.type === 'progress') p.onProgress({ stage: m.stage, done: m.done, total: m.total });
    else if (m.type === 'done') {
      this.pending.delete(m.id);
      p.resolve({ docText: m.doc, ms: m.ms, bytes: m.bytes });
    } else if (m.type === 'failed') {
      this.pending.delete(m.id);
      // A trap inside the core leaves its memory in an unknown state: start a fresh worker.
      if (/^(RuntimeError|InternalError)/.test(m.error)) {
        this.worker?.terminate();
        this.worker = null;
        this.start();
        p.reject(new Error(JSON.stringify({ message: `the audit core stopped unexpectedly (${m.error}); it has been restarted — please report the layers that caused it`, at: null })));
        return;
      }
      p.reject(new Error(m.error));
    }
  }

  /** Runs one audit in the worker. */
  audit(layers: string, config: string, onProgress: (p: Progress) => void): Promise<AuditResult> {
    return this.send((id) => ({ type: 'audit', id, layers, config }), onProgress);
  }

  /** Runs the audit and the upgrade planner in the worker; the result is the plan document. */
  plan(layers: string, config: string, budget: number, onProgress: (p: Progress) => void): Promise<AuditResult> {
    return this.send((id) => ({ type: 'plan', id, layers, config, budget }), onProgress);
  }

  /** A layer file as text: GeoJSON/CSV as they are; a zipped Shapefile (.zip) or an
   * OpenStreetMap extract (.pbf) converted to WGS84 GeoJSON by the core in the worker. */
  async layerText(layer: string, file: File, crs = ''): Promise<string> {
    if (!isBinaryLayer(file.name)) return utf8Text(file.name, await file.arrayBuffer());
    const bytes = await file.arrayBuffer();
    const r = await this.send((id) => ({ type: 'convert', id, layer, name: file.name, bytes, crs }), () => {});
    return r.docText;
  }

  /** Re-audits the last audit with a scenario's interventions (GeoJSON text; '' for none). */
  reaudit(interventions: string, onProgress: (p: Progress) => void): Promise<AuditResult> {
    return this.send((id) => ({ type: 'reaudit', id, interventions }), onProgress);
  }

  /** Route lines of the audit `auditId` the worker holds, as GeoJSON: `homes` (ids), or a
   * `school`'s homes, of the `kinds` given (all three when empty); `{}` for every route. */
  async routes(auditId: number, query: RouteQuery): Promise<FeatureCollection<RouteProps>> {
    return JSON.parse(await this.routesText(auditId, query)) as FeatureCollection<RouteProps>;
  }

  /** [`routes`] as the core's GeoJSON text (an export saves it as it is). */
  async routesText(auditId: number, query: RouteQuery): Promise<string> {
    return (await this.send((id) => ({ type: 'routes', id, audit: auditId, query: JSON.stringify(query) }), () => {})).docText;
  }

  /** Segment `segment` of the held audit `auditId`'s centrelines (null when there is none). */
  async segment(auditId: number, segment: number): Promise<Feature | null> {
    const r = await this.send((id) => ({ type: 'segment', id, audit: auditId, segment }), () => {});
    return JSON.parse(r.docText) as Feature | null;
  }

  /** Street or hotspot tile z/x/y of the held audit `auditId` as Mapbox Vector Tile bytes. */
  async tile(layer: TileLayer, auditId: number, z: number, x: number, y: number): Promise<Uint8Array> {
    const r = await this.send((id) => ({ type: 'tile', id, layer, audit: auditId, z, x, y }), () => {});
    return r.bytes ?? new Uint8Array(0);
  }

  /** Lets the worker drop a held audit the page no longer shows. */
  release(auditId: number): void {
    this.send((id) => ({ type: 'release', id, audit: auditId }), () => {}).catch(() => {});
  }

  /** The core's comparison of two audits' homes.csv (before, after), as JSON text. */
  compare(before: string, after: string): Promise<AuditResult> {
    return this.send((id) => ({ type: 'compare', id, before, after }), () => {});
  }

  /** The project (the core's Project as JSON) as project-file bytes. */
  async writeProject(project: string): Promise<Uint8Array> {
    const r = await this.send((id) => ({ type: 'write_project', id, project }), () => {});
    if (!r.bytes) throw new Error('the core wrote no project file');
    return r.bytes;
  }

  /** A project file's bytes read back to the core's Project as JSON. */
  async readProject(bytes: Uint8Array): Promise<string> {
    return (await this.send((id) => ({ type: 'read_project', id, bytes }), () => {})).docText;
  }

  private send(make: (id: number) => ToWorker, onProgress: (p: Progress) => void): Promise<AuditResult> {
    if (!this.ready) this.start();
    const id = this.nextId++;
    return new Promise((resolve, reject) => {
      // Registered before the worker is ready, so that a cancel in between rejects it too.
      this.pending.set(id, { resolve, reject, onProgress });
      const post = async () => {
        await this.ready;
        if (!this.pending.has(id)) return;
        if (!this.worker) return reject(new Error('the audit worker is not running'));
        this.worker.postMessage(make(id));
      };
      post().catch((e: Error) => {
        this.pending.delete(id);
        reject(e);
      });
    });
  }

  /** Stops a running audit: the worker is terminated and a fresh one started. */
  cancel(): Promise<void> {
    this.worker?.terminate();
    this.worker = null;
    for (const p of this.pending.values()) p.reject(new Error('cancelled'));
    this.pending.clear();
    return this.start();
  }
}
