// Named scenarios: lists of interventions made by clicking the map. The page only writes the
// interventions layer; every figure of a scenario comes from the core's re-audit.

import { $, el } from './dom';
import { distanceM, snapToLine } from './geometry';
import type { AuditMap, Pick } from './map';
import type { View } from './model';
import type { Intervention, Scenario } from './project';
import type { Feature, FeatureCollection, LonLat } from './types';

/** The core's intervention kinds (crate/src/scenario/read.rs) with their wording. */
export const KINDS: { kind: string; label: string; on: 'crossing' | 'street' | 'path' }[] = [
  { kind: 'signal', label: 'signal', on: 'crossing' },
  { kind: 'all_way_stop', label: 'all-way stop', on: 'crossing' },
  { kind: 'stop', label: 'stop sign on the minor leg', on: 'crossing' },
  { kind: 'yield', label: 'yield sign on the minor leg', on: 'crossing' },
  { kind: 'marked', label: 'marked crosswalk', on: 'crossing' },
  { kind: 'guard', label: 'crossing guard (hours)', on: 'crossing' },
  { kind: 'refuge', label: 'refuge island', on: 'crossing' },
  { kind: 'raised', label: 'raised crossing', on: 'crossing' },
  { kind: 'beacon', label: 'flashing beacon', on: 'crossing' },
  { kind: 'speed', label: 'speed limit on a street', on: 'street' },
  { kind: 'sidewalk', label: 'sidewalk on a street side', on: 'street' },
  { kind: 'close', label: 'close a street (works)', on: 'street' },
  { kind: 'path', label: 'new foot path (click points)', on: 'path' },
];

const labelOf = (kind: string) => KINDS.find((k) => k.kind === kind)?.label.replace(/ \(.*\)$/, '') ?? kind.replace(/_/g, ' ');

/** A few words for the map. */
function shortLabel(iv: Intervention): string {
  const p = iv.properties;
  if (p.kind === 'speed') return `${String(p['speed_kmh'])} km/h`;
  if (p.kind === 'close') return 'closed';
  if (p.kind === 'sidewalk') return 'sidewalk';
  if (p.kind === 'path') return 'path';
  return labelOf(p.kind).replace(/ \/.*$/, '');
}

/** A control clicked within this distance of a junction is placed on the junction. */
const JUNCTION_SNAP_M = 12;
/** A path's point within this distance of a street vertex joins the street there. */
const PATH_SNAP_M = 10;

export interface ScenarioEvents {
  /** The shown scenario or its list changed: re-audit it. */
  changed: () => void;
  view: () => View | null;
  status: (text: string) => void;
  /** A segment of the shown audit's centrelines by its index (the worker holds them). */
  segment: (i: number) => Promise<Feature | null>;
}

export class Scenarios {
  list: Scenario[] = [];
  /** -1: the existing network (the baseline). */
  active = -1;
  private history: Intervention[][] = [];
  private armed = false;
  private path: LonLat[] = [];
  private next = 1;

  constructor(private map: AuditMap, private ev: ScenarioEvents) {
    $('scn-new').addEventListener('click', () => this.add(this.freshName('Scenario'), []));
    $('scn-rename').addEventListener('click', () => this.rename());
    $('scn-remove').addEventListener('click', () => this.removeScenario());
    $('scn-pick').addEventListener('change', () => this.show(Number(($('scn-pick') as HTMLSelectElement).value)));
    $('scn-arm').addEventListener('click', () => this.arm(!this.armed));
    $('scn-undo').addEventListener('click', () => this.undo());
    $('scn-finish').addEventListener('click', () => this.finishPath());
    const kind = $('scn-kind') as HTMLSelectElement;
    kind.replaceChildren(...KINDS.map((k) => el('option', { value: k.kind }, k.label)));
    kind.addEventListener('change', () => { this.path = []; this.syncTool(); });
    this.render();
  }

  /** The shown scenario's interventions (empty for the existing network). */
  current(): Intervention[] {
    return this.list[this.active]?.interventions ?? [];
  }

  name(i = this.active): string {
    return i < 0 ? 'Existing network' : this.list[i]?.name ?? '';
  }

  set(list: Scenario[], active: number) {
    this.list = list;
    this.active = active >= 0 && active < list.length ? active : -1;
    this.history = [];
    this.next = 1 + list.reduce((a, s) => a + s.interventions.length, 0);
    this.render();
  }

  freshName(stem: string): string {
    let n = this.list.length + 1;
    while (this.list.some((s) => s.name === `${stem} ${n}`)) n++;
    return `${stem} ${n}`;
  }

  /** Adds a scenario and shows it. */
  add(name: string, interventions: Intervention[]) {
    this.list.push({ name, interventions });
    this.active = this.list.length - 1;
    this.history = [];
    this.render();
    this.ev.changed();
  }

  show(i: number) {
    this.active = i >= 0 && i < this.list.length ? i : -1;
    this.history = [];
    this.arm(false);
    this.render();
    this.ev.changed();
  }

  private rename() {
    const s = this.list[this.active];
    if (!s) return;
    const input = $('scn-name') as HTMLInputElement;
    const name = input.value.trim();
    if (!name) { this.ev.status('Give the scenario a name first.'); return; }
    if (this.list.some((x, i) => x.name === name && i !== this.active)) { this.ev.status(`A scenario is already called “${name}”.`); return; }
    s.name = name;
    this.render();
    this.ev.changed();
  }

  private removeScenario() {
    if (this.active < 0) return;
    this.list.splice(this.active, 1);
    this.active = -1;
    this.history = [];
    this.render();
    this.ev.changed();
  }

  /** Adds one intervention to the shown scenario (a new one when the baseline is shown). */
  push(iv: Intervention) {
    if (this.active < 0) {
      this.list.push({ name: this.freshName('Scenario'), interventions: [] });
      this.active = this.list.length - 1;
    }
    const s = this.list[this.active];
    this.history.push([...s.interventions]);
    iv.properties.id ??= `iv-${this.next++}`;
    s.interventions.push(iv);
    this.render();
    this.ev.changed();
  }

  private remove(i: number) {
    const s = this.list[this.active];
    if (!s) return;
    this.history.push([...s.interventions]);
    s.interventions.splice(i, 1);
    this.render();
    this.ev.changed();
  }

  private undo() {
    const s = this.list[this.active];
    const prev = this.history.pop();
    if (!s || !prev) return;
    s.interventions = prev;
    this.render();
    this.ev.changed();
  }

  arm(on: boolean) {
    this.armed = on;
    this.path = [];
    this.map.onPick = on ? (p) => { this.pick(p).catch((e: Error) => this.ev.status(`The change could not be placed: ${e.message}`)); } : null;
    this.map.armed(on);
    this.syncTool();
  }

  /** Another tool took the map. */
  disarm() {
    if (this.armed) { this.armed = false; this.path = []; this.syncTool(); }
  }

  private kind() {
    const k = ($('scn-kind') as HTMLSelectElement).value;
    return KINDS.find((x) => x.kind === k) ?? KINDS[0];
  }

  private syncTool() {
    const k = this.kind();
    $('scn-guard-row').hidden = k.kind !== 'guard';
    $('scn-speed-row').hidden = k.kind !== 'speed';
    $('scn-side-row').hidden = k.kind !== 'sidewalk';
    $('scn-finish').hidden = !(this.armed && k.on === 'path');
    ($('scn-finish') as HTMLButtonElement).disabled = this.path.length < 2;
    const arm = $('scn-arm');
    arm.textContent = this.armed ? 'Stop adding' : 'Add on the map';
    arm.classList.toggle('tool-on', this.armed);
    $('scn-hint').textContent = !this.armed ? ''
      : k.on === 'crossing' ? 'Click a crossing or a junction (a click mid-street makes a mid-block crossing).'
        : k.on === 'street' ? `Click the street${k.kind === 'sidewalk' ? ' on the side that gets the sidewalk' : ''}: the change applies to the block clicked, between its junctions.`
          : `Click the path's points (${this.path.length} so far; ends join a street at its vertices), then “Finish path”.`;
  }

  private async pick(p: Pick) {
    const k = this.kind();
    const seg = p.segment === null ? null : await this.ev.segment(p.segment);
    if (k.on === 'path') {
      const snap = seg ? snapToLine(seg, p.at) : null;
      this.path.push(snap && snap.vertexM <= PATH_SNAP_M ? snap.vertex : p.at);
      this.syncTool();
      this.map.setOverlay(this.overlay(), null);
      return;
    }
    if (k.on === 'crossing') {
      let at: LonLat | null = p.crossing?.at ?? null;
      if (!at && seg) {
        const snap = snapToLine(seg, p.at);
        if (snap) at = snap.vertexM <= JUNCTION_SNAP_M ? snap.vertex : snap.at;
      }
      if (!at) { this.ev.status('Click on a street or a crossing to place the control.'); return; }
      const props: Intervention['properties'] = { kind: k.kind };
      if (k.kind === 'guard') props['guard_hours'] = ($('scn-guard') as HTMLInputElement).value.trim() || '07:30-08:45,14:45-15:30';
      this.push({ type: 'Feature', geometry: { type: 'Point', coordinates: at }, properties: props });
      return;
    }
    if (!seg) { this.ev.status('Click on a street to change it.'); return; }
    const street = String(seg.properties['street_id'] ?? '');
    const snap = snapToLine(seg, p.at);
    const props: Intervention['properties'] = { kind: k.kind, street };
    if (k.kind === 'speed') {
      const v = Number(($('scn-speed') as HTMLInputElement).value);
      if (!(v > 0 && v <= 200)) { this.ev.status('Give the new speed in km/h (above 0).'); return; }
      props['speed_kmh'] = v;
    }
    if (k.kind === 'sidewalk') {
      const choice = ($('scn-side') as HTMLSelectElement).value;
      props['side'] = choice === 'both' ? 'both' : snap?.side ?? 'both';
    }
    this.push({ type: 'Feature', geometry: { type: 'Point', coordinates: snap?.at ?? p.at }, properties: props });
  }

  private finishPath() {
    const pts = this.path.filter((q, i, a) => i === 0 || distanceM(q, a[i - 1]) > 0.5);
    this.path = [];
    if (pts.length < 2) { this.syncTool(); return; }
    this.push({ type: 'Feature', geometry: { type: 'LineString', coordinates: pts }, properties: { kind: 'path' } });
    this.syncTool();
  }

  /** The shown scenario's interventions for the map (with a short label), and a path being drawn. */
  overlay(): FeatureCollection {
    const features: Feature[] = this.current().map((iv, i) => ({
      type: 'Feature',
      geometry: iv.geometry,
      properties: { origin: iv.properties['origin'] ?? 'proposal', label: `${i + 1} ${shortLabel(iv)}` },
    }));
    if (this.path.length) features.push({ type: 'Feature', geometry: this.path.length > 1 ? { type: 'LineString', coordinates: this.path } : { type: 'Point', coordinates: this.path[0] }, properties: { origin: 'proposal', label: 'new path' } });
    return { type: 'FeatureCollection', features };
  }

  /** One line describing an intervention. */
  static describe(iv: Intervention): string {
    const p = iv.properties;
    const parts = [({ speed: 'speed limit', sidewalk: 'sidewalk', close: 'closed', path: 'new foot path' } as Record<string, string>)[p.kind] ?? labelOf(p.kind)];
    if (p['street']) parts.push(`on ${String(p['street'])}`);
    if (p['side']) parts.push(`(${String(p['side'])} side${p['side'] === 'both' ? 's' : ''})`);
    if (p['speed_kmh']) parts.push(`→ ${String(p['speed_kmh'])} km/h`);
    if (p['guard_hours']) parts.push(String(p['guard_hours']));
    if (p.kind === 'path' && iv.geometry) parts.push(`${(iv.geometry.coordinates as unknown[]).length} points`);
    return parts.join(' ');
  }

  render() {
    const pick = $('scn-pick') as HTMLSelectElement;
    pick.replaceChildren(el('option', { value: '-1' }, 'Existing network (baseline)'), ...this.list.map((s, i) => el('option', { value: String(i) }, `${s.name} (${s.interventions.length})`)));
    pick.value = String(this.active);
    const s = this.list[this.active];
    ($('scn-name') as HTMLInputElement).value = s?.name ?? '';
    $('scn-edit').hidden = !s;
    ($('scn-undo') as HTMLButtonElement).disabled = !this.history.length;
    const items = (s?.interventions ?? []).map((iv, i) => {
      const rm = el('button', { type: 'button', class: 'link', title: 'remove this intervention', 'aria-label': `remove intervention ${i + 1}` }, '×');
      rm.addEventListener('click', () => this.remove(i));
      const origin = String(iv.properties['origin'] ?? 'proposal');
      const li = el('li', { class: `iv ${origin}` }, el('span', { class: 'n' }, String(i + 1)), el('span', { class: 'what' }, Scenarios.describe(iv)),
        origin !== 'proposal' ? el('span', { class: `badge ${origin}` }, origin === 'observation' ? 'observed on site' : 'from the planner') : null, rm);
      li.addEventListener('click', (e) => { if (e.target !== rm && iv.geometry) this.map.fit([iv as Feature], 18); });
      return li;
    });
    $('scn-list').replaceChildren(...(items.length ? items : [el('li', { class: 'muted small' }, s ? 'No interventions yet: choose a kind and click the map.' : 'The network as the layers give it. Add an intervention to start a scenario.')]));
    this.syncTool();
    this.map.setOverlay(this.overlay(), null);
  }
}
