// The page's view of one audit: homes with their figures, catchment rows, hotspots.
// Figures come from the core; the page only groups them for display. Route lines stay in the
// worker: the page asks for one home's or one catchment's when it draws them (`Engine.routes`).

import { CsvLines } from './csv';
import type { AuditDoc, Feature, FeatureCollection, LonLat, RouteProps } from './types';

/** A home's three routes as the worker draws them (null where the home has none). */
export interface Routes {
  shortest: Feature<RouteProps> | null;
  recommended: Feature<RouteProps> | null;
  safe: Feature<RouteProps> | null;
}

/** A routes collection from the worker, by home id. */
export function routesByHome(fc: FeatureCollection<RouteProps>): Map<string, Routes> {
  const out = new Map<string, Routes>();
  for (const f of fc.features) {
    const id = f.properties.home_id;
    const e = out.get(id) ?? { shortest: null, recommended: null, safe: null };
    e[f.properties.kind] = f;
    out.set(id, e);
  }
  return out;
}

export type HomeStatus = 'safe' | 'unsafe' | 'hazardous' | 'beyond' | 'unreached';

export interface HomeView {
  idx: number;
  id: string;
  at: LonLat;
  children: number;
  schoolId: string | null;
  /** The shortest route's length along the network (null: no route found). */
  shortestM: number | null;
  /** Both the shortest and the recommended route were found. */
  routed: boolean;
  status: HomeStatus;
  reasons: string[];
  /** The home's row of the core's homes.csv (score columns: active minutes, waits, ...),
   * parsed from its line when asked. */
  readonly row: Record<string, string>;
}

export interface CatchmentView {
  schoolId: string;
  name: string;
  homes: number;
  children: number;
  inZone: number;
  inZoneShare: number | null;
  safe: number;
  safeShare: number | null;
  deficit: number | null;
  activeMin: number | null;
  riskPerTrip: number | null;
  meanShortestM: number | null;
  meanUncontrolled: number | null;
  /** Children on hazardous routes (core scores only). */
  hazardous: number | null;
  /** The core's balance class: walkable_and_safe, walkable_but_unsafe, far_but_safe, ... */
  quadrant: string | null;
}

export interface View {
  doc: AuditDoc;
  homes: HomeView[];
  byId: Map<string, HomeView>;
  catchments: CatchmentView[];
  hotspots: Feature[];
  walkZoneM: number;
}

const num = (v: unknown): number | null => {
  if (v === null || v === undefined || v === '') return null;
  const n = Number(v);
  return isFinite(n) ? n : null;
};

/** The core's verdict on a home, from its homes.csv row. */
function coreVerdict(r: Record<string, string>): { status: HomeStatus; reasons: string[] } | null {
  const safe = r['safe_route'];
  if (safe !== 'true' && safe !== 'false') return null;
  const split = (x: string | undefined) => (x ? x.split(/;\s*(?=[a-z0-9-]+:)/) : []);
  if (r['hazardous'] === 'true') return { status: 'hazardous', reasons: [...new Set([...split(r['hazard_reason']), ...split(r['unsafe_reason'])])] };
  if (safe === 'true') return { status: 'safe', reasons: [] };
  const reasons = split(r['unsafe_reason']);
  return { status: 'unsafe', reasons: reasons.length ? reasons : ['fails the safe-route test'] };
}

export function buildView(doc: AuditDoc): View {
  const walkZoneM = doc.summary.walk_zone_m;
  // The figures each home's view needs, read once; the rows stay as the CSV's text.
  const needed = ['shortest_network_m', 'recommended_network_m', 'in_walk_zone', 'walk_zone_m', 'safe_route', 'hazardous',
    'hazard_reason', 'unsafe_reason', 'over_detour_cap', 'school_id'];
  const figures = new Map<string, Record<string, string>>();
  const lines = new CsvLines(doc.homes_csv, 'home_id', (_, col) => {
    figures.set(col('home_id'), Object.fromEntries(needed.map((k) => [k, col(k)])));
  });
  const homes: HomeView[] = doc.layers.homes.map((h, idx) => {
    const row = figures.get(h.id) ?? {};
    const shortestM = num(row['shortest_network_m']);
    const routed = shortestM !== null && num(row['recommended_network_m']) !== null;
    let status: HomeStatus;
    let reasons: string[] = [];
    if (!routed) {
      status = 'unreached';
      reasons = ['no walking route to a school was found'];
    } else if (row['in_walk_zone'] === 'false') {
      status = 'beyond';
      reasons = [`shortest route ${Math.round(shortestM ?? 0)} m is beyond the ${row['walk_zone_m'] || walkZoneM} m walk zone`];
    } else {
      // Every verdict is the core's; the page only displays it.
      ({ status, reasons } = coreVerdict(row) ?? { status: 'unsafe', reasons: ['the core gave no safe-route verdict for this route'] });
      if (row['over_detour_cap'] === 'true' && status !== 'safe')
        reasons.push('a safer route would exceed the detour cap, so the shortest stands');
    }
    return {
      idx,
      id: h.id,
      at: h.at,
      children: h.children,
      schoolId: (routed ? row['school_id'] : '') || h.school || null,
      shortestM,
      routed,
      status,
      reasons,
      get row() {
        return lines.row(h.id);
      },
    };
  });
  const byId = new Map(homes.map((h) => [h.id, h]));
  // Homes grouped by school once: a county has thousands of schools and their homes.
  const bySchool = new Map<string, HomeView[]>();
  for (const h of homes) {
    if (!h.schoolId) continue;
    const list = bySchool.get(h.schoolId);
    if (list) list.push(h);
    else bySchool.set(h.schoolId, [h]);
  }
  const catchments = doc.summary.schools.map((s) => catchmentRow(s.id, s.name, bySchool.get(s.id) ?? [], doc, walkZoneM));
  const hot = doc['hotspots'] as FeatureCollection | undefined;
  return {
    doc,
    homes,
    byId,
    catchments,
    hotspots: hot?.features ?? [],
    walkZoneM,
  };
}

function catchmentRow(schoolId: string, name: string, members: HomeView[], doc: AuditDoc, walkZoneM: number): CatchmentView {
  const children = members.reduce((a, h) => a + h.children, 0);
  const routed = members.filter((h) => h.routed);
  const inZone = members.filter((h) => h.shortestM !== null && h.shortestM <= walkZoneM);
  const inZoneN = inZone.reduce((a, h) => a + h.children, 0);
  const safeN = members.filter((h) => h.status === 'safe').reduce((a, h) => a + h.children, 0);
  const w = routed.reduce((a, h) => a + h.children, 0);
  const mean = (f: (h: HomeView) => number) => (w > 0 ? routed.reduce((a, h) => a + f(h) * h.children, 0) / w : null);
  const s = doc.summary.schools.find((x) => x.id === schoolId);
  const core = (doc.summary['catchments'] as Record<string, unknown>[] | undefined)?.find((c) => c['school_id'] === schoolId);
  if (core) {
    return {
      schoolId,
      name,
      homes: members.length,
      children: num(core['children']) ?? children,
      inZone: num(core['children_in_walk_zone']) ?? inZoneN,
      inZoneShare: num(core['walk_zone_share']),
      safe: num(core['children_safe_route']) ?? safeN,
      safeShare: num(core['safe_route_share']),
      deficit: num(core['gap']),
      activeMin: num(core['mean_active_minutes']),
      riskPerTrip: num(core['mean_risk_per_trip']),
      meanShortestM: num(s?.mean_shortest_network_m),
      meanUncontrolled: num(s?.mean_uncontrolled_crossings),
      hazardous: num(core['children_hazardous']),
      quadrant: typeof core['quadrant'] === 'string' ? (core['quadrant'] as string) : null,
    };
  }
  const coreActive = num(s?.['mean_active_minutes']);
  return {
    schoolId,
    name,
    homes: members.length,
    children,
    inZone: inZoneN,
    inZoneShare: children ? inZoneN / children : null,
    safe: safeN,
    safeShare: children ? safeN / children : null,
    deficit: children ? (inZoneN - safeN) / children : null,
    // Two trips a day at the recommended route's walking time.
    activeMin: coreActive ?? mean((h) => 2 * (num(h.row['walking_time_min']) ?? 0)),
    riskPerTrip: num(s?.mean_risk_per_trip) ?? mean((h) => num(h.row['risk']) ?? 0),
    meanShortestM: num(s?.mean_shortest_network_m),
    meanUncontrolled: num(s?.mean_uncontrolled_crossings),
    hazardous: null,
    quadrant: null,
  };
}
