// End-to-end tests of the ranges view of dist/hibernal.html (file://, network refused):
// uncertain inputs, the study over Web Workers with progress and stop, the percentiles,
// the charts, the CSV files, reproducibility from the seed, and bad input.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { browserForFile, andRecompute, field, msgFor } from './helpers.mjs';

const { withPage: withPageAt } = browserForFile();
const withPage = (body, init = null) => withPageAt(body, undefined, init);

const studies = (page) => page.evaluate(() => Number(document.querySelector('#ranges-results').dataset.runs || 0));

// Clicks Run and waits for the study to finish; returns the results box's data.
async function study(page) {
  const n = await studies(page);
  await page.click('#r-go');
  await page.waitForFunction((b) => Number(document.querySelector('#ranges-results').dataset.runs || 0) > b
    || ['failed', 'refused'].includes(document.querySelector('#ranges-results').dataset.state), n, { timeout: 120000 });
  return page.evaluate(() => Object.assign({}, document.querySelector('#ranges-results').dataset));
}

async function setField(page, path, text) {
  await andRecompute(page, () => field(page, path).fill(text));
}

const cell = (page, result, col) => page.locator(`#r-summary tr[data-result="${result}"] td[data-col="${col}"]`).textContent();
const num = (t) => Number(String(t).replace(/\u2212/g, '-').replace(/[^0-9.eE+-]/g, ''));

async function download(page, id) {
  const [d] = await Promise.all([page.waitForEvent('download'), page.click('#' + id)]);
  return readFileSync(await d.path(), 'utf8');
}

test('the silt yard: frost depth as P10, P50, P90 over Web Workers, reproducible from the seed', () => withPage(async (page) => {
  await andRecompute(page, () => page.selectOption('#example-pick', 'silt-yard-how-sure'));
  assert.equal(await page.locator('#ranges-on').isVisible(), true);
  assert.equal(await page.locator('#r-inputs tbody tr').count(), 4);
  await setField(page, 'ranges.runs', '24');
  const d = await study(page);
  assert.equal(d.state, 'done');
  assert.ok(Number(d.workers) >= 1, `ran on workers: ${d.workers}`);
  const p10 = num(await cell(page, 'frost-depth', 'p10'));
  const p50 = num(await cell(page, 'frost-depth', 'p50'));
  const p90 = num(await cell(page, 'frost-depth', 'p90'));
  assert.ok(p10 > 0 && p10 < p50 && p50 < p90, `${p10} < ${p50} < ${p90}`);
  // The regressions' band for the base case holds the base case.
  const band = (await cell(page, 'frost-depth', 'band')).split(' to ').map(num);
  const base = num(await cell(page, 'frost-depth', 'base'));
  assert.ok(band[0] <= base && base <= band[1], `${band} holds ${base}`);
  assert.match(await page.locator('#r-failed').textContent(), /Seed 2026, 24 runs/);
  // Both charts drawn.
  for (const id of ['r-spread-chart', 'r-sensitivity-chart']) {
    assert.ok(Number(await page.locator('#' + id).getAttribute('data-draws')) >= 1, id);
    assert.equal(await page.locator('#' + id + ' ~ .chart-msg').textContent().catch(() => ''), '');
  }
  // The CSV files carry the seed and the percentiles.
  const runsCsv = await download(page, 'r-trials-csv');
  const lines = runsCsv.trim().split('\n');
  assert.equal(lines.length, 25);
  assert.match(lines[0], /^run,seed,Snow density \[kg\/m³\]/);
  assert.ok(lines.slice(1).every((l) => l.split(',')[1] === '2026'));
  const sum = await download(page, 'r-summary-csv');
  const row = sum.split('\n').find((l) => l.startsWith('Deepest frost')).split(',');
  assert.ok(Math.abs(Number(row[4]) - p50) < 0.01, `summary P50 ${row[4]} vs ${p50}`);
  // The same seed again: the same numbers. Another seed: others.
  const again = await study(page);
  assert.equal(again.state, 'done');
  assert.equal(num(await cell(page, 'frost-depth', 'p50')), p50);
  await setField(page, 'ranges.seed', '7');
  assert.match(await page.locator('#r-stale').textContent(), /changed/);
  assert.equal(await page.locator('#r-stale').isHidden(), false);
  await study(page);
  assert.notEqual(num(await cell(page, 'frost-depth', 'p50')), p50);
  // US units: the same study shown in feet.
  await andRecompute(page, () => page.check('input[name="units"][value="us"]'));
  assert.match(await cell(page, 'frost-depth', 'p50'), /ft|in/);
  // The printed report carries the percentiles, the seed and the charts, not the controls.
  await page.emulateMedia({ media: 'print' });
  assert.equal(await page.locator('#r-summary').isVisible(), true);
  assert.equal(await page.locator('#r-failed').isVisible(), true);
  assert.equal(await page.locator('#r-spread-chart').isVisible(), true);
  for (const id of ['r-go', 'r-stop', 'r-trials-csv', 'ranges-remove', 'r-add-input']) {
    assert.equal(await page.locator('#' + id).isVisible(), false, id);
  }
  await page.emulateMedia({ media: 'screen' });
}));

test('a scenario without ranges prints no ranges section', () => withPage(async (page) => {
  await andRecompute(page, () => page.selectOption('#example-pick', 'snow-over-foam-on-silt'));
  await page.emulateMedia({ media: 'print' });
  assert.equal(await page.locator('#ranges').isVisible(), false);
  await page.emulateMedia({ media: 'screen' });
  assert.equal(await page.locator('#ranges').isVisible(), true);
}));

test('a study can be stopped, and a bad range is named beside its field', () => withPage(async (page) => {
  await andRecompute(page, () => page.selectOption('#example-pick', 'silt-yard-how-sure'));
  await page.click('#r-go');
  await page.waitForFunction(() => document.querySelector('#ranges-results').dataset.state === 'running');
  await page.waitForFunction(() => /of \d+ trials/.test(document.querySelector('#r-status').textContent));
  await page.click('#r-stop');
  assert.equal(await page.evaluate(() => document.querySelector('#ranges-results').dataset.state), 'stopped');
  assert.match(await page.locator('#r-status').textContent(), /Stopped after \d+ of \d+ trials/);
  assert.equal(await page.locator('#r-go').isDisabled(), false);
  // High end below the low end: refused, named at its field.
  await setField(page, 'ranges.inputs[0].high', '100');
  const d = await study(page);
  assert.equal(d.state, 'refused');
  assert.match(await msgFor(page, 'ranges.inputs[0].high').textContent(), /above the low end/);
  // Not a number: named, nothing runs.
  await setField(page, 'ranges.inputs[0].high', '3x0');
  await page.click('#r-go');
  assert.match(await page.locator('#r-errors').textContent(), /High end of input 1: enter a number/);
}));

test('marking inputs from scratch on a scenario without ranges, saved in the file', () => withPage(async (page) => {
  await andRecompute(page, () => page.selectOption('#example-pick', 'snow-over-foam-on-silt'));
  assert.equal(await page.locator('#ranges-off').isVisible(), true);
  await andRecompute(page, () => page.click('#ranges-add'));
  // The first input with a value in this scenario, its range around that value.
  assert.equal(await field(page, 'ranges.inputs[0].what').inputValue(), 'snow-density');
  await andRecompute(page, () => page.click('#r-add-input'));
  assert.equal(await page.locator('#r-inputs tbody tr').count(), 2);
  await andRecompute(page, () => field(page, 'ranges.inputs[1].what').selectOption('insulation-derating'));
  await andRecompute(page, () => field(page, 'ranges.inputs[1].distribution.kind').selectOption('triangular'));
  assert.equal(await field(page, 'ranges.inputs[1].distribution.mode').isVisible(), true);
  await setField(page, 'ranges.runs', '40');
  await setField(page, 'ranges.seed', '11');
  const d = await study(page);
  assert.equal(d.state, 'done');
  // The R-value of the stack and the shelter-free steady case: one result, with a band
  // (the stack holds snow) and both inputs in the sensitivity ranking.
  const p10 = num(await cell(page, 'r-value', 'p10'));
  const p90 = num(await cell(page, 'r-value', 'p90'));
  assert.ok(p10 < p90);
  assert.notEqual(await cell(page, 'r-value', 'band'), 'no snow');
  // Saved with the scenario.
  const [dl] = await Promise.all([page.waitForEvent('download'), page.click('#save-file')]);
  const saved = JSON.parse(readFileSync(await dl.path(), 'utf8'));
  assert.equal(saved.version, 6);
  assert.equal(saved.ranges.seed, 11);
  assert.equal(saved.ranges.inputs[1].what, 'insulation-derating');
  assert.equal(saved.ranges.inputs[1].distribution.kind, 'triangular');
}));

test('a shelter study: the interior and the melt as ranges, and how many runs melt the inner surface', () => withPage(async (page) => {
  await andRecompute(page, () => page.selectOption('#example-pick', 'training-dome-four'));
  await andRecompute(page, () => page.click('#ranges-add'));
  // The dome's own snow density gives the default range around it.
  assert.equal(await field(page, 'ranges.inputs[0].what').inputValue(), 'snow-density');
  await setField(page, 'ranges.inputs[0].low', '200');
  await setField(page, 'ranges.inputs[0].high', '420');
  await setField(page, 'ranges.runs', '30');
  await setField(page, 'ranges.seed', '21');
  const d = await study(page);
  assert.equal(d.state, 'done');
  for (const id of ['shelter-interior', 'shelter-melt']) {
    assert.equal(await page.locator(`#r-summary tr[data-result="${id}"]`).count(), 1, id);
  }
  // Lighter snow insulates better: some runs melt the inner surface, not all.
  const line = await page.locator('#r-limits li[data-result="shelter-melt"]').textContent();
  const m = line.match(/the inner surface melts in (\d+) of 30 runs/);
  assert.ok(m, line);
  assert.ok(Number(m[1]) > 0 && Number(m[1]) < 30, line);
  assert.equal(await page.locator('#r-limits').isVisible(), true);
  // The summary CSV carries the same count.
  const sum = await download(page, 'r-summary-csv');
  const row = sum.split('\n').find((l) => l.startsWith('Melt inside the shelter')).split(',');
  assert.equal(row[15], m[1]);
}));

test('without Web Workers the study runs on the page, in slices, to the same numbers', async () => {
  const p50s = [];
  for (const init of [null, () => { delete window.Worker; }]) {
    await withPage(async (page) => {
      await andRecompute(page, () => page.selectOption('#example-pick', 'silt-yard-how-sure'));
      await setField(page, 'ranges.runs', '12');
      const d = await study(page);
      assert.equal(d.state, 'done');
      assert.equal(d.workers, init ? '0' : String(Math.min(8, await page.evaluate(() => navigator.hardwareConcurrency || 2))));
      if (init) assert.match(await page.locator('#r-status').textContent(), /on this page/);
      p50s.push(await page.locator('#r-summary').textContent());
    }, init);
  }
  // The same seed: the same table, to the digit, whichever way the tasks ran.
  assert.equal(p50s[0], p50s[1]);
});
