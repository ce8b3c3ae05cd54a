// Exports. Files meant for sharing carry no single home unless the planner ticks
// "include individual homes"; every file carries the caution.

import { toCsv } from './csv';
import { download } from './dom';
import type { View } from './model';
import { COLUMNS } from './table';
import type { FeatureCollection } from './types';

const stamp = () => new Date().toISOString().slice(0, 10);

/** Routes shared: figures per catchment on its polygon, no single home. */
export function routesExport(view: View, catchmentFile: FeatureCollection | null): FeatureCollection {
  const caution = view.doc.summary.caution;
  const idOf = new Map(view.doc.layers.catchments.map((c) => [c.feature, c.school_id]));
  const rows = new Map(view.catchments.map((c) => [c.schoolId, c]));
  const features = (catchmentFile?.features ?? []).map((f, i) => {
    const c = rows.get(idOf.get(i) ?? '');
    return {
      type: 'Feature' as const,
      geometry: f.geometry,
      properties: c
        ? {
            school_id: c.schoolId, school: c.name, homes: c.homes, children: c.children,
            children_in_walk_zone: c.inZone, children_with_safe_route: c.safe,
            deficit_share: c.deficit, mean_shortest_network_m: c.meanShortestM,
            mean_uncontrolled_crossings: c.meanUncontrolled, mean_risk_per_trip: c.riskPerTrip,
            active_minutes_per_day: c.activeMin,
          }
        : { school_id: idOf.get(i) ?? null },
    };
  });
  return { type: 'FeatureCollection', caution, features } as FeatureCollection;
}

export function catchmentsCsv(view: View): string {
  const header = ['school_id', ...COLUMNS.map((c) => String(c.key)), 'homes', 'children_in_walk_zone', 'children_with_safe_route'];
  const rows = view.catchments.map((c) => [c.schoolId, ...COLUMNS.map((k) => c[k.key]), c.homes, c.inZone, c.safe]);
  return toCsv(header, rows); // the caution: the report and the core's CSV metadata
}

/** Saves the routes: every home's routes (individual; `allRoutes` asks the worker for the
 * core's routes.geojson, caution included), or figures per catchment (shared). */
export async function saveRoutes(view: View, file: FeatureCollection | null, individual: boolean, allRoutes: () => Promise<string>) {
  if (individual) download(`catchwalk-routes-by-home-${stamp()}.geojson`, await allRoutes(), 'application/geo+json');
  else download(`catchwalk-routes-by-catchment-${stamp()}.geojson`, JSON.stringify(routesExport(view, file)), 'application/geo+json');
}

export function saveHotspots(view: View) {
  const fc = { type: 'FeatureCollection', caution: view.doc.summary.caution, features: view.hotspots };
  download(`catchwalk-hotspots-${stamp()}.geojson`, JSON.stringify(fc), 'application/geo+json');
}

/** The core's catchments.csv when it scores catchments (the same file as the command line's). */
export function saveCatchments(view: View) {
  const core = view.doc['catchments_csv'];
  download(`catchwalk-catchments-${stamp()}.csv`, typeof core === 'string' && core ? core : catchmentsCsv(view), 'text/csv');
}

/** The core's hotspots.csv: edges, not homes, so safe to share. */
export function saveHotspotsCsv(view: View) {
  const core = view.doc['hotspots_csv'];
  if (typeof core === 'string') download(`catchwalk-hotspots-${stamp()}.csv`, core, 'text/csv');
}

/** The core's homes.csv as it is (same columns and figures as the command line's). */
export function saveHomes(view: View) {
  download(`catchwalk-homes-${stamp()}.csv`, view.doc.homes_csv, 'text/csv');
}
