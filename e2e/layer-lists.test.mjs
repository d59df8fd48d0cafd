// End-to-end tests: every list on the page that names layers of the stack (the least
// thickness search's layer and its "bottom of layer" limit, the ranges' "where") follows
// each add, remove and reorder of the layers at once, and the choice made in it stays on
// the same layer.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { browserForFile, andRecompute, field } from './helpers.mjs';

const { withPage } = browserForFile();

// The options of a select, and the text of the one chosen.
const listOf = (page, path) => field(page, path).evaluate((s) => ({
  options: [...s.options].map((o) => o.textContent),
  chosen: s.selectedOptions[0] ? s.selectedOptions[0].textContent : null,
}));
const layerNames = (page) => page.locator('#layer-list > li input[data-field$=".name"]').evaluateAll((xs) => xs.map((x) => x.value));
const layerButton = (page, i, act) => page.locator(`#layer-list > li[data-index="${i}"] [data-act="${act}"]`);
// Each test runs on a desktop screen and on a phone's.
const SCREENS = [{ width: 1366, height: 900 }, { width: 390, height: 844 }];

for (const screen of SCREENS) test(`at ${screen.width} px, the least-thickness lists follow the layers when one is moved, added or removed`, () => withPage(async (page) => {
  await andRecompute(page, () => page.selectOption('#example-pick', 'cabin-porch-slab-snowy-winter'));
  await page.click('#w-design > summary');
  const size = 'winter.least_thickness.layer';
  const bottom = 'winter.least_thickness.keep_frost_above.layer';
  await field(page, bottom).selectOption('2');
  assert.equal((await listOf(page, size)).chosen, '2. Foam board');
  assert.equal((await listOf(page, bottom)).chosen, '3. Gravel pad');

  // The board moves to the top: the search still sizes the board, the limit is still the pad.
  await andRecompute(page, () => layerButton(page, 1, 'up').click());
  assert.deepEqual((await layerNames(page)).slice(0, 2), ['Foam board', 'Concrete slab']);
  for (const path of [size, bottom]) {
    const l = await listOf(page, path);
    assert.deepEqual(l.options, (await layerNames(page)).map((n, i) => (i + 1) + '. ' + n), path + ' lists the stack as it is');
  }
  assert.equal((await listOf(page, size)).chosen, '1. Foam board');
  assert.equal((await listOf(page, bottom)).chosen, '3. Gravel pad');

  // A new layer at the bottom is listed at once.
  await andRecompute(page, () => page.click('#add-layer'));
  assert.equal((await listOf(page, size)).options.length, 6);
  assert.equal((await listOf(page, bottom)).options.at(-1), '6. New layer');

  // The slab goes: every layer below it moves up one, and the choices go with their layers.
  await andRecompute(page, () => layerButton(page, 1, 'remove').click());
  const l = await listOf(page, bottom);
  assert.deepEqual(l.options, ['1. Foam board', '2. Gravel pad', '3. Moist silt', '4. Sand', '5. New layer']);
  assert.equal(l.chosen, '2. Gravel pad');
  assert.equal((await listOf(page, size)).chosen, '1. Foam board');

  // Removing the layer being sized hands the search to the layer a new search would size.
  await andRecompute(page, () => layerButton(page, 0, 'remove').click());
  assert.equal((await listOf(page, size)).chosen, '1. Gravel pad', 'no board left: the top layer');
}, screen));

for (const screen of SCREENS) test(`at ${screen.width} px, an uncertain input of one layer follows that layer, and goes when the layer goes`, () => withPage(async (page) => {
  await andRecompute(page, () => page.selectOption('#example-pick', 'silt-yard-how-sure'));
  const where = 'ranges.inputs[1].layer';
  const rows = () => page.locator('#r-inputs tbody tr').count();
  assert.equal((await listOf(page, where)).chosen, 'Layer 1: Moist silt');
  const before = await rows();

  await andRecompute(page, () => layerButton(page, 0, 'down').click());
  const l = await listOf(page, where);
  assert.deepEqual(l.options, ['Everywhere', 'Layer 1: Sand', 'Layer 2: Moist silt']);
  assert.equal(l.chosen, 'Layer 2: Moist silt', 'the water content stays on the silt');

  await andRecompute(page, () => layerButton(page, 1, 'remove').click());
  assert.equal(await rows(), before - 1, 'the input of the removed layer is gone');
  const whats = await page.locator('#r-inputs tbody tr [data-field$=".what"]').evaluateAll((xs) => xs.map((x) => x.value));
  assert.ok(!whats.includes('water-content'), 'no input is left on a layer that is not there: ' + whats.join(', '));
  await andRecompute(page, () => page.click('#undo'));
  assert.equal(await rows(), before, 'the undo brings the layer and its input back');
  assert.equal((await listOf(page, where)).chosen, 'Layer 2: Moist silt');
}, screen));
