// catchwalk's own palette and symbols: speed bands, classes, crossing controls, home status.

export const PAPER = '#f3efe6';

export const SPEED_BANDS = [
  { key: 'le30', label: '30 km/h or less', color: '#3f8f74' },
  { key: '31_50', label: '31–50 km/h', color: '#d49a2a' },
  { key: 'gt50', label: 'over 50 km/h', color: '#b8412f' },
] as const;

export const PATH_COLOR = '#7b6bb3';

export const CLASS_WIDTH: Record<string, number> = {
  arterial: 5,
  collector: 3.4,
  local: 2,
  service: 1.3,
  path: 1.6,
  steps: 1.6,
};

export const HOME_STATUS = [
  { key: 'safe', label: 'has a safe route', color: '#2f7d5b' },
  { key: 'unsafe', label: 'no safe route', color: '#e07b39' },
  { key: 'hazardous', label: 'no safe route, hazardous one', color: '#8e1b2c' },
  { key: 'beyond', label: 'beyond the walk zone', color: '#8c8c8c' },
  { key: 'unreached', label: 'no route found', color: '#111111' },
] as const;

export const ROUTE_STYLE = {
  recommended: { color: '#1b5fa7', label: 'recommended route' },
  shortest: { color: '#262626', label: 'shortest route' },
  safe: { color: '#2f9e6b', label: 'safe route (shortest that no rule flags)' },
};

export const DEVICES: { key: string; label: string }[] = [
  { key: 'signal', label: 'signal with walk phase' },
  { key: 'all_way_stop', label: 'all-way stop' },
  { key: 'stop', label: 'stop sign on the crossed leg' },
  { key: 'yield', label: 'yield sign on the crossed leg' },
  { key: 'beacon', label: 'flashing beacon' },
  { key: 'marked', label: 'marked crosswalk only' },
  { key: 'none', label: 'nothing (uncontrolled)' },
  { key: 'guard', label: 'crossing guard' },
];

export const QA_COLOR = '#d0368a';
export const HOTSPOT_COLOR = '#e0412b';

/** Draws one crossing symbol (size px, already scaled for the device pixel ratio). */
export function drawDevice(ctx: CanvasRenderingContext2D, key: string, s: number): void {
  const c = s / 2;
  ctx.lineWidth = s * 0.08;
  ctx.strokeStyle = '#1b1b1b';
  const poly = (n: number, r: number, rot: number) => {
    ctx.beginPath();
    for (let i = 0; i < n; i++) {
      const a = rot + (i * 2 * Math.PI) / n;
      const x = c + r * Math.cos(a);
      const y = c + r * Math.sin(a);
      if (i === 0) ctx.moveTo(x, y);
      else ctx.lineTo(x, y);
    }
    ctx.closePath();
  };
  switch (key) {
    case 'signal': {
      ctx.fillStyle = '#1f2b33';
      ctx.beginPath();
      ctx.roundRect(s * 0.28, s * 0.06, s * 0.44, s * 0.88, s * 0.12);
      ctx.fill();
      ['#e25541', '#f0c23c', '#3fae6d'].forEach((col, i) => {
        ctx.fillStyle = col;
        ctx.beginPath();
        ctx.arc(c, s * (0.24 + i * 0.26), s * 0.1, 0, 2 * Math.PI);
        ctx.fill();
      });
      break;
    }
    case 'all_way_stop':
      ctx.fillStyle = '#b3261e';
      poly(8, s * 0.45, Math.PI / 8);
      ctx.fill();
      ctx.strokeStyle = '#ffffff';
      poly(8, s * 0.34, Math.PI / 8);
      ctx.stroke();
      break;
    case 'stop':
      ctx.fillStyle = '#b3261e';
      poly(4, s * 0.44, 0);
      ctx.fill();
      ctx.strokeStyle = '#ffffff';
      poly(4, s * 0.28, 0);
      ctx.stroke();
      break;
    case 'yield':
      // A downward triangle, red rim on white: drivers yield but need not stop.
      ctx.fillStyle = '#b3261e';
      poly(3, s * 0.46, Math.PI / 2);
      ctx.fill();
      ctx.fillStyle = '#ffffff';
      poly(3, s * 0.24, Math.PI / 2);
      ctx.fill();
      break;
    case 'beacon':
      ctx.fillStyle = '#f2b705';
      ctx.beginPath();
      ctx.arc(c, c, s * 0.26, 0, 2 * Math.PI);
      ctx.fill();
      ctx.stroke();
      for (let i = 0; i < 8; i++) {
        const a = (i * Math.PI) / 4;
        ctx.beginPath();
        ctx.moveTo(c + s * 0.33 * Math.cos(a), c + s * 0.33 * Math.sin(a));
        ctx.lineTo(c + s * 0.46 * Math.cos(a), c + s * 0.46 * Math.sin(a));
        ctx.stroke();
      }
      break;
    case 'marked':
      ctx.fillStyle = '#ffffff';
      ctx.fillRect(s * 0.1, s * 0.1, s * 0.8, s * 0.8);
      ctx.fillStyle = '#1b1b1b';
      for (let i = 0; i < 4; i++) ctx.fillRect(s * (0.16 + i * 0.2), s * 0.14, s * 0.1, s * 0.72);
      ctx.strokeRect(s * 0.1, s * 0.1, s * 0.8, s * 0.8);
      break;
    case 'guard':
      ctx.fillStyle = '#6a3fa0';
      poly(6, s * 0.45, 0);
      ctx.fill();
      ctx.fillStyle = '#ffffff';
      ctx.beginPath();
      ctx.arc(c, s * 0.33, s * 0.1, 0, 2 * Math.PI);
      ctx.fill();
      ctx.fillRect(s * 0.4, s * 0.46, s * 0.2, s * 0.3);
      break;
    default:
      ctx.fillStyle = '#ffffff';
      ctx.beginPath();
      ctx.arc(c, c, s * 0.3, 0, 2 * Math.PI);
      ctx.fill();
      ctx.strokeStyle = '#6b6b6b';
      ctx.lineWidth = s * 0.12;
      ctx.stroke();
  }
}

/** A crossing symbol as an image for the map or a data URL for the legend. */
export function deviceImage(key: string, px: number): { canvas: HTMLCanvasElement; data: ImageData } {
  const canvas = document.createElement('canvas');
  canvas.width = px;
  canvas.height = px;
  const ctx = canvas.getContext('2d') as CanvasRenderingContext2D;
  drawDevice(ctx, key, px);
  return { canvas, data: ctx.getImageData(0, 0, px, px) };
}

/** Shading of a catchment by its deficit (0 = every child in the walk zone has a safe route). */
export function deficitColor(d: number | null): string {
  if (d === null || !isFinite(d)) return '#cfcfcf';
  const stops = [
    [0, [214, 234, 206]],
    [0.25, [246, 221, 160]],
    [0.5, [238, 164, 112]],
    [1, [196, 72, 52]],
  ] as const;
  const x = Math.max(0, Math.min(1, d));
  for (let i = 1; i < stops.length; i++) {
    const [x1, c1] = stops[i];
    const [x0, c0] = stops[i - 1];
    if (x <= x1) {
      const t = (x - x0) / (x1 - x0);
      const rgb = c0.map((v, k) => Math.round(v + (c1[k] - v) * t));
      return `rgb(${rgb[0]},${rgb[1]},${rgb[2]})`;
    }
  }
  return 'rgb(196,72,52)';
}

/** A scenario's interventions on the map; a correction observed on site in its own colour. */
export const EDIT_COLOR = '#6b3fa0';
export const OBSERVED_COLOR = '#c2571a';
/** Site-visit notes. */
export const NOTE_COLOR = '#f2c14e';
/** A comparison's routes: before (wide, pale) under after (narrow, dashed). */
export const CMP_BEFORE = '#9aa3a6';
export const CMP_AFTER = '#1f7a5a';
