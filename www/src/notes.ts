// Site-visit notes: dropped on a crossing, a street side or a point; the core's checklist,
// free text, photos scaled down in the page, and an observed correction that a scenario can
// take as an intervention (marked as coming from an observation).

import { $, download, el } from './dom';
import { snapToLine } from './geometry';
import type { AuditMap, Pick } from './map';
import type { View } from './model';
import { CHECKS, emptyChecklist, notesGeojson, readNotesGeojson, type Check, type Intervention, type Note, type Photo } from './project';
import type { Feature, FeatureCollection } from './types';

/** Photos are kept at most this many pixels on their long side, as JPEG. */
export const PHOTO_MAX_PX = 1280;
const PHOTO_QUALITY = 0.85;

/** Corrections a note can record, as intervention kinds of the core. */
const OBSERVED: { kind: string; label: string }[] = [
  { kind: '', label: 'nothing: the layers are right here' },
  { kind: 'guard', label: 'a crossing guard stands here (hours)' },
  { kind: 'signal', label: 'there is a signal here' },
  { kind: 'stop', label: 'there is a stop sign here' },
  { kind: 'yield', label: 'there is a yield sign here' },
  { kind: 'marked', label: 'the crossing is marked' },
  { kind: 'refuge', label: 'there is a refuge island' },
  { kind: 'sidewalk', label: 'there is a sidewalk on this side' },
  { kind: 'speed', label: 'the posted speed is different (km/h)' },
  { kind: 'close', label: 'this street or path is closed' },
];

export interface NoteEvents {
  changed: () => void;
  view: () => View | null;
  status: (text: string) => void;
  /** A segment of the shown audit's centrelines by its index (the worker holds them). */
  segment: (i: number) => Promise<Feature | null>;
  /** Another tool must let go of the map. */
  takeMap: () => void;
  /** The note's correction goes into the scenario shown. */
  observe: (iv: Intervention) => void;
  showTab: () => void;
}

/** A photo file scaled to at most PHOTO_MAX_PX on its long side, as JPEG bytes (base64). */
export async function scalePhoto(file: Blob): Promise<{ bytes: string; width: number; height: number }> {
  const bmp = await createImageBitmap(file);
  const k = Math.min(1, PHOTO_MAX_PX / Math.max(bmp.width, bmp.height));
  const w = Math.max(1, Math.round(bmp.width * k)), h = Math.max(1, Math.round(bmp.height * k));
  const c = document.createElement('canvas');
  c.width = w; c.height = h;
  const g = c.getContext('2d');
  if (!g) throw new Error('this browser cannot draw the photo');
  g.fillStyle = '#fff';
  g.fillRect(0, 0, w, h);
  g.drawImage(bmp, 0, 0, w, h);
  bmp.close();
  const blob = await new Promise<Blob | null>((r) => c.toBlob(r, 'image/jpeg', PHOTO_QUALITY));
  if (!blob) throw new Error('this browser could not encode the photo');
  const buf = new Uint8Array(await blob.arrayBuffer());
  let bin = '';
  for (let i = 0; i < buf.length; i += 0x8000) bin += String.fromCharCode(...buf.subarray(i, i + 0x8000));
  return { bytes: btoa(bin), width: w, height: h };
}

export const photoUrl = (p: Photo) => `data:${p.media_type};base64,${p.bytes}`;

export class Notes {
  notes: Note[] = [];
  photos: Photo[] = [];
  open: string | null = null;
  private armed = false;

  constructor(private map: AuditMap, private ev: NoteEvents) {
    $('note-arm').addEventListener('click', () => this.arm(!this.armed));
    $('note-export').addEventListener('click', () => download('site-notes.geojson', JSON.stringify(notesGeojson(this.notes), null, 1), 'application/geo+json'));
    const imp = $<HTMLInputElement>('note-import');
    imp.addEventListener('change', async () => {
      const f = imp.files?.[0];
      imp.value = '';
      if (!f) return;
      try {
        const got = readNotesGeojson(await f.text());
        const have = new Set(this.notes.map((n) => n.id));
        for (const n of got) { while (have.has(n.id)) n.id = `${n.id}-b`; have.add(n.id); this.notes.push(n); }
        this.ev.status(`${got.length} notes read from ${f.name}.`);
        this.render();
        this.ev.changed();
      } catch (e) {
        this.ev.status(`${f.name}: ${(e as Error).message}`);
      }
    });
    this.render();
  }

  set(notes: Note[], photos: Photo[]) {
    this.notes = notes;
    this.photos = photos;
    this.open = null;
    this.render();
  }

  arm(on: boolean) {
    if (on) this.ev.takeMap();
    this.armed = on;
    this.map.onPick = on ? (p) => { this.drop(p).catch((e: Error) => this.ev.status(`The note could not be placed: ${e.message}`)); } : null;
    this.map.armed(on);
    $('note-arm').textContent = on ? 'Click the map…' : 'Drop a note';
    $('note-arm').classList.toggle('tool-on', on);
  }

  disarm() {
    if (this.armed) { this.armed = false; $('note-arm').textContent = 'Drop a note'; $('note-arm').classList.remove('tool-on'); }
  }

  private async drop(p: Pick) {
    this.arm(false);
    const seg = p.segment !== null ? await this.ev.segment(p.segment) : null;
    let note: Note;
    const id = `n${Date.now().toString(36)}`;
    const base = { id, checklist: emptyChecklist(), text: '', photos: [], visited: new Date().toISOString().slice(0, 16), observed: null };
    if (p.crossing) note = { ...base, at: p.crossing.at, target: { on: 'crossing', crossing: p.crossing.id } };
    else if (seg) {
      const s = snapToLine(seg, p.at);
      note = { ...base, at: p.at, target: { on: 'street_side', street: String(seg.properties['street_id'] ?? ''), side: s?.side ?? 'left' } };
    } else note = { ...base, at: p.at, target: { on: 'point' } };
    this.notes.push(note);
    this.open = id;
    this.render();
    this.ev.changed();
    this.ev.showTab();
  }

  show(id: string) {
    this.open = id;
    this.render();
    this.ev.showTab();
  }

  static where(n: Note): string {
    const t = n.target;
    if (t.on === 'crossing') return t.crossing ? `crossing ${t.crossing}` : 'a crossing';
    if (t.on === 'street_side') return `${t.street}, ${t.side} side`;
    return `a point (${n.at[0].toFixed(5)}, ${n.at[1].toFixed(5)})`;
  }

  overlay(): FeatureCollection {
    return {
      type: 'FeatureCollection',
      features: this.notes.map((n, i) => ({ type: 'Feature', geometry: { type: 'Point', coordinates: n.at }, properties: { id: n.id, label: String(i + 1), open: n.id === this.open } })),
    };
  }

  /** The intervention a note's observed correction stands for. */
  static intervention(n: Note): Intervention | null {
    if (!n.observed || !n.observed['kind']) return null;
    return { type: 'Feature', geometry: { type: 'Point', coordinates: n.at }, properties: { ...n.observed, kind: String(n.observed['kind']), origin: 'observation', id: `note-${n.id}`, note: n.text } };
  }

  render() {
    this.renderList();
    this.editor();
  }

  /** The list and the map's dots (the editor stays as it is, with the focus in it). */
  private renderList() {
    const list = this.notes.map((n, i) => {
      const li = el('li', { class: `note-item${n.id === this.open ? ' on' : ''}`, 'data-note': n.id },
        el('span', { class: 'n' }, String(i + 1)), el('span', { class: 'what' }, `${Notes.where(n)}${n.text ? ` — ${n.text.slice(0, 40)}` : ''}`),
        n.photos.length ? el('span', { class: 'badge' }, `${n.photos.length} photo${n.photos.length > 1 ? 's' : ''}`) : null,
        n.observed?.['kind'] ? el('span', { class: 'badge observation' }, 'correction') : null);
      li.addEventListener('click', () => { this.show(n.id); this.map.fit([{ type: 'Feature', geometry: { type: 'Point', coordinates: n.at }, properties: {} }], 18); });
      return li;
    });
    $('note-list').replaceChildren(...(list.length ? list : [el('li', { class: 'muted small' }, 'No notes yet.')]));
    ($('note-export') as HTMLButtonElement).disabled = !this.notes.length;
    this.map.setOverlay(null, this.overlay()).catch(() => {});
  }

  private editor() {
    const host = $('note-editor');
    const n = this.notes.find((x) => x.id === this.open);
    if (!n) { host.replaceChildren(el('p', { class: 'muted' }, 'Drop a note on the map (left, “Site-visit notes”), or click a note’s yellow dot.')); return; }
    const save = () => this.ev.changed();
    const checks = CHECKS.map(([k, label]) => {
      const sel = el('select', { 'data-check': k }, ...(['not_checked', 'ok', 'problem'] as Check[]).map((c) => el('option', { value: c }, c === 'not_checked' ? '–' : c === 'ok' ? 'fine' : 'problem'))) as HTMLSelectElement;
      sel.value = String(n.checklist[k]);
      sel.addEventListener('change', () => { (n.checklist as unknown as Record<string, unknown>)[k] = sel.value; save(); });
      return el('label', { class: 'setting' }, el('span', {}, label), sel);
    });
    const speed = el('input', { type: 'number', min: '0', step: '1', id: 'note-speed', value: n.checklist.observed_speed_kmh === null ? '' : String(n.checklist.observed_speed_kmh) }) as HTMLInputElement;
    speed.addEventListener('change', () => { n.checklist.observed_speed_kmh = speed.value === '' || !isFinite(Number(speed.value)) ? null : Number(speed.value); save(); });
    const guard = el('select', { id: 'note-guard' }, el('option', { value: '' }, 'not noted'), el('option', { value: 'yes' }, 'yes'), el('option', { value: 'no' }, 'no')) as HTMLSelectElement;
    guard.value = n.checklist.crossing_guard_seen === null ? '' : n.checklist.crossing_guard_seen ? 'yes' : 'no';
    guard.addEventListener('change', () => { n.checklist.crossing_guard_seen = guard.value === '' ? null : guard.value === 'yes'; save(); });
    const text = el('textarea', { id: 'note-text', rows: '4', placeholder: 'What you saw: sight lines, where children actually cross, what drivers do…' }) as HTMLTextAreaElement;
    text.value = n.text;
    text.addEventListener('input', () => { n.text = text.value; save(); });
    text.addEventListener('change', () => this.renderList());
    const visited = el('input', { type: 'datetime-local', id: 'note-visited', value: n.visited ?? '' }) as HTMLInputElement;
    visited.addEventListener('change', () => { n.visited = visited.value || null; save(); });
    const pics = n.photos.map((name) => {
      const ph = this.photos.find((p) => p.name === name);
      const rm = el('button', { type: 'button', class: 'link', title: 'remove this photo', 'aria-label': `remove photo ${name}` }, '×');
      rm.addEventListener('click', () => {
        n.photos = n.photos.filter((x) => x !== name);
        this.photos = this.photos.filter((p) => p.name !== name);
        this.render();
        save();
      });
      return el('figure', { class: 'photo' }, ph ? el('img', { src: photoUrl(ph), alt: `photo ${name}` }) : el('span', { class: 'muted small' }, 'missing'), rm);
    });
    const file = el('input', { type: 'file', accept: 'image/*', multiple: '', id: 'note-photo', class: 'visually-hidden' }) as HTMLInputElement;
    file.addEventListener('change', async () => {
      for (const f of Array.from(file.files ?? [])) {
        try {
          const s = await scalePhoto(f);
          let k = n.photos.length + 1;
          while (this.photos.some((p) => p.name === `${n.id}-${k}.jpg`)) k++;
          const name = `${n.id}-${k}.jpg`;
          this.photos.push({ name, media_type: 'image/jpeg', bytes: s.bytes });
          n.photos.push(name);
        } catch (e) {
          this.ev.status(`${f.name}: not a photo this browser can read (${(e as Error).message}).`);
        }
      }
      this.render();
      save();
    });
    const obs = el('select', { id: 'note-observed' }, ...OBSERVED.map((o) => el('option', { value: o.kind }, o.label))) as HTMLSelectElement;
    obs.value = String(n.observed?.['kind'] ?? '');
    const extra = el('input', { type: 'text', id: 'note-observed-value', placeholder: '07:45-08:15' }) as HTMLInputElement;
    const syncExtra = () => {
      const k = obs.value;
      extra.hidden = k !== 'guard' && k !== 'speed';
      extra.placeholder = k === 'speed' ? 'km/h' : '07:45-08:15';
      extra.value = String(n.observed?.[k === 'speed' ? 'speed_kmh' : 'guard_hours'] ?? '');
    };
    const setObserved = () => {
      const k = obs.value;
      const street = n.target.on === 'street_side' ? n.target.street : undefined;
      if (!k) n.observed = null;
      else if (k === 'guard') { n.observed = { kind: k, guard_hours: extra.value.trim() || '07:45-08:15' }; extra.value = String(n.observed['guard_hours']); }
      else if (k === 'speed') n.observed = { kind: k, street, speed_kmh: Number(extra.value) || 30 };
      else if (k === 'sidewalk') n.observed = { kind: k, street, side: n.target.on === 'street_side' ? n.target.side : 'both' };
      else if (k === 'close') n.observed = { kind: k, street };
      else n.observed = { kind: k };
      take.disabled = !n.observed;
      this.renderList();
      save();
    };
    obs.addEventListener('change', () => { syncExtra(); setObserved(); });
    extra.addEventListener('change', setObserved);
    syncExtra();
    const take = el('button', { type: 'button', id: 'note-take' }, 'Take into the scenario shown') as HTMLButtonElement;
    take.disabled = !n.observed;
    take.addEventListener('click', () => {
      const iv = Notes.intervention(n);
      if (!iv) return;
      if ((iv.properties['kind'] === 'speed' || iv.properties['kind'] === 'sidewalk' || iv.properties['kind'] === 'close') && !iv.properties['street']) {
        this.ev.status('This correction changes a street: drop the note on the street itself.');
        return;
      }
      this.ev.observe(iv);
    });
    const del = el('button', { type: 'button', id: 'note-delete' }, 'Delete note');
    del.addEventListener('click', () => {
      this.photos = this.photos.filter((p) => !n.photos.includes(p.name));
      this.notes = this.notes.filter((x) => x !== n);
      this.open = null;
      this.render();
      save();
    });
    host.replaceChildren(
      el('h3', {}, `Note ${this.notes.indexOf(n) + 1}: ${Notes.where(n)}`),
      el('label', { class: 'setting' }, el('span', {}, 'Visited'), visited),
      el('fieldset', { class: 'checklist' }, el('legend', {}, 'Checklist'), ...checks,
        el('label', { class: 'setting' }, el('span', {}, 'Driver speed seen (km/h)'), speed),
        el('label', { class: 'setting' }, el('span', {}, 'Crossing guard seen'), guard)),
      text,
      el('div', { class: 'photos', id: 'note-photos' }, ...pics, el('label', { for: 'note-photo', class: 'pick' }, 'add photos…'), file),
      el('p', { class: 'small muted' }, `Photos are scaled to ${PHOTO_MAX_PX} px and kept in the project on this computer.`),
      el('fieldset', { class: 'observed' }, el('legend', {}, 'What the layers got wrong'), obs, extra, take,
        el('p', { class: 'small muted' }, 'Taken into a scenario, the correction is audited as an intervention marked “observed on site”.')),
      el('div', { class: 'row' }, del),
    );
  }
}
