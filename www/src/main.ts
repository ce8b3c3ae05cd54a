// The page: layers in, the audit in a worker, the map, panels, charts and exports out.

import { chartImages, drawCharts } from './charts';
import { $, download, el } from './dom';
import { Engine } from './engine';
import { catchmentsCsv, saveCatchments, saveHomes, saveHotspots, saveHotspotsCsv, saveRoutes } from './exports';
import { AuditMap } from './map';
import { buildView, type View } from './model';
import { DEVICES, HOME_STATUS, PATH_COLOR, QA_COLOR, ROUTE_STYLE, SPEED_BANDS, deficitColor, deviceImage } from './palette';
import { buildReport } from './report';
import { catchmentPanel, districtPanel, homePanel } from './selection';
import { Settings } from './settings';
import { CatchmentTable } from './table';
import { LAYER_KEYS, type AuditDoc, type Feature, type FeatureCollection, type LayerFile, type LayerKey, type Message } from './types';

declare const CATCHWALK_AUTODEMO: boolean;

const LAYER_INFO: Record<LayerKey, { label: string; required: boolean; accept: string }> = {
  streets: { label: 'Streets', required: true, accept: '.geojson,.json' },
  crossings: { label: 'Crossings', required: false, accept: '.geojson,.json' },
  schools: { label: 'Schools', required: true, accept: '.geojson,.json' },
  homes: { label: 'Homes', required: true, accept: '.geojson,.json,.csv' },
  catchments: { label: 'Catchments', required: false, accept: '.geojson,.json' },
  mapping: { label: 'Field mapping', required: false, accept: '.json' },
};

const files: Record<LayerKey, LayerFile | null> = { streets: null, crossings: null, schools: null, homes: null, catchments: null, mapping: null };
const parsed = new Map<LayerKey, FeatureCollection | null>();
const engine = new Engine();
let view: View | null = null;
let selected: { kind: 'home' | 'catchment'; id: string } | null = null;
let running = false;
let again = false;
let audits = 0;

const map = new AuditMap($('map'), { onHome: (id) => select('home', id), onCatchment: (id) => select('catchment', id) });
const table = new CatchmentTable($('table'), (id) => select('catchment', id));
const settings = new Settings($<HTMLFormElement>('settings'), () => schedule());

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

function setFile(key: LayerKey, f: LayerFile | null) {
  files[key] = f;
  parsed.delete(key);
  renderLayerList();
}

function renderLayerList() {
  const host = $('layer-list');
  host.replaceChildren(...LAYER_KEYS.map((key) => {
    const info = LAYER_INFO[key];
    const f = files[key];
    const input = el('input', { type: 'file', accept: info.accept, id: `file-${key}`, class: 'visually-hidden' });
    input.addEventListener('change', async () => {
      const file = input.files?.[0];
      if (file) { setFile(key, { name: file.name, text: await file.text() }); schedule(); }
    });
    const pick = el('label', { for: `file-${key}`, class: 'pick' }, f ? 'replace' : 'choose…');
    const clear = f && !info.required ? el('button', { type: 'button', class: 'link', title: `remove the ${info.label.toLowerCase()} layer` }, '×') : null;
    clear?.addEventListener('click', () => { setFile(key, null); schedule(); });
    return el('div', { class: `layer ${f ? 'has' : info.required ? 'missing' : ''}`, 'data-layer': key },
      el('span', { class: 'lname' }, info.label, info.required ? el('span', { class: 'req', title: 'required' }, ' *') : null),
      el('span', { class: 'fname', title: f?.name ?? '' }, f ? f.name : info.required ? 'required' : 'optional'),
      input, pick, clear);
  }));
}

/** Which layer a dropped file is: by its name, else by its geometry. */
function guessLayer(name: string, text: string): LayerKey | null {
  const n = name.toLowerCase();
  for (const key of LAYER_KEYS) if (n.includes(key.replace(/s$/, ''))) return key;
  if (n.includes('mapping') || n.includes('fields')) return 'mapping';
  if (n.endsWith('.csv')) return 'homes';
  try {
    const fc = JSON.parse(text) as FeatureCollection;
    const t = fc.features?.[0]?.geometry?.type ?? '';
    if (t.includes('LineString')) return 'streets';
    if (t.includes('Polygon')) return 'catchments';
  } catch { /* not JSON: leave it to the pickers */ }
  return null;
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
  await runAudit(true);
}

// ---------- audit ----------

let timer = 0;
function schedule() {
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
  const fitNow = fit || !view;
  try {
    const t0 = performance.now();
    const res = await engine.audit(layers, settings.json(), (p) => {
      const share = p.total ? p.done / p.total : 0;
      const order = ['parsing', 'network', 'routing', 'scoring'];
      const i = Math.max(0, order.indexOf(p.stage));
      ($('progress-fill') as HTMLElement).style.width = `${Math.round(((i + share) / order.length) * 100)}%`;
      $('progress-text').textContent = `${p.stage}${p.total > 1 ? ` ${p.done} / ${p.total}` : ''}`;
    });
    const doc = JSON.parse(res.docText) as AuditDoc;
    $('mapnote').hidden = true;
    $('plan-out').replaceChildren();
    const tParsed = performance.now();
    view = buildView(doc);
    await map.show(view, layerJson('catchments'), fitNow);
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
    $('audit-time').textContent = `Last audit: ${Math.round(total)} ms in all (core ${Math.round(res.ms)} ms, page ${Math.round(performance.now() - tParsed)} ms).`;
    document.body.dataset.auditMs = String(Math.round(total));
    document.body.dataset.coreMs = String(Math.round(res.ms));
    setStatus(`${doc.summary.homes} homes, ${doc.summary.children} children, ${doc.summary.schools.length} schools, ${doc.summary.network.length_km} km of street.`);
    setState('done');
  } catch (e) {
    const msg = (e as Error).message;
    if (msg === 'cancelled') { setStatus('Audit cancelled.'); setState('cancelled'); }
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
      document.body.dataset.failures = String(Number(document.body.dataset.failures ?? 0) + 1);
      setState('failed');
    }
  } finally {
    running = false;
    bar.hidden = true;
    if (again) { again = false; schedule(); }
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

function select(kind: 'home' | 'catchment', id: string) {
  selected = { kind, id };
  reselect();
  showTab('sel');
  if (!view) return;
  if (kind === 'home') {
    const h = view.byId.get(id);
    const routes = [h?.shortest, h?.recommended, h?.safe].filter((x): x is NonNullable<typeof x> => !!x) as Feature[];
    if (routes.length) map.fit(routes, 17);
  } else {
    const routes = view.homes.filter((h) => h.schoolId === id && h.recommended).map((h) => h.recommended as Feature);
    const poly = layerJson('catchments')?.features.filter((_, i) => view?.doc.layers.catchments.find((c) => c.feature === i)?.school_id === id) ?? [];
    map.fit(poly.length ? poly : routes, 16);
  }
}

function reselect() {
  const host = $('selection');
  if (!view || !selected) {
    map.showRoutes([], null);
    if (view) host.replaceChildren(districtPanel(view));
    return;
  }
  if (selected.kind === 'home') {
    const h = view.byId.get(selected.id);
    if (!h) { host.replaceChildren(el('p', { class: 'muted' }, 'That home is not in this audit.')); return; }
    host.replaceChildren(homePanel(view, h));
    map.showRoutes([h.safe, h.shortest, h.recommended].filter((x): x is NonNullable<typeof x> => !!x) as Feature[], h.at);
    map.setCatchments(view, layerJson('catchments'), null);
  } else {
    const c = view.catchments.find((x) => x.schoolId === selected?.id);
    if (!c) return;
    host.replaceChildren(catchmentPanel(view, c));
    const id = selected.id;
    map.showRoutes(view.homes.filter((h) => h.schoolId === id && h.recommended).map((h) => h.recommended as Feature), null);
    map.setCatchments(view, layerJson('catchments'), id);
  }
}

// ---------- upgrade planner ----------

interface PlanStep { rank: number; upgrade: string; edge: number; street: string; children_gained: number; risk_reduction: number; safe_children_after: number }
interface PlanDoc { plan: { steps: PlanStep[]; safe_children_before: number; safe_children_after: number; children_routed: number }; caution?: string }

function layersJson(): string {
  return JSON.stringify({
    streets: files.streets?.text,
    crossings: files.crossings?.text ?? null,
    schools: files.schools?.text,
    homes: files.homes?.text,
    homes_format: files.homes?.name.toLowerCase().endsWith('.csv') ? 'csv' : 'geo_json',
    catchments: files.catchments?.text ?? null,
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
  if (scope) select('catchment', scope);
  else { selected = null; reselect(); map.fit(view.doc.centrelines); }
  await new Promise<void>((r) => map.map.once('idle', () => r()));
  const mapImage = map.image();
  map.hideHomes(false);
  $('map').classList.remove('capture');
  map.map.resize();
  if (wasOpen) legend.classList.remove('folded');
  const fl: Record<string, string> = {};
  for (const k of LAYER_KEYS) if (files[k]) fl[k] = files[k]?.name ?? '';
  buildReport($('report-body'), { view, scope, mapImage, charts: chartImages(), files: fl, settings: settings.json(), caution: engine.caution || view.doc.summary.caution, individual });
  $('report').hidden = false;
  $('report').scrollTop = 0;
  document.body.classList.add('reporting');
}
$('report-print').addEventListener('click', () => window.print());
$('report-close').addEventListener('click', () => { $('report').hidden = true; document.body.classList.remove('reporting'); });

// ---------- wiring ----------

document.querySelectorAll<HTMLElement>('.tabs button').forEach((b) => b.addEventListener('click', () => showTab(b.dataset.tab ?? 'sel')));
$('demo').addEventListener('click', () => loadDemo());
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
$('x-routes').addEventListener('click', () => view && saveRoutes(view, layerJson('catchments'), includeHomes.checked));
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
  for (const file of Array.from(e.dataTransfer?.files ?? [])) {
    const text = await file.text();
    const key = guessLayer(file.name, text);
    if (key) setFile(key, { name: file.name, text });
    else unknown.push(file.name);
  }
  if (unknown.length) setStatus(`Could not tell which layer ${unknown.join(', ')} is: use the pickers.`);
  schedule();
});

// Exposed for the end-to-end tests and for planners who script the page.
(window as unknown as Record<string, unknown>).catchwalk = {
  map: map.map,
  select,
  homes: () => view?.homes.map((h) => ({ id: h.id, at: h.at, status: h.status, schoolId: h.schoolId })) ?? [],
  catchmentsCsv: () => view && catchmentsCsv(view),
  download,
};

renderLayerList();
renderLegend();
setState('starting');
engine.start().then(() => {
  settings.init(engine.defaultConfig, engine.ruleSets, engine.configBounds);
  setState('idle');
  if (typeof CATCHWALK_AUTODEMO !== 'undefined' && CATCHWALK_AUTODEMO) loadDemo();
}).catch((e) => {
  setStatus(`The audit core could not start: ${(e as Error).message}`);
  setState('failed');
});
