// Shared pieces of the browser tests: Debian's Chromium through playwright-core, the built
// page served on 127.0.0.1, and a guard that fails the test on any request leaving the machine.

import { createRequire } from 'node:module';
import { mkdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const require = createRequire(join(root, 'www', 'package.json'));
const { chromium } = require('playwright-core');

export const CHROMIUM = process.env.CHROMIUM ?? '/usr/bin/chromium';
export const shots = join(root, 'out', 'screenshots');
mkdirSync(shots, { recursive: true });

export async function launch() {
  return chromium.launch({
    executablePath: CHROMIUM,
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking',
      '--disable-component-update', '--disable-sync'],
  });
}

/** True for URLs that stay on this machine: 127.0.0.1, file:, data:, blob:, about:. */
export function local(url) {
  const u = new URL(url);
  if (['file:', 'data:', 'blob:', 'about:'].includes(u.protocol)) return true;
  return (u.protocol === 'http:' || u.protocol === 'https:' || u.protocol === 'ws:') && u.hostname === '127.0.0.1';
}

/**
 * A page whose every outside request is aborted and recorded in `leaks` (the test asserts it
 * stays empty), and whose console errors are recorded in `errors`.
 */
export async function guardedPage(browser, viewport = { width: 1500, height: 900 }) {
  const context = await browser.newContext({ viewport, acceptDownloads: true });
  const leaks = [];
  const errors = [];
  await context.route('**/*', (route) => {
    const url = route.request().url();
    if (local(url)) return route.continue();
    leaks.push(url);
    return route.abort();
  });
  const page = await context.newPage();
  page.on('request', (r) => { if (!local(r.url())) leaks.push(r.url()); });
  page.on('pageerror', (e) => errors.push(String(e)));
  page.on('console', (m) => { if (m.type() === 'error') errors.push(m.text()); });
  // Printing would open a dialog: the tests read the report from the page instead.
  await page.addInitScript(() => { window.print = () => {}; });
  return { context, page, leaks, errors };
}

/**
 * Waits until the page has finished `n` audits (data-audits on body); an audit that fails
 * in between (data-failures grows) fails the wait with the page's messages.
 */
export async function waitAudits(page, n, timeout = 60_000) {
  const failures = await page.evaluate(() => Number(document.body.dataset.failures ?? 0));
  await page.waitForFunction(([k, f]) => Number(document.body.dataset.audits ?? 0) >= k || Number(document.body.dataset.failures ?? 0) > f,
    [n, failures], { timeout });
  if (await page.evaluate((f) => Number(document.body.dataset.failures ?? 0) > f, failures)) {
    const msg = await page.evaluate(() => document.getElementById('messages')?.innerText ?? '');
    throw new Error(`audit failed in the page: ${msg}`);
  }
}

/** The built page served on a free loopback port, and Chromium: one of each per test file. */
export async function openPage() {
  const { serve } = await import('../../www/serve.mjs');
  const server = await serve(join(root, 'www', 'build'), 0);
  return { server, base: `http://127.0.0.1:${server.address().port}/`, browser: await launch() };
}

/** Stops what [`openPage`] started. */
export async function closePage({ browser, server }) {
  await browser?.close();
  server?.close();
}
