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
