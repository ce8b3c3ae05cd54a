// The page: layers in, the audit in a worker, the map, panels, charts and exports out.

import { chartImages, drawCharts } from './charts';
import { $, download, el } from './dom';
import { Engine, utf8Text } from './engine';
import { catchmentsCsv, saveCatchments, saveHomes, saveHotspots, saveHotspotsCsv, saveRoutes } from './exports';
import { AuditMap } from './map';
import { buildView, routesByHome, type View } from './model';
import { DEVICES, HOME_STATUS, PATH_COLOR, QA_COLOR, ROUTE_STYLE, SPEED_BANDS, deficitColor, deviceImage } from './palette';
import { buildReport } from './report';
import { catchmentPanel, districtPanel, homePanel } from './selection';
import { FindBox, findIndex, type Found } from './find';
import { isBinary, placeFile, type Placement } from './placement';
import { Settings } from './settings';
import { CatchmentTable } from './table';
import { Autosave } from './autosave';
import { Compare, comparisonElements, type Comparison } from './compare';
import { Notes, photoUrl } from './notes';
import { ProjectCard } from './projectcard';
import { interventionsText, type Intervention, type PageState } from './project';
import { Scenarios } from './scenarios';
import { LAYER_KEYS, type AuditDoc, type Feature, type FeatureCollection, type LayerFile, type LayerKey, type Message } from './types';

/** An error's message; the core's errors come as `{message, at}` JSON. */
function errorText(e: unknown): string {
  const m = e instanceof Error ? e.message : String(e);
  try { return (JSON.parse(m) as { message?: string }).message ?? m; } catch { return m; }
}

declare const CATCHWALK_AUTODEMO: boolean;

const LAYER_INFO: Record<LayerKey, { label: string; required: boolean; accept: string }> = {
  streets: { label: 'Streets', required: true, accept: '.geojson,.json,.zip,.pbf' },
  crossings: { label: 'Crossings', required: false, accept: '.geojson,.json,.zip,.pbf' },
  schools: { label: 'Schools', required: true, accept: '.geojson,.json,.zip,.pbf' },
  homes: { label: 'Homes', required: true, accept: '.geojson,.json,.csv,.zip' },
  catchments: { label: 'Catchments', required: false, accept: '.geojson,.json,.zip' },
  crashes: { label: 'Crashes (observed)', required: false, accept: '.geojson,.json' },
  mapping: { label: 'Field mapping', required: false, accept: '.json' },
};

const files: Record<LayerKey, LayerFile | null> = { streets: null, crossings: null, schools: null, homes: null, catchments: null, crashes: null, mapping: null };
const parsed = new Map<LayerKey, FeatureCollection | null>();
/** Why each dropped file went where it did (absent for files chosen with a picker). */
const placed = new Map<LayerKey, Placement>();
/** Set when the set of loaded layers changes: the next audit frames the data. */
let framePending = false;
const engine = new Engine();
let view: View | null = null;
let selected: { kind: 'home' | 'catchment'; id: string } | null = null;
let running = false;
let again = false;
let audits = 0;

const map = new AuditMap($('map'), {
  onHome: (id) => select('home', id),
  onCatchment: (id) => select('catchment', id),
  onNote: (id) => notes.show(id),
  tile: (layer, audit, z, x, y) => engine.tile(layer, audit, z, x, y),
  // After a cancel the fresh worker holds no audit: the streets not drawn yet need it again.
  onTileFailed: (why) => {
    if (/no longer held/.test(why) && !running) setStatus('Some streets cannot be drawn: the audit shown is no longer held by the worker (after a cancel). Press “Run audit” to draw them.');
  },
});
const table = new CatchmentTable($('table'), (id) => select('catchment', id));
const settings = new Settings($<HTMLFormElement>('settings'), () => schedule());
const findBox = new FindBox($<HTMLInputElement>('find'), $('find-list'), (f) => found(f));
findBox.setIndex([]);

// ---------- scenarios, comparison, notes, project ----------

/** Audits by interventions text ('' is the existing network), as the core returned them. */
const views = new Map<string, View>();
const VIEW_CACHE = 4;

function keep(key: string, v: View) {
  views.delete(key);
  views.set(key, v);
  while (views.size > VIEW_CACHE) {
    const old = [...views.keys()].find((k) => k !== '' && k !== key);
    if (old === undefined) break;
    const gone = views.get(old);
    views.delete(old);
    // The worker holds each view's audit for its routes; this one is no longer shown.
    if (gone && ![...views.values()].some((x) => x.doc.audit_id === gone.doc.audit_id)) engine.release(gone.doc.audit_id);
  }
}
/** The segment of the shown audit's centrelines a click landed on, from the worker. */
const segmentOf = (i: number): Promise<Feature | null> => (view ? engine.segment(view.doc.audit_id, i) : Promise.resolve(null));
const scenarios = new Scenarios(map, { changed: () => { runScenario(); changed(); }, view: () => view, status: setStatus, segment: segmentOf });
const notes = new Notes(map, {
  changed: () => changed(),
  view: () => view,
  segment: segmentOf,
  status: setStatus,
  takeMap: () => scenarios.disarm(),
  observe: (iv: Intervention) => scenarios.push(iv),
  showTab: () => showTab('note'),
});
const compare = new Compare(map, {
  auditOf: async (i: number) => {
    const key = i < 0 ? '' : interventionsText(scenarios.list[i]?.interventions);
    const have = views.get(key);
    if (have) return have;
    const r = await engine.reaudit(key, () => {});
    const v = buildView(JSON.parse(r.docText) as AuditDoc);
    keep(key, v);
    return v;
  },
  compare: async (b: string, a: string) => JSON.parse((await engine.compare(b, a)).docText) as Comparison,
  options: () => [{ value: -1, label: 'Existing network' }, ...scenarios.list.map((x, i) => ({ value: i, label: x.name }))],
  selectHome: (id: string) => select('home', id),
  recommended: async (v: View, homeId: string) => (await engine.routes(v.doc.audit_id, { homes: [homeId], kinds: ['recommended'] })).features[0] ?? null,
});
const autosave = new Autosave(
  (at) => {
    $('prj-saved').textContent = `Saved on this computer at ${at.toLocaleTimeString('en-GB')}.`;
    $('prj-error').hidden = true;
    document.body.dataset.saved = at.toISOString();
  },
  (message) => {
    const last = document.body.dataset.saved;
    $('prj-saved').textContent = last ? `Last saved at ${new Date(last).toLocaleTimeString('en-GB')}; later changes are not kept in this browser.` : 'Not kept in this browser.';
    const e = $('prj-error');
    e.textContent = message;
    e.hidden = false;
    document.body.dataset.saveFailed = String(Number(document.body.dataset.saveFailed ?? 0) + 1);
  });
/** Nothing is saved until the page has its state (restored or loaded): a start never overwrites the last save. */
let restored = false;
function pageState(): PageState {
  return {
    files: { ...files },
    preset: ($('preset') as HTMLSelectElement).value,
    config: settings.json(),
    scenarios: scenarios.list,
    active: scenarios.active,
    notes: notes.notes,
    photos: notes.photos,
  };
}
function changed() {
  if (restored) autosave.schedule(pageState);
}
async function restore(st: PageState) {
  for (const k of LAYER_KEYS) setFile(k, st.files[k] ?? null);
  ($('preset') as HTMLSelectElement).value = st.preset || 'plain';
  if (st.config) settings.load(st.config);
  scenarios.set(st.scenarios ?? [], st.active ?? -1);
  notes.set(st.notes ?? [], st.photos ?? []);
  selected = null;
  restored = true;
  if (ready()) await runAudit(true);
}
const projectCard = new ProjectCard(engine, pageState, async (st) => { await restore(st); changed(); }, autosave, setStatus);

// ---------- layers ----------

function layerJson(key: LayerKey): FeatureCollection | null {
  if (!parsed.has(key)) {
    const f = files[key];
    let fc: FeatureCollection | null = null;
    if (f && !f.name.toLowerCase().endsWith('.csv')) {
      try { fc = JSON.parse(f.text) as FeatureCollection; } catch { fc = null; }
    }
    parsed.set(key, fc);
  }
  return parsed.get(key) ?? null;
}

function setFile(key: LayerKey, f: LayerFile | null, why: Placement | null = null) {
  files[key] = f;
  parsed.delete(key);
  if (why) placed.set(key, why);
  else placed.delete(key);
  framePending = true;
  renderLayerList();
  changed();
}

/** Moves a loaded file to another layer; a file already there takes its place. */
function moveFile(from: LayerKey, to: LayerKey) {
  if (from === to) return;
  const a = files[from];
  const b = files[to];
  setFile(to, a, { layer: to, why: 'moved here by you' });
  setFile(from, b, b ? { layer: from, why: 'moved here by you' } : null);
  schedule();
}

function renderLayerList() {
  const host = $('layer-list');
  host.replaceChildren(...LAYER_KEYS.map((key) => {
    const info = LAYER_INFO[key];
    const f = files[key];
    const input = el('input', { type: 'file', accept: info.accept, id: `file-${key}`, class: 'visually-hidden' });
    input.addEventListener('change', async () => {
      const file = input.files?.[0];
      if (!file) return;
      try { setFile(key, { name: file.name, text: await engine.layerText(key, file) }); schedule(); }
      catch (e) { setStatus(`${file.name}: ${errorText(e)}`); }
    });
    const pick = el('label', { for: `file-${key}`, class: 'pick' }, f ? 'replace' : 'choose…');
    const clear = f && !info.required ? el('button', { type: 'button', class: 'link', title: `remove the ${info.label.toLowerCase()} layer`, 'aria-label': `remove the ${info.label.toLowerCase()} layer` }, '×') : null;
    clear?.addEventListener('click', () => { setFile(key, null); schedule(); });
    const why = placed.get(key);
    let move: HTMLElement | null = null;
    if (f && why) {
      const sel = el('select', { class: 'move', title: 'move this file to another layer', 'aria-label': `move ${f.name} to another layer` },
        el('option', { value: '' }, 'move to…'),
        ...LAYER_KEYS.filter((k) => k !== key).map((k) => el('option', { value: k }, LAYER_INFO[k].label))) as HTMLSelectElement;
      sel.addEventListener('change', () => { if (sel.value) moveFile(key, sel.value as LayerKey); });
      move = sel;
    }
    return el('div', { class: `layer ${f ? 'has' : info.required ? 'missing' : ''}`, 'data-layer': key },
      el('span', { class: 'lname' }, info.label, info.required ? el('span', { class: 'req', title: 'required' }, ' *') : null),
      el('span', { class: 'fname', title: f?.name ?? '' }, f ? f.name : info.required ? 'required' : 'optional'),
      input, pick, clear,
      f && why ? el('div', { class: 'placed' }, el('span', { class: 'why' }, why.why), move) : null);
  }));
}

async function loadDemo() {
  const names: LayerKey[] = ['streets', 'crossings', 'schools', 'homes', 'catchments'];
  const inline = window.CATCHWALK_INLINE;
  for (const k of names) {
    let text: string | null = null;
    if (inline) text = inline.demo[k] ?? null;
    else {
      const r = await fetch(`demo/${k}.geojson`);
      text = r.ok ? await r.text() : null;
    }
    setFile(k, text === null ? null : { name: `demo-town/${k}.geojson`, text });
  }
  setFile('mapping', null);
  ($('preset') as HTMLSelectElement).value = 'plain';
  selected = null;
  restored = true;
  changed();
  await runAudit(true);
}

// ---------- audit ----------

let timer = 0;
function schedule() {
  changed();
  clearTimeout(timer);
  timer = window.setTimeout(() => runAudit(false), 150);
}

function ready(): boolean {
  return LAYER_KEYS.every((k) => !LAYER_INFO[k].required || files[k]);
}

function setState(s: string) {
  document.body.dataset.audit = s;
}

async function runAudit(fit: boolean) {
  if (!ready()) {
    setStatus(`Load ${LAYER_KEYS.filter((k) => LAYER_INFO[k].required && !files[k]).join(', ')} to audit.`);
    return;
  }
  if (running) { again = true; return; }
  running = true;
  setState('running');
  const bar = $('progress');
  bar.hidden = false;
  const layers = layersJson();
  const frame = framePending;
  framePending = false;
  const fitNow = fit || frame || !view;
  try {
    const t0 = performance.now();
    const res = await engine.audit(layers, settings.json(), (p) => {
      const share = p.total ? p.done / p.total : 0;
      const order = ['parsing', 'network', 'routing', 'scoring'];
      const i = Math.max(0, order.indexOf(p.stage));
      ($('progress-fill') as HTMLElement).style.width = `${Math.round(((i + share) / order.length) * 100)}%`;
      $('progress-text').textContent = `${p.stage}${p.total > 1 ? ` ${p.done} / ${p.total}` : ''}`;
    });
    let doc = JSON.parse(res.docText) as AuditDoc;
    views.clear();
    keep('', buildView(doc));
    let coreMs = res.ms;
    const list = interventionsText(scenarios.current());
    if (list) {
      $('progress-text').textContent = `scenario “${scenarios.name()}”`;
      const r2 = await engine.reaudit(list, () => {});
      doc = JSON.parse(r2.docText) as AuditDoc;
      coreMs += r2.ms;
    }
    $('plan-out').replaceChildren();
    await display(doc, fitNow, t0, coreMs, list);
    setState('done');
  } catch (e) {
    failed(e, frame);
  } finally {
    running = false;
    bar.hidden = true;
    if (again) { again = false; schedule(); }
  }
}

/** Re-audits the scenario shown from the last audit (only the schools it touches re-route). */
async function runScenario() {
  if (!view) return;
  if (running) { again = true; return; }
  running = true;
  setState('running');
  const list = interventionsText(scenarios.current());
  try {
    const t0 = performance.now();
    const cached = views.get(list);
    let doc: AuditDoc;
    let coreMs = 0;
    if (cached) doc = cached.doc;
    else {
      const r = await engine.reaudit(list, () => {});
      doc = JSON.parse(r.docText) as AuditDoc;
      coreMs = r.ms;
      const re = doc['reaudit'] as { core_ms?: number; schools_rerouted?: number; schools?: number; full?: boolean } | undefined;
      if (re) {
        document.body.dataset.reauditMs = String(re.core_ms ?? '');
        $('scn-time').textContent = `Re-audit: ${Math.round(re.core_ms ?? r.ms)} ms in the core, ${re.schools_rerouted ?? '?'} of ${re.schools ?? '?'} schools re-routed${re.full ? ' (a full audit: the network changed)' : ''}.`;
      }
    }
    await display(doc, false, t0, coreMs, list);
    setState('done');
  } catch (e) {
    const msg = (e as Error).message;
    // A fresh worker (after a cancel or a crash) holds no audit to start from.
    if (/run an audit before a re-audit/.test(msg)) { running = false; return runAudit(false); }
    failed(e, false);
  } finally {
    running = false;
    $('progress').hidden = true;
    if (again) { again = false; schedule(); }
  }
}

/** Shows one audit (the baseline or a scenario's) in the map, panels and charts. */
async function display(doc: AuditDoc, fitNow: boolean, t0: number, coreMs: number, list: string) {
  {
    $('mapnote').hidden = true;
    const tParsed = performance.now();
    view = views.get(list)?.doc === doc ? views.get(list) as View : buildView(doc);
    keep(list, view);
    await map.show(view, layerJson('catchments'), fitNow);
    const names = doc.street_names;
    await map.setStreetNames(names);
    findBox.setIndex(findIndex(view, names));
    map.showFound([]);
    table.set(view.catchments);
    drawCharts(view);
    renderMessages(doc.warnings, doc.qa, null);
    renderLegend();
    fillReportScopes();
    ($('x-hotspots-csv') as HTMLButtonElement).disabled = typeof doc['hotspots_csv'] !== 'string';
    $('maptip').textContent = 'Click a home or a catchment to see its routes.';
    reselect();
    const total = performance.now() - t0;
    audits++;
    document.body.dataset.audits = String(audits);
    $('audit-time').textContent = `Last audit: ${Math.round(total)} ms in all (core ${Math.round(coreMs)} ms, page ${Math.round(performance.now() - tParsed)} ms).`;
    document.body.dataset.auditMs = String(Math.round(total));
    document.body.dataset.coreMs = String(Math.round(coreMs));
    document.body.dataset.scenario = scenarios.name();
    $('scn-badge').textContent = list ? `Scenario: ${scenarios.name()}` : '';
    $('scn-badge').hidden = !list;
    setStatus(`${doc.summary.homes} homes, ${doc.summary.children} children, ${doc.summary.schools.length} schools, ${doc.summary.network.length_km} km of street${list ? ` · scenario “${scenarios.name()}”, ${scenarios.current().length} interventions` : ''}.`);
    compare.options(scenarios.active);
    compare.run();
  }
}

function failed(e: unknown, frame: boolean) {
  {
    const msg = (e as Error).message;
    if (msg === 'cancelled') { framePending = framePending || frame; setStatus('Audit cancelled.'); setState('cancelled'); }
    else {
      let m: Message = { message: msg, at: null };
      try { m = JSON.parse(msg) as Message; } catch { /* plain text */ }
      renderMessages([], null, m);
      setStatus('The audit stopped on an error in the data: see “Problems in the data”.');
      $('messages-card').scrollIntoView({ block: 'nearest' });
      if (view) {
        $('mapnote').textContent = 'The audit stopped on an error in the data; the map still shows the last audit that ran.';
        $('mapnote').hidden = false;
      }
      framePending = framePending || frame;
      document.body.dataset.failures = String(Number(document.body.dataset.failures ?? 0) + 1);
      setState('failed');
    }
  }
}

function setStatus(s: string) {
  $('status').textContent = s;
}

// ---------- messages ----------

function featureOf(layer: string, index: number | null): Feature | null {
  if (index === null) return null;
  const fc = layerJson(layer as LayerKey);
  const f = fc?.features?.[index];
  if (f?.geometry) return f;
  if (layer === 'homes' && view) {
    const h = view.doc.layers.homes.find((x) => x.feature === index);
    if (h) return { type: 'Feature', geometry: { type: 'Point', coordinates: h.at }, properties: {} };
  }
  return null;
}

function renderMessages(warnings: Message[], qa: FeatureCollection | null, error: Message | null) {
  const items: HTMLElement[] = [];
  const add = (cls: string, text: string, where: string, f: Feature | null) => {
    const li = el('li', { class: cls }, el('span', { class: 'what' }, text), where ? el('span', { class: 'where' }, where) : null);
    if (f) {
      li.classList.add('zoomable');
      li.title = 'show on the map';
      li.addEventListener('click', () => map.fit([f]));
    }
    items.push(li);
  };
  const where = (m: Message) => m.at ? [m.at.layer, m.at.feature !== null ? `feature ${m.at.feature}` : '', m.at.id ? `id ${m.at.id}` : '', m.at.property ? `“${m.at.property}”` : ''].filter(Boolean).join(' · ') : '';
  if (error) add('error', error.message, where(error), error.at ? featureOf(error.at.layer, error.at.feature) : null);
  for (const w of warnings) add('warning', w.message, where(w), w.at ? featureOf(w.at.layer, w.at.feature) : null);
  for (const q of qa?.features ?? []) add('qa', String(q.properties.message ?? q.properties.kind), `network check · ${String(q.properties.kind).replace(/_/g, ' ')}`, q);
  const errs = error ? 1 : 0;
  $('msg-count').textContent = errs + warnings.length + (qa?.features.length ?? 0) ? `${errs ? '1 error, ' : ''}${warnings.length} warnings, ${qa?.features.length ?? 0} network checks` : 'none';
  $('messages').replaceChildren(...(items.length ? items : [el('li', { class: 'muted' }, 'No problems found in the layers.')]));
}

// ---------- selection ----------

function select(kind: 'home' | 'catchment', id: string, fit = true) {
  selected = { kind, id };
  reselect(fit);
  showTab('sel');
}

/** The find box's choice: the map goes there and the panel shows it. */
function found(f: Found) {
  if (!view) return;
  map.showFound(f.features);
  if (f.kind === 'home') return select('home', f.key);
  if (f.kind === 'school') {
    select('catchment', f.key, false);
    map.fit(f.features, 16);
    return;
  }
  selected = null;
  reselect();
  showTab('sel');
  map.fit(f.features, f.kind === 'crossing' ? 18 : 17);
  const host = $('selection');
  if (f.kind === 'crossing') {
    const c = view.doc.layers.crossings.find((x) => x.id === f.key);
    host.replaceChildren(el('h3', {}, `Crossing ${f.key}`),
      el('p', {}, `Control: ${c ? (c.control.guard ? 'crossing guard' : String(c.control.device).replace(/_/g, ' ')) : 'unknown'}${c?.control.refuge_island ? ', refuge island' : ''}.`),
      el('p', { class: 'small muted' }, 'Click its symbol on the map for what the audit found there.'));
  } else {
    const spots = view.hotspots.filter((h) => h.properties['street'] === f.key).slice(0, 8);
    host.replaceChildren(el('h3', {}, f.key),
      el('p', { class: 'small muted' }, `${f.features.length} line${f.features.length === 1 ? '' : 's'} in the streets layer.`),
      spots.length
        ? el('table', { class: 'figures' }, el('tbody', {}, ...spots.map((h) => el('tr', {}, el('th', {}, `hotspot #${h.properties['rank']}`), el('td', {}, `${h.properties['kind'] === 'crossing' ? 'crossing' : 'along'}, ${Number(h.properties['product']).toFixed(1)} children × risk`)))))
        : el('p', { class: 'small' }, 'No hotspot on this street.'));
  }
}

/** Counts redraws of the selection: a worker's answer for an older one is dropped. */
let selectionDrawn = 0;

/** Shows the selection's panel and asks the worker for its routes (the audit document carries
 * none); `fit` moves the map to them. */
function reselect(fit = false) {
  const host = $('selection');
  const token = ++selectionDrawn;
  delete document.body.dataset.routesDrawn;
  if (!view || !selected) {
    map.showRoutes([], null);
    if (view) host.replaceChildren(districtPanel(view));
    return;
  }
  const v = view;
  const failed = (e: unknown) => {
    if (token === selectionDrawn) host.append(el('p', { class: 'error' }, `The routes could not be drawn: ${errorText(e)}`));
  };
  if (selected.kind === 'home') {
    const h = v.byId.get(selected.id);
    if (!h) { host.replaceChildren(el('p', { class: 'muted' }, 'That home is not in this audit.')); return; }
    host.replaceChildren(el('h3', {}, `Home ${h.id}`), el('p', { class: 'muted' }, 'Drawing its routes…'));
    map.setCatchments(v, layerJson('catchments'), null);
    engine.routes(v.doc.audit_id, { homes: [h.id] }).then((fc) => {
      if (token !== selectionDrawn) return;
      const r = routesByHome(fc).get(h.id) ?? { shortest: null, recommended: null, safe: null };
      host.replaceChildren(homePanel(v, h, r));
      const lines = [r.safe, r.shortest, r.recommended].filter((x): x is NonNullable<typeof x> => !!x) as Feature[];
      map.showRoutes(lines, h.at);
      document.body.dataset.routesDrawn = String(lines.length);
      if (fit && lines.length) map.fit(lines, 17);
    }).catch(failed);
  } else {
    const c = v.catchments.find((x) => x.schoolId === selected?.id);
    if (!c) return;
    host.replaceChildren(catchmentPanel(v, c));
    const id = selected.id;
    const areas = layerJson('catchments');
    map.setCatchments(v, areas, id);
    const poly = areas?.features.filter((_, i) => v.doc.layers.catchments.find((x) => x.feature === i)?.school_id === id) ?? [];
    if (fit && poly.length) map.fit(poly, 16);
    engine.routes(v.doc.audit_id, { school: id, kinds: ['recommended'] }).then((fc) => {
      if (token !== selectionDrawn) return;
      map.showRoutes(fc.features as Feature[], null);
      document.body.dataset.routesDrawn = String(fc.features.length);
      if (fit && !poly.length && fc.features.length) map.fit(fc.features as Feature[], 16);
    }).catch(failed);
  }
}

// ---------- upgrade planner ----------

interface PlanStep { rank: number; upgrade: string; edge: number; street: string; children_gained: number; risk_reduction: number; safe_children_after: number }
interface PlanDoc { plan: { steps: PlanStep[]; safe_children_before: number; safe_children_after: number; children_routed: number }; caution?: string; interventions?: FeatureCollection }

function layersJson(): string {
  return JSON.stringify({
    streets: files.streets?.text,
    crossings: files.crossings?.text ?? null,
    schools: files.schools?.text,
    homes: files.homes?.text,
    homes_format: files.homes?.name.toLowerCase().endsWith('.csv') ? 'csv' : 'geo_json',
    catchments: files.catchments?.text ?? null,
    crashes: files.crashes?.text ?? null,
    preset: ($('preset') as HTMLSelectElement).value,
    mapping: files.mapping?.text ?? null,
  });
}

async function runPlan() {
  if (!ready() || running) return;
  const budget = Math.max(1, Math.min(50, Math.round(Number(($('plan-budget') as HTMLInputElement).value) || 5)));
  const out = $('plan-out');
  out.replaceChildren(el('p', { class: 'small muted' }, 'Planning…'));
  running = true;
  try {
    const res = await engine.plan(layersJson(), settings.json(), budget, () => {});
    const doc = JSON.parse(res.docText) as PlanDoc;
    (window as unknown as Record<string, unknown>).catchwalkPlan = doc;
    const p = doc.plan;
    const pct = (x: number) => (p.children_routed ? `${Math.round((100 * x) / p.children_routed)} %` : '–');
    const rows = p.steps.map((st) => {
      const tr = el('tr', { tabindex: '0' }, el('td', {}, String(st.rank)), el('td', {}, st.upgrade.replace(/_/g, ' ')), el('td', {}, st.street), el('td', {}, `+${st.children_gained}`));
      const spot = view?.hotspots.find((f) => f.properties['edge'] === st.edge);
      if (spot) { tr.classList.add('zoomable'); tr.addEventListener('click', () => map.fit([spot], 18)); }
      return tr;
    });
    out.replaceChildren(
      el('p', { class: 'small', id: 'plan-summary' }, `Children with a safe route: ${p.safe_children_before} (${pct(p.safe_children_before)}) → ${p.safe_children_after} (${pct(p.safe_children_after)}) after ${p.steps.length} upgrade${p.steps.length === 1 ? '' : 's'}.`),
      p.steps.length
        ? el('table', { class: 'figures', id: 'plan-table' }, el('thead', {}, el('tr', {}, el('th', {}, '#'), el('th', {}, 'Upgrade'), el('th', {}, 'Where'), el('th', {}, 'Children'))), el('tbody', {}, ...rows))
        : el('p', { class: 'small muted' }, 'No upgrade in the catalogue gives another child a safe route.'),
      el('p', { class: 'small muted' }, 'Candidates to study on site, not designs: each needs an engineering study and local approval.'),
    );
    const ivs = (doc.interventions?.features ?? []) as Intervention[];
    if (ivs.length) {
      const b = el('button', { type: 'button', id: 'plan-scenario' }, 'Make this plan a scenario');
      b.addEventListener('click', () => scenarios.add(scenarios.freshName(`Plan of ${ivs.length}`), ivs.map((f) => ({ ...f, properties: { ...f.properties } }))));
      out.append(b);
    }
  } catch (e) {
    let msg = (e as Error).message;
    try { msg = (JSON.parse(msg) as Message).message; } catch { /* plain text */ }
    out.replaceChildren(el('p', { class: 'small error' }, msg === 'cancelled' ? 'Planning cancelled.' : msg));
  } finally {
    running = false;
    if (again) { again = false; schedule(); }
  }
}

// ---------- legend, tabs, report ----------

function renderLegend() {
  const sw = (color: string, cls = 'sw') => el('span', { class: cls, style: `background:${color}` });
  const icon = (key: string) => el('img', { class: 'icon', src: deviceImage(key, 32).canvas.toDataURL(), alt: '' });
  const row = (mark: HTMLElement, text: string) => el('div', { class: 'lrow' }, mark, el('span', {}, text));
  const toggle = el('button', { type: 'button', class: 'legend-toggle', id: 'legend-toggle' }, 'Legend');
  toggle.addEventListener('click', () => $('legend').classList.toggle('folded'));
  $('legend').replaceChildren(
    toggle,
    el('h4', {}, 'Streets by speed'),
    ...SPEED_BANDS.map((b) => row(sw(b.color, 'sw line'), b.label)),
    row(el('span', { class: 'sw line dash', style: `border-color:${PATH_COLOR}` }), 'foot path / steps'),
    el('p', { class: 'small' }, 'Wider line: higher class (arterial › collector › local › service).'),
    el('h4', {}, 'Crossings'),
    ...DEVICES.map((d) => row(icon(d.key), d.label)),
    el('h4', {}, 'Homes'),
    ...HOME_STATUS.map((s) => row(sw(s.color, 'sw dot'), s.label)),
    el('p', { class: 'small' }, 'Larger circles: homes grouped at this zoom, sized by children; green when every child in the walk zone has a safe route, orange when none has, grey when all live beyond it.'),
    el('h4', {}, 'Routes'),
    row(el('span', { class: 'sw line dash', style: `border-color:${ROUTE_STYLE.shortest.color}` }), ROUTE_STYLE.shortest.label),
    row(sw(ROUTE_STYLE.recommended.color, 'sw line thick'), ROUTE_STYLE.recommended.label),
    row(sw(ROUTE_STYLE.safe.color, 'sw line wide'), ROUTE_STYLE.safe.label),
    el('h4', {}, 'Catchments by deficit'),
    el('div', { class: 'ramp' }, ...[0, 0.25, 0.5, 1].map((d) => el('span', { style: `background:${deficitColor(d)}` }, `${d * 100}%`))),
    row(el('span', { class: 'sw ring', style: `border-color:${QA_COLOR}` }), 'network check (see list)'),
    row(el('span', { class: 'sw ring hot' }), 'hotspot: children × risk'),
  );
}

function showTab(name: string) {
  document.querySelectorAll<HTMLElement>('.tabs button').forEach((b) => b.classList.toggle('on', b.dataset.tab === name));
  document.querySelectorAll<HTMLElement>('.tab').forEach((t) => t.classList.toggle('on', t.id === `tab-${name}`));
  if (name === 'charts' && view) drawCharts(view);
}

function fillReportScopes() {
  const sel = $('report-scope') as HTMLSelectElement;
  const cur = sel.value;
  sel.replaceChildren(el('option', { value: '' }, 'the whole district'), ...(view?.catchments ?? []).map((c) => el('option', { value: c.schoolId }, `catchment: ${c.name || c.schoolId}`)));
  sel.value = cur;
}

async function printReport() {
  if (!view) return;
  const scope = ($('report-scope') as HTMLSelectElement).value || null;
  showTab('charts');
  drawCharts(view);
  // The map is drawn once at a fixed landscape size, legend folded, framing the scope alone.
  const legend = $('legend');
  const wasOpen = !legend.classList.contains('folded');
  legend.classList.add('folded');
  $('map').classList.add('capture');
  map.map.resize();
  const individual = includeHomes.checked;
  map.hideHomes(!individual);
  map.showFound([]);
  if (scope) select('catchment', scope);
  else { selected = null; reselect(); map.fitBox(view.doc.bounds); }
  await new Promise<void>((r) => map.map.once('idle', () => r()));
  const mapImage = map.image();
  map.hideHomes(false);
  $('map').classList.remove('capture');
  map.map.resize();
  if (wasOpen) legend.classList.remove('folded');
  const fl: Record<string, string> = {};
  for (const k of LAYER_KEYS) if (files[k]) fl[k] = files[k]?.name ?? '';
  buildReport($('report-body'), { view, scope, mapImage, charts: chartImages(), files: fl, settings: settings.json(), caution: engine.caution || view.doc.summary.caution, individual });
  $('report-body').append(...reportExtras(individual));
  $('report').hidden = false;
  $('report').scrollTop = 0;
  document.body.classList.add('reporting');
}
/** The report's scenario, comparison and notes sections. */
function reportExtras(individual: boolean): HTMLElement[] {
  const out: HTMLElement[] = [];
  if (scenarios.active >= 0) {
    out.push(el('h2', {}, `Scenario: ${scenarios.name()}`), el('p', { class: 'small' }, 'The figures above are this scenario’s: the existing network with these interventions, audited by the same core.'),
      el('ol', {}, ...scenarios.current().map((iv) => el('li', {}, Scenarios.describe(iv), iv.properties['origin'] === 'observation' ? ' (observed on site)' : iv.properties['origin'] === 'plan' ? ' (from the upgrade planner)' : ''))));
  }
  if (compare.last) {
    const last = individual ? compare.last : { ...compare.last, comparison: { ...compare.last.comparison, homes_route_changed: [], homes_gained_safe_route: [], homes_lost_safe_route: [] } };
    out.push(el('h2', {}, `Before and after: ${compare.last.after} against ${compare.last.before}`), ...comparisonElements(last, null).filter((e) => e.tagName !== 'SPAN'));
  }
  if (notes.notes.length) {
    out.push(el('h2', {}, 'Site-visit notes'), el('ol', { class: 'report-notes' }, ...notes.notes.map((n) => el('li', {},
      el('strong', {}, Notes.where(n)), n.visited ? ` · visited ${n.visited.replace('T', ' ')}` : '',
      el('div', {}, n.text),
      el('div', { class: 'small' }, Object.entries(n.checklist).filter(([, v]) => v !== 'not_checked' && v !== null).map(([k, v]) => `${k.replace(/_/g, ' ')}: ${String(v)}`).join(' · ')),
      n.observed ? el('div', { class: 'small' }, `Observed correction: ${String(n.observed['kind']).replace(/_/g, ' ')}`) : null,
      el('div', { class: 'report-photos' }, ...n.photos.map((name) => notes.photos.find((p) => p.name === name)).filter((p) => !!p).map((p) => el('img', { src: photoUrl(p as NonNullable<typeof p>), alt: `photo ${p?.name}` })))))));
  }
  return out;
}
$('report-print').addEventListener('click', () => window.print());
$('report-close').addEventListener('click', () => { $('report').hidden = true; document.body.classList.remove('reporting'); });

// ---------- wiring ----------

document.querySelectorAll<HTMLElement>('.tabs button').forEach((b) => b.addEventListener('click', () => showTab(b.dataset.tab ?? 'sel')));
$('demo').addEventListener('click', () => loadDemo());
$('fit-all').addEventListener('click', () => { if (view) map.fitBox(view.doc.bounds, 18); });
$('run').addEventListener('click', () => runAudit(false));
$('preset').addEventListener('change', () => schedule());
$('cancel').addEventListener('click', async () => {
  await engine.cancel();
});
const includeHomes = $('include-homes') as HTMLInputElement;
const homesBtn = $('x-homes') as HTMLButtonElement;
const syncPrivacy = () => {
  homesBtn.disabled = !includeHomes.checked;
  homesBtn.title = includeHomes.checked ? 'one row per home' : 'tick “include individual homes” first';
  $('x-routes').textContent = includeHomes.checked ? 'Routes GeoJSON (per home)' : 'Routes GeoJSON (per catchment)';
};
includeHomes.addEventListener('change', syncPrivacy);
syncPrivacy();
$('x-routes').addEventListener('click', () => {
  const v = view;
  if (v) saveRoutes(v, layerJson('catchments'), includeHomes.checked, () => engine.routesText(v.doc.audit_id, {})).catch((e) => setStatus(`The routes could not be saved: ${errorText(e)}`));
});
$('x-hotspots').addEventListener('click', () => view && saveHotspots(view));
$('x-catchments').addEventListener('click', () => view && saveCatchments(view));
$('x-hotspots-csv').addEventListener('click', () => view && saveHotspotsCsv(view));
homesBtn.addEventListener('click', () => view && includeHomes.checked && saveHomes(view));
$('x-report').addEventListener('click', () => printReport());
$('plan-run').addEventListener('click', () => runPlan());

const drop = $('drop');
for (const ev of ['dragenter', 'dragover']) document.addEventListener(ev, (e) => { e.preventDefault(); drop.classList.add('over'); });
document.addEventListener('dragleave', () => drop.classList.remove('over'));
document.addEventListener('drop', async (e) => {
  e.preventDefault();
  drop.classList.remove('over');
  const unknown: string[] = [];
  const went: string[] = [];
  for (const file of Array.from(e.dataTransfer?.files ?? [])) {
    if (file.name.toLowerCase().endsWith('.pmtiles')) {
      await loadBasemap(file);
      went.push(`${file.name} → basemap`);
      continue;
    }
    if (isBinary(file.name)) {
      // Binary layers (zipped Shapefile, .osm.pbf): the core converts them to GeoJSON, then a
      // Shapefile is placed by what it holds; an OpenStreetMap extract goes to streets.
      const hint = placeFile({ name: file.name, bytes: new Uint8Array(0) });
      let text: string;
      try { text = await engine.layerText(hint.layer ?? 'streets', file); }
      catch (e) { unknown.push(`${file.name} (${errorText(e)})`); continue; }
      const byContent = placeFile({ name: file.name, text });
      const p = /\.pbf$/i.test(file.name) || !byContent.layer ? hint : byContent;
      if (p.layer) {
        setFile(p.layer, { name: file.name, text }, p);
        went.push(`${file.name} → ${LAYER_INFO[p.layer].label.toLowerCase()}`);
      } else unknown.push(`${file.name} (${p.why})`);
      continue;
    }
    let text: string;
    try { text = utf8Text(file.name, await file.arrayBuffer()); }
    catch (e) { unknown.push(errorText(e)); continue; }
    const p = placeFile({ name: file.name, text });
    if (p.layer) {
      setFile(p.layer, { name: file.name, text }, p);
      went.push(`${file.name} → ${LAYER_INFO[p.layer].label.toLowerCase()}`);
    } else unknown.push(`${file.name} (${p.why})`);
  }
  setStatus([went.length ? `Placed ${went.join(', ')}: check the list and move a file if it is wrong.` : '',
    unknown.length ? `Could not place ${unknown.join('; ')}: use the pickers.` : ''].filter(Boolean).join(' '));
  if (went.some((w) => !w.endsWith('→ basemap'))) schedule();
});

// ---------- basemap ----------

async function loadBasemap(file: File | null) {
  const info = $('basemap-info');
  try {
    const b = await map.setBasemap(file);
    info.textContent = b ? `${b.name}: ${b.kind} tiles, zoom ${b.minZoom}–${b.maxZoom}${b.kind === 'vector' ? ` (${b.layers.join(', ')})` : ''}` : 'optional: a .pmtiles archive of your area';
    $('basemap-clear').hidden = !b;
    document.body.dataset.basemap = b ? b.kind : '';
    if (b && !view) map.map.fitBounds(b.bounds, { duration: 0 });
  } catch (e) {
    info.textContent = `${file?.name ?? ''}: ${(e as Error).message}`;
    document.body.dataset.basemap = 'failed';
  }
}
const basemapInput = $<HTMLInputElement>('file-basemap');
basemapInput.addEventListener('change', () => { const f = basemapInput.files?.[0]; if (f) loadBasemap(f); });
$('basemap-clear').addEventListener('click', () => { basemapInput.value = ''; loadBasemap(null); });

// Exposed for the end-to-end tests and for planners who script the page.
(window as unknown as Record<string, unknown>).catchwalk = {
  map: map.map,
  scaleBar: () => map.lastScale,
  placeFile,
  select,
  homes: () => view?.homes.map((h) => ({ id: h.id, at: h.at, status: h.status, schoolId: h.schoolId })) ?? [],
  catchmentsCsv: () => view && catchmentsCsv(view),
  state: () => JSON.parse(JSON.stringify(pageState())) as PageState,
  view: () => view && { catchments: view.catchments, summary: view.doc.summary, reaudit: view.doc['reaudit'] ?? null, homesCsv: view.doc.homes_csv, docKeys: Object.keys(view.doc) },
  hotspots: () => view?.hotspots.slice(0, 20).map((h) => ({ properties: h.properties, geometry: h.geometry })) ?? [],
  hotspotCount: () => view?.hotspots.length ?? 0,
  hotspot: (i: number) => view?.hotspots[i]?.properties ?? null,
  comparison: () => compare.last?.comparison ?? null,
  comparisonRoutes: () => compare.drawn,
  coreMemory: () => Number(view?.doc['core_memory_bytes'] ?? 0),
  flushSave: () => autosave.flush(),
  project: projectCard,
  download,
};

renderLayerList();
renderLegend();
// On a small screen the legend starts folded, so the town is not under it on first view.
if ($('map').clientWidth < 900) $('legend').classList.add('folded');
setState('starting');
engine.start().then(async () => {
  settings.init(engine.defaultConfig, engine.ruleSets, engine.configBounds);
  setState('idle');
  const saved = await autosave.load();
  if (saved) {
    $('prj-saved').textContent = `Restored the project saved on this computer at ${new Date(saved.savedAt).toLocaleString('en-GB')}.`;
    await restore(saved.state);
  } else {
    restored = true;
    if (typeof CATCHWALK_AUTODEMO !== 'undefined' && CATCHWALK_AUTODEMO) await loadDemo();
  }
  document.body.dataset.restored = saved ? 'yes' : 'no';
}).catch((e) => {
  setStatus(`The audit core could not start: ${(e as Error).message}`);
  setState('failed');
});
