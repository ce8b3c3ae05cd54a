// Tiny DOM helpers.

export const $ = <T extends HTMLElement = HTMLElement>(id: string): T => {
  const el = document.getElementById(id);
  if (!el) throw new Error(`page is missing #${id}`);
  return el as T;
};

/** Creates an element with text (never HTML from data). */
export function el<K extends keyof HTMLElementTagNameMap>(
  tag: K,
  attrs: Record<string, string> = {},
  ...children: (Node | string | null | undefined)[]
): HTMLElementTagNameMap[K] {
  const e = document.createElement(tag);
  for (const [k, v] of Object.entries(attrs)) {
    if (k === 'class') e.className = v;
    else e.setAttribute(k, v);
  }
  for (const c of children) if (c !== null && c !== undefined) e.append(c);
  return e;
}

export const fmt = {
  m: (x: number | null | undefined) => (x === null || x === undefined ? '–' : `${Math.round(x).toLocaleString('en')} m`),
  min: (x: number | null | undefined) => (x === null || x === undefined ? '–' : `${x.toFixed(1)} min`),
  pct: (x: number | null | undefined) => (x === null || x === undefined ? '–' : `${Math.round(x * 100)} %`),
  n: (x: number | null | undefined, d = 0) => (x === null || x === undefined ? '–' : x.toFixed(d)),
};

/** Offers a text as a file download (a blob URL: nothing leaves the machine). */
export function download(name: string, text: string, type = 'text/plain') {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = el('a', { href: url, download: name });
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
