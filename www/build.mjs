// Builds the page into www/build/ (served) and dist/catchwalk.html (one self-contained file).
// Expects the wasm-bindgen output in www/build/wasm/ (see web.mk). Every library comes from
// node_modules and is bundled: nothing is fetched from outside at run time.

import * as esbuild from 'esbuild';
import { copyFileSync, existsSync, mkdirSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const www = dirname(fileURLToPath(import.meta.url));
const root = join(www, '..');
const out = join(www, 'build');
const dist = join(root, 'dist');
const demoDir = join(root, 'sample-maps', 'demo-town');
const DEMO = ['streets', 'crossings', 'schools', 'homes', 'catchments'];

if (!existsSync(join(out, 'wasm', 'catchwalk_bg.wasm'))) {
  console.error('build.mjs: www/build/wasm/catchwalk_bg.wasm is missing; run `make web-build`');
  process.exit(1);
}

const common = { bundle: true, minify: true, target: 'es2022', legalComments: 'none', logLevel: 'warning' };

// Label glyph ranges made by tools/glyphs (web.mk): served from build/glyphs, inlined in the
// single file.
const glyphDir = join(out, 'glyphs');
const glyphs = {};
if (existsSync(glyphDir))
  for (const f of readdirSync(glyphDir).filter((n) => n.endsWith('.pbf')).sort())
    glyphs[f.replace(/\.pbf$/, '')] = readFileSync(join(glyphDir, f)).toString('base64');
if (!Object.keys(glyphs).length) console.warn('build.mjs: no label glyphs in www/build/glyphs (run `make web-build`): street names will not show');

async function bundle(entry, autodemo) {
  const r = await esbuild.build({
    ...common,
    entryPoints: [join(www, 'src', entry)],
    format: 'iife',
    write: false,
    define: { CATCHWALK_AUTODEMO: String(autodemo), CATCHWALK_GLYPH_RANGES: JSON.stringify(Object.keys(glyphs)), 'import.meta.url': '"about:blank"' },
  });
  return r.outputFiles[0].text;
}

const worker = await bundle('worker.ts', false);
const appServed = await bundle('main.ts', true);
const appSingle = await bundle('main.ts', false);
const css = [
  readFileSync(join(www, 'node_modules', 'maplibre-gl', 'dist', 'maplibre-gl.css'), 'utf8'),
  readFileSync(join(www, 'styles.css'), 'utf8'),
  readFileSync(join(www, 'print.css'), 'utf8'),
].join('\n');
const html = readFileSync(join(www, 'index.html'), 'utf8');

// Served build: files side by side, the demo town beside them.
writeFileSync(join(out, 'worker.js'), worker);
writeFileSync(join(out, 'app.js'), appServed);
writeFileSync(join(out, 'app.css'), css);
writeFileSync(
  join(out, 'index.html'),
  html.replace('<!--STYLES-->', '<link rel="stylesheet" href="app.css">').replace('<!--SCRIPTS-->', '<script src="app.js"></script>'),
);
const demo = {};
mkdirSync(join(out, 'demo'), { recursive: true });
for (const k of DEMO) {
  const p = join(demoDir, `${k}.geojson`);
  if (existsSync(p)) {
    copyFileSync(p, join(out, 'demo', `${k}.geojson`));
    demo[k] = readFileSync(p, 'utf8');
  }
}

// Single file: everything inline. "</script" and "<!--" inside scripts are escaped.
const safeJs = (s) => s.replace(/<\/(script)/gi, '<\\/$1').replace(/<!--/g, '<\\!--');
const inline = {
  wasm: readFileSync(join(out, 'wasm', 'catchwalk_bg.wasm')).toString('base64'),
  worker,
  demo,
  glyphs,
};
const single = html
  .replace('<!--STYLES-->', () => `<style>\n${css.replace(/<\/style/gi, '<\\/style')}\n</style>`)
  .replace(
    '<!--SCRIPTS-->',
    () => `<script>window.CATCHWALK_INLINE = ${safeJs(JSON.stringify(inline))};</script>\n<script>${safeJs(appSingle)}</script>`,
  );
mkdirSync(dist, { recursive: true });
writeFileSync(join(dist, 'catchwalk.html'), single);

const size = (p) => `${(statSync(p).size / 1024).toFixed(0)} KiB`;
console.log(
  `page built: build/app.js ${size(join(out, 'app.js'))}, build/worker.js ${size(join(out, 'worker.js'))}, ` +
    `build/wasm/catchwalk_bg.wasm ${size(join(out, 'wasm', 'catchwalk_bg.wasm'))}, dist/catchwalk.html ${size(join(dist, 'catchwalk.html'))}` +
    `, label glyphs ${Object.keys(glyphs).join(', ') || 'none'} (${(Object.values(glyphs).reduce((a, b) => a + b.length, 0) / 1024).toFixed(0)} KiB inlined)` +
    (Object.keys(demo).length ? `, demo town: ${Object.keys(demo).join(', ')}` : ', demo town not found'),
);
if (!readdirSync(out).includes('index.html')) process.exit(1);
