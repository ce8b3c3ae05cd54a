// The find box: a street, a school, a home or a crossing by its name or id, with suggestions
// as the planner types; arrow keys move through them, Enter picks, Escape closes.

import { el } from './dom';
import type { View } from './model';
import type { Feature, FeatureCollection } from './types';

export type FoundKind = 'street' | 'school' | 'home' | 'crossing';

export interface Found {
  kind: FoundKind;
  /** The school, home or crossing id, or the street's name. */
  key: string;
  label: string;
  features: Feature[];
}

const KIND_LABEL: Record<FoundKind, string> = { street: 'street', school: 'school', home: 'home', crossing: 'crossing' };
const point = (at: [number, number]): Feature => ({ type: 'Feature', geometry: { type: 'Point', coordinates: at }, properties: {} });

/** Everything the box can find in one audit: streets by name, schools, homes and crossings. */
export function findIndex(view: View, streetNames: FeatureCollection): Found[] {
  const streets = new Map<string, Feature[]>();
  for (const f of streetNames.features) {
    const name = String(f.properties['name']);
    streets.set(name, [...(streets.get(name) ?? []), f]);
  }
  const out: Found[] = [...streets].map(([name, features]) => ({ kind: 'street', key: name, label: name, features }));
  for (const s of view.doc.layers.schools)
    if (s.entrances[0]) out.push({ kind: 'school', key: s.id, label: s.name ? `${s.name} (${s.id})` : s.id, features: s.entrances.map(point) });
  for (const c of view.doc.layers.crossings) out.push({ kind: 'crossing', key: c.id, label: c.id, features: [point(c.at)] });
  for (const h of view.homes) out.push({ kind: 'home', key: h.id, label: h.id, features: [point(h.at)] });
  return out;
}

/** The best few entries for what was typed: whole-word and prefix matches first. */
export function suggest(index: Found[], typed: string, max = 8): Found[] {
  const q = typed.trim().toLowerCase();
  if (!q) return [];
  const rank = (f: Found) => {
    const l = f.label.toLowerCase();
    if (l === q || f.key.toLowerCase() === q) return 0;
    if (l.startsWith(q) || f.key.toLowerCase().startsWith(q)) return 1;
    if (l.split(/[\s(),-]+/).some((w) => w.startsWith(q))) return 2;
    return l.includes(q) ? 3 : 9;
  };
  return index.map((f) => [rank(f), f] as const).filter(([r]) => r < 9).sort((a, b) => a[0] - b[0] || a[1].label.localeCompare(b[1].label)).slice(0, max).map(([, f]) => f);
}

/** Wires the box: `input` and its suggestion `list`; `onPick` gets the entry chosen. */
export class FindBox {
  private index: Found[] = [];
  private shown: Found[] = [];
  private active = -1;

  constructor(private input: HTMLInputElement, private list: HTMLElement, private onPick: (f: Found) => void) {
    input.addEventListener('input', () => this.update());
    input.addEventListener('keydown', (e) => this.key(e));
    input.addEventListener('blur', () => window.setTimeout(() => this.close(), 150));
  }

  setIndex(index: Found[]) {
    this.index = index;
    this.input.disabled = !index.length;
    this.input.placeholder = index.length ? 'Find a street, school…' : 'Find: run an audit first';
  }

  private update() {
    this.shown = suggest(this.index, this.input.value);
    this.active = this.shown.length ? 0 : -1;
    this.render();
  }

  private render() {
    this.list.hidden = !this.shown.length && !this.input.value.trim();
    this.list.replaceChildren(...(this.shown.length ? this.shown.map((f, i) => {
      const li = el('li', { role: 'option', id: `find-opt-${i}`, 'aria-selected': String(i === this.active), class: i === this.active ? 'on' : '' },
        el('span', { class: 'fkind' }, KIND_LABEL[f.kind]), el('span', {}, f.label));
      li.addEventListener('mousedown', (e) => { e.preventDefault(); this.pick(f); });
      return li;
    }) : [el('li', { class: 'muted' }, 'nothing by that name or id')]));
    if (this.active >= 0) this.input.setAttribute('aria-activedescendant', `find-opt-${this.active}`);
    else this.input.removeAttribute('aria-activedescendant');
    this.input.setAttribute('aria-expanded', String(!this.list.hidden));
  }

  private key(e: KeyboardEvent) {
    if (e.key === 'ArrowDown' || e.key === 'ArrowUp') {
      if (!this.shown.length) return;
      e.preventDefault();
      this.active = (this.active + (e.key === 'ArrowDown' ? 1 : this.shown.length - 1)) % this.shown.length;
      this.render();
    } else if (e.key === 'Enter') {
      e.preventDefault();
      const f = this.shown[this.active] ?? suggest(this.index, this.input.value, 1)[0];
      if (f) this.pick(f);
    } else if (e.key === 'Escape') {
      this.close();
    }
  }

  private pick(f: Found) {
    this.input.value = f.label;
    this.close();
    this.onPick(f);
  }

  private close() {
    this.shown = [];
    this.active = -1;
    this.list.hidden = true;
    this.input.setAttribute('aria-expanded', 'false');
  }
}
