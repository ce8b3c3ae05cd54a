// Settings: the numeric fields of the core's config, with labels a planner reads.

import { el } from './dom';

type Cfg = Record<string, Record<string, unknown>>;

const LABELS: Record<string, [string, string]> = {
  'benefit.walk_zone_m': ['Walk zone', 'm of network distance'],
  'benefit.walking_speed_mps': ["Child's walking speed", 'm/s'],
  'route.detour_cap': ['Detour cap', '× the shortest route'],
  'route.metres_per_risk_point': ['Weight of risk', 'm of detour per risk point'],
};

/** Sections shown; network building settings stay in the config file. */
const SECTIONS = ['benefit', 'route', 'safe', 'safety', 'score'];

const readable = (k: string) => k.replace(/_/g, ' ').replace(/\b(m|mps|kmh)$/, (u) => ({ m: '(m)', mps: '(m/s)', kmh: '(km/h)' })[u] ?? u);

export class Settings {
  private base: Cfg = {};
  private values = new Map<string, number>();

  constructor(private form: HTMLFormElement, private onChange: () => void) {}

  init(defaultJson: string) {
    try { this.base = JSON.parse(defaultJson) as Cfg; } catch { this.base = {}; }
    const fields: HTMLElement[] = [];
    const order = Object.keys(LABELS);
    const keys: string[] = [];
    for (const sec of SECTIONS) {
      const s = this.base[sec];
      if (!s || typeof s !== 'object') continue;
      for (const [k, v] of Object.entries(s)) if (typeof v === 'number') keys.push(`${sec}.${k}`);
    }
    keys.sort((a, b) => (order.indexOf(a) + 1 || 99) - (order.indexOf(b) + 1 || 99));
    for (const key of keys) {
      const [sec, k] = key.split('.');
      const v = this.base[sec][k] as number;
      this.values.set(key, v);
      const [label, unit] = LABELS[key] ?? [readable(k), ''];
      const input = el('input', { type: 'number', step: 'any', value: String(v), name: key, id: `set-${key.replace('.', '-')}` });
      input.addEventListener('change', () => {
        const n = Number(input.value);
        if (!isFinite(n) || input.value === '') { input.value = String(this.values.get(key)); return; }
        this.values.set(key, n);
        this.onChange();
      });
      fields.push(el('label', { class: 'setting' }, el('span', {}, label), input, el('small', {}, unit)));
    }
    const reset = el('button', { type: 'button' }, 'Back to defaults');
    reset.addEventListener('click', () => { this.form.replaceChildren(); this.values.clear(); this.init(defaultJson); this.onChange(); });
    this.form.replaceChildren(...fields, reset);
  }

  /** The config JSON for the core: defaults with the planner's values. */
  json(): string {
    const cfg: Cfg = JSON.parse(JSON.stringify(this.base));
    for (const [key, v] of this.values) {
      const [sec, k] = key.split('.');
      cfg[sec][k] = v;
    }
    return JSON.stringify(cfg);
  }
}
