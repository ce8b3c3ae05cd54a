// A small invented district far from the demo town and from any real place (open South
// Pacific, lon -128.5, lat -38.2): a 4 x 4 street grid, two schools, crossings, homes as CSV
// and two catchments, written under names that say nothing of what they hold, as municipal
// exports come.

import { writeFileSync } from 'node:fs';
import { join } from 'node:path';

export const ORIGIN = [-128.5, -38.2];
const DLON = 0.0023; // about 200 m at this latitude
const DLAT = 0.0018; // about 200 m
const N = 4;
const at = (i, j) => [Number((ORIGIN[0] + i * DLON).toFixed(7)), Number((ORIGIN[1] + j * DLAT).toFixed(7))];

/** The district's bounding box [[w, s], [e, n]]. */
export const BOUNDS = [at(0, 0), at(N - 1, N - 1)];

const EW = ['Tidewater Lane', 'Brinefield Road', 'Kelpmarket Street', 'Gullstone Way'];
const NS = ['Driftwood Avenue', 'Saltmeadow Road', 'Ropewalk Street', 'Lanternhill Road'];

function streets() {
  const features = [];
  for (let j = 0; j < N; j++)
    features.push({ type: 'Feature', properties: { id: `E${j}`, name: EW[j], class: j === 1 ? 'collector' : 'local', speed_kmh: j === 1 ? 50 : 30, lanes: 2, sidewalk: 'both' },
      geometry: { type: 'LineString', coordinates: [...Array(N).keys()].map((i) => at(i, j)) } });
  for (let i = 0; i < N; i++)
    features.push({ type: 'Feature', properties: { id: `N${i}`, name: NS[i], class: 'local', speed_kmh: 30, lanes: 2, sidewalk: 'both' },
      geometry: { type: 'LineString', coordinates: [...Array(N).keys()].map((j) => at(i, j)) } });
  return { type: 'FeatureCollection', features };
}

const point = (props, c) => ({ type: 'Feature', properties: props, geometry: { type: 'Point', coordinates: c } });

function crossings() {
  return { type: 'FeatureCollection', features: [
    point({ id: 'C1', control: 'signal' }, at(1, 1)),
    point({ id: 'C2', control: 'marked' }, at(2, 1)),
    point({ id: 'C3', control: 'stop' }, at(1, 2)),
  ] };
}

function schools() {
  return { type: 'FeatureCollection', features: [
    point({ id: 'W1', name: 'Pebblecove School' }, at(0.5, 2)),
    point({ id: 'W2', name: 'Harbourlight School' }, at(2.5, 0)),
  ] };
}

function homesCsv() {
  const rows = ['id,lon,lat,children'];
  let k = 0;
  for (let i = 0; i < N - 1; i++)
    for (let j = 0; j < N - 1; j++)
      for (const [a, b] of [[0.3, 0], [0, 0.6]]) {
        const [x, y] = at(i + a, j + b);
        rows.push(`P${String(++k).padStart(3, '0')},${x},${y},${1 + (k % 2)}`);
      }
  return `${rows.join('\n')}\n`;
}

function catchments() {
  const box = (i0, i1) => [[at(i0, 0), at(i1, 0), at(i1, N - 1), at(i0, N - 1), at(i0, 0)]];
  return { type: 'FeatureCollection', features: [
    { type: 'Feature', properties: { school: 'W1' }, geometry: { type: 'Polygon', coordinates: box(-0.5, 1.5) } },
    { type: 'Feature', properties: { school: 'W2' }, geometry: { type: 'Polygon', coordinates: box(1.5, N - 0.5) } },
  ] };
}

/** The files by the layer they must land in, each under a name that says nothing. */
export function districtFiles() {
  return {
    streets: { name: 'Centerlines_2024.geojson', text: JSON.stringify(streets()) },
    crossings: { name: 'export (3).geojson', text: JSON.stringify(crossings()) },
    schools: { name: 'points_final.geojson', text: JSON.stringify(schools()) },
    homes: { name: 'pupils.csv', text: homesCsv() },
    catchments: { name: 'Layer 7.geojson', text: JSON.stringify(catchments()) },
  };
}

/** Writes the files into `dir`; returns their paths by layer. */
export function writeDistrict(dir) {
  const out = {};
  for (const [layer, f] of Object.entries(districtFiles())) {
    out[layer] = join(dir, f.name);
    writeFileSync(out[layer], f.text);
  }
  return out;
}

/** Number of homes in the district's CSV. */
export const DISTRICT_HOMES = (N - 1) * (N - 1) * 2;
