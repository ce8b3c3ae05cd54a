// An optional basemap from a PMTiles archive the planner supplies (their own area's tiles, on
// their own disk): read with the `pmtiles` package straight from the File, never fetched, and
// drawn in a quiet style of our own under every audit layer. Vector archives (MVT) get a fill
// and a line layer per source layer, coloured by what the layer's name says it holds
// (water, green space, buildings, roads); raster archives are drawn faded.

import maplibregl, { type Map as MlMap } from 'maplibre-gl';
import { FileSource, PMTiles, Protocol, TileType } from 'pmtiles';

const protocol = new Protocol();
let registered = false;

/** Layer ids the basemap adds, all under `beforeId`. */
export const BASEMAP_PREFIX = 'base-';

/** Quiet colours for a source layer, from what its name says it holds. */
function tone(name: string): { fill: string; line: string; fillOpacity: number } {
  const n = name.toLowerCase();
  if (/water|ocean|sea|lake|river|stream|canal|coast/.test(n)) return { fill: '#cbdde3', line: '#a9c4cc', fillOpacity: 0.9 };
  if (/park|green|grass|wood|forest|leisure|landcover|garden|pitch|cemetery|nature/.test(n)) return { fill: '#dfe8d2', line: '#c2d2ae', fillOpacity: 0.85 };
  if (/build/.test(n)) return { fill: '#e2dccf', line: '#cfc6b5', fillOpacity: 0.9 };
  if (/road|street|transport|highway|path|rail/.test(n)) return { fill: '#ece6da', line: '#d3cab9', fillOpacity: 0.5 };
  return { fill: '#ebe5d9', line: '#d8d0c0', fillOpacity: 0.5 };
}

export interface BasemapInfo {
  name: string;
  kind: 'vector' | 'raster';
  layers: string[];
  minZoom: number;
  maxZoom: number;
  bounds: [[number, number], [number, number]];
}

/** Removes the basemap, if any. */
export function removeBasemap(map: MlMap) {
  for (const l of map.getStyle().layers ?? []) if (l.id.startsWith(BASEMAP_PREFIX)) map.removeLayer(l.id);
  if (map.getSource('basemap')) map.removeSource('basemap');
}

/** Adds the archive in `file` as the basemap under `beforeId`; replaces one already there. */
export async function addBasemap(map: MlMap, file: File, beforeId: string): Promise<BasemapInfo> {
  if (!registered) {
    maplibregl.addProtocol('pmtiles', protocol.tile);
    registered = true;
  }
  const archive = new PMTiles(new FileSource(file));
  const header = await archive.getHeader();
  protocol.add(archive);
  removeBasemap(map);
  const tiles = [`pmtiles://${file.name}/{z}/{x}/{y}`];
  const bounds: BasemapInfo['bounds'] = [[header.minLon, header.minLat], [header.maxLon, header.maxLat]];
  const range = { minzoom: header.minZoom, maxzoom: header.maxZoom, bounds: [header.minLon, header.minLat, header.maxLon, header.maxLat] as [number, number, number, number] };
  if (header.tileType === TileType.Mvt) {
    const meta = (await archive.getMetadata()) as { vector_layers?: { id: string }[] } | null;
    const layers = (meta?.vector_layers ?? []).map((l) => l.id);
    if (!layers.length) throw new Error('the archive lists no vector layers in its metadata (vector_layers)');
    map.addSource('basemap', { type: 'vector', tiles, ...range });
    // Areas first (water, green, buildings), then lines, so lines sit on the areas.
    for (const id of layers) {
      const t = tone(id);
      map.addLayer({ id: `${BASEMAP_PREFIX}${id}-fill`, type: 'fill', source: 'basemap', 'source-layer': id, filter: ['in', ['geometry-type'], ['literal', ['Polygon', 'MultiPolygon']]], paint: { 'fill-color': t.fill, 'fill-opacity': t.fillOpacity, 'fill-outline-color': t.line } }, beforeId);
    }
    for (const id of layers) {
      const t = tone(id);
      map.addLayer({ id: `${BASEMAP_PREFIX}${id}-line`, type: 'line', source: 'basemap', 'source-layer': id, filter: ['in', ['geometry-type'], ['literal', ['LineString', 'MultiLineString']]], paint: { 'line-color': t.line, 'line-width': 1 } }, beforeId);
    }
    return { name: file.name, kind: 'vector', layers, minZoom: header.minZoom, maxZoom: header.maxZoom, bounds };
  }
  if ([TileType.Png, TileType.Jpeg, TileType.Webp, TileType.Avif].includes(header.tileType)) {
    map.addSource('basemap', { type: 'raster', tiles, tileSize: 256, ...range });
    map.addLayer({ id: `${BASEMAP_PREFIX}raster`, type: 'raster', source: 'basemap', paint: { 'raster-opacity': 0.55, 'raster-saturation': -0.6 } }, beforeId);
    return { name: file.name, kind: 'raster', layers: ['raster'], minZoom: header.minZoom, maxZoom: header.maxZoom, bounds };
  }
  throw new Error(`the archive holds tiles of a kind this page does not draw (type ${header.tileType}); use vector (MVT) or image tiles`);
}
