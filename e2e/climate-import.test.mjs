// End-to-end tests of the import of a daily climate record into the winter (file://,
// network refused): units taken from the file's header, the file read again on any change
// of an import option, no error before a file is chosen, the design winter built from the
// record (its season and its snow), each winter's freezing season, and the daily CSV with
// dates. Every test runs on a desktop screen and on a phone's. The records are invented
// here.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { browserForFile, andRecompute, field, parseShown } from './helpers.mjs';

const { withPage } = browserForFile();
const SCREENS = [{ width: 1366, height: 900 }, { width: 390, height: 844 }];

// ---------- invented records ----------
const addDays = (iso, n) => new Date(Date.parse(iso + 'T00:00:00Z') + n * 86400000).toISOString().slice(0, 10);

// Three winters from 1 July 2004 (no 29 February in them): a daily mean of
// 2 − A cos(2π (k − 200) / 365) °C with A = 14, 16, 12 K, and snow rising from the first
// day below 0 °C to a peak of 40, 60, 30 cm on day 230 of the winter, gone by day 290.
const PEAKS_CM = [40, 60, 30];
function threeWinters() {
  const rows = [];
  for (let w = 0; w < 3; w++) {
    const amp = [14, 16, 12][w];
    for (let k = 0; k < 365; k++) {
      const t = 2 - amp * Math.cos(2 * Math.PI * (k - 200) / 365);
      rows.push({ date: addDays('2004-07-01', w * 365 + k), t: Math.round(t * 10) / 10, k, w });
    }
  }
  for (let w = 0; w < 3; w++) {
    const mine = rows.filter((r) => r.w === w);
    const first = mine.findIndex((r) => r.t < 0);
    for (const r of mine) {
      let s = 0;
      if (r.k >= first && r.k <= 230) s = PEAKS_CM[w] * (r.k - first + 1) / (231 - first);
      else if (r.k > 230 && r.k < 290) s = PEAKS_CM[w] * (290 - r.k) / 60;
      r.snow = Math.round(s * 10) / 10;
    }
  }
  return rows;
}

// Freezing index of one winter, computed here independently: the range of the cumulative
// freezing degree-day curve (TM 5-852-6 definition).
function freezingIndex(temps) {
  let c = 0, max = 0, range = 0;
  for (const t of temps) { c += t; max = Math.max(max, c); range = Math.max(range, max - c); }
  return range;
}

const fToC = (f) => (f - 32) / 1.8; // NIST SP 811 B.8

const file = (name, text) => ({ name, mimeType: 'text/csv', buffer: Buffer.from(text) });

// The scenario as the page saves it.
async function saved(page) {
  const [dl] = await Promise.all([page.waitForEvent('download'), page.click('#save-file')]);
  return JSON.parse(readFileSync(await dl.path(), 'utf8'));
}

async function toDaily(page) {
  await andRecompute(page, () => page.selectOption('#example-pick', 'silty-yard-design-winter'));
  await field(page, 'winter.climate.kind').selectOption('daily');
}

// Reads a file and waits for the record's summary.
async function read(page, name, text) {
  await page.setInputFiles('#imp-file', file(name, text));
  await page.waitForSelector('#w-record-span');
}

const winterIndices = (page) => page.locator('#w-winters tbody tr td.num:not(.season)').evaluateAll((xs) => xs.map((x) => x.textContent));
const winterSeasons = (page) => page.locator('#w-winters tbody tr td.season').evaluateAll((xs) => xs.map((x) => Number(x.textContent)));

// Waits for the winter run that ends after `before` runs; its data-state.
async function winterDone(page, before, timeout = 90000) {
  await page.waitForFunction((b) => {
    const r = document.querySelector('#winter-results');
    return Number(r.dataset.outcomes || 0) > b && (r.dataset.state === 'done' || r.dataset.state === 'stale');
  }, before, { timeout });
  return page.evaluate(() => document.querySelector('#winter-results').dataset.state);
}
const winterOutcomes = (page) => page.evaluate(() => Number(document.querySelector('#winter-results').dataset.outcomes || 0));

for (const screen of SCREENS) {
  test(`at ${screen.width} px, nothing is wrong before a file is chosen`, () => withPage(async (page) => {
    await toDaily(page);
    await page.waitForFunction(() => document.querySelector('#winter-results').dataset.state === 'stale');
    // No error anywhere in the winter: a neutral hint says what to do.
    assert.equal(await page.locator('#w-errors').isHidden(), true, 'no error list');
    assert.equal(await page.locator('#w-errors li').count(), 0);
    assert.equal(await page.locator('#imp-problems').isHidden(), true, 'no import problems');
    assert.equal(await page.locator('#winter .msg.error').count(), 0, 'no error message');
    assert.match(await page.locator('#w-status').textContent(), /Waiting for a daily record: choose a CSV file/);
    assert.match(await page.locator('#w-record-none').textContent(), /No records yet/);
    // A file read ends the waiting: the run goes.
    const b = await winterOutcomes(page);
    await field(page, 'winter.initial.kind').selectOption('uniform');
    const rows = threeWinters().slice(0, 200);
    await read(page, 'short.csv', 'date,temp\n' + rows.map((r) => r.date + ',' + r.t).join('\n') + '\n');
    assert.equal(await winterDone(page, b), 'done');
  }, screen));

  test(`at ${screen.width} px, units named in the header are taken from it and the page says so`, () => withPage(async (page) => {
    await toDaily(page);
    // The page's choices say °C and m; the header says °F and cm.
    assert.equal(await page.locator('#imp-temp').inputValue(), '°C');
    assert.equal(await page.locator('#imp-depth').inputValue(), 'm');
    const rows = threeWinters();
    const f = (c) => Math.round((c * 1.8 + 32) * 100) / 100;
    await read(page, 'header-units.csv', 'Date,TMEAN (°F),snow depth (cm)\n' + rows.map((r) => r.date + ',' + f(r.t) + ',' + r.snow).join('\n') + '\n');
    const units = await page.locator('#imp-units').textContent();
    assert.match(units, /mean air temperature in °F \(not °C as chosen above\)/);
    assert.match(units, /snow depth in cm \(not m as chosen above\)/);
    assert.equal(await page.locator('#imp-problems').isHidden(), true);
    // Read in °F: the first winter's index is that of the °C values (to the 0.01 °F rounding).
    const fi = parseShown((await winterIndices(page))[0]).value;
    const want = freezingIndex(rows.filter((r) => r.w === 0).map((r) => fToC(f(r.t))));
    assert.ok(Math.abs(fi - want) <= 1, `index ${fi}, computed ${want}`);
    // snow_depth_cm as a suffix is read as cm too (its day of greatest depth: 0.6 m).
    await read(page, 'suffix.csv', 'date,t_mean,snow_depth_cm\n' + rows.map((r) => r.date + ',' + r.t + ',' + r.snow).join('\n') + '\n');
    assert.match(await page.locator('#imp-units').textContent(), /snow depth in cm \(not m as chosen above\)/);
    const deepest = Math.max(...(await saved(page)).winter.climate.days.map((d) => d.snow_depth_m || 0));
    assert.ok(Math.abs(deepest - 0.6) < 1e-9, `deepest snow ${deepest} m`);
  }, screen));

  test(`at ${screen.width} px, changing an import option reads the chosen file again`, () => withPage(async (page) => {
    await toDaily(page);
    const rows = threeWinters().slice(0, 120);
    // A bad line and a gap of three days.
    const lines = rows.map((r) => r.date + ',' + r.t);
    lines[10] = rows[10].date + ',cold';
    const withGap = lines.filter((_, i) => i < 50 || i > 52);
    await page.setInputFiles('#imp-file', file('gappy.csv', 'date,temperature\n' + withGap.join('\n') + '\n'));
    await page.waitForSelector('#imp-problems:not([hidden])');
    assert.match(await page.locator('#imp-problems').textContent(), /gappy\.csv was not read/);
    // Leave bad lines out: read again at once, still refused for the gap.
    await page.check('#imp-skip');
    await page.waitForFunction(() => /missing|gap/i.test(document.querySelector('#imp-problems').textContent)
      && !/line 12, mean air temperature/.test(document.querySelector('#imp-problems').textContent));
    // Fill gaps: read again, now accepted with the four days filled (the three missing and
    // the bad line's, left out).
    await page.check('#imp-fill');
    await page.waitForSelector('#w-record-span');
    const span = await page.locator('#w-record-span').textContent();
    assert.match(span, /gappy\.csv: 120 days/);
    assert.match(span, /4 missing days filled in/);
    assert.match(await page.locator('#imp-problems').textContent(), /leaving out 1 bad line/);
    // A unit changed (no unit in this header): read again in °F.
    const before = parseShown((await winterIndices(page))[0]).value;
    await page.selectOption('#imp-temp', '°F');
    await page.waitForFunction((b) => {
      const td = document.querySelector('#w-winters tbody tr td.num');
      return td && Number(td.textContent.replace(/[^0-9.-]/g, '')) !== b;
    }, before);
    const temps = rows.filter((_, i) => i !== 10).map((r) => r.t);
    const first = (await saved(page)).winter.climate.days[0].mean_air_c;
    assert.ok(Math.abs(first - fToC(temps[0])) < 1e-9, `first day ${first} °C from ${temps[0]} °F`);
    // Leaving bad lines in again refuses the file again.
    await page.uncheck('#imp-skip');
    await page.waitForFunction(() => /was not read/.test(document.querySelector('#imp-problems').textContent));
  }, screen));

  test(`at ${screen.width} px, each winter's freezing season is shown and the hand methods take one winter`, () => withPage(async (page) => {
    await toDaily(page);
    await field(page, 'winter.initial.kind').selectOption('uniform');
    await field(page, 'winter.step_s').fill('6');
    const rows = threeWinters();
    const b = await winterOutcomes(page);
    await read(page, 'three.csv', 'date,mean air temperature,snow depth (cm)\n' + rows.map((r) => r.date + ',' + r.t + ',' + r.snow).join('\n') + '\n');
    const below = [0, 1, 2].map((w) => rows.filter((r) => r.w === w && r.t < 0).length);
    assert.deepEqual(await winterSeasons(page), below, 'days below 0 °C of each winter, counted here');
    assert.equal(await winterDone(page, b), 'done');
    // Modified Berggren: the season of one winter (the coldest, A = 16 K), not of all three;
    // the run's surface is under snow, so its season is near, not equal to, the air's.
    const note = await page.locator('#w-hand tr[data-method="berggren"] td').last().textContent();
    const season = Number(/season (\d+) days/.exec(note)[1]);
    assert.ok(season < 366, `one winter's season: ${note}`);
    assert.ok(Math.abs(season - below[1]) <= 40, `near the coldest winter's ${below[1]} air days: ${note}`);
    assert.match(note, /winter \d of 3/);
  }, screen));

  test(`at ${screen.width} px, the design winter built from a record carries its season and its snow`, () => withPage(async (page) => {
    await toDaily(page);
    const rows = threeWinters();
    await read(page, 'three.csv', 'date,mean air temperature,snow depth (cm)\n' + rows.map((r) => r.date + ',' + r.t + ',' + r.snow).join('\n') + '\n');
    assert.match(await page.locator('#w-design-fit').textContent(), /fitted to 3 snowy winters/);
    await andRecompute(page, () => page.click('#w-use-design'));
    assert.equal(await field(page, 'winter.climate.kind').inputValue(), 'design-winter');
    // The season: the mean days below 0 °C of the three coldest (here all three) winters.
    const below = [0, 1, 2].map((w) => rows.filter((r) => r.w === w && r.t < 0).length);
    const season = Number(await field(page, 'winter.climate.season_days').inputValue());
    assert.equal(season, Math.round((below[0] + below[1] + below[2]) / 3));
    // The index: the mean of the three winters' indices, computed here.
    const fi = [0, 1, 2].map((w) => freezingIndex(rows.filter((r) => r.w === w).map((r) => r.t)));
    const shownFi = parseShown(await field(page, 'winter.climate.freezing_index_c_days').inputValue()).value;
    assert.ok(Math.abs(shownFi - (fi[0] + fi[1] + fi[2]) / 3) <= 1, `index ${shownFi}`);
    // The snow: on, its greatest depth the mean of the winters' peaks (40, 60, 30 cm),
    // shown in cm, to the centimetre kept.
    assert.equal(await page.locator('#w-snow-on').isChecked(), true, 'snow carried over');
    const peak = parseShown(await field(page, 'winter.climate.snow.peak_depth_m').inputValue()).value;
    assert.ok(Math.abs(peak - 130 / 3) <= 0.5, `peak ${peak} cm`);
    // Deepest on day 230 of each winter; counted from freeze-up, the day after the top of
    // each winter's cumulative curve (computed here).
    const freezeUp = [0, 1, 2].map((w) => {
      let c = 0, top = 0, at = 0, range = 0, start = 0;
      rows.filter((r) => r.w === w).forEach((r, i) => { c += r.t; if (c > top) { top = c; at = i + 1; } if (top - c > range) { range = top - c; start = at; } });
      return start;
    });
    const wantPeak = Math.round(230 - (freezeUp[0] + freezeUp[1] + freezeUp[2]) / 3);
    assert.equal(Number(await field(page, 'winter.climate.snow.peak_day').inputValue()), wantPeak);
  }, screen));

  test(`at ${screen.width} px, the daily CSV of a record has a date beside each day`, () => withPage(async (page) => {
    await toDaily(page);
    await field(page, 'winter.initial.kind').selectOption('uniform');
    await field(page, 'winter.step_s').fill('6');
    const rows = threeWinters().slice(0, 100);
    const b = await winterOutcomes(page);
    await read(page, 'short.csv', 'date,temp\n' + rows.map((r) => r.date + ',' + r.t).join('\n') + '\n');
    assert.equal(await winterDone(page, b), 'done');
    const [dl] = await Promise.all([page.waitForEvent('download'), page.click('#w-csv')]);
    const lines = readFileSync(await dl.path(), 'utf8').trim().split('\n');
    assert.match(lines[0], /^day,date,air temperature \[°C\]/);
    assert.equal(lines.length, 1 + 101, 'a header and days 0 to 100 (the end of the 100th)');
    lines.slice(1).forEach((l, i) => {
      const [day, date] = l.split(',');
      assert.equal(Number(day), i);
      assert.equal(date, addDays('2004-07-01', i), l);
    });
    // A design winter keeps day numbers only.
    await andRecompute(page, () => field(page, 'winter.climate.kind').selectOption('design-winter'));
    const b2 = await winterOutcomes(page);
    assert.equal(await winterDone(page, b2), 'done');
    const [dl2] = await Promise.all([page.waitForEvent('download'), page.click('#w-csv')]);
    assert.match(readFileSync(await dl2.path(), 'utf8').split('\n')[0], /^day,air temperature/);
  }, screen));
}
