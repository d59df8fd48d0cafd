// Shared set-up for the browser tests: Debian's Chromium, the single-file page
// opened from file://, every network request refused and recorded.
import { before, after } from 'node:test';
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

// How many pixels of the canvas `id` differ from its corner pixel in colour (alpha aside),
// and how many it has.
export const inkedPixels = (page, id) => page.evaluate((id) => {
  const c = document.getElementById(id);
  const { data } = c.getContext('2d').getImageData(0, 0, c.width, c.height);
  const [r0, g0, b0] = data;
  let n = 0;
  for (let i = 0; i < data.length; i += 4) if (Math.abs(data[i] - r0) + Math.abs(data[i + 1] - g0) + Math.abs(data[i + 2] - b0) > 24) n++;
  return { n, size: c.width * c.height };
}, id);

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

// One browser for a test file: launched before its tests, closed after them. Returns
// `withPage(body, viewport, init)`, which opens a fresh page (see openPage), runs
// `body(page, problems)`, checks that nothing went wrong on the way and closes the page;
// and `openPage(viewport, …)`, which opens another page in the same browser.
export function browserForFile() {
  let browser;
  before(async () => { browser = await launch(); });
  after(async () => { if (browser) await browser.close(); });
  async function withPage(body, viewport, init = null) {
    const { context, page, problems } = await openPage(browser, viewport, undefined, init);
    try {
      await body(page, problems);
      assertNoProblems(problems);
    } finally {
      await context.close();
    }
  }
  return { withPage, openPage: (...args) => openPage(browser, ...args) };
}

// How many runs of the section whose results box is `resultsId` have ended (finished or
// refused) so far: the box's data-outcomes.
export const outcomes = (page, resultsId) => page.evaluate(
  (id) => Number(document.getElementById(id).dataset.outcomes || 0), resultsId);

// Does `action`, then waits for the recompute it causes and for the next run of the section
// whose results box is `resultsId` to end (within `timeout` ms, or Playwright's default);
// returns that box's data-state.
export async function andSectionRun(page, resultsId, action, timeout = undefined) {
  const b = await outcomes(page, resultsId);
  await andRecompute(page, action);
  await page.waitForFunction(([id, n]) => Number(document.getElementById(id).dataset.outcomes || 0) > n,
    [resultsId, b], timeout === undefined ? {} : { timeout });
  return page.evaluate((id) => document.getElementById(id).dataset.state, resultsId);
}
