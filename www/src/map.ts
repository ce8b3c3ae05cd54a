// The map: MapLibre GL JS with a blank style of our own (no tiles: the streets are the map).

import maplibregl, { type GeoJSONSource, type VectorTileSource, type LngLatBoundsLike, type Map as MlMap } from 'maplibre-gl';
import {
  CLASS_WIDTH,
  DEVICES,
  HOME_STATUS,
  HOTSPOT_COLOR,
  PAPER,
  PATH_COLOR,
  QA_COLOR,
  ROUTE_STYLE,
  SPEED_BANDS,
  CMP_AFTER,
  CMP_BEFORE,
  EDIT_COLOR,
  NOTE_COLOR,
  OBSERVED_COLOR,
  deficitColor,
  deviceImage,
} from './palette';
import { addBasemap, removeBasemap, type BasemapInfo } from './basemap';
import { GLYPHS_URL, LABEL_FONT, registerGlyphs } from './labels';
import type { View } from './model';
import type { Feature, FeatureCollection, TileLayer } from './types';
import { addCrashLayer, crashFeatures, crashPopupLines } from './crashes';


const empty = (): FeatureCollection => ({ type: 'FeatureCollection', features: [] });
type SourceData = maplibregl.GeoJSONSourceSpecification['data'];
const data = (fc: FeatureCollection) => fc as unknown as SourceData;
/** Expressions are built as plain arrays; MapLibre validates them at run time. */
const ex = (e: unknown) => e as maplibregl.ExpressionSpecification;

export interface MapEvents {
  onHome: (id: string) => void;
  onCatchment: (schoolId: string) => void;
  onNote?: (id: string) => void;
  /** Street or hotspot tile z/x/y of a held audit (Mapbox Vector Tile bytes), from the worker. */
  tile: (layer: TileLayer, audit: number, z: number, x: number, y: number) => Promise<Uint8Array>;
  /** A map tile could not be had (the worker was restarted and holds the audit no more). */
  onTileFailed?: (why: string) => void;
}

/** What a click in an editing mode landed on (scenarios.ts, notes.ts decide what it means). */
export interface Pick {
  at: [number, number];
  crossing: { id: string; at: [number, number] } | null;
  /** The noded segment (its index in the centrelines) under the click, if any. */
  segment: number | null;
}

let mapTiles: MapEvents['tile'] | null = null;
let tileFailed: MapEvents['onTileFailed'] | null = null;

/** The protocol each tiled layer's source asks its tiles through (`cwstreets://audit/z/x/y`). */
const TILE_PROTOCOLS: Record<TileLayer, string> = { streets: 'cwstreets', hotspots: 'cwhotspots' };

/** Registers (once) the protocols the streets and hotspots sources ask their tiles through: each
 * goes to the worker that holds the audit. A tile of no audit, or of one the worker no longer
 * holds (after a cancel), is empty. */
function registerMapTiles(get: MapEvents['tile'], failed: MapEvents['onTileFailed']) {
  const first = mapTiles === null;
  mapTiles = get;
  tileFailed = failed;
  if (!first) return;
  for (const [layer, protocol] of Object.entries(TILE_PROTOCOLS) as [TileLayer, string][]) {
    const address = new RegExp(`^${protocol}://(\\d+)/(\\d+)/(\\d+)/(\\d+)`);
    maplibregl.addProtocol(protocol, async (params) => {
      const m = address.exec(params.url);
      if (!m || m[1] === '0' || !mapTiles) return { data: new ArrayBuffer(0) };
      try {
        const bytes = await mapTiles(layer, Number(m[1]), Number(m[2]), Number(m[3]), Number(m[4]));
        const whole = bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength;
        return { data: whole ? bytes.buffer : bytes.slice().buffer };
      } catch (e) {
        tileFailed?.((e as Error).message);
        return { data: new ArrayBuffer(0) };
      }
    });
  }
}

export class AuditMap {
  map: MlMap;
  private loaded: Promise<void>;
  private schoolMarkers: maplibregl.Marker[] = [];
  /** Set while a scenario or note tool is armed: clicks go to it instead of the selection. */
  onPick: ((p: Pick) => void) | null = null;
  /** The hotspots shown, in the order of the map's `i` property. */
  private hotspotList: Feature[] = [];

  constructor(container: HTMLElement, private events: MapEvents) {
    registerGlyphs();
    registerMapTiles(events.tile, events.onTileFailed);
    this.map = new maplibregl.Map({
      container,
      style: {
        version: 8,
        glyphs: GLYPHS_URL,
        sources: {},
        layers: [{ id: 'paper', type: 'background', paint: { 'background-color': PAPER } }],
      },
      center: [0, 0],
      zoom: 1,
      attributionControl: false,
      canvasContextAttributes: { preserveDrawingBuffer: true },
    });
    this.map.addControl(new maplibregl.NavigationControl({ showCompass: false }), 'top-right');
    this.map.addControl(new maplibregl.ScaleControl({ unit: 'metric' }), 'bottom-right');
    this.loaded = new Promise((resolve) => this.map.on('load', () => resolve()));
    this.loaded.then(() => this.setup());
  }

  private setup() {
    const m = this.map;
    for (const d of DEVICES) {
      const { data } = deviceImage(d.key, 40);
      m.addImage(`dev-${d.key}`, data, { pixelRatio: 2 });
    }
    // The streets as vector tiles the worker cuts on demand (`cwstreets://audit/z/x/y`), so the
    // map never holds or tiles a district's segments as GeoJSON; beyond zoom 16 it scales up.
    m.addSource('streets', { type: 'vector', tiles: ['cwstreets://0/{z}/{x}/{y}'], minzoom: 0, maxzoom: 16 });
    // The hotspots likewise (`cwhotspots://`): a point each with its index and weight.
    m.addSource('hotspots', { type: 'vector', tiles: ['cwhotspots://0/{z}/{x}/{y}'], minzoom: 0, maxzoom: 16 });
    for (const id of ['catchments', 'street-names', 'sel-routes', 'crossings', 'qa', 'sel-home', 'found', 'edits', 'notes', 'cmp-routes'])
      m.addSource(id, { type: 'geojson', data: data(empty()) });
    m.addSource('homes', {
      type: 'geojson',
      data: data(empty()),
      cluster: true,
      clusterMaxZoom: 15,
      clusterRadius: 36,
      clusterProperties: {
        children: ['+', ['get', 'children']],
        safe: ['+', ['case', ['==', ['get', 'status'], 'safe'], ['get', 'children'], 0]],
        unsafe: ['+', ['case', ['in', ['get', 'status'], ['literal', ['unsafe', 'hazardous']]], ['get', 'children'], 0]],
      },
    });
    m.addLayer({
      id: 'catchments-fill',
      type: 'fill',
      source: 'catchments',
      paint: { 'fill-color': ['coalesce', ['get', 'shade'], '#cccccc'], 'fill-opacity': 0.3 },
    });
    m.addLayer({
      id: 'catchments-line',
      type: 'line',
      source: 'catchments',
      paint: {
        'line-color': '#5b5146',
        'line-width': ['case', ['boolean', ['get', 'selected'], false], 3, 1.2],
        'line-dasharray': [3, 2],
      },
    });
    const speed = ['get', 'speed_kmh'];
    const foot = ['in', ['get', 'class'], ['literal', ['path', 'steps']]];
    const width = ['match', ['get', 'class'], ...Object.entries(CLASS_WIDTH).flat(), 2];
    m.addLayer({
      id: 'streets-casing',
      type: 'line',
      source: 'streets',
      'source-layer': 'streets',
      filter: ['!', foot] as maplibregl.FilterSpecification,
      layout: { 'line-cap': 'round', 'line-join': 'round' },
      paint: {
        'line-color': '#ffffff',
        'line-width': ex(['interpolate', ['linear'], ['zoom'], 12, ['*', 0.7, width], 17, ['*', 3.2, width]]),
      },
    });
    m.addLayer({
      id: 'streets',
      type: 'line',
      source: 'streets',
      'source-layer': 'streets',
      filter: ['!', foot] as maplibregl.FilterSpecification,
      layout: { 'line-cap': 'round', 'line-join': 'round' },
      paint: {
        'line-color': ex(['case', ['<=', speed, 30], SPEED_BANDS[0].color, ['<=', speed, 50], SPEED_BANDS[1].color, SPEED_BANDS[2].color]),
        'line-width': ex(['interpolate', ['linear'], ['zoom'], 12, ['*', 0.45, width], 17, ['*', 2.2, width]]),
      },
    });
    m.addLayer({
      id: 'paths',
      type: 'line',
      source: 'streets',
      'source-layer': 'streets',
      filter: foot as maplibregl.FilterSpecification,
      paint: { 'line-color': PATH_COLOR, 'line-width': 2, 'line-dasharray': [2, 1.5] },
    });
    // What the find box found: a street drawn over, a point ringed.
    m.addLayer({
      id: 'found-line',
      type: 'line',
      source: 'found',
      filter: ['!=', ['geometry-type'], 'Point'],
      layout: { 'line-cap': 'round', 'line-join': 'round' },
      paint: { 'line-color': '#d49a2a', 'line-width': 8, 'line-opacity': 0.55 },
    });
    // The selected home's routes, drawn safe (widest, faint) under recommended under shortest.
    const routePaint: [string, Record<string, unknown>][] = [
      ['shortest', { 'line-color': ROUTE_STYLE.shortest.color, 'line-width': 3, 'line-dasharray': [1.5, 1.2], 'line-opacity': 0.85 }],
      ['safe', { 'line-color': ROUTE_STYLE.safe.color, 'line-width': 9, 'line-opacity': 0.35 }],
      ['recommended', { 'line-color': ROUTE_STYLE.recommended.color, 'line-width': 5, 'line-opacity': 0.75 }],
    ];
    for (const [kind, paint] of routePaint)
      m.addLayer({
        id: `sel-${kind}`,
        type: 'line',
        source: 'sel-routes',
        filter: ['==', ['get', 'kind'], kind],
        layout: { 'line-cap': 'round', 'line-join': 'round' },
        paint: paint as maplibregl.LineLayerSpecification['paint'],
      });
    // Street names along the lines, where they fit (MapLibre drops a label that collides).
    m.addLayer({
      id: 'street-names',
      type: 'symbol',
      source: 'street-names',
      minzoom: 14.5,
      layout: {
        'symbol-placement': 'line',
        'text-field': ['get', 'name'],
        'text-font': LABEL_FONT,
        'text-size': ['interpolate', ['linear'], ['zoom'], 15, 11, 18, 14],
        'text-max-angle': 35,
        'symbol-spacing': 280,
        'text-padding': 4,
      },
      paint: { 'text-color': '#26383a', 'text-halo-color': 'rgba(255, 253, 248, 0.95)', 'text-halo-width': 2 },
    });
    m.addLayer({
      id: 'hotspots',
      type: 'circle',
      source: 'hotspots',
      'source-layer': 'hotspots',
      paint: {
        'circle-color': HOTSPOT_COLOR,
        'circle-opacity': 0.35,
        'circle-stroke-color': HOTSPOT_COLOR,
        'circle-stroke-width': 1.5,
        'circle-radius': ['interpolate', ['linear'], ['sqrt', ['coalesce', ['get', 'weight'], 0]], 0, 0, 1, 22],
      },
    });
    m.addLayer({
      id: 'crossings',
      type: 'symbol',
      source: 'crossings',
      minzoom: 13.5,
      layout: {
        'icon-image': ['concat', 'dev-', ['get', 'symbol']],
        'icon-allow-overlap': true,
        'icon-size': ['interpolate', ['linear'], ['zoom'], 14, 0.6, 17, 1],
      },
    });
    m.addLayer({
      id: 'homes-cluster',
      type: 'circle',
      source: 'homes',
      filter: ['has', 'point_count'],
      paint: {
        // Share with a safe route among the grouped children inside the walk zone; grey when
        // every one of them lives beyond it.
        'circle-color': ex([
          'case', ['==', ['+', ['get', 'safe'], ['get', 'unsafe']], 0], '#8c8c8c',
          ['interpolate', ['linear'], ['/', ['get', 'safe'], ['+', ['get', 'safe'], ['get', 'unsafe']]],
            0, HOME_STATUS[1].color, 0.5, '#d9b441', 1, HOME_STATUS[0].color],
        ]),
        'circle-opacity': 0.8,
        'circle-stroke-color': '#ffffff',
        'circle-stroke-width': 1.5,
        'circle-radius': ['interpolate', ['linear'], ['sqrt', ['get', 'children']], 1, 6, 20, 26],
      },
    });
    m.addLayer({
      id: 'homes-pt',
      type: 'circle',
      source: 'homes',
      filter: ['!', ['has', 'point_count']],
      paint: {
        'circle-color': ex(['match', ['get', 'status'], ...HOME_STATUS.flatMap((s) => [s.key, s.color]), '#777']),
        'circle-radius': ['interpolate', ['linear'], ['zoom'], 14, 3.5, 18, 7],
        'circle-stroke-color': '#ffffff',
        'circle-stroke-width': 1,
      },
    });
    m.addLayer({
      id: 'sel-home',
      type: 'circle',
      source: 'sel-home',
      paint: { 'circle-radius': 10, 'circle-color': 'rgba(0,0,0,0)', 'circle-stroke-color': '#1b5fa7', 'circle-stroke-width': 3 },
    });
    m.addLayer({
      id: 'found-pt',
      type: 'circle',
      source: 'found',
      filter: ['==', ['geometry-type'], 'Point'],
      paint: { 'circle-radius': 14, 'circle-color': 'rgba(0,0,0,0)', 'circle-stroke-color': '#d49a2a', 'circle-stroke-width': 4 },
    });
    m.addLayer({
      id: 'qa',
      type: 'circle',
      source: 'qa',
      paint: { 'circle-radius': 6, 'circle-color': 'rgba(0,0,0,0)', 'circle-stroke-color': QA_COLOR, 'circle-stroke-width': 2.5 },
    });
    addCrashLayer(m, data);

    overlayLayers(m);
    m.on('click', (e) => {
      if (this.onPick) {
        const box: [maplibregl.PointLike, maplibregl.PointLike] = [[e.point.x - 8, e.point.y - 8], [e.point.x + 8, e.point.y + 8]];
        const cr = m.queryRenderedFeatures(box, { layers: ['crossings'] })[0];
        const st = m.queryRenderedFeatures(box, { layers: ['streets', 'paths'] })[0];
        const crAt = (cr?.geometry as unknown as { coordinates?: [number, number] } | undefined)?.coordinates;
        return this.onPick({
          at: [e.lngLat.lng, e.lngLat.lat],
          crossing: cr && crAt ? { id: String(cr.properties.id), at: crAt } : null,
          segment: st && st.properties.segment !== undefined ? Number(st.properties.segment) : null,
        });
      }
      const note = m.queryRenderedFeatures(e.point, { layers: ['notes-pt'] })[0];
      if (note && this.events.onNote) return this.events.onNote(String(note.properties.id));
      const spot = m.queryRenderedFeatures(e.point, { layers: ['crashes', 'hotspots', 'crossings', 'qa'] })[0];
      if (spot) {
        const props = spot.layer.id === 'hotspots' ? this.hotspotList[Number(spot.properties.i)]?.properties ?? {} : spot.properties;
        new maplibregl.Popup({ closeButton: true, maxWidth: '260px' }).setLngLat(e.lngLat).setDOMContent(popupContent(spot.layer.id, props)).addTo(m);
      }
      const hit = m.queryRenderedFeatures(e.point, { layers: ['homes-pt', 'homes-cluster', 'catchments-fill'] });
      const home = hit.find((f) => f.layer.id === 'homes-pt');
      if (home) return this.events.onHome(String(home.properties.id));
      const cluster = hit.find((f) => f.layer.id === 'homes-cluster');
      if (cluster) {
        const src = m.getSource('homes') as GeoJSONSource;
        src.getClusterExpansionZoom(cluster.properties.cluster_id as number).then((z) => {
          m.easeTo({ center: (cluster.geometry as unknown as { coordinates: [number, number] }).coordinates, zoom: z + 0.5 });
        });
        return;
      }
      const c = hit.find((f) => f.layer.id === 'catchments-fill');
      if (c && c.properties.school_id !== undefined) this.events.onCatchment(String(c.properties.school_id));
    });
    for (const id of ['homes-pt', 'homes-cluster', 'catchments-fill', 'hotspots', 'crossings', 'qa', 'notes-pt']) {
      m.on('mouseenter', id, () => (m.getCanvas().style.cursor = 'pointer'));
      m.on('mouseleave', id, () => (m.getCanvas().style.cursor = ''));
    }
  }

  private set(id: string, fc: FeatureCollection) {
    (this.map.getSource(id) as GeoJSONSource | undefined)?.setData(data(fc) as Parameters<GeoJSONSource['setData']>[0]);
  }

  /** Draws one audit. `catchmentFile` is the planner's catchments layer as loaded. */
  async show(view: View, catchmentFile: FeatureCollection | null, fit: boolean) {
    await this.loaded;
    const doc = view.doc;
    (this.map.getSource('streets') as VectorTileSource | undefined)?.setTiles([`cwstreets://${doc.audit_id}/{z}/{x}/{y}`]);
    this.set('crossings', {
      type: 'FeatureCollection',
      features: doc.layers.crossings.map((c) => ({
        type: 'Feature',
        geometry: { type: 'Point', coordinates: c.at },
        properties: { id: c.id, symbol: c.control.guard ? 'guard' : c.control.device, island: c.control.refuge_island },
      })),
    });
    this.set('homes', {
      type: 'FeatureCollection',
      features: view.homes.map((h) => ({
        type: 'Feature',
        geometry: { type: 'Point', coordinates: h.at },
        properties: { id: h.id, children: h.children, status: h.status },
      })),
    });
    this.set('qa', doc.qa);
    this.set('crashes', crashFeatures(doc));
    // The map's hotspot tiles hold each one's place, weight and index only; a popup reads the
    // rest from the view (a district's 34 000 hotspots as GeoJSON cost the map 190-280 MB).
    this.hotspotList = view.hotspots;
    (this.map.getSource('hotspots') as VectorTileSource | undefined)?.setTiles([`cwhotspots://${doc.audit_id}/{z}/{x}/{y}`]);
    this.setCatchments(view, catchmentFile, null);
    this.setSchools(view);
    if (fit) {
      const b = doc.bounds;
      if (b) this.map.fitBounds([[b[0], b[1]], [b[2], b[3]]], { padding: this.padding(20), duration: 0 });
    }
  }

  setCatchments(view: View, file: FeatureCollection | null, selected: string | null) {
    if (!file) return this.set('catchments', empty());
    const bySchool = new Map(view.catchments.map((c) => [c.schoolId, c]));
    const idOf = new Map(view.doc.layers.catchments.map((c) => [c.feature, c.school_id]));
    this.set('catchments', {
      type: 'FeatureCollection',
      features: file.features.map((f, i) => {
        const sid = idOf.get(i) ?? null;
        const row = sid !== null ? bySchool.get(sid) : undefined;
        return {
          type: 'Feature',
          geometry: f.geometry,
          properties: { school_id: sid, shade: deficitColor(row?.deficit ?? null), selected: sid !== null && sid === selected },
        };
      }),
    });
  }

  private setSchools(view: View) {
    for (const mk of this.schoolMarkers) mk.remove();
    this.schoolMarkers = [];
    for (const s of view.doc.layers.schools) {
      const at = s.entrances[0];
      if (!at) continue;
      const el = document.createElement('div');
      el.className = 'school-pin';
      el.innerHTML = `<span class="school-dot"></span><span class="school-name"></span>`;
      (el.querySelector('.school-name') as HTMLElement).textContent = s.name || s.id;
      el.addEventListener('click', (e) => {
        e.stopPropagation();
        this.events.onCatchment(s.id);
      });
      this.schoolMarkers.push(new maplibregl.Marker({ element: el, anchor: 'left', offset: [-7, 0] }).setLngLat(at).addTo(this.map));
    }
  }

  /** The planner's street names, drawn along their streets. */
  async setStreetNames(fc: FeatureCollection) {
    await this.loaded;
    this.set('street-names', fc);
  }

  /** Marks what the find box found (or clears it with an empty list). */
  showFound(features: Feature[]) {
    this.set('found', { type: 'FeatureCollection', features });
  }

  /** Draws the planner's PMTiles archive as the basemap, under every audit layer. */
  async setBasemap(file: File | null): Promise<BasemapInfo | null> {
    await this.loaded;
    if (!file) { removeBasemap(this.map); return null; }
    return addBasemap(this.map, file, 'catchments-fill');
  }

  /** Draws routes (and a ring on the home when one is selected). */
  showRoutes(routes: Feature[], home: [number, number] | null) {
    this.set('sel-routes', { type: 'FeatureCollection', features: routes });
    this.set('sel-home', {
      type: 'FeatureCollection',
      features: home ? [{ type: 'Feature', geometry: { type: 'Point', coordinates: home }, properties: {} }] : [],
    });
  }

  /** A scenario's interventions and the site-visit notes, drawn over the audit. */
  async setOverlay(edits: FeatureCollection | null, notes: FeatureCollection | null) {
    await this.loaded;
    if (edits) this.set('edits', edits);
    if (notes) this.set('notes', notes);
  }

  /** A comparison's routes: `kind` 'before' or 'after' on each feature. */
  showComparison(routes: Feature[]) {
    this.set('cmp-routes', { type: 'FeatureCollection', features: routes });
  }

  /** The crosshair while a tool is armed. */
  armed(on: boolean) {
    this.map.getCanvas().style.cursor = on ? 'crosshair' : '';
    this.map.getContainer().classList.toggle('armed', on);
  }

  /** Room on the left for the legend when it is open, so fitted features are not under it. */
  private padding(extra: number) {
    const legend = document.getElementById('legend');
    const capture = this.map.getContainer().classList.contains('capture');
    const left = legend && !capture && !legend.classList.contains('folded') ? legend.offsetWidth + 20 : 0;
    return { top: extra, bottom: extra, right: extra, left: left + extra };
  }

  /** Fits the map to west, south, east, north bounds (nothing for none). */
  fitBox(b: [number, number, number, number] | null, maxZoom = 17) {
    const still = this.map.getContainer().classList.contains('capture');
    if (b) this.map.fitBounds([[b[0], b[1]], [b[2], b[3]]], { padding: this.padding(50), maxZoom, duration: still ? 0 : 300 });
  }

  fit(fc: FeatureCollection | Feature[], maxZoom = 17) {
    const b = bounds({ type: 'FeatureCollection', features: Array.isArray(fc) ? fc : fc.features });
    const still = this.map.getContainer().classList.contains('capture');
    if (b) this.map.fitBounds(b, { padding: this.padding(50), maxZoom, duration: still ? 0 : 300 });
  }

  /** Hides (or shows again) every layer that places a single home: homes and routes. */
  hideHomes(hide: boolean) {
    for (const id of ['homes-cluster', 'homes-pt', 'sel-home', 'sel-shortest', 'sel-recommended', 'sel-safe'])
      if (this.map.getLayer(id)) this.map.setLayoutProperty(id, 'visibility', hide ? 'none' : 'visible');
  }

  /** The map as a PNG, with a scale bar and a north arrow drawn on it (for the report). */
  image(): string {
    const src = this.map.getCanvas();
    const c = document.createElement('canvas');
    c.width = src.width;
    c.height = src.height;
    const g = c.getContext('2d');
    if (!g) return src.toDataURL('image/png');
    g.drawImage(src, 0, 0);
    const k = src.width / Math.max(1, this.map.getContainer().clientWidth);
    // Scale: metres per CSS pixel at the centre (512-pixel world at zoom 0, Web Mercator).
    const lat = this.map.getCenter().lat;
    const mPerPx = (40075016.686 * Math.cos((lat * Math.PI) / 180)) / (512 * 2 ** this.map.getZoom());
    const nice = [10, 20, 50, 100, 200, 250, 500, 1000, 2000, 5000, 10000].filter((m) => m / mPerPx <= 160).pop() ?? 10;
    const w = (nice / mPerPx) * k;
    // Marks drawn half as large again: the report shows the image scaled down.
    const u = k * 1.5;
    const x = 16 * u, y = src.height - 18 * u;
    g.fillStyle = 'rgba(255, 253, 248, 0.9)';
    g.fillRect(x - 8 * u, y - 24 * u, w + 16 * u + 60 * u, 34 * u);
    g.strokeStyle = '#1e2a2b';
    g.lineWidth = 2 * u;
    g.beginPath();
    g.moveTo(x, y - 6 * u); g.lineTo(x, y); g.lineTo(x + w, y); g.lineTo(x + w, y - 6 * u);
    g.stroke();
    g.fillStyle = '#1e2a2b';
    g.font = `${12 * u}px sans-serif`;
    g.fillText(nice >= 1000 ? `${nice / 1000} km` : `${nice} m`, x + w + 8 * u, y);
    // North arrow, turned with the map's bearing.
    const cx = src.width - 28 * u, cy = 34 * u;
    g.save();
    g.fillStyle = 'rgba(255, 253, 248, 0.9)';
    g.beginPath(); g.arc(cx, cy, 20 * u, 0, 2 * Math.PI); g.fill();
    g.translate(cx, cy);
    g.rotate((-this.map.getBearing() * Math.PI) / 180);
    g.fillStyle = '#1e2a2b';
    g.beginPath(); g.moveTo(0, -14 * u); g.lineTo(7 * u, 8 * u); g.lineTo(0, 4 * u); g.lineTo(-7 * u, 8 * u); g.closePath(); g.fill();
    g.font = `bold ${10 * u}px sans-serif`;
    g.textAlign = 'center';
    g.fillText('N', 0, 19 * u);
    g.restore();
    this.lastScale = { metres: nice, px: w / k };
    return c.toDataURL('image/png');
  }

  /** The last report image's scale bar: the metres it stands for and its length in CSS pixels. */
  lastScale = { metres: 0, px: 0 };
}

/** Layers for the comparison's routes, the scenario's interventions and the notes. */
function overlayLayers(m: MlMap) {
  m.addLayer({ id: 'cmp-before', type: 'line', source: 'cmp-routes', filter: ex(['==', ['get', 'kind'], 'before']),
    layout: { 'line-cap': 'round', 'line-join': 'round' }, paint: { 'line-color': CMP_BEFORE, 'line-width': 7, 'line-opacity': 0.75 } });
  m.addLayer({ id: 'cmp-after', type: 'line', source: 'cmp-routes', filter: ex(['==', ['get', 'kind'], 'after']),
    layout: { 'line-cap': 'round', 'line-join': 'round' }, paint: { 'line-color': CMP_AFTER, 'line-width': 3.5, 'line-dasharray': [2, 1.2] } });
  const tint = ex(['case', ['==', ['get', 'origin'], 'observation'], OBSERVED_COLOR, EDIT_COLOR]);
  m.addLayer({ id: 'edits-line', type: 'line', source: 'edits', filter: ex(['!=', ['geometry-type'], 'Point']),
    layout: { 'line-cap': 'round' }, paint: { 'line-color': tint, 'line-width': 5, 'line-opacity': 0.85 } });
  m.addLayer({ id: 'edits-pt', type: 'circle', source: 'edits', filter: ex(['==', ['geometry-type'], 'Point']),
    paint: { 'circle-radius': 8, 'circle-color': 'rgba(0,0,0,0)', 'circle-stroke-color': tint, 'circle-stroke-width': 3 } });
  m.addLayer({ id: 'edits-label', type: 'symbol', source: 'edits', filter: ex(['==', ['geometry-type'], 'Point']),
    layout: { 'text-field': ['get', 'label'], 'text-font': LABEL_FONT, 'text-size': 11, 'text-variable-anchor': ['top', 'bottom', 'left', 'right', 'top-left', 'bottom-right'], 'text-radial-offset': 1.1, 'text-allow-overlap': false, 'text-ignore-placement': false },
    paint: { 'text-color': tint, 'text-halo-color': '#fffdf8', 'text-halo-width': 1.5 } });
  m.addLayer({ id: 'notes-pt', type: 'circle', source: 'notes',
    paint: { 'circle-radius': 7, 'circle-color': NOTE_COLOR, 'circle-stroke-color': '#1e2a2b', 'circle-stroke-width': ex(['case', ['get', 'open'], 3, 1.5]) } });
  m.addLayer({ id: 'notes-label', type: 'symbol', source: 'notes',
    layout: { 'text-field': ['get', 'label'], 'text-font': LABEL_FONT, 'text-size': 10, 'text-allow-overlap': true }, paint: { 'text-color': '#1e2a2b' } });
}

/** What a popup says about a hotspot, a crossing point or a network check. */
function popupContent(layer: string, p: Record<string, unknown>): HTMLElement {
  const div = document.createElement('div');
  div.className = 'popup';
  const line = (k: string, v: unknown) => {
    if (v === null || v === undefined || v === '') return;
    const row = document.createElement('div');
    if (k) {
      const b = document.createElement('b');
      b.textContent = `${k}: `;
      row.append(b);
    }
    row.append(String(v));
    div.append(row);
  };
  if (layer === 'hotspots') {
    line('Hotspot', `#${p['rank']} ${p['kind'] === 'crossing' ? 'crossing of' : 'walking along'} ${p['street']}`);
    line('Control', String(p['control'] ?? '').replace(/_/g, ' '));
    line('Traffic', `${p['speed_kmh']} km/h, ${p['lanes']} lanes`);
    line('Children routed', p['children']);
    line('Risk of the edge', Number(p['risk']).toFixed(2));
    line('Children × risk', Number(p['product']).toFixed(1));
    if (p['wait_s'] !== null && p['wait_s'] !== undefined) line('Average wait', `${Math.round(Number(p['wait_s']))} s (level of service ${p['los']})`);
    if (Number(p['crashes'] ?? 0) > 0) line('Observed crashes', `${p['crashes']} (${p['crashes_pedestrian']} with a pedestrian, ${p['crashes_ksi']} killed or seriously injured)`);
  } else if (layer === 'crashes') {
    for (const [k, v] of crashPopupLines(p)) line(k, v);
  } else if (layer === 'crossings') {
    line('Crossing', p['id']);
    line('Control', String(p['symbol']).replace(/_/g, ' ') + (p['island'] ? ' with refuge island' : ''));
  } else {
    line('Network check', String(p['kind']).replace(/_/g, ' '));
    line('', p['message']);
  }
  return div;
}

function collect(c: unknown, out: [number, number][] = []): [number, number][] {
  if (Array.isArray(c) && typeof c[0] === 'number') out.push([c[0], c[1] as number]);
  else if (Array.isArray(c)) for (const x of c) collect(x, out);
  return out;
}

/** The bounding box of a collection, or null when it has no coordinates. */
export function bounds(fc: FeatureCollection): LngLatBoundsLike | null {
  let x0 = Infinity, y0 = Infinity, x1 = -Infinity, y1 = -Infinity;
  for (const f of fc.features) {
    for (const [x, y] of collect(f.geometry?.coordinates)) {
      if (!isFinite(x) || !isFinite(y) || Math.abs(x) > 180 || Math.abs(y) > 90) continue;
      x0 = Math.min(x0, x); y0 = Math.min(y0, y); x1 = Math.max(x1, x); y1 = Math.max(y1, y);
    }
  }
  if (!isFinite(x0)) return null;
  if (x0 === x1 && y0 === y1) return [[x0 - 0.001, y0 - 0.001], [x1 + 0.001, y1 + 0.001]];
  return [[x0, y0], [x1, y1]];
}
