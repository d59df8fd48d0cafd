// End-to-end tests: frost that reaches the bottom of the modelled ground is never shown as a
// depth. By default a winter run continues the deepest layer downwards (the chart marks the
// added ground); held at the layers' bottom on purpose, frost that gets there reads "at
// least", with a warning that says what to change.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { browserForFile, REPO, andSectionRun, field } from './helpers.mjs';

const { withPage } = browserForFile();
const SCREENS = [{ width: 1366, height: 900 }, { width: 390, height: 844 }];

// The shed example's 3.0 m stack under a design winter of 2 500 °C·days whose mean is below
// freezing: held at 3.0 m, the column freezes to its bottom.
function coldFloor(held) {
  const s = JSON.parse(readFileSync(join(REPO, 'scenarios', 'unheated-shed-floor.json'), 'utf8'));
  s.version = 5;
  s.winter = {
    climate: { kind: 'design-winter', freezing_index_c_days: 2500, season_days: 200, mean_annual_c: -1 },
    surface: { kind: 'film', film_w_m2k: 20, snow_correlation: 'sturm-1997-quadratic' },
    bottom: held ? { kind: 'flux', upward_w_m2: 0.06, at_layers_bottom: true } : { kind: 'flux', upward_w_m2: 0.06 },
    initial: { kind: 'spin-up', start_c: 0, max_years: 30, from_periodic: true },
    step_s: 3600,
  };
  return s;
}

const openCase = (page, s) => andSectionRun(page, 'winter-results',
  () => page.setInputFiles('#open-file', { name: 'floor.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(s)) }), 120000);

for (const screen of SCREENS) test(`at ${screen.width} px, frost held at the layers' bottom reads "at least", and letting the run add ground takes the hold off`, () => withPage(async (page) => {
  assert.equal(await openCase(page, coldFloor(true)), 'done');
  const headline = (await page.textContent('#w-max-frost')).trim();
  assert.match(headline, /^at least 3\.00*\s*m$/, 'a bound, not a depth');
  assert.match(await page.textContent('#w-max-frost-when'), /bottom of the modelled ground/);
  const warnings = await page.textContent('#w-warnings');
  assert.match(warnings, /Frost reached the bottom of the layers given, 3\.00 m down/);
  assert.match(warnings, /do not hold the deep condition/);
  assert.match(warnings, /permafrost/);
  const hold = field(page, 'winter.bottom.at_layers_bottom');
  assert.equal(await hold.isChecked(), true);

  // Untick the hold: the run adds ground below, and the page says where the condition acts.
  assert.equal(await andSectionRun(page, 'winter-results', () => hold.uncheck(), 120000), 'done');
  assert.match(await page.textContent('#w-bottom'), /three damping depths/);
  const again = (await page.textContent('#w-max-frost')).trim();
  assert.doesNotMatch(again, /^at least 3\.00*\s*m$/);
  // Whatever the deeper ground gives, a frozen-all-year case is never passed off as seasonal.
  assert.match(await page.textContent('#w-warnings'), /stayed frozen through the whole run/);
}, screen));

for (const screen of SCREENS) test(`at ${screen.width} px, a mild winter on a shallow stack gives a depth above the layers' bottom, with the added ground drawn`, () => withPage(async (page) => {
  const s = coldFloor(false);
  s.winter.climate.mean_annual_c = 2;
  assert.equal(await openCase(page, s), 'done');
  const headline = (await page.textContent('#w-max-frost')).trim();
  assert.doesNotMatch(headline, /at least/);
  const m = headline.match(/^([\d.]+)\s*m$/);
  assert.ok(m && Number(m[1]) > 0.5 && Number(m[1]) < 2.5, JSON.stringify(headline));
  assert.equal(await page.evaluate(() => document.querySelector('#w-max-frost').dataset.bound), '');
  assert.doesNotMatch(await page.textContent('#w-warnings'), /bottom of the/);
  // The day chart draws (the added ground is marked on it; the SVG form is checked natively).
  await page.waitForFunction(() => {
    const c = document.querySelector('#day-chart');
    return c && c.width > 0;
  });
}, screen));
