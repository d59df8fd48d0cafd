// Shared set-up for the browser tests: Debian's Chromium, the single-file page
// opened from file://, every network request refused and recorded.
import { chromium } from 'playwright-core';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { dirname, resolve } from 'node:path';
import { existsSync } from 'node:fs';
import assert from 'node:assert/strict';

export const REPO = resolve(dirname(fileURLToPath(import.meta.url)), '..');
export const PAGE_PATH = process.env.HIBERNAL_PAGE
  ? resolve(process.env.HIBERNAL_PAGE)
  : resolve(REPO, 'dist/hibernal.html');
export const PAGE_URL = pathToFileURL(PAGE_PATH).href;

export async function launch() {
  assert.ok(existsSync(PAGE_PATH), `${PAGE_PATH} is missing: run ./build.sh first`);
  return chromium.launch({
    executablePath: process.env.CHROMIUM || '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
      '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

// blob: URLs are the page's own memory (its Web Workers' script, its downloads).
const local = (url) => url.startsWith('file:') || url.startsWith('data:') || url.startsWith('blob:');

// Opens the page in a fresh context. `problems` collects anything that must fail
// a test: network requests, console errors, page errors, dialogs. `init`, if given, runs in
// the page before its own scripts (to take a browser feature away, say).
export async function openPage(browser, viewport = { width: 1280, height: 900 }, deviceScaleFactor = 1, init = null) {
  const context = await browser.newContext({ viewport, deviceScaleFactor });
  if (init) await context.addInitScript(init);
  const problems = [];
  await context.route('**/*', (route) => (local(route.request().url()) ? route.continue() : route.abort()));
  const page = await context.newPage();
  page.on('request', (req) => { if (!local(req.url())) problems.push(`network request: ${req.url()}`); });
  page.on('console', (msg) => { if (msg.type() === 'error') problems.push(`console error: ${msg.text()}`); });
  page.on('pageerror', (err) => problems.push(`page error: ${err.message}`));
  page.on('dialog', (d) => { problems.push(`dialog opened: ${d.message()}`); d.dismiss().catch(() => {}); });
  await page.goto(PAGE_URL);
  try {
    await page.waitForSelector('html[data-ready="true"]', { state: 'attached', timeout: 20000 });
    await page.waitForFunction(() => document.querySelector('#results').dataset.pending === 'false'
      && Number(document.querySelector('#results').dataset.runs) > 0, null, { timeout: 10000 });
  } catch (e) {
    const status = await page.locator('#load-status').textContent().catch(() => '');
    const panic = await page.locator('#panic').textContent().catch(() => '');
    throw new Error(`page did not start: ${e.message}\nstatus: ${status}\npanic: ${panic}\n${problems.join('\n')}`);
  }
  return { context, page, problems };
}

export function assertNoProblems(problems) {
  assert.deepEqual(problems, [], 'no network requests, console errors or page errors');
}

// Number of completed recomputes so far.
export const runs = (page) => page.evaluate(() => Number(document.querySelector('#results').dataset.runs || 0));

// Waits until at least one recompute after `before` has finished.
export async function settled(page, before) {
  await page.waitForFunction((b) => {
    const r = document.querySelector('#results');
    return Number(r.dataset.runs) > b && r.dataset.pending === 'false';
  }, before);
}

// Does `action`, then waits for the recompute it causes.
export async function andRecompute(page, action) {
  const before = await runs(page);
  await action();
  await settled(page, before);
}

// Reads a shown number (allows the typographic minus sign); returns value and decimals.
export function parseShown(text) {
  const t = String(text).replace(/\u2212/g, '-').replace(/[^0-9.+-]/g, '');
  const value = Number(t);
  const dot = t.indexOf('.');
  return { value, decimals: dot < 0 ? 0 : t.length - dot - 1 };
}

export async function shown(page, selector) {
  return parseShown(await page.locator(selector).textContent());
}

export const field = (page, path) => page.locator(`[data-field="${path}"]`);
export const msgFor = (page, path) => page.locator(`[data-msg-for="${path}"]`);

// A digest of the chart's pixels.
export const chartDigest = (page) => page.evaluate(() => {
  const url = document.getElementById('profile-chart').toDataURL('image/png');
  let h = 0x811c9dc5; // FNV-1a, 32 bit
  for (let i = 0; i < url.length; i++) { h ^= url.charCodeAt(i); h = Math.imul(h, 0x01000193) >>> 0; }
  return h.toString(16) + ':' + url.length;
});

// How many pixels of the chart differ from its corner pixel.
export const chartInkedPixels = (page) => page.evaluate(() => {
  const c = document.getElementById('profile-chart');
  const ctx = c.getContext('2d');
  const { data } = ctx.getImageData(0, 0, c.width, c.height);
  const [r0, g0, b0, a0] = data;
  let n = 0;
  for (let i = 0; i < data.length; i += 4) {
    if (Math.abs(data[i] - r0) + Math.abs(data[i + 1] - g0) + Math.abs(data[i + 2] - b0) + Math.abs(data[i + 3] - a0) > 24) n++;
  }
  return { n, width: c.width, height: c.height };
});
