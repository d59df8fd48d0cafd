// End-to-end tests of the building-edge section of dist/hibernal.html (file://, network
// refused): the cross-section run, its results, charts, exports, cautions and the search.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import {
  browserForFile, andRecompute, andSectionRun, outcomes as outcomesOf, field, msgFor,
} from './helpers.mjs';

const { withPage } = browserForFile();

const outcomes = (page) => outcomesOf(page, 'edge-results');

// Does `action`, then waits until the edge run after it has ended; returns its state.
const andEdge = (page, action) => andSectionRun(page, 'edge-results', action, 60000);

// A length as shown ("0.123 m", "1.2 ft"), in metres.
function metres(text) {
  const m = /(−|-)?([\d.]+)\s*(m|cm|ft|in)\b/.exec(text);
  assert.ok(m, text);
  const v = Number(m[2]) * (m[1] ? -1 : 1);
  return { m: v, cm: v / 100, ft: v * 0.3048, in: v * 0.0254 }[m[3]];
}

test('the heated workshop: frost stays away from the footing, with the far field, the hand methods and the cautions', () => withPage(async (page) => {
  assert.equal(await andEdge(page, () => page.selectOption('#example-pick', 'heated-workshop-edge')), 'done');
  assert.match(await page.locator('#e-below').textContent(), /No frost at the footing|above the base/);
  assert.equal(await page.locator('#e-below').getAttribute('class'), 'small good');
  // The far side of the section against a single column of the same soil and winter: the
  // same physics in 1D, so within a few centimetres (snow stores no heat in the 2D run).
  const far = metres(await page.locator('#e-far').textContent());
  const column = metres(await page.locator('#e-far-sub').textContent());
  assert.ok(far > 0.5 && Math.abs(far - column) < 0.05, `${far} vs ${column}`);
  // Every method on the same case, side by side; the hand methods ignore the building's
  // heat, so none is shallower than the 2D frost at the footing.
  const rows = page.locator('#e-hand tbody tr');
  assert.equal(await rows.count(), 6);
  const depth = async (m) => metres(await page.locator(`#e-hand tr[data-method="${m}"] td.num`).textContent());
  const footing = await depth('footing-2d');
  for (const m of ['stefan', 'stefan-resistance', 'berggren', 'column', 'far-field-2d']) assert.ok(await depth(m) > footing, m);
  assert.ok(await depth('stefan') >= await depth('berggren'), 'Stefan is the upper bound');
  // The cautions beside the result.
  const cautions = await page.locator('#e-caution-list').textContent();
  for (const re of [/heave/i, /licensed engineer/i, /moisture/i, /code/i]) assert.match(cautions, re);
  // The field map and the series are drawn; moving the day redraws the map.
  await page.waitForFunction(() => Number(document.querySelector('#e-field-chart').dataset.draws || 0) > 0 && Number(document.querySelector('#e-series-chart').dataset.draws || 0) > 0);
  const draws = await page.evaluate(() => Number(document.querySelector('#e-field-chart').dataset.draws));
  await page.locator('#e-day').fill('30');
  await page.waitForFunction((d) => Number(document.querySelector('#e-field-chart').dataset.draws) > d, draws);
  assert.match(await page.locator('#e-day-out').textContent(), /day (28|35)\b/);
  assert.equal(await page.locator('#e-field-chart + .chart-msg').textContent().catch(() => ''), '');
}));

test('the unheated store: frost gets under the footing, and a wider wing keeps it out', () => withPage(async (page) => {
  assert.equal(await andEdge(page, () => page.selectOption('#example-pick', 'unheated-storage-edge')), 'done');
  const text = await page.locator('#e-below').textContent();
  assert.match(text, /below the base/);
  assert.ok(metres(text) > 0.02, text);
  assert.match(await page.locator('#e-below').getAttribute('class'), /bad/);
  assert.equal(await andEdge(page, () => field(page, 'edge.wing.width_m').fill('1.6')), 'done');
  assert.match(await page.locator('#e-below').textContent(), /above the base|No frost/);
}));

test('the daily series and the field download as CSV in the units shown', () => withPage(async (page) => {
  assert.equal(await andEdge(page, () => page.selectOption('#example-pick', 'heated-workshop-edge')), 'done');
  await andRecompute(page, () => page.check('#units-us'));
  const [dl] = await Promise.all([page.waitForEvent('download'), page.click('#e-csv')]);
  const lines = readFileSync(await dl.path(), 'utf8').trim().split('\n');
  assert.match(lines[0], /°F/);
  assert.match(lines[0], /\[ft\]/);
  assert.match(lines[0], /Btu/);
  assert.ok(lines.length > 150, `${lines.length} lines`);
  const [dl2] = await Promise.all([page.waitForEvent('download'), page.click('#e-field-csv')]);
  const f = readFileSync(await dl2.path(), 'utf8').trim().split('\n').filter((l) => !l.startsWith('#'));
  assert.match(f[0], /\[ft\].*\[°F\]/);
  assert.ok(f.length > 1000, 'a row per cell');
  // The shown values follow the unit switch.
  assert.match(await page.locator('#e-far').textContent(), /ft/);
  assert.match(await page.locator('#e-heat').textContent(), /Btu/);
}));

test('bad input in the edge is flagged beside its field and the last result is kept', () => withPage(async (page) => {
  assert.equal(await andEdge(page, () => page.selectOption('#example-pick', 'heated-workshop-edge')), 'done');
  await andRecompute(page, () => field(page, 'edge.wing.width_m').fill('wide'));
  assert.match(await msgFor(page, 'edge.wing.width_m').textContent(), /number/);
  assert.equal(await page.evaluate(() => document.querySelector('#edge-results').dataset.state), 'stale');
  assert.equal(await field(page, 'edge.wing.width_m').inputValue(), 'wide', 'what was typed is kept');
  // A number the core refuses: its message names the field, beside it.
  assert.equal(await andEdge(page, () => field(page, 'edge.wing.width_m').fill('0.6')), 'done');
  assert.equal(await andEdge(page, () => field(page, 'edge.wall.base_depth_m').fill('-1')), 'stale');
  assert.match(await msgFor(page, 'edge.wall.base_depth_m').textContent(), /between/);
  // Fixed, it runs again.
  assert.equal(await andEdge(page, () => field(page, 'edge.wall.base_depth_m').fill('0.6')), 'done');
}));

test('from scratch: a new edge runs with progress shown and the page stays responsive', () => withPage(async (page) => {
  await andRecompute(page, () => page.selectOption('#example-pick', 'snow-block-wall'));
  assert.equal(await page.locator('#edge-on').isHidden(), true);
  await page.evaluate(() => {
    window.__gaps = [];
    let last = performance.now();
    window.__tick = setInterval(() => { const t = performance.now(); window.__gaps.push(t - last); last = t; }, 20);
  });
  const b = await outcomes(page);
  await page.click('#edge-add');
  await page.waitForFunction(() => document.querySelector('#edge-results').dataset.state === 'running');
  await page.waitForFunction((n) => Number(document.querySelector('#edge-results').dataset.outcomes || 0) > n, b, { timeout: 60000 });
  assert.equal(await page.evaluate(() => document.querySelector('#edge-results').dataset.state), 'done');
  const worst = await page.evaluate(() => { clearInterval(window.__tick); return Math.max(...window.__gaps); });
  assert.ok(worst < 250, `the page froze for ${worst} ms`);
  assert.match(await page.locator('#e-status').textContent(), /Done in/);
}));

test('the least wing width that keeps frost above the footing base is found and holds', () => withPage(async (page) => {
  assert.equal(await andEdge(page, () => page.selectOption('#example-pick', 'unheated-storage-edge')), 'done');
  // A coarser grid keeps the search short here (each try is a whole winter).
  await page.click('#edge details.grid-opts > summary');
  await andEdge(page, () => field(page, 'edge.grid.fine_m').fill('5'));
  await andEdge(page, () => field(page, 'edge.grid.growth_ratio').fill('1.3'));
  await page.click('#e-design > summary');
  assert.equal(await field(page, 'edge.least.quantity').inputValue(), 'wing-width');
  await field(page, 'edge.least.max').fill('2.5');
  await field(page, 'edge.least.resolution').fill('0.05');
  await page.click('#e-design-go');
  await page.waitForFunction(() => document.querySelector('#e-design').dataset.state === 'done', null, { timeout: 180000 });
  const text = await page.locator('#e-design-answer').textContent();
  const m = /is ([\d.]+)\s(m|cm)\b/.exec(text);
  assert.ok(m, text);
  const w = Number(m[1]) * (m[2] === 'cm' ? 0.01 : 1);
  assert.ok(w > 0.3 && w < 2.5, `${w} m`);
  assert.ok(await page.locator('#e-design-trials tbody tr').count() >= 3, 'the tries are listed');
  // Applied, the answer holds; a resolution less does not.
  assert.equal(await andEdge(page, () => field(page, 'edge.wing.width_m').fill(String(w))), 'done');
  assert.doesNotMatch(await page.locator('#e-below').textContent(), /below the base/);
  assert.equal(await page.evaluate(() => document.querySelector('#e-design').dataset.state), 'stale');
  assert.equal(await andEdge(page, () => field(page, 'edge.wing.width_m').fill(String(w - 0.05))), 'done');
  assert.match(await page.locator('#e-below').textContent(), /below the base/);
}));

test('a scenario file whose names carry markup and script opens as plain text in every view', () => withPage(async (page, problems) => {
  // The edge example with hostile text in the title, notes, layer, soil band and a winter
  // and shelter added from the other examples: nothing is parsed as markup, nothing runs.
  // (Short enough for a name: names are capped at 80 characters.)
  const bad = '<img src=x onerror=__p=1><script>__p=2</script>';
  const edge = await page.evaluate(() => wasm_bindgen.example('unheated-storage-edge'));
  const dome = await page.evaluate(() => wasm_bindgen.example('training-dome-four'));
  const cabin = await page.evaluate(() => wasm_bindgen.example('cabin-porch-slab-snowy-winter'));
  const s = Object.assign({}, cabin, { edge: edge.edge, shelter: dome.shelter, title: 'Store ' + bad, notes: bad });
  s.layers = s.layers.map((l) => Object.assign({}, l, { name: l.name + bad }));
  s.edge.soil = s.edge.soil.map((b) => Object.assign({}, b, { name: 'band ' + bad }));
  await andRecompute(page, () => page.setInputFiles('#open-file', { name: 'x.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(s)) }));
  await page.waitForFunction(() => document.querySelector('#edge-results').dataset.state === 'done', null, { timeout: 60000 });
  await page.waitForFunction(() => document.querySelector('#winter-results').dataset.state === 'done', null, { timeout: 60000 });
  assert.equal(await page.locator('main img, main script').count(), 0, 'no element made from the text');
  assert.equal(await page.evaluate(() => window.__p), undefined, 'nothing ran');
  assert.equal(await page.inputValue('#f-title'), 'Store ' + bad);
  assert.equal(await field(page, 'edge.soil[0].name').inputValue(), 'band ' + bad);
  assert.ok((await page.locator('#layer-results tbody th').first().textContent()).includes('<img'), 'shown as text');
  assert.ok((await page.locator('#print-stamp').textContent()).includes('<script>'), 'the print stamp as text');
  assert.deepEqual(problems, []);
}));
