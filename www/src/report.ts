// The printable report: map, tables, charts, methods, sources and cautions, for the district
// or one catchment. Shown in place of the page under the print stylesheet.

import { el, fmt } from './dom';
import type { View } from './model';
import { COLUMNS } from './table';

const SOURCES = [
  'Walking time and active minutes at 1.22 m/s (4.0 ft/s): the Highway Capacity Manual walking speed for pedestrians where few are elderly, and the design speed Knoblauch et al. 1996 recommend for pedestrians under 65 (both from memory; not a child-specific figure). Crossing times and waits at 1.07 m/s (3.5 ft/s), the signal-timing design value.',
  'Daily activity: WHO 2020 guidelines on physical activity and sedentary behaviour — an average of 60 minutes a day of moderate-to-vigorous activity for ages 5–17. Counting every walking minute towards it assumes the walk is of moderate intensity (our assumption).',
  'Our assumptions, from no source: exposure beside a street without sidewalk grows linearly with its traffic, without bound; the crossing exposure uses the HCM probability of meeting traffic, which saturates at 7.3 times the reference crossing on busy roads.',
  'Waiting at uncontrolled crossings: Highway Capacity Manual gap-acceptance method for pedestrians at unsignalised crossings.',
  'Severity against vehicle speed: published logistic fits of pedestrian fatality risk (see the core documentation for the table in use and its source).',
  'Street network, crossings, schools, homes and catchments: the layers loaded by the planner (listed below).',
];

export interface ReportInput {
  view: View;
  scope: string | null;
  mapImage: string;
  charts: Record<string, string>;
  files: Record<string, string>;
  settings: string;
  caution: string;
  /** The planner ticked "include individual homes": the map shows homes and routes. */
  individual: boolean;
}

export function buildReport(host: HTMLElement, r: ReportInput) {
  const { view } = r;
  const rows = r.scope ? view.catchments.filter((c) => c.schoolId === r.scope) : view.catchments;
  const title = r.scope ? `Catchment of ${rows[0]?.name ?? r.scope}` : 'District walking-route audit';
  const homes = r.scope ? view.homes.filter((h) => h.schoolId === r.scope) : view.homes;
  const byStatus = (s: string) => homes.filter((h) => h.status === s).reduce((a, h) => a + h.children, 0);
  const children = homes.reduce((a, h) => a + h.children, 0);
  const table = el('table', { class: 'figures wide' },
    el('thead', {}, el('tr', {}, ...COLUMNS.map((c) => el('th', {}, c.label)))),
    el('tbody', {}, ...rows.map((c) => el('tr', {}, ...COLUMNS.map((k) => el('td', {}, k.show(c)))))));
  const cfg = JSON.parse(r.settings) as Record<string, Record<string, unknown>>;
  host.replaceChildren(
    el('header', {},
      el('h1', {}, title),
      el('p', {}, `catchwalk audit, ${new Date().toLocaleDateString('en-CA')} · walk zone ${view.walkZoneM} m · ${children} children in ${homes.length} homes`)),
    el('p', { class: 'caution' }, r.caution),
    el('img', { class: 'report-map', src: r.mapImage, alt: 'map of the audited network' }),
    el('p', { class: 'small' }, r.individual ? 'Map: streets by speed, crossings by control, homes and routes, hotspots (red circles), network checks (pink rings).' : 'Map: streets by speed, crossings by control, hotspots sized by children × risk (red circles), network checks (pink rings); homes and routes left out.'),
    el('h2', {}, 'Children by route'),
    el('table', { class: 'figures narrow' }, el('tbody', {},
      ...[['Has a safe route', byStatus('safe')], ['No safe route', byStatus('unsafe')], ['No safe route, the recommended one hazardous', byStatus('hazardous')], ['Beyond the walk zone', byStatus('beyond')], ['No route found', byStatus('unreached')]]
        .map(([k, v]) => el('tr', {}, el('th', {}, String(k)), el('td', {}, `${v} (${fmt.pct(children ? Number(v) / children : null)})`))))),
    el('h2', {}, 'Catchments'),
    table,
    ...crashSection(view),
    el('h2', {}, 'Charts'),
    el('div', { class: 'report-charts' }, ...Object.entries(r.charts).map(([caption, src]) => el('figure', {}, el('img', { src, alt: caption }), el('figcaption', {}, caption)))),
    el('h2', {}, 'Method'),
    el('p', {}, 'Streets are split into their two sides; corners join at every junction and each leg of a junction is a crossing with the control the crossings layer gives it. Every home is routed to its school twice: the shortest walk, and a recommended walk that trades length against risk (each risk point is worth a set number of metres) within a detour cap. Each route is audited for its length, walking time, the crossings it makes and what controls them, and the distance walked beside traffic or without a sidewalk. Risk is an index, not a prediction of injuries.'),
    el('p', {}, `Settings: walk zone ${cfg.benefit?.walk_zone_m} m, walking speed ${cfg.benefit?.walking_speed_mps} m/s (crossings and waits at ${cfg.risk?.walk_mps} m/s), detour cap ${cfg.route?.detour_cap}×, ${cfg.route?.metres_per_risk_point} m per risk point.`),
    el('p', {}, `Safe route: the shortest route that no rule of the rule set “${String((cfg.score?.rules as Record<string, unknown> | undefined)?.['name'] ?? '')}” flags; a home has one when it lies inside the walk zone. Hazardous: a hazardous rule fires on the recommended route and the home has no safe route.`),
    el('h2', {}, 'Exported tables'),
    el('p', { class: 'small' }, 'Every CSV is plain RFC 4180, header first; its columns, units and the caution are also in a W3C CSV on the Web metadata file beside it (homes.csv-metadata.json, ...).'),
    ...Object.values(view.doc.csv_metadata ?? {}).map((m) => el('div', { class: 'report-table-columns' },
      el('h3', {}, `${m.url}: ${m['dc:title']}`),
      el('ul', { class: 'small' }, ...m.tableSchema.columns.map((c) => el('li', {}, `${c.name}${c['schema:unitText'] ? ` (${c['schema:unitText']})` : ''}: ${c['dc:description']}`))))),
    el('h2', {}, 'Sources'),
    el('ul', {}, ...SOURCES.map((s) => el('li', {}, s)), ...Object.entries(r.files).map(([k, v]) => el('li', {}, `${k}: ${v}`))),
    el('h2', {}, 'Cautions'),
    el('ul', {},
      el('li', {}, r.caution),
      el('li', {}, 'Figures are only as good as the layers: missing sidewalks, crossings or speeds change routes and scores. Check the data problems listed by the audit.'),
      el('li', {}, r.individual
        ? 'This report shows individual homes and their routes (personal data): keep it inside your organisation.'
        : 'This report shows no single home: the map leaves homes and routes out; figures are counts per catchment.')),
  );
}

/** Hotspots with observed crashes beside their modelled risk (counts only: safe to share). */
function crashSection(view: View): HTMLElement[] {
  const rows = view.hotspots.filter((f) => Number(f.properties['crashes'] ?? 0) > 0);
  if (!rows.length) return [];
  return [
    el('h2', {}, 'Observed crashes at hotspots'),
    el('table', { class: 'figures wide' },
      el('thead', {}, el('tr', {}, ...['Rank', 'Where', 'Children × risk', 'Crashes', 'With a pedestrian', 'Killed or seriously injured (K, A)'].map((h) => el('th', {}, h)))),
      el('tbody', {}, ...rows.map((f) => {
        const p = f.properties;
        return el('tr', {}, el('td', {}, String(p['rank'])), el('td', {}, `${p['kind'] === 'crossing' ? 'crossing of' : 'along'} ${p['street']}`),
          el('td', {}, Number(p['product']).toFixed(1)), el('td', {}, String(p['crashes'])), el('td', {}, String(p['crashes_pedestrian'])), el('td', {}, String(p['crashes_ksi'])));
      }))),
    el('p', { class: 'small' }, 'Crash records are joined to the crossings and sides within 15 m; they are shown beside the modelled risk, never added to it.'),
  ];
}
