// The planner's work as one plain value: the layers as loaded, settings, scenarios, notes and
// photos. It converts to and from the core's project (crate/src/project/), which writes and
// reads the project file; the page keeps only what the core's format does not (file names,
// which scenario is shown) beside it.

import type { Feature, FeatureCollection, LayerFile, LayerKey, LonLat } from './types';

/** One intervention: a GeoJSON feature as the core's interventions layer reads it. */
export type Intervention = Feature<{ kind: string; [k: string]: unknown }>;

export interface Scenario {
  name: string;
  interventions: Intervention[];
}

export type Check = 'not_checked' | 'ok' | 'problem';

/** The core's checklist (crate/src/project/notes.rs, `Checklist`). */
export interface Checklist {
  sight_lines: Check;
  kerb_ramps: Check;
  crossing_time: Check;
  parked_cars: Check;
  sidewalk_condition: Check;
  lighting: Check;
  observed_speed_kmh: number | null;
  crossing_guard_seen: boolean | null;
}

export type NoteTarget = { on: 'crossing'; crossing: string | null } | { on: 'street_side'; street: string; side: string } | { on: 'point' };

export interface Note {
  id: string;
  at: LonLat;
  target: NoteTarget;
  checklist: Checklist;
  text: string;
  photos: string[];
  visited: string | null;
  /** What the layers got wrong, as an intervention's properties (`kind`, `street`, ...). */
  observed: Record<string, unknown> | null;
}

export interface Photo {
  name: string;
  media_type: string;
  /** The image's bytes, base64 (as the core's project JSON carries them). */
  bytes: string;
}

export interface PageState {
  files: Record<LayerKey, LayerFile | null>;
  preset: string;
  /** The config JSON (settings with the rule set), or null for the defaults. */
  config: string | null;
  scenarios: Scenario[];
  /** Index of the scenario shown; -1: the existing network. */
  active: number;
  notes: Note[];
  photos: Photo[];
}

/** The checklist items with their wording, in the core's order. */
export const CHECKS: [keyof Checklist, string][] = [
  ['sight_lines', 'Sight lines'],
  ['kerb_ramps', 'Kerb ramps'],
  ['crossing_time', 'Enough time to cross'],
  ['parked_cars', 'Parked cars in the way'],
  ['sidewalk_condition', 'Sidewalk condition'],
  ['lighting', 'Lighting'],
];

export const emptyChecklist = (): Checklist => ({
  sight_lines: 'not_checked', kerb_ramps: 'not_checked', crossing_time: 'not_checked', parked_cars: 'not_checked',
  sidewalk_condition: 'not_checked', lighting: 'not_checked', observed_speed_kmh: null, crossing_guard_seen: null,
});

export const collection = (list: Intervention[]): FeatureCollection => ({ type: 'FeatureCollection', features: list as Feature[] });

/** The interventions layer's text for a scenario ('' for the existing network). */
export function interventionsText(list: Intervention[] | undefined): string {
  return list && list.length ? JSON.stringify(collection(list)) : '';
}

/** The core's Project as JSON (crate/src/project/mod.rs). */
export function toCoreProject(s: PageState): string {
  const f = s.files;
  return JSON.stringify({
    layers: {
      streets: f.streets?.text ?? '',
      crossings: f.crossings?.text ?? null,
      schools: f.schools?.text ?? '',
      homes: f.homes?.text ?? '',
      homes_format: f.homes?.name.toLowerCase().endsWith('.csv') ? 'csv' : 'geo_json',
      catchments: f.catchments?.text ?? null,
      crashes: f.crashes?.text ?? null,
      preset: s.preset,
      mapping: f.mapping?.text ?? null,
    },
    config: s.config ? JSON.parse(s.config) : null,
    scenarios: s.scenarios.map((x) => ({ name: x.name, interventions: JSON.stringify(collection(x.interventions)) })),
    notes: s.notes,
    photos: s.photos,
  });
}

interface CoreProject {
  layers: { streets: string; crossings: string | null; schools: string; homes: string; homes_format: string; catchments: string | null; crashes?: string | null; preset: string; mapping: string | null };
  config: unknown;
  scenarios: { name: string; interventions: string }[];
  notes: Note[];
  photos: Photo[];
}

/** The page's state from the core's Project JSON; layer files are named after `source`. */
export function fromCoreProject(text: string, source: string): PageState {
  const p = JSON.parse(text) as CoreProject;
  const l = p.layers;
  const file = (t: string | null, name: string): LayerFile | null => (t === null || t === undefined ? null : { name: `${source}/${name}`, text: t });
  return {
    files: {
      streets: file(l.streets, 'streets.geojson'),
      crossings: file(l.crossings, 'crossings.geojson'),
      schools: file(l.schools, 'schools.geojson'),
      homes: file(l.homes, l.homes_format === 'csv' ? 'homes.csv' : 'homes.geojson'),
      catchments: file(l.catchments, 'catchments.geojson'),
      crashes: file(l.crashes ?? null, 'crashes.geojson'),
      mapping: file(l.mapping, 'mapping.json'),
    },
    preset: l.preset,
    config: p.config ? JSON.stringify(p.config) : null,
    scenarios: p.scenarios.map((s) => ({ name: s.name, interventions: ((JSON.parse(s.interventions) as FeatureCollection).features ?? []) as Intervention[] })),
    active: -1,
    notes: p.notes.map((n) => ({ ...n, checklist: { ...emptyChecklist(), ...n.checklist } })),
    photos: p.photos,
  };
}

/** Notes as GeoJSON Points, every field but the point a property (as the core writes them). */
export function notesGeojson(notes: Note[]): FeatureCollection {
  return {
    type: 'FeatureCollection',
    features: notes.map(({ at, ...rest }) => ({ type: 'Feature', geometry: { type: 'Point', coordinates: at }, properties: rest as unknown as Record<string, unknown> })),
  };
}

/** Notes read back from a GeoJSON FeatureCollection of Points; an error names the feature. */
export function readNotesGeojson(text: string): Note[] {
  const fc = JSON.parse(text) as FeatureCollection;
  if (!fc || !Array.isArray(fc.features)) throw new Error('not a GeoJSON FeatureCollection');
  return fc.features.map((f, i) => {
    const g = f.geometry;
    if (!g || g.type !== 'Point' || !Array.isArray(g.coordinates)) throw new Error(`notes feature ${i}: a note is a Point`);
    const p = f.properties as Partial<Note>;
    return {
      id: String(p.id ?? `imported-${i + 1}`),
      at: g.coordinates as LonLat,
      target: p.target ?? { on: 'point' },
      checklist: { ...emptyChecklist(), ...(p.checklist ?? {}) },
      text: String(p.text ?? ''),
      photos: Array.isArray(p.photos) ? p.photos.map(String) : [],
      visited: p.visited ?? null,
      observed: p.observed ?? null,
    };
  });
}
