// Compares two homes.csv texts cell by cell (numbers numerically, everything else exactly),
// and runs the native CLI on the demo town for the expected figures.

import { strict as assert } from 'node:assert';
import { execFileSync } from 'node:child_process';
import { createRequire } from 'node:module';
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
export const demo = join(root, 'sample-maps', 'demo-town');
const cli = process.env.CATCHWALK_CLI ?? join(root, 'target', 'release', 'catchwalk');


const require = createRequire(join(root, 'www', 'package.json'));
const Papa = require('papaparse');

/** Rows of cells, read by papaparse (RFC 4180); blank lines skipped. */
export function parseCsv(text) {
  return Papa.parse(text, { skipEmptyLines: true }).data;
}

/**
 * Asserts the same header, the same rows in the same order and the same figures. Numbers may
 * differ by `tol` (the two builds round the same f64 to 2-4 decimals; libm differences between
 * wasm and native can move a last digit). Returns the number of numeric cells compared and the
 * largest difference seen.
 */
export function assertSameHomesCsv(actualText, expectedText, tol = 0.011, name = 'homes.csv') {
  const a = parseCsv(actualText);
  const e = parseCsv(expectedText);
  assert.deepEqual(a[0], e[0], `${name} headers differ`);
  assert.equal(a.length, e.length, `${name} row counts differ`);
  let numeric = 0, maxDiff = 0;
  for (let r = 1; r < e.length; r++) {
    assert.equal(a[r].length, e[r].length, `row ${r}: cell counts differ`);
    for (let c = 0; c < e[r].length; c++) {
      const x = a[r][c], y = e[r][c];
      const nx = Number(x), ny = Number(y);
      if (x !== '' && y !== '' && Number.isFinite(nx) && Number.isFinite(ny)) {
        const d = Math.abs(nx - ny);
        maxDiff = Math.max(maxDiff, d);
        assert.ok(d <= tol + 1e-9 * Math.abs(ny), `row ${r} (${e[r][0]}), column ${e[0][c]}: ${x} != ${y}`);
        numeric++;
      } else {
        assert.equal(x, y, `row ${r} (${e[r][0]}), column ${e[0][c]}`);
      }
    }
  }
  return { numeric, maxDiff };
}

/** Runs the native CLI on the demo town and returns its homes.csv. */
export function cliHomesCsv(homesFile = 'homes.geojson', extra = []) {
  return readFileSync(join(cliAudit(homesFile, extra), 'homes.csv'), 'utf8');
}

/** Runs the native CLI's audit on the demo town; returns the folder it wrote. */
export function cliAudit(homesFile = 'homes.geojson', extra = []) {
  assert.ok(existsSync(cli), `native CLI not found at ${cli} (set CATCHWALK_CLI or run make build)`);
  const out = mkdtempSync(join(tmpdir(), 'catchwalk-cli-'));
  execFileSync(cli, ['audit', '--streets', join(demo, 'streets.geojson'), '--schools', join(demo, 'schools.geojson'),
    '--homes', join(demo, homesFile), '--crossings', join(demo, 'crossings.geojson'),
    '--catchments', join(demo, 'catchments.geojson'), '--out', out, ...extra], { stdio: ['ignore', 'ignore', 'inherit'] });
  return out;
}


/** Runs the native CLI's upgrade planner on the demo town; returns its plan.json. */
export function cliPlan(budget) {
  assert.ok(existsSync(cli), `native CLI not found at ${cli} (set CATCHWALK_CLI or run make build)`);
  const out = mkdtempSync(join(tmpdir(), 'catchwalk-plan-'));
  execFileSync(cli, ['plan', '--budget', String(budget), '--streets', join(demo, 'streets.geojson'), '--schools', join(demo, 'schools.geojson'),
    '--homes', join(demo, 'homes.geojson'), '--crossings', join(demo, 'crossings.geojson'),
    '--catchments', join(demo, 'catchments.geojson'), '--out', out], { stdio: ['ignore', 'ignore', 'inherit'] });
  return JSON.parse(readFileSync(join(out, 'plan.json'), 'utf8'));
}
