// End-to-end tests: the labels and stamps the page writes say what was chosen (the format
// version a saved file carries).
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { browserForFile, andRecompute } from './helpers.mjs';

const { withPage } = browserForFile();
const SCREENS = [{ width: 1366, height: 900 }, { width: 390, height: 844 }];

for (const screen of SCREENS) test(`at ${screen.width} px, an example of an older version saves as the current version and reopens without a notice`, () => withPage(async (page) => {
  const current = await page.evaluate(() => wasm_bindgen.catalogue().format_version);
  const example = await page.evaluate(() => wasm_bindgen.example('silty-yard-design-winter'));
  assert.ok(example.version < current, 'the example is of an older version: ' + example.version);
  await andRecompute(page, () => page.selectOption('#example-pick', 'silty-yard-design-winter'));
  const [dl] = await Promise.all([page.waitForEvent('download'), page.click('#save-file')]);
  const text = readFileSync(await dl.path(), 'utf8');
  assert.equal(JSON.parse(text).version, current, 'saved as the current version');
  await andRecompute(page, () => page.setInputFiles('#open-file', { name: 'yard.json', mimeType: 'application/json', buffer: Buffer.from(text) }));
  assert.equal(await page.locator('#format-note').isHidden(), true, 'no older-format notice for the page\'s own file');
}, screen));

for (const screen of SCREENS) test(`at ${screen.width} px, an example's summary and notes are marked once the case departs from it, and not for a note of one's own`, () => withPage(async (page) => {
  const mark = page.locator('#example-changed');
  await andRecompute(page, () => page.selectOption('#example-pick', 'cabin-porch-slab-snowy-winter'));
  assert.equal(await mark.isHidden(), true, 'as opened, the example is the case its text describes');
  // Notes of one's own are not a change of the case.
  await andRecompute(page, () => page.fill('[data-field="notes"]', 'Checked on site.'));
  assert.equal(await mark.isHidden(), true);
  // A thicker board is.
  await andRecompute(page, () => page.fill('[data-field="layers[1].thickness_m"]', '10'));
  assert.equal(await mark.isVisible(), true, 'the changed case is marked');
  assert.match(await mark.textContent(), /describe the example as it was/);
  // Back to the example's board: the mark goes.
  await andRecompute(page, () => page.fill('[data-field="layers[1].thickness_m"]', '5'));
  assert.equal(await mark.isHidden(), true, 'the same case again');
  // A file of one's own carries no example's summary.
  await andRecompute(page, () => page.fill('[data-field="layers[1].thickness_m"]', '10'));
  const [dl] = await Promise.all([page.waitForEvent('download'), page.click('#save-file')]);
  const mine = readFileSync(await dl.path());
  await andRecompute(page, () => page.setInputFiles('#open-file', { name: 'mine.json', mimeType: 'application/json', buffer: mine }));
  assert.equal(await page.locator('#example-summary').textContent(), '');
  assert.equal(await mark.isHidden(), true);
}, screen));

// The option shown as chosen in a select.
const chosenText = (page, path) => page.locator(`[data-field="${path}"]`).evaluate((s) => s.selectedOptions[0] ? s.selectedOptions[0].textContent : null);

for (const screen of SCREENS) test(`at ${screen.width} px, the n-factor surface shown is the one chosen, and it travels in the saved file`, () => withPage(async (page) => {
  await andRecompute(page, () => page.selectOption('#example-pick', 'silty-yard-design-winter'));
  const preset = 'winter.surface.preset';
  // The bare yard's 0.7 is bare soil's (the example says so), not the first surface with 0.7.
  assert.match(await chosenText(page, preset), /^Bare soil/);
  const presets = await page.evaluate(() => wasm_bindgen.catalogue().n_factor_presets);
  const twin = presets.find((p) => p.id !== 'bare-soil' && Math.abs(p.freezing - 0.7) < 1e-9);
  assert.ok(twin, 'another surface shares bare soil\'s n-factor, so the value alone cannot tell them apart');
  await andRecompute(page, () => page.selectOption(`[data-field="${preset}"]`, twin.id));
  assert.equal(await chosenText(page, preset), twin.name + ' — 0.7');
  const [dl] = await Promise.all([page.waitForEvent('download'), page.click('#save-file')]);
  const text = readFileSync(await dl.path(), 'utf8');
  assert.equal(JSON.parse(text).winter.surface.preset, twin.id, 'the file records the surface chosen');
  await andRecompute(page, () => page.selectOption('#example-pick', 'cabin-porch-slab-snowy-winter'));
  await andRecompute(page, () => page.setInputFiles('#open-file', { name: 'yard.json', mimeType: 'application/json', buffer: Buffer.from(text) }));
  assert.equal(await chosenText(page, preset), twin.name + ' — 0.7', 'reopened, the same surface');
  // A freezing n-factor of one's own is shown as such, and the file stops naming a surface.
  await andRecompute(page, () => page.fill('[data-field="winter.surface.freezing"]', '0.66'));
  assert.equal(await chosenText(page, preset), 'Own value');
  const saved = await page.evaluate(() => JSON.parse(localStorage.getItem('hibernal.autosave.1')).scenario.winter.surface);
  assert.equal(saved.preset, undefined, JSON.stringify(saved));
}, screen));
