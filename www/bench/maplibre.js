// Bench page script: time for MapLibre GL JS to draw a large street GeoJSON (no tiles).
import maplibregl from 'maplibre-gl';

window.runBench = async (fc) => {
  const tasks = [];
  new PerformanceObserver((l) => l.getEntries().forEach((e) => tasks.push(e.duration))).observe({ type: 'longtask', buffered: false });
  const map = new maplibregl.Map({
    container: 'map',
    style: { version: 8, sources: {}, layers: [{ id: 'bg', type: 'background', paint: { 'background-color': '#f3efe6' } }] },
    center: [-35, 42], zoom: 12, attributionControl: false,
  });
  await new Promise((r) => map.on('load', r));
  const t0 = performance.now();
  map.addSource('s', { type: 'geojson', data: fc });
  map.addLayer({ id: 'l', type: 'line', source: 's', paint: { 'line-color': ['case', ['<=', ['get', 'speed_kmh'], 30], '#3f8f74', '#b8412f'], 'line-width': 1.5 } });
  await new Promise((r) => map.once('idle', r));
  const first = performance.now() - t0;
  const t1 = performance.now();
  map.jumpTo({ zoom: 14, center: [-35.01, 42.01] });
  await new Promise((r) => map.once('idle', r));
  const zoom = performance.now() - t1;
  const t2 = performance.now();
  map.panBy([400, 0], { animate: false });
  await new Promise((r) => map.once('idle', r));
  const pan = performance.now() - t2;
  return { first_ms: first, zoom_ms: zoom, pan_ms: pan, longest_task_ms: Math.max(0, ...tasks) };
};
