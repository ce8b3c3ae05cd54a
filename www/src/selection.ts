// The selection panel: a home's two routes side by side, or a catchment's figures.

import { el, fmt } from './dom';
import type { CatchmentView, HomeView, Routes, View } from './model';
import { DEVICES } from './palette';
import type { RouteProps } from './types';

const deviceLabel = (k: string) => DEVICES.find((d) => d.key === k)?.label ?? k;

/** A soft hyphen inside words too long for a third of the panel: at a laptop's 1366 px the
 * three routes' columns are about 75 px wide, and a long word would push the last one out. */
const breakable = (s: string) => s.replace('uncontrolled', 'un\u00adcontrolled').replace('Recommended', 'Recom\u00admended');

function crossingsText(r: RouteProps | undefined): string {
  if (!r) return '–';
  const parts = Object.entries(r.crossings_by_device ?? {}).map(([k, n]) => `${n} ${breakable(deviceLabel(k))}`);
  return parts.length ? parts.join('; ') : 'none';
}

type Row = [string, (r: RouteProps | undefined) => string];

const ROWS: Row[] = [
  ['Network length', (r) => fmt.m(r?.network_m)],
  ['Walked (with crossings)', (r) => fmt.m(r?.walked_m)],
  ['Walking time', (r) => fmt.min(r?.walking_time_min)],
  ['Crossings', (r) => (r ? String(r.crossings) : '–')],
  ['… by control', crossingsText],
  ['Uncontrolled crossings', (r) => (r ? String(r.uncontrolled_crossings) : '–')],
  ['Arterial crossings', (r) => (r ? String(r.arterial_crossings) : '–')],
  ['Beside arterials', (r) => fmt.m(r?.arterial_exposure_m)],
  ['Beside traffic ≤30 km/h', (r) => fmt.m(r?.along_le30_m)],
  ['Beside traffic 31–50 km/h', (r) => fmt.m(r?.along_31_50_m)],
  ['Beside traffic >50 km/h', (r) => fmt.m(r?.along_gt50_m)],
  ['No sidewalk', (r) => fmt.m(r?.no_sidewalk_m)],
  ['Risk per trip (points)', (r) => (r ? r.risk.toFixed(3) : '–')],
];

const STATUS_TEXT: Record<string, string> = {
  safe: 'Has a safe route',
  unsafe: 'No safe route',
  hazardous: 'Hazardous: no safe route',
  beyond: 'Beyond the walk zone',
  unreached: 'No route found',
};

/** A home's panel; `routes` are its three routes as the worker drew them. */
export function homePanel(view: View, h: HomeView, routes: Routes): HTMLElement {
  const s = routes.shortest?.properties;
  const r = routes.recommended?.properties;
  const sf = routes.safe?.properties;
  const school = view.doc.layers.schools.find((x) => x.id === h.schoolId);
  const table = el(
    'table',
    { class: 'figures', id: 'home-figures' },
    el('thead', {}, el('tr', {}, el('th', {}, ''), el('th', { class: 'k-short' }, 'Shortest'), el('th', { class: 'k-rec' }, breakable('Recommended')),
      el('th', { class: 'k-safe' }, 'Safe'))),
    el('tbody', {}, ...ROWS.map(([label, f]) => el('tr', { 'data-row': label }, el('th', {}, label), el('td', {}, f(s)), el('td', {}, f(r)),
      el('td', {}, sf ? f(sf) : '–')))),
  );
  const verdict = el(
    'div',
    { class: `verdict v-${h.status}`, id: 'home-verdict' },
    el('strong', {}, STATUS_TEXT[h.status] ?? h.status),
    h.reasons.length ? el('ul', {}, ...h.reasons.map((x) => el('li', {}, x))) : null,
  );
  // Rules that would fire but for a fact the layers lack: the core lists what to check.
  const checks = Array.isArray(r?.['site_checks']) ? (r?.['site_checks'] as unknown[]).map(String) : [];
  const siteChecks = checks.length
    ? el('div', { class: 'verdict', id: 'home-site-checks' }, el('strong', {}, 'To check on site (candidate, not counted hazardous)'),
      el('ul', {}, ...checks.map((x) => el('li', {}, x))))
    : null;
  return el(
    'div',
    {},
    el('h3', {}, `Home ${h.id}`),
    el('p', { class: 'muted' }, `${h.children} child${h.children === 1 ? '' : 'ren'} · school ${school?.name ?? h.schoolId ?? '–'}`),
    verdict,
    siteChecks,
    el('p', { class: 'small muted' }, 'A home has a safe route when the shortest route that no rule of the rule set flags lies inside the walk zone (rules in Settings).'),
    table,
    dailyTable(h),
    !sf ? el('p', { class: 'small muted' }, 'No route to the school avoids every rule of the rule set.') : null,
    el('p', { class: 'small muted' }, 'Dashed dark line: shortest route. Blue line: recommended route (length plus risk, within the detour cap). Wide pale green band: safe route, the shortest that no rule flags.'),
  );
}

/** The core's per-home score columns (homes.csv), when the core scores routes. */
function dailyTable(h: HomeView): HTMLElement | null {
  const r = h.row;
  if (!('active_minutes' in r) || r['active_minutes'] === '') return null;
  const n = (k: string) => Number(r[k]);
  const rows: [string, string][] = [
    ['Active minutes a day (two trips)', fmt.min(n('active_minutes'))],
    ['Share of the 60 daily minutes (WHO 2020)', fmt.pct(n('guideline_share'))],
    ['Energy a day', `${Math.round(n('energy_kcal'))} kcal`],
    ['Longest wait at an uncontrolled crossing', r['longest_wait_s'] ? `${Math.round(n('longest_wait_s'))} s${r['longest_wait_los'] ? ` (level of service ${r['longest_wait_los']})` : ''}` : '–'],
  ];
  return el('table', { class: 'figures', id: 'home-daily' },
    el('thead', {}, el('tr', {}, el('th', { colspan: '2' }, 'Recommended route, every school day'))),
    el('tbody', {}, ...rows.map(([k, v]) => el('tr', {}, el('th', {}, k), el('td', {}, v)))));
}

export function catchmentPanel(view: View, c: CatchmentView): HTMLElement {
  const rows: [string, string][] = [
    ['Homes', String(c.homes)],
    ['Children', String(c.children)],
    ['In the walk zone', `${c.inZone} (${fmt.pct(c.inZoneShare)})`],
    ['With a safe route', `${c.safe} (${fmt.pct(c.safeShare)})`],
    ['Deficit (walk zone − safe)', fmt.pct(c.deficit)],
    ['On hazardous routes', c.hazardous === null ? '–' : String(c.hazardous)],
    ['Balance', c.quadrant ? c.quadrant.replace(/_/g, ' ') : '–'],
    ['Active minutes a day (two trips)', fmt.min(c.activeMin)],
    ['Risk per trip (points)', fmt.n(c.riskPerTrip, 3)],
    ['Mean shortest route', fmt.m(c.meanShortestM)],
    ['Mean uncontrolled crossings', fmt.n(c.meanUncontrolled, 2)],
  ];
  return el(
    'div',
    {},
    el('h3', {}, `Catchment of ${c.name || c.schoolId}`),
    el('p', { class: 'muted' }, `Walk zone ${view.walkZoneM} m. Recommended routes of its homes are drawn on the map.`),
    el('table', { class: 'figures', id: 'catchment-figures' }, el('tbody', {}, ...rows.map(([k, v]) => el('tr', {}, el('th', {}, k), el('td', {}, v))))),
  );
}

/** The district at a glance, shown while nothing is selected. */
export function districtPanel(view: View): HTMLElement {
  const kids = view.homes.reduce((a, h) => a + h.children, 0);
  const by = (st: string) => view.homes.filter((h) => h.status === st).reduce((a, h) => a + h.children, 0);
  const share = (n: number) => (kids ? ` (${Math.round((100 * n) / kids)} %)` : '');
  const rows: [string, string][] = [
    ['Schools', String(view.catchments.length)],
    ['Homes / children', `${view.homes.length} / ${kids}`],
    ['Children with a safe route', `${by('safe')}${share(by('safe'))}`],
    ['In the walk zone, no safe route', `${by('unsafe') + by('hazardous')}${share(by('unsafe') + by('hazardous'))}`],
    ['… of them on a hazardous route', `${by('hazardous')}`],
    ['Beyond the walk zone', `${by('beyond')}${share(by('beyond'))}`],
    ['No route found', `${by('unreached')}`],
  ];
  const worst = [...view.catchments].filter((c) => c.deficit !== null).sort((a, b) => (b.deficit ?? 0) - (a.deficit ?? 0))[0];
  return el('div', { id: 'district' },
    el('h3', {}, 'The district at a glance'),
    el('p', { class: 'muted' }, `Walk zone ${view.walkZoneM} m. Click a home or a catchment on the map, or a row of the Catchments tab.`),
    el('table', { class: 'figures' }, el('tbody', {}, ...rows.map(([k, v]) => el('tr', {}, el('th', {}, k), el('td', {}, v))))),
    worst && (worst.deficit ?? 0) > 0
      ? el('p', {}, `Largest deficit: ${worst.name || worst.schoolId}, ${Math.round((worst.deficit ?? 0) * 100)} % of its children live in the walk zone without a safe route.`)
      : null);
}
