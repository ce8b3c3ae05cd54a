// Which layer a dropped file is, from what it holds (geometry types, property names, CSV
// columns), never from its name: a municipal export called "Centerlines_2024.geojson" or
// "export (3).geojson" must land where it belongs. A binary file is placed by its extension
// until a content reader is hooked in (`binaryPlacers`).

import { parseCsv } from './csv';
import type { FeatureCollection, LayerKey } from './types';

/** Where a file went and why, shown beside the layer so the planner can check or move it. */
export interface Placement {
  layer: LayerKey | null;
  why: string;
}

/** What the placer sees of a file: its name (for the extension only), and text or bytes. */
export interface DroppedFile {
  name: string;
  text?: string;
  bytes?: Uint8Array;
}

/**
 * Readers for binary formats (Zipped Shapefile, `.shp`, `.osm.pbf`): each may look inside
 * the bytes and answer, or return null to let the next one (and finally the extension) decide.
 */
export const binaryPlacers: ((f: DroppedFile) => Placement | null)[] = [];

const BINARY: Record<string, Placement> = {
  '.osm.pbf': { layer: 'streets', why: 'an OpenStreetMap extract: its ways are streets' },
  '.pbf': { layer: 'streets', why: 'an OpenStreetMap extract: its ways are streets' },
};

/** Lower-cased property names that point to each layer (our plain names and OSM tags). */
const HINTS: Record<'crossings' | 'homes' | 'schools' | 'catchments', string[]> = {
  crossings: ['control', 'crossing', 'crossing_ref', 'device', 'guard', 'guard_hours', 'signal', 'traffic_signals', 'refuge', 'refuge_island', 'island', 'beacon', 'crossing:island', 'crossing:markings'],
  homes: ['children', 'pupils', 'kids', 'students_count', 'child_count', 'weight', 'home', 'home_id', 'address_id'],
  schools: ['name', 'school_name', 'entrances', 'entrance', 'amenity', 'grades', 'isced:level', 'capacity', 'students'],
  catchments: ['school', 'school_id', 'school_ref', 'zone', 'attendance_zone'],
};

const LON = ['lon', 'lng', 'long', 'longitude', 'x'];
const LAT = ['lat', 'latitude', 'y'];

function extension(name: string): string {
  const n = name.toLowerCase();
  if (n.endsWith('.osm.pbf')) return '.osm.pbf';
  const i = n.lastIndexOf('.');
  return i < 0 ? '' : n.slice(i);
}

/** True when the file is read as bytes rather than text (the page's binary formats). */
export function isBinary(name: string): boolean {
  return ['.zip', '.shp', '.pbf', '.osm.pbf'].includes(extension(name));
}

/** Places one file by its content; `layer` is null when nothing in it says which layer. */
export function placeFile(f: DroppedFile): Placement {
  const ext = extension(f.name);
  if (f.bytes || (f.text === undefined && isBinary(f.name))) {
    for (const p of binaryPlacers) {
      const got = p(f);
      if (got) return got;
    }
    return BINARY[ext] ?? { layer: null, why: `a ${ext || 'binary'} file: choose its layer` };
  }
  const text = f.text ?? '';
  const trimmed = text.trimStart();
  if (trimmed.startsWith('{') || trimmed.startsWith('[')) {
    let doc: unknown;
    try { doc = JSON.parse(text); } catch { return { layer: null, why: 'not valid JSON: choose its layer' }; }
    return placeJson(doc);
  }
  return placeCsv(text);
}

/** A CSV with longitude and latitude columns is a homes table. */
function placeCsv(text: string): Placement {
  const header = (parseCsv(text.slice(0, 4096))[0] ?? []).map((h) => h.trim().toLowerCase());
  const lon = header.find((h) => LON.includes(h));
  const lat = header.find((h) => LAT.includes(h));
  if (lon && lat) return { layer: 'homes', why: `a table with “${lon}” and “${lat}” columns: homes` };
  return { layer: null, why: 'a table without longitude and latitude columns: choose its layer' };
}

function placeJson(doc: unknown): Placement {
  if (!doc || typeof doc !== 'object' || Array.isArray(doc)) return { layer: null, why: 'JSON but not GeoJSON: choose its layer' };
  const o = doc as Record<string, unknown>;
  const features = o['type'] === 'FeatureCollection' && Array.isArray(o['features']) ? (o['features'] as FeatureCollection['features'])
    : o['type'] === 'Feature' ? [o as unknown as FeatureCollection['features'][number]] : null;
  if (!features) {
    // A field mapping file: per-layer tables of field names, no features.
    const keys = Object.keys(o);
    if (keys.some((k) => ['streets', 'crossings', 'schools', 'homes', 'catchments', 'layers', 'preset'].includes(k)))
      return { layer: 'mapping', why: 'per-layer field names: a field mapping' };
    return { layer: null, why: 'JSON but not GeoJSON: choose its layer' };
  }
  const count = { line: 0, point: 0, polygon: 0 };
  const keys = new Map<string, number>();
  const values = new Set<string>();
  for (const f of features.slice(0, 2000)) {
    const t = f?.geometry?.type ?? '';
    if (t.includes('LineString')) count.line++;
    else if (t.includes('Polygon')) count.polygon++;
    else if (t.includes('Point')) count.point++;
    for (const [k, v] of Object.entries(f?.properties ?? {})) {
      keys.set(k.toLowerCase(), (keys.get(k.toLowerCase()) ?? 0) + 1);
      if (typeof v === 'string' && v.length < 40) values.add(`${k.toLowerCase()}=${v.toLowerCase()}`);
    }
  }
  const n = count.line + count.point + count.polygon;
  if (!n) return { layer: null, why: 'no geometry in it: choose its layer' };
  const score = (layer: keyof typeof HINTS) => HINTS[layer].reduce((s, k) => s + (keys.get(k) ?? 0), 0);
  const named = (layer: keyof typeof HINTS) => HINTS[layer].filter((k) => keys.has(k)).map((k) => `“${k}”`).slice(0, 2).join(', ');
  if (count.line >= count.point && count.line >= count.polygon)
    return { layer: 'streets', why: `${count.line} lines: streets` };
  if (count.polygon > count.point) {
    const school = values.has('amenity=school') || (score('schools') > score('catchments') && !keys.has('school') && !keys.has('school_id'));
    if (school) return { layer: 'schools', why: `${count.polygon} areas with ${named('schools') || 'school tags'}: schools` };
    return { layer: 'catchments', why: `${count.polygon} areas${named('catchments') ? ` with ${named('catchments')}` : ''}: catchments` };
  }
  // Points: crossings carry a control, homes a number of children, schools a name.
  const crossing = score('crossings') + [...values].filter((v) => v === 'highway=crossing' || v === 'highway=traffic_signals').length * 2;
  const homes = score('homes');
  const schools = values.has('amenity=school') ? Number.MAX_SAFE_INTEGER : keys.get('name') || keys.get('school_name') || keys.get('entrances') ? score('schools') : 0;
  const best = Math.max(crossing, homes, schools);
  if (best === 0) {
    // Nothing tells: many bare points are homes, a handful are schools.
    return count.point > 50
      ? { layer: 'homes', why: `${count.point} points without telling properties: homes` }
      : { layer: null, why: `${count.point} points without telling properties: choose their layer` };
  }
  if (best === schools) return { layer: 'schools', why: `${count.point} points with ${named('schools')}: schools` };
  if (best === crossing) return { layer: 'crossings', why: `${count.point} points with ${named('crossings') || 'crossing tags'}: crossings` };
  return { layer: 'homes', why: `${count.point} points with ${named('homes')}: homes` };
}
