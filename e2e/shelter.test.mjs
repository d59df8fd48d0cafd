// End-to-end tests of the snow shelter section of dist/hibernal.html (file://, network refused).
import { test } from 'node:test';
import assert from 'node:assert/strict';
import {
  browserForFile, andRecompute, andSectionRun, shown, field, msgFor, inkedPixels,
} from './helpers.mjs';

const { withPage } = browserForFile();

// Does `action`, then waits for the shelter to be computed again; returns its state.
const andShelter = (page, action) => andSectionRun(page, 'shelter-results', action);

async function openDome(page) {
  const st = await andShelter(page, () => page.selectOption('#example-pick', 'training-dome-four'));
  assert.equal(st, 'done', 'the shelter is computed');
  await page.locator('#shelter').scrollIntoViewIfNeeded();
}

async function type(page, path, text) {
  return andShelter(page, () => field(page, path).fill(text));
}

const interior = async (page) => (await shown(page, '#s-interior')).value;

const inked = inkedPixels;

test('a shelter example shows the air inside, the cautions and drawn charts', () => withPage(async (page) => {
  await openDome(page);
  const t = await interior(page);
  // Warmer than the −20 °C outside, not above the melt limit (the dome is frozen as set).
  assert.ok(t > -20 && t < 1, `interior ${t}`);
  assert.match(await page.locator('#s-interior').locator('xpath=..').textContent(), /°C/);
  assert.equal(await page.locator('#s-surface').getAttribute('data-state'), 'frozen');
  assert.ok((await shown(page, '#s-co2')).value > 420, 'CO₂ above outdoor air');
  assert.equal(await page.locator('#s-least').getAttribute('data-answer'), 'reached');
  // The cautions sit beside the results and are on screen with them.
  const cautions = page.locator('#s-caution-list li');
  assert.ok(await cautions.count() >= 8);
  assert.match(await page.locator('[data-caution="collapse"]').textContent(), /collapse/);
  await assert.doesNotReject(page.locator('[data-caution="carbon-monoxide"]').waitFor({ state: 'visible' }));
  assert.match(await page.locator('[data-caution="carbon-monoxide"]').textContent(), /Never sleep with a stove/);
  assert.match(await page.locator('[data-caution="wall-thickness"]').textContent(), /30 cm/);
  const box = await page.locator('#s-cautions').boundingBox();
  const big = await page.locator('#s-interior').boundingBox();
  assert.ok(Math.abs(box.y - big.y) < 300, 'cautions beside the big number, not far below');
  // The band names the spread, and says when the regression in use is the warmest one.
  assert.match(await page.locator('#s-band').textContent(), /gives the warmest answer/);
  // Losses by path add to 100 %.
  const shares = await page.locator('#s-losses tbody td:last-child').allTextContents();
  const sum = shares.map((s) => Number(s.replace(/[^0-9.]/g, ''))).reduce((a, b) => a + b, 0);
  assert.ok(Math.abs(sum - 100) <= 3, `shares add to ${sum}`);
  for (const id of ['s-night-chart', 's-sweep-0', 's-sweep-1', 's-sweep-2']) {
    const { n, size } = await inked(page, id);
    assert.ok(size > 0 && n > size / 200, `${id} is drawn (${n} of ${size} pixels inked)`);
  }
  const ms = Number(await page.locator('#shelter-results').getAttribute('data-ms'));
  assert.ok(ms >= 0, 'the computation time is recorded');
}));

test('more people warm it, a thinner wall cools it', () => withPage(async (page) => {
  await openDome(page);
  const base = await interior(page);
  await type(page, 'shelter.conditions.people', '6');
  const more = await interior(page);
  assert.ok(more > base, `6 people ${more} > 4 people ${base}`);
  await type(page, 'shelter.conditions.people', '4');
  assert.equal(await interior(page), base);
  await type(page, 'shelter.shape.wall_thickness_m', '15');
  const thin = await interior(page);
  assert.ok(thin < base - 0.5, `15 cm wall ${thin} colder than 35 cm ${base}`);
  // A thin wall is warned about beside its field.
  assert.match(await msgFor(page, 'shelter.shape.wall_thickness_m').textContent(), /15\.0\scm is thinner than about 30\scm/);
}));

test('a big stove trips the melt limit: the page says it will glaze and gives kg/h', () => withPage(async (page) => {
  await openDome(page);
  await type(page, 'shelter.conditions.stove_w', '1500');
  assert.equal(await page.locator('#s-surface').getAttribute('data-state'), 'melting');
  assert.match(await page.locator('#s-surface').textContent(), /0\s°C and melting/);
  const sub = await page.locator('#s-surface-sub').textContent();
  assert.match(sub, /glaze/);
  const m = /([0-9.]+)\skg\/h/.exec(sub);
  assert.ok(m && Number(m[1]) > 0, `melt rate in kg/h: ${sub}`);
  // The stove's carbon-monoxide warning sits beside its field.
  assert.match(await msgFor(page, 'shelter.conditions.stove_w').textContent(), /carbon monoxide/);
  assert.ok(await page.locator('#s-lining').isVisible(), 'the lining comparison is shown');
}));

test('the unit switch converts the interior temperature', () => withPage(async (page) => {
  await openDome(page);
  const c = await shown(page, '#s-interior');
  await andShelter(page, () => page.check('#units-us'));
  const f = await shown(page, '#s-interior');
  // °F = °C × 1.8 + 32 (NIST SP 811); both shown to one decimal.
  assert.ok(Math.abs(f.value - (c.value * 1.8 + 32)) <= 0.11, `${c.value} °C → ${f.value} °F`);
  assert.match(await page.locator('#s-interior').locator('xpath=..').textContent(), /°F/);
  // Inputs convert too, at the precision they are written in: the 35 cm wall reads in
  // inches to the 1/8 in (0.35 / 0.0254 = 13.78 in → 110.2 eighths → 13 3/4), the wind in
  // mph to 0.1 (5 / 0.44704 = 11.18 → 11.2).
  assert.equal(await field(page, 'shelter.shape.wall_thickness_m').inputValue(), '13 3/4');
  assert.equal(await field(page, 'shelter.conditions.wind_m_s').inputValue(), '11.2');
  // A value typed in °F reaches the core in °C: −4 °F is −20 °C, the example's own.
  await type(page, 'shelter.conditions.outside_c', '-4');
  assert.equal((await shown(page, '#s-interior')).value, f.value);
  // Warnings speak the units shown: a 6 in wall against the 12 in (30 cm) of the manuals.
  await type(page, 'shelter.shape.wall_thickness_m', '6');
  const warn = await msgFor(page, 'shelter.shape.wall_thickness_m').textContent();
  assert.match(warn, /6\sin is thinner than about 12\sin/, warn);
  assert.doesNotMatch(warn, /cm/);
  await type(page, 'shelter.conditions.stove_w', '5000');
  assert.match(await page.locator('#s-surface-sub').textContent(), /lb\/h/);
  assert.doesNotMatch(await page.locator('#s-warnings').textContent(), /kg|°C/);
}));

test('a negative radius is named beside its field, and fixing it recovers', () => withPage(async (page) => {
  await openDome(page);
  const st = await type(page, 'shelter.shape.inner_radius_m', '-1');
  assert.equal(st, 'stale');
  const msg = await msgFor(page, 'shelter.shape.inner_radius_m').textContent();
  assert.match(msg, /between/, msg);
  assert.equal(await field(page, 'shelter.shape.inner_radius_m').getAttribute('aria-invalid'), 'true');
  assert.ok(await page.locator('#shelter-results').evaluate((e) => e.classList.contains('is-stale')));
  // Text that is not a number is flagged before the core is asked.
  await type(page, 'shelter.conditions.outside_c', 'cold');
  assert.match(await msgFor(page, 'shelter.conditions.outside_c').textContent(), /enter a number/);
  await type(page, 'shelter.conditions.outside_c', '-20');
  assert.equal(await type(page, 'shelter.shape.inner_radius_m', '1.5'), 'done');
  assert.equal(await msgFor(page, 'shelter.shape.inner_radius_m').textContent(), '');
}));

test('a shelter can be started from scratch, reshaped and removed', () => withPage(async (page) => {
  assert.ok(await page.locator('#shelter-off').isVisible());
  assert.equal(await andShelter(page, () => page.click('#shelter-add')), 'done');
  assert.ok(await page.locator('#shelter-on').isVisible());
  const dome = await interior(page);
  assert.ok(Number.isFinite(dome));
  assert.equal(await andShelter(page, () => field(page, 'shelter.shape.kind').selectOption('drift-cave')), 'done');
  // The cave has a chamber radius and an outside face, and no dome wall.
  assert.equal(await field(page, 'shelter.shape.wall_thickness_m').count(), 0);
  assert.equal(await field(page, 'shelter.shape.exposed_face.thickness_m').count(), 1);
  assert.equal(await andShelter(page, () => field(page, 'shelter.shape.kind').selectOption('trench')), 'done');
  assert.equal(await field(page, 'shelter.shape.roof_thickness_m').count(), 1);
  assert.equal(await andShelter(page, () => field(page, 'shelter.entrance.kind').selectOption('level')), 'done');
  assert.equal(await field(page, 'shelter.entrance.opening_width_m').count(), 1);
  assert.ok(await page.locator('#s-losses tr[data-path="doorway"]').count() === 1, 'the doorway loss is listed');
  await andRecompute(page, () => page.click('#shelter-remove'));
  assert.ok(await page.locator('#shelter-off').isVisible());
  assert.equal(await page.locator('#shelter-results').getAttribute('data-state'), 'idle');
}));

test('the night and series download as CSV in the units shown', () => withPage(async (page) => {
  await openDome(page);
  await andShelter(page, () => page.check('#units-us'));
  const [dl] = await Promise.all([page.waitForEvent('download'), page.click('#s-night-csv')]);
  const path = await dl.path();
  const { readFileSync } = await import('node:fs');
  const text = readFileSync(path, 'utf8');
  assert.match(text, /^time \[h\],air inside \[°F\]/);
  assert.ok(text.trim().split('\n').length > 10);
  const [dl2] = await Promise.all([page.waitForEvent('download'), page.click('#s-sweeps-csv')]);
  const series = readFileSync(await dl2.path(), 'utf8');
  assert.match(series, /^series,x,x unit,air inside \[°F\]/);
  assert.match(series, /\nthickness,[0-9.]+,in,/);
}));

test('warmer snow at the start makes a warmer first night, and the page says what it assumed', () => withPage(async (page) => {
  await openDome(page);
  const night = async () => page.locator('#s-night').textContent();
  const before = await night();
  assert.match(before, /snow starting at −20\.0\s°C/);
  const endOf = async () => Number(/^(−?[0-9.]+)\s°C at the end of the first/.exec((await page.locator('#s-interior-sub').textContent()))[1].replace('−', '-'));
  const cold = await endOf();
  await type(page, 'shelter.night.snow_start_c', '-5');
  assert.match(await night(), /snow starting at −5\.0\s°C/);
  const warm = await endOf();
  assert.ok(warm > cold + 1, `end of night ${warm} °C from −5 °C snow against ${cold} °C from −20 °C snow`);
  // The steady state does not depend on where the night starts.
  const t = await interior(page);
  await type(page, 'shelter.night.snow_start_c', '');
  assert.equal(await interior(page), t);
  assert.match(await night(), /snow starting at −20\.0\s°C/);
}));
