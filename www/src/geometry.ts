// Small plane geometry for placing a click on the drawn network (metres on a local
// equirectangular plane: good to centimetres over the few metres a click spans).

import type { Feature, LonLat } from './types';

const M_PER_DEG = 111_320;

function plane(o: LonLat) {
  const k = Math.cos((o[1] * Math.PI) / 180);
  return {
    to: (p: LonLat): [number, number] => [(p[0] - o[0]) * M_PER_DEG * k, (p[1] - o[1]) * M_PER_DEG],
    from: (x: number, y: number): LonLat => [o[0] + x / (M_PER_DEG * k), o[1] + y / M_PER_DEG],
  };
}

export function distanceM(a: LonLat, b: LonLat): number {
  const [x, y] = plane(a).to(b);
  return Math.hypot(x, y);
}

/** The vertices of a LineString or MultiLineString feature, as lines. */
export function lines(f: Feature): LonLat[][] {
  const g = f.geometry;
  if (!g) return [];
  if (g.type === 'LineString') return [g.coordinates as LonLat[]];
  if (g.type === 'MultiLineString') return g.coordinates as LonLat[][];
  return [];
}

export interface Snap {
  at: LonLat;
  distanceM: number;
  /** Which side of the line's drawn direction the clicked point lies on. */
  side: 'left' | 'right';
  /** The nearest vertex of the line and its distance. */
  vertex: LonLat;
  vertexM: number;
}

/** The point of `f` nearest to `p`, the side `p` is on, and the nearest vertex. */
export function snapToLine(f: Feature, p: LonLat): Snap | null {
  const pl = plane(p);
  let best: Snap | null = null;
  for (const line of lines(f)) {
    for (let i = 0; i + 1 < line.length; i++) {
      const a = pl.to(line[i]);
      const b = pl.to(line[i + 1]);
      const dx = b[0] - a[0], dy = b[1] - a[1];
      const len2 = dx * dx + dy * dy;
      const t = len2 > 0 ? Math.max(0, Math.min(1, (-a[0] * dx - a[1] * dy) / len2)) : 0;
      const x = a[0] + t * dx, y = a[1] + t * dy;
      const d = Math.hypot(x, y);
      if (best && d >= best.distanceM) continue;
      // The click is at the origin: its side is the sign of (b - a) × (p - a).
      const cross = dx * -a[1] - dy * -a[0];
      const da = Math.hypot(a[0], a[1]), db = Math.hypot(b[0], b[1]);
      best = { at: pl.from(x, y), distanceM: d, side: cross >= 0 ? 'left' : 'right', vertex: da <= db ? line[i] : line[i + 1], vertexM: Math.min(da, db) };
    }
  }
  return best;
}
