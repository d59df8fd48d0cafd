// End-to-end tests of the first screen's frost answer (#frost-headline): with a winter, the
// winter run's deepest frost in the same words as the winter section's figure, never a
// number while the run is under way; without one, that a frost depth needs a winter. The
// steady 0 °C plane is never titled frost depth. And the shelter's steady panel (its wall
// laid flat) follows the shelter's own outside air, not the stack's top face.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { browserForFile, andRecompute, andSectionRun, field, shown } from './helpers.mjs';

const { withPage } = browserForFile();
const SCREENS = [{ width: 1366, height: 900 }, { width: 390, height: 844 }];

const text = async (page, sel) => (await page.locator(sel).textContent()).trim();

// The headline card lies within the screen's width, and above the steady cards.
async function fitsAndLeads(page, screen) {
  const card = await page.locator('#frost-headline').boundingBox();
  assert.ok(card.x >= 0 && card.x + card.width <= screen.width, `card ${JSON.stringify(card)} within 0..${screen.width}`);
  const steady = await page.locator('#r-total').boundingBox();
  assert.ok(card.y + card.height <= steady.y, 'the frost answer comes before the steady numbers');
}

async function steadyPlaneIsNotFrostDepth(page) {
  const label = await text(page, '#zero-label');
  assert.match(label, /plane for the steady temperatures entered/);
  assert.doesNotMatch(label, /frost depth/i);
  assert.match(await text(page, '#zero-note'), /not how deep frost goes in a winter/);
}

for (const screen of SCREENS) test(`at ${screen.width} px, with a winter the headline is its deepest frost, in the winter section's words, and says so while it runs`, () => withPage(async (page) => {
  const st = await andSectionRun(page, 'winter-results', () => page.selectOption('#example-pick', 'cabin-porch-slab-snowy-winter'), 120000);
  assert.equal(st, 'done');
  assert.equal(await page.getAttribute('#frost-headline', 'data-state'), 'done');
  const frost = await text(page, '#w-max-frost');
  assert.match(frost, /^(at least )?\d+\.\d+\s*m$/, 'a depth in metres');
  assert.equal(await text(page, '#h-frost'), frost);
  assert.equal(await text(page, '#h-frost-when'), await text(page, '#w-max-frost-when'));
  assert.match(await text(page, '#h-frost-when'), /^On day \d+/);
  // Not the steady plane: the cabin's steady plane (constant −25 °C on top) is far deeper.
  const plane = (await shown(page, '#zero-depth')).value;
  assert.ok(plane > 2 * (await shown(page, '#w-max-frost')).value, `steady plane ${plane} against the winter's ${frost}`);
  assert.ok(await page.isVisible('#h-frost-link'));
  assert.ok(await page.isHidden('#h-winter-add'));
  await steadyPlaneIsNotFrostDepth(page);
  await fitsAndLeads(page, screen);

  // An edit starts the run again: the card says it is under way and shows no number.
  const b = Number(await page.getAttribute('#winter-results', 'data-outcomes'));
  await field(page, 'top.temperature_c').fill('-20');
  await page.waitForFunction(() => document.querySelector('#frost-headline').dataset.state === 'running');
  assert.doesNotMatch(await text(page, '#h-frost'), /\d/, 'no stale or steady number while the winter runs');
  await page.waitForFunction((n) => Number(document.querySelector('#winter-results').dataset.outcomes) > n, b, { timeout: 120000 });
  assert.equal(await text(page, '#h-frost'), await text(page, '#w-max-frost'));

  // The pointer leads to the winter's results.
  await page.evaluate(() => window.scrollTo(0, 0));
  await page.click('#h-frost-link');
  await page.waitForFunction(() => {
    const r = document.querySelector('#winter-results').getBoundingClientRect();
    return r.top >= -2 && r.top < window.innerHeight;
  });
}, screen));

for (const screen of SCREENS) test(`at ${screen.width} px, without a winter the headline says a frost depth needs one, and its button adds one`, () => withPage(async (page) => {
  await andRecompute(page, () => page.selectOption('#example-pick', 'snow-block-wall'));
  assert.equal(await page.getAttribute('#frost-headline', 'data-state'), 'no-winter');
  assert.match(await text(page, '#h-frost'), /needs a winter/i);
  assert.doesNotMatch(await text(page, '#h-frost'), /\d/, 'no depth shown without a winter');
  assert.match(await text(page, '#h-frost-when'), /depends on a whole winter/);
  assert.ok(await page.isHidden('#h-frost-link'));
  await steadyPlaneIsNotFrostDepth(page);
  await fitsAndLeads(page, screen);
  const st = await andSectionRun(page, 'winter-results', () => page.click('#h-winter-add'), 120000);
  assert.equal(st, 'done', 'the button added a winter, which ran');
  assert.ok(await page.isVisible('#winter-on'));
  assert.equal(await text(page, '#h-frost'), await text(page, '#w-max-frost'));
  // Removing the winter brings the plain statement back.
  await andRecompute(page, () => page.click('#winter-remove'));
  assert.equal(await page.getAttribute('#frost-headline', 'data-state'), 'no-winter');
}, screen));

// The flat wall's flux against the plane wall with films on both sides, q = (T_i − T_o)/R
// (Incropera & DeWitt), from the temperatures and R the panel shows.
async function planeWall(page) {
  const what = (await text(page, '#s-flat-what')).replace(/\u2212/g, '-');
  const [, to, ti] = what.match(/the (-?[\d.]+)\s°C outside air and the (-?[\d.]+)\s°C air inside/).map(Number);
  const r = (await shown(page, '#s-flat-r')).value;
  const q = (await shown(page, '#s-flat-q')).value;
  const expected = (ti - to) / r;
  const tol = expected * (0.005 / r + 0.1 / (ti - to)) + 0.01;
  assert.ok(Math.abs(q - expected) <= tol, `q ${q} against (${ti} − ${to})/${r} = ${expected}`);
}

for (const screen of SCREENS) test(`at ${screen.width} px, the shelter's wall laid flat follows the shelter's outside air and not the stack's top face`, () => withPage(async (page) => {
  const andShelter = (action) => andSectionRun(page, 'shelter-results', action);
  assert.equal(await andShelter(() => page.selectOption('#example-pick', 'training-dome-four')), 'done');
  assert.ok(await page.isVisible('#s-flat-wall'));
  const q0 = (await shown(page, '#s-flat-q')).value;
  await planeWall(page);
  const r0 = (await shown(page, '#s-flat-r')).value;
  // The same 35 cm of snow with nearly the same films as the example's stack (outside film
  // from the wind, 27.7 against the stack's 25 W/(m²·K): 0.004 m²·K/W apart).
  const stackR = (await shown(page, '#r-total')).value;
  assert.ok(Math.abs(r0 - stackR) < 0.02, `flat wall R ${r0} against the stack's ${stackR}`);
  assert.match(await text(page, '#s-flat-what'), /−20(\.0)?\s°C outside air/);

  // Colder outside air for the shelter: more heat through the wall, the stack unchanged.
  const flux0 = await text(page, '#heat-flux');
  assert.equal(await andShelter(() => field(page, 'shelter.conditions.outside_c').fill('-35')), 'done');
  const q1 = (await shown(page, '#s-flat-q')).value;
  // The air inside falls with the outside air (the people's heat is the same), so the flux
  // moves little; it is the plane wall's q = (T_i − T_o)/R of the numbers shown (to their
  // rounding: R to 0.01, temperatures to 0.1 K).
  assert.notEqual(q1, q0, "the panel moved with the shelter's outside air");
  await planeWall(page);
  assert.match(await text(page, '#s-flat-what'), /−35(\.0)?\s°C outside air/);
  assert.equal(await text(page, '#heat-flux'), flux0, 'the stack does not read the shelter');

  // The stack's top face warmer: the stack's flux changes, the shelter's panel does not.
  assert.equal(await andShelter(() => field(page, 'top.temperature_c').fill('-5')), 'done');
  assert.notEqual(await text(page, '#heat-flux'), flux0, 'the edit reached the stack');
  assert.equal((await shown(page, '#s-flat-q')).value, q1);
  assert.match(await text(page, '#s-flat-what'), /−35(\.0)?\s°C outside air/);
  const box = await page.locator('#s-flat-wall').boundingBox();
  assert.ok(box.x >= 0 && box.x + box.width <= screen.width, 'the panel fits the width');
}, screen));
