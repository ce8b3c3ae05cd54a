// Charts (Chart.js, vendored in the bundle): benefit against risk, route lengths, hotspots.

import { Chart, registerables, type Plugin } from 'chart.js';
import type { View } from './model';
import { HOTSPOT_COLOR, SPEED_BANDS } from './palette';

Chart.register(...registerables);
Chart.defaults.font.family = 'system-ui, sans-serif';
Chart.defaults.animation = false;

const charts = new Map<string, Chart>();

/** Colours of the core's balance classes (walk-zone share and safe-route share). */
export const QUADRANT_COLOR: Record<string, string> = {
  walkable_and_safe: 'rgba(47,125,91,0.75)',
  walkable_but_unsafe: 'rgba(224,123,57,0.8)',
  far_but_safe: 'rgba(120,140,160,0.75)',
  far_and_unsafe: 'rgba(142,27,44,0.8)',
};

function replace(id: string, make: (c: HTMLCanvasElement) => Chart) {
  charts.get(id)?.destroy();
  const canvas = document.getElementById(id) as HTMLCanvasElement | null;
  if (canvas) charts.set(id, make(canvas));
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? (s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2) : 0;
};

/** Quadrant lines at the median risk and median benefit, with a name in each quadrant. */
function quadrants(xMid: number, yMid: number): Plugin<'scatter'> {
  return {
    id: 'quadrants',
    beforeDatasetsDraw(chart) {
      const { ctx, chartArea: a, scales } = chart;
      const x = scales.x.getPixelForValue(xMid);
      const y = scales.y.getPixelForValue(yMid);
      ctx.save();
      ctx.fillStyle = 'rgba(63,143,116,0.08)';
      ctx.fillRect(a.left, a.top, x - a.left, y - a.top);
      ctx.fillStyle = 'rgba(184,65,47,0.08)';
      ctx.fillRect(x, y, a.right - x, a.bottom - y);
      ctx.strokeStyle = '#8a8172';
      ctx.setLineDash([4, 3]);
      ctx.beginPath();
      ctx.moveTo(x, a.top); ctx.lineTo(x, a.bottom);
      ctx.moveTo(a.left, y); ctx.lineTo(a.right, y);
      ctx.stroke();
      ctx.fillStyle = '#5b5146';
      ctx.font = '11px system-ui, sans-serif';
      ctx.textAlign = 'left';
      ctx.fillText('more walking, less risk', a.left + 4, a.top + 12);
      ctx.textAlign = 'right';
      ctx.fillText('more walking, more risk', a.right - 4, a.top + 12);
      ctx.fillText('less walking, more risk', a.right - 4, a.bottom - 6);
      ctx.textAlign = 'left';
      ctx.fillText('less walking, less risk', a.left + 4, a.bottom - 6);
      ctx.restore();
    },
  };
}

/** Writes each catchment's school name beside its point. */
const pointNames: Plugin<'scatter'> = {
  id: 'pointNames',
  afterDatasetsDraw(chart) {
    const { ctx } = chart;
    const meta = chart.getDatasetMeta(0);
    ctx.save();
    ctx.font = '10.5px system-ui, sans-serif';
    ctx.fillStyle = '#203b3e';
    meta.data.forEach((pt, i) => {
      const d = chart.data.datasets[0].data[i] as unknown as { name: string };
      const short = d.name.replace(/ (Elementary|Secondary)? ?School$/, '');
      const right = pt.x < chart.chartArea.right - 90;
      ctx.textAlign = right ? 'left' : 'right';
      ctx.fillText(short, pt.x + (right ? 9 : -9), pt.y + 3 + (i % 2 ? 9 : -4));
    });
    ctx.restore();
  },
};

export function drawCharts(view: View) {
  const pts = view.catchments.filter((c) => c.riskPerTrip !== null && c.activeMin !== null);
  const xMid = median(pts.map((c) => c.riskPerTrip as number));
  const yMid = median(pts.map((c) => c.activeMin as number));
  replace('c-scatter', (canvas) => new Chart(canvas, {
    type: 'scatter',
    data: {
      datasets: [{
        label: 'catchments',
        data: pts.map((c) => ({ x: c.riskPerTrip as number, y: c.activeMin as number, name: c.name || c.schoolId, children: c.children })),
        pointRadius: pts.map((c) => 4 + Math.sqrt(c.children) / 2),
        backgroundColor: pts.map((c) => QUADRANT_COLOR[c.quadrant ?? ''] ?? 'rgba(27,95,167,0.55)'),
        borderColor: '#203b3e',
      }],
    },
    options: {
      maintainAspectRatio: false,
      plugins: {
        legend: { display: false },
        tooltip: { callbacks: { label: (c) => { const d = c.raw as { name: string; x: number; y: number; children: number }; return `${d.name}: ${d.y.toFixed(1)} active min/day, risk ${d.x.toFixed(2)}/trip, ${d.children} children`; } } },
      },
      scales: {
        x: { title: { display: true, text: 'mean risk per trip (points)' }, beginAtZero: true },
        y: { title: { display: true, text: 'active minutes a day (two trips)' }, beginAtZero: true },
      },
    },
    plugins: [quadrants(xMid, yMid), pointNames],
  }));

  const key = document.getElementById('scatter-key');
  if (key) {
    const classes = [...new Set(pts.map((c) => c.quadrant).filter((q): q is string => !!q))];
    key.replaceChildren(...classes.map((q) => {
      const span = document.createElement('span');
      const dot = document.createElement('i');
      dot.style.background = QUADRANT_COLOR[q] ?? '#888';
      span.append(dot, q.replace(/_/g, ' '));
      return span;
    }));
    if (classes.length) key.append(document.createTextNode(' — colour: the balance class (walk-zone share and safe-route share against their thresholds); dashed lines: district medians.'));
  }

  // Route lengths, weighted by children, in 200 m bins, the walk zone marked.
  const bin = 200;
  const lens = view.homes.filter((h) => h.shortestM !== null).map((h) => ({ m: h.shortestM ?? 0, w: h.children }));
  // A loop, not a spread: a county's homes are more arguments than a call may take.
  const top = lens.reduce((t, l) => Math.max(t, l.m), view.walkZoneM * 1.5);
  const nb = Math.max(1, Math.ceil(top / bin));
  const counts = new Array(nb).fill(0);
  for (const l of lens) counts[Math.min(nb - 1, Math.floor(l.m / bin))] += l.w;
  const zoneBin = view.walkZoneM / bin;
  replace('c-lengths', (canvas) => new Chart(canvas, {
    type: 'bar',
    data: {
      labels: counts.map((_, i) => `${((i * bin) / 1000).toFixed(1)}`),
      datasets: [{
        label: 'children',
        data: counts,
        backgroundColor: counts.map((_, i) => (i + 1 <= zoneBin ? SPEED_BANDS[0].color : '#a8a195')),
        barPercentage: 1,
        categoryPercentage: 0.96,
      }],
    },
    options: {
      maintainAspectRatio: false,
      plugins: { legend: { display: false } },
      scales: {
        x: { title: { display: true, text: `shortest route, km (green: inside the ${view.walkZoneM} m walk zone)` } },
        y: { title: { display: true, text: 'children' }, beginAtZero: true },
      },
    },
  }));

  // The hotspots come ranked by children × risk: the first ten are the top ten (a district has
  // tens of thousands). A label stays within the third of the chart its axis may take.
  const clip = (s: string, n: number) => (s.length > n ? `${s.slice(0, n - 1)}…` : s);
  const hot = view.hotspots.slice(0, 10).map((f) => {
    const p = f.properties;
    const control = String(p['control'] ?? '').replace('sidewalk_absent', 'no sidewalk').replace('sidewalk_unknown', 'sidewalk?').replace(/_/g, ' ');
    const what = p['kind'] === 'crossing' ? ` × ${control}` : `, ${control}`;
    return { label: clip(`${String(p['rank'] ?? '')}. ${clip(String(p['street'] ?? ''), 14)}${what}`, 28), v: Number(p['product'] ?? 0) };
  });
  replace('c-hotspots', (canvas) => new Chart(canvas, {
    type: 'bar',
    data: { labels: hot.map((h) => h.label), datasets: [{ label: 'children × risk', data: hot.map((h) => h.v), backgroundColor: HOTSPOT_COLOR }] },
    options: {
      indexAxis: 'y',
      maintainAspectRatio: false,
      plugins: { legend: { display: false }, title: { display: hot.length === 0, text: 'No hotspots in this audit' } },
      scales: { x: { title: { display: true, text: 'children routed × risk points' }, beginAtZero: true }, y: { ticks: { autoSkip: false, font: { size: 10.5 } } } },
    },
  }));
}

const CAPTIONS: Record<string, string> = {
  'c-scatter': 'Benefit against risk, per catchment (district)',
  'c-lengths': 'Shortest route lengths against the walk zone (district)',
  'c-hotspots': 'Top hotspots: children × risk (district)',
};

/** The charts as images with their captions, for the printable report. */
export function chartImages(): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [id, c] of charts) out[CAPTIONS[id] ?? id] = c.toBase64Image('image/png', 1);
  return out;
}
