// Settings: walk zone, walking speed, detour cap, risk weight, the safe-route rule set and its
// thresholds, read from (and written back into) the core's config.

import { el } from './dom';

type Obj = Record<string, unknown>;

/** The allowed range of a setting, as the core's `configBounds()` gives it. */
interface Bound { field: string; min: number; min_exclusive: boolean; max: number }

/** The core's wording for an out-of-range value (config.rs / range.rs), or '' when allowed. */
export function outOfRange(b: Bound | undefined, v: number): string {
  if (!b) return '';
  const ok = (b.min_exclusive ? v > b.min : v >= b.min) && v <= b.max;
  if (ok) return '';
  const range = b.min_exclusive ? `greater than ${b.min} and at most ${b.max}` : `from ${b.min} to ${b.max}`;
  return `${b.field} is ${v}; allowed: ${range}`;
}

const LABELS: Record<string, [string, string]> = {
  'benefit.walk_zone_m': ['Walk zone', 'm of network distance'],
  'benefit.walking_speed_mps': ['Walking speed (walking time, active minutes)', 'm/s (1.22 = 4.0 ft/s)'],
  'risk.walk_mps': ['Crossing speed (crossing time, HCM waits)', 'm/s (1.07 = 3.5 ft/s, signal timing)'],
  'route.detour_cap': ['Detour cap', '× the shortest route'],
  'route.metres_per_risk_point': ['Weight of risk', 'm of detour worth one risk point'],
  'score.walkable_share': ['Walkable catchment', 'share of children in the walk zone'],
  'score.safe_share': ['Safe catchment', 'share of children with a safe route'],
};

/** Rule thresholds a planner may move, with their wording. */
const RULE_FIELDS: Record<string, string> = {
  speed_kmh_gt: 'speed above (km/h)',
  speed_kmh_ge: 'speed at least (km/h)',
  lanes_ge: 'lanes at least',
  shoulder_m_lt: 'shoulder narrower than (m)',
  width_m_gt: 'wider than (m)',
  vehicles_15min_gt: 'vehicles in 15 min above',
  roadway_width_m_lt: 'roadway narrower than (m)',
  min_length_m: 'over a length of at least (m)',
};

const get = (o: Obj, path: (string | number)[]): unknown => path.reduce<unknown>((a, k) => (a && typeof a === 'object' ? (a as Obj)[k as string] : undefined), o);
function set(o: Obj, path: (string | number)[], v: unknown) {
  let a: Obj = o;
  for (const k of path.slice(0, -1)) a = a[k as string] as Obj;
  a[path[path.length - 1] as string] = v;
}

export class Settings {
  private cfg: Obj = {};
  private defaults = '{}';
  private ruleSets: Record<string, string> = {};
  private bounds = new Map<string, Bound>();

  constructor(private form: HTMLFormElement, private onChange: () => void) {
    form.addEventListener('submit', (e) => e.preventDefault());
  }

  init(defaultJson: string, ruleSets: Record<string, string> = {}, boundsJson = '[]') {
    this.defaults = defaultJson;
    this.ruleSets = ruleSets;
    try { this.bounds = new Map((JSON.parse(boundsJson) as Bound[]).map((b) => [b.field, b])); } catch { /* keep */ }
    try { this.cfg = JSON.parse(defaultJson) as Obj; } catch { this.cfg = {}; }
    this.render();
  }

  /** Takes a saved config (a project's or the last autosave's). */
  load(configJson: string) {
    try { this.cfg = JSON.parse(configJson) as Obj; } catch { return; }
    this.render();
  }

  private number(path: (string | number)[], label: string, unit: string, id: string): HTMLElement {
    const v = get(this.cfg, path) as number;
    const bound = this.bounds.get(path.join('.'));
    const input = el('input', { type: 'number', step: 'any', value: String(v), id });
    if (bound) { input.min = String(bound.min); input.max = String(bound.max); }
    input.addEventListener('change', () => {
      const n = Number(input.value);
      const problem = input.value === '' || !isFinite(n) ? `${path.join('.')} must be a number` : outOfRange(bound, n);
      input.setCustomValidity(problem);
      input.title = problem;
      if (problem) { input.reportValidity(); return; }
      set(this.cfg, path, n);
      this.onChange();
    });
    return el('label', { class: 'setting' }, el('span', {}, label), input, unit ? el('small', {}, unit) : null);
  }

  private render() {
    const out: HTMLElement[] = [];
    for (const [key, [label, unit]] of Object.entries(LABELS)) {
      const path = key.split('.');
      if (typeof get(this.cfg, path) === 'number') out.push(this.number(path, label, unit, `set-${key.replace('.', '-')}`));
    }
    const rules = get(this.cfg, ['score', 'rules']) as Obj | undefined;
    if (rules && Array.isArray(rules['rules'])) {
      const names = Object.keys(this.ruleSets);
      const pick = el('select', { id: 'set-rules' }, ...names.map((n) => el('option', { value: n }, n)));
      pick.value = String(rules['name'] ?? '');
      pick.addEventListener('change', () => {
        const text = this.ruleSets[pick.value];
        if (!text) return;
        set(this.cfg, ['score', 'rules'], JSON.parse(text));
        this.render();
        this.onChange();
      });
      const group = el('fieldset', { class: 'rules' },
        el('legend', {}, 'Safe-route rules'),
        names.length > 1 ? el('label', { class: 'setting' }, el('span', {}, 'Rule set'), pick) : null,
        rules['title'] ? el('p', { class: 'small muted' }, String(rules['title'])) : null);
      (rules['rules'] as Obj[]).forEach((rule, i) => {
        const fields = Object.keys(RULE_FIELDS).filter((k) => typeof rule[k] === 'number');
        if (!fields.length) return;
        group.append(el('div', { class: `rule v-${String(rule['verdict'])}` },
          el('p', { class: 'rule-reason' }, el('strong', {}, String(rule['verdict'] ?? '')), ` ${String(rule['reason'] ?? rule['id'])}`),
          ...fields.map((k) => this.number(['score', 'rules', 'rules', i, k], RULE_FIELDS[k], '', `set-rule-${i}-${k}`))));
      });
      out.push(group);
    }
    const reset = el('button', { type: 'button' }, 'Back to defaults');
    reset.addEventListener('click', () => { this.init(this.defaults, this.ruleSets, JSON.stringify([...this.bounds.values()])); this.onChange(); });
    out.push(reset);
    this.form.replaceChildren(...out);
  }

  /** The config JSON for the core: defaults with the planner's values. */
  json(): string {
    return JSON.stringify(this.cfg);
  }
}
