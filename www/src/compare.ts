// Before and after: any two of the existing network and the scenarios, compared by the core
// (`compareAudits`, the same comparison as `catchwalk compare`); the page lays it out and
// draws a home's two routes.

import { $, el, fmt } from './dom';
import type { AuditMap } from './map';
import type { View } from './model';
import type { Feature } from './types';

interface Figures {
  children: number;
  children_in_walk_zone: number;
  children_safe_route: number;
  children_hazardous: number;
  mean_risk_per_trip: number | null;
  mean_active_minutes: number | null;
}

export interface Comparison {
  caution: string;
  catchments: { school_id: string; before: Figures; after: Figures; children_route_changed: number; children_gained_safe_route: number; children_lost_safe_route: number }[];
  homes_route_changed: string[];
  homes_gained_safe_route: string[];
  homes_lost_safe_route: string[];
  homes_only_before: string[];
  homes_only_after: string[];
}

export interface CompareEvents {
  /** The audit of option `i` (-1: the existing network), from the core. */
  auditOf: (i: number) => Promise<View>;
  compare: (beforeCsv: string, afterCsv: string) => Promise<Comparison>;
  options: () => { value: number; label: string }[];
  selectHome: (id: string) => void;
  /** A home's recommended route in an audit, asked of the worker (null: none). */
  recommended: (v: View, homeId: string) => Promise<Feature | null>;
}

const ROWS: [keyof Figures, string, (x: number | null) => string][] = [
  ['children_in_walk_zone', 'In the walk zone', (x) => fmt.n(x)],
  ['children_safe_route', 'With a safe route', (x) => fmt.n(x)],
  ['children_hazardous', 'On hazardous routes', (x) => fmt.n(x)],
  ['mean_risk_per_trip', 'Mean risk per trip', (x) => fmt.n(x, 2)],
  ['mean_active_minutes', 'Active minutes a day', (x) => fmt.n(x, 1)],
];

/** Whether an increase is good (true), bad (false) for a figure. */
const BETTER_UP: Record<keyof Figures, boolean | null> = {
  children: null, children_in_walk_zone: true, children_safe_route: true, children_hazardous: false, mean_risk_per_trip: false, mean_active_minutes: true,
};

export class Compare {
  last: { comparison: Comparison; before: string; after: string; names: Map<string, string> } | null = null;
  private views: [View, View] | null = null;
  private seq = 0;

  constructor(private map: AuditMap, private ev: CompareEvents) {
    for (const id of ['cmp-before', 'cmp-after']) $(id).addEventListener('change', () => this.run());
  }

  /** Refreshes the choices; `after` defaults to the scenario shown. */
  options(shown: number) {
    const opts = this.ev.options();
    for (const id of ['cmp-before', 'cmp-after']) {
      const sel = $(id) as HTMLSelectElement;
      const cur = sel.value;
      sel.replaceChildren(...opts.map((o) => el('option', { value: String(o.value) }, o.label)));
      if (opts.some((o) => String(o.value) === cur)) sel.value = cur;
    }
    const b = $('cmp-before') as HTMLSelectElement, a = $('cmp-after') as HTMLSelectElement;
    if (!opts.some((o) => String(o.value) === b.value) || b.value === '') b.value = '-1';
    a.value = String(shown);
  }

  async run() {
    const seq = ++this.seq;
    const bi = Number(($('cmp-before') as HTMLSelectElement).value);
    const ai = Number(($('cmp-after') as HTMLSelectElement).value);
    const out = $('cmp-out');
    const label = (i: number) => this.ev.options().find((o) => o.value === i)?.label ?? '';
    if (bi === ai) {
      out.replaceChildren(el('p', { class: 'muted small' }, 'Choose two different states to compare (a scenario against the existing network, or two scenarios).'));
      this.last = null;
      this.draw(null);
      return;
    }
    try {
      const before = await this.ev.auditOf(bi);
      const after = await this.ev.auditOf(ai);
      const c = await this.ev.compare(before.doc.homes_csv, after.doc.homes_csv);
      if (seq !== this.seq) return;
      this.views = [before, after];
      const names = new Map(after.catchments.map((x) => [x.schoolId, x.name || x.schoolId]));
      this.last = { comparison: c, before: label(bi), after: label(ai), names };
      out.replaceChildren(...comparisonElements(this.last, (id) => this.home(id)));
      document.body.dataset.compared = String(Number(document.body.dataset.compared ?? 0) + 1);
      this.draw(null);
    } catch (e) {
      if (seq !== this.seq) return;
      out.replaceChildren(el('p', { class: 'small error' }, (e as Error).message));
    }
  }

  /** Draws a home's recommended route before and after, and selects it. */
  home(id: string) {
    this.ev.selectHome(id);
    this.draw(id);
  }

  async draw(id: string | null) {
    const seq = ++this.drawSeq;
    if (!id || !this.views) { this.drawn = 0; this.map.showComparison([]); return; }
    const [b, a] = this.views;
    const [rb, ra] = await Promise.all([this.ev.recommended(b, id), this.ev.recommended(a, id)]).catch(() => [null, null]);
    if (seq !== this.drawSeq) return;
    const routes: Feature[] = [];
    if (rb) routes.push({ ...rb, properties: { kind: 'before' } } as Feature);
    if (ra) routes.push({ ...ra, properties: { kind: 'after' } } as Feature);
    this.drawn = routes.length;
    this.map.showComparison(routes);
  }

  private drawSeq = 0;

  /** How many comparison routes are drawn (for the tests). */
  drawn = 0;
}

/** The comparison as page (and report) elements; `onHome` makes home ids clickable. */
export function comparisonElements(r: NonNullable<Compare['last']>, onHome: ((id: string) => void) | null): HTMLElement[] {
  const c = r.comparison;
  const sum = (k: 'children_route_changed' | 'children_gained_safe_route' | 'children_lost_safe_route') => c.catchments.reduce((a, x) => a + x[k], 0);
  const row = (k: keyof Figures, label: string, b: number | null, a: number | null, f: (x: number | null) => string) => {
    const d = a !== null && b !== null ? a - b : null;
    const same = d === null || Math.abs(d) < 1e-9;
    const good = same || BETTER_UP[k] === null ? '' : (d > 0) === BETTER_UP[k] ? 'better' : 'worse';
    return el('tr', { 'data-figure': k }, el('td', {}, label), el('td', {}, f(b)), el('td', {}, f(a)), el('td', { class: good }, same ? '' : `${d > 0 ? '+' : '−'}${f(Math.abs(d))}`));
  };
  const same = (x: Comparison['catchments'][number]) => x.children_route_changed === 0 && ROWS.every(([k]) => x.before[k] === x.after[k]);
  const changed = c.catchments.filter((x) => !same(x));
  const unchanged = c.catchments.filter(same).map((x) => r.names.get(x.school_id) ?? x.school_id);
  const table = el('table', { class: 'figures cmp', id: 'cmp-table' },
    el('thead', {}, el('tr', {}, el('th', {}, 'Children / figure'), el('th', {}, 'Before'), el('th', {}, 'After'), el('th', {}, 'Change'))),
    ...changed.map((x) => el('tbody', { 'data-school': x.school_id },
      el('tr', { class: 'group' }, el('th', { colspan: '4' }, r.names.get(x.school_id) ?? x.school_id,
        el('span', { class: 'small muted' }, ` · ${fmt.n(x.children_gained_safe_route)} gain, ${fmt.n(x.children_lost_safe_route)} lose a safe route; ${fmt.n(x.children_route_changed)} change route`))),
      ...ROWS.map(([k, l, f]) => row(k, l, x.before[k], x.after[k], f)))));
  const homes = (ids: string[], what: string) => {
    if (!ids.length) return null;
    const shown = ids.slice(0, 40);
    return el('div', { class: 'cmp-homes' }, el('span', { class: 'small' }, `${what}: `),
      ...shown.map((id) => {
        if (!onHome) return el('span', { class: 'hid' }, id);
        const b = el('button', { type: 'button', class: 'chip', title: 'show this home and its route before and after' }, id);
        b.addEventListener('click', () => onHome(id));
        return b;
      }), ids.length > shown.length ? el('span', { class: 'small muted' }, ` and ${ids.length - shown.length} more`) : null);
  };
  return [
    el('p', { class: 'small', id: 'cmp-summary' },
      `${r.after} against ${r.before}: `,
      el('strong', {}, `${fmt.n(sum('children_gained_safe_route'))} children gain a safe route`),
      `, ${fmt.n(sum('children_lost_safe_route'))} lose one; the route changes for ${fmt.n(sum('children_route_changed'))} children in ${c.homes_route_changed.length} homes.`),
    changed.length ? table : el('p', { class: 'small' }, 'No catchment’s figures change.'),
    unchanged.length ? el('p', { class: 'small muted', id: 'cmp-unchanged' }, `Unchanged: ${unchanged.join(', ')}.`) : el('span'),
    homes(c.homes_gained_safe_route, 'Homes gaining a safe route') ?? el('span'),
    homes(c.homes_lost_safe_route, 'Homes losing a safe route') ?? el('span'),
    homes(c.homes_route_changed, 'Homes whose route changed') ?? el('p', { class: 'small muted' }, 'No home’s route changes.'),
    el('p', { class: 'small muted' }, onHome ? 'Click a home: its route before (wide, grey) and after (dashed, green) are drawn. ' + c.caution : c.caution),
  ];
}
