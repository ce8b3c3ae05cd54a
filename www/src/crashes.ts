// Observed crashes on the map (the optional crashes layer): a small layer and its popup.
// Crash records are personal data: they are drawn on this machine only; shared exports
// carry counts per hotspot (hotspots.csv / hotspots.geojson), never the points.

import type maplibregl from 'maplibre-gl';
import type { AuditDoc, FeatureCollection } from './types';

export const CRASH_COLOR = '#5b2a86';

interface CrashRecord {
  id: string;
  at: [number, number];
  date?: string | null;
  minute?: number | null;
  severity?: string | null;
  pedestrian?: boolean;
  cyclist?: boolean;
  age?: number | null;
}

/** Adds the crashes source and layer (drawn above hotspots). */
export function addCrashLayer(m: maplibregl.Map, data: (fc: FeatureCollection) => unknown) {
  m.addSource('crashes', { type: 'geojson', data: data({ type: 'FeatureCollection', features: [] }) as never });
  m.addLayer({
    id: 'crashes',
    type: 'circle',
    source: 'crashes',
    paint: {
      'circle-color': ['case', ['get', 'ksi'], CRASH_COLOR, '#ffffff'],
      'circle-stroke-color': CRASH_COLOR,
      'circle-stroke-width': 1.5,
      'circle-radius': ['interpolate', ['linear'], ['zoom'], 13, 2.5, 17, 5],
    },
  });
}

/** The audit's crash records as points (empty when no crashes layer was loaded). */
export function crashFeatures(doc: AuditDoc): FeatureCollection {
  const list = ((doc.layers as unknown as { crashes?: CrashRecord[] }).crashes ?? []);
  return {
    type: 'FeatureCollection',
    features: list.map((c) => ({
      type: 'Feature',
      geometry: { type: 'Point', coordinates: c.at },
      properties: {
        id: c.id,
        date: c.date ?? '',
        time: typeof c.minute === 'number' ? `${String(Math.floor(c.minute / 60)).padStart(2, '0')}:${String(c.minute % 60).padStart(2, '0')}` : '',
        severity: c.severity ?? 'unknown',
        ksi: c.severity === 'K' || c.severity === 'A',
        who: [c.pedestrian ? 'pedestrian' : '', c.cyclist ? 'cyclist' : ''].filter(Boolean).join(', ') || 'no pedestrian or cyclist recorded',
        age: c.age ?? '',
      },
    })),
  } as FeatureCollection;
}

/** Lines of a crash popup: [label, value]. */
export function crashPopupLines(p: Record<string, unknown>): [string, unknown][] {
  return [
    ['Observed crash', p['id']],
    ['When', `${p['date'] || 'date unknown'} ${p['time'] || ''}`.trim()],
    ['Severity (KABCO)', p['severity']],
    ['Involved', p['who']],
    ['Age', p['age']],
  ];
}
