// The catchment table: sortable by any column.

import { el, fmt } from './dom';
import type { CatchmentView } from './model';

/** A school's name without the trailing kind of school, for narrow tables. */
export const shortName = (n: string) => n.replace(/ (Elementary|Secondary|Middle|High|Primary)? ?School$/i, '') || n;

type Col = { key: keyof CatchmentView; label: string; show: (c: CatchmentView) => string };

export const COLUMNS: Col[] = [
  { key: 'name', label: 'School', show: (c) => shortName(c.name || c.schoolId) },
  { key: 'children', label: 'Children', show: (c) => String(c.children) },
  { key: 'inZoneShare', label: 'In walk zone', show: (c) => fmt.pct(c.inZoneShare) },
  { key: 'safeShare', label: 'Safe route', show: (c) => fmt.pct(c.safeShare) },
  { key: 'deficit', label: 'Deficit', show: (c) => fmt.pct(c.deficit) },
  { key: 'activeMin', label: 'Active min/day', show: (c) => fmt.n(c.activeMin, 1) },
  { key: 'riskPerTrip', label: 'Risk/trip', show: (c) => fmt.n(c.riskPerTrip, 2) },
  { key: 'meanShortestM', label: 'Mean route', show: (c) => fmt.m(c.meanShortestM) },
];

export class CatchmentTable {
  private sortKey: keyof CatchmentView = 'deficit';
  private desc = true;
  private rows: CatchmentView[] = [];

  constructor(private host: HTMLElement, private onPick: (schoolId: string) => void) {}

  set(rows: CatchmentView[]) {
    this.rows = rows;
    this.render();
  }

  private render() {
    const k = this.sortKey;
    const sorted = [...this.rows].sort((a, b) => {
      const x = a[k], y = b[k];
      const r = typeof x === 'string' || typeof y === 'string' ? String(x).localeCompare(String(y)) : (Number(x ?? -Infinity) - Number(y ?? -Infinity));
      return this.desc ? -r : r;
    });
    const head = el('tr', {}, ...COLUMNS.map((c) => {
      const th = el('th', { 'data-key': String(c.key), class: c.key === k ? (this.desc ? 'sorted desc' : 'sorted asc') : '', tabindex: '0',
        'aria-sort': c.key === k ? (this.desc ? 'descending' : 'ascending') : 'none' }, c.label);
      th.addEventListener('keydown', (e) => { if (e.key === 'Enter') th.click(); });
      th.addEventListener('click', () => {
        if (this.sortKey === c.key) this.desc = !this.desc;
        else { this.sortKey = c.key; this.desc = c.key !== 'name'; }
        this.render();
      });
      return th;
    }));
    const body = sorted.map((r) => {
      const tr = el('tr', { 'data-school': r.schoolId, title: r.name, tabindex: '0' }, ...COLUMNS.map((c) => el('td', {}, c.show(r))));
      tr.addEventListener('click', () => this.onPick(r.schoolId));
      tr.addEventListener('keydown', (e) => { if (e.key === 'Enter') this.onPick(r.schoolId); });
      return tr;
    });
    this.host.replaceChildren(
      el('table', { class: 'sortable', id: 'catchment-table' }, el('thead', {}, head), el('tbody', {}, ...body)),
      el('p', { class: 'small muted' }, 'Click a column to sort, a row to show the catchment. Deficit: share of children in the walk zone without a safe route — the gap infrastructure must close.'),
    );
  }
}
