// Street names along the streets, offline: the SDF glyph ranges are built at build time from a
// font in Debian's packages (tools/glyphs, see www/web.mk) and served with the page, or inlined
// in the single-file build. MapLibre asks for them through the `cwglyphs:` protocol; a range
// the build did not make answers empty, so a name in another script shows no glyphs rather
// than asking anyone outside.

import maplibregl from 'maplibre-gl';

declare const CATCHWALK_GLYPH_RANGES: string[];

/** The font stack the labels use (the name the glyph tool reads from the font). */
export const LABEL_FONT = ['DejaVu Sans Book'];
export const GLYPHS_URL = 'cwglyphs://{fontstack}/{range}';

function base64ToBytes(b64: string): Uint8Array {
  const bin = atob(b64);
  const out = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
  return out;
}

let registered = false;

/** Registers the glyph protocol once for the page. */
export function registerGlyphs() {
  if (registered) return;
  registered = true;
  const ranges = new Set(typeof CATCHWALK_GLYPH_RANGES === 'undefined' ? [] : CATCHWALK_GLYPH_RANGES);
  maplibregl.addProtocol('cwglyphs', async (params) => {
    const range = params.url.split('/').pop() ?? '';
    const inline = window.CATCHWALK_INLINE?.glyphs;
    if (inline) {
      const b64 = inline[range];
      return { data: b64 ? base64ToBytes(b64).buffer : new ArrayBuffer(0) };
    }
    if (!ranges.has(range)) return { data: new ArrayBuffer(0) };
    const r = await fetch(`glyphs/${range}.pbf`);
    return { data: r.ok ? await r.arrayBuffer() : new ArrayBuffer(0) };
  });
}
