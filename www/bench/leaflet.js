// Bench page script: time for Leaflet (canvas renderer) to draw the same GeoJSON.
import L from 'leaflet';

const frames = () => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r)));

window.runBench = async (fc) => {
  const tasks = [];
  new PerformanceObserver((l) => l.getEntries().forEach((e) => tasks.push(e.duration))).observe({ type: 'longtask', buffered: false });
  const map = L.map('map', { preferCanvas: true, attributionControl: false }).setView([42, -35], 12);
  const t0 = performance.now();
  L.geoJSON(fc, { renderer: L.canvas(), style: (f) => ({ color: f.properties.speed_kmh <= 30 ? '#3f8f74' : '#b8412f', weight: 1.5 }) }).addTo(map);
  await frames();
  const first = performance.now() - t0;
  const t1 = performance.now();
  map.setView([42.01, -35.01], 14, { animate: false });
  await frames();
  const zoom = performance.now() - t1;
  const t2 = performance.now();
  map.panBy([400, 0], { animate: false });
  await frames();
  const pan = performance.now() - t2;
  return { first_ms: first, zoom_ms: zoom, pan_ms: pan, longest_task_ms: Math.max(0, ...tasks) };
};
