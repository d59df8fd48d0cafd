// End-to-end tests of dist/hibernal.html in Chromium, opened from file:// with the
// network refused. Run from the repository root: node --test e2e/
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import {
  browserForFile, andRecompute, shown, field, msgFor,
  chartDigest, chartInkedPixels, parseShown,
} from './helpers.mjs';

// Opens a fresh page, runs `body`, then checks nothing went wrong on the way.
const { withPage } = browserForFile();

async function pickExample(page, id) {
  const ids = await page.locator('#example-pick option').evaluateAll((os) => os.map((o) => o.value));
  assert.ok(ids.includes(id), `example ${id} is offered (offered: ${ids.join(', ')})`);
  await andRecompute(page, () => page.selectOption('#example-pick', id));
}

// The number shown by `selector` is within display rounding of `expected`.
async function assertShown(page, selector, expected, extraTolerance = 0) {
  const { value, decimals } = await shown(page, selector);
  const tol = 0.5 * 10 ** -decimals + 1e-9 + extraTolerance;
  assert.ok(Number.isFinite(value), `${selector} shows a number`);
  assert.ok(Math.abs(value - expected) <= tol,
    `${selector} shows ${value}, expected ${expected.toFixed(decimals + 3)} ± ${tol}`);
}

test('the page loads from file:// and shows results and a drawn chart', () => withPage(async (page) => {
  assert.match(await page.title(), /Hibernal/);
  for (const id of ['#r-total', '#u-value', '#heat-flux']) {
    assert.ok(Number.isFinite((await shown(page, id)).value), `${id} shows a number`);
  }
  assert.notEqual((await page.locator('#zero-depth').textContent()).trim(), '–');
  assert.equal(await page.locator('#panic').isHidden(), true);
  assert.ok(await page.locator('#layer-results tbody tr').count() >= 1);
  const ink = await chartInkedPixels(page);
  assert.ok(ink.width > 100 && ink.height > 100, `canvas has a real size (${ink.width}×${ink.height})`);
  assert.ok(ink.n > 500, `chart has drawn pixels (${ink.n})`);
  // The cautions are always shown.
  const cautions = await page.locator('.cautions').textContent();
  for (const word of [/frost heave/i, /carbon monoxide/i, /avalanche/i, /licensed engineer/i, /30\u00a0?\s?cm/]) {
    assert.match(cautions, word);
  }
}));

test('a snow wall: shown R matches the series formula with Sturm et al. 1997', () => withPage(async (page) => {
  await pickExample(page, 'snow-block-wall');
  const ex = await page.evaluate(() => wasm_bindgen.example('snow-block-wall'));
  const rUnit = await page.evaluate(() => wasm_bindgen.catalogue().units.r_value.si);
  assert.equal(ex.layers.length, 1);
  const snow = ex.layers[0].material;
  assert.equal(snow.kind, 'snow');
  assert.equal(snow.correlation, 'sturm-1997-quadratic');
  // The page shows the example's values.
  assert.equal(parseShown(await field(page, 'layers[0].material.density_kg_m3').inputValue()).value, snow.density_kg_m3);
  assert.equal(await field(page, 'layers[0].material.correlation').inputValue(), snow.correlation);

  const film = (face) => (face.kind === 'air' ? 1 / face.film_w_m2k : 0);
  const r = snow.density_kg_m3 / 1000;
  const k = 0.138 - 1.01 * r + 3.233 * r * r; // Sturm et al. 1997, quadratic
  const expectR = (d) => film(ex.top) + d / k + film(ex.bottom);

  const thick = field(page, 'layers[0].thickness_m');
  const unitText = (await thick.locator('xpath=following-sibling::*[1]').textContent()).trim();
  assert.equal(unitText, 'cm');
  await assertShown(page, '#r-total', expectR(ex.layers[0].thickness_m) * rUnit.factor + rUnit.offset);

  const chartBefore = await chartDigest(page);
  await andRecompute(page, () => thick.fill('55'));
  await assertShown(page, '#r-total', expectR(0.55) * rUnit.factor + rUnit.offset);
  await assertShown(page, '#u-value', 1 / expectR(0.55), 0);
  const chartAfter = await chartDigest(page);
  assert.notEqual(chartAfter, chartBefore, 'the chart was redrawn with new pixels');
  // The band across correlations is reported.
  assert.match(await page.locator('#band-summary').textContent(), /R ranges from .* across \d+ published snow conductivity regressions/);
  assert.ok(await page.locator('#band-table tbody tr').count() >= 2);
}));

test('switching to US customary converts every shown value, and back restores them', () => withPage(async (page) => {
  await pickExample(page, 'snow-block-wall');
  const siR = await shown(page, '#r-total');
  const siText = await page.locator('#r-total').textContent();
  const thick = field(page, 'layers[0].thickness_m');
  const siThickText = await thick.inputValue();
  const thicknessM = (await page.evaluate(() => wasm_bindgen.example('snow-block-wall'))).layers[0].thickness_m;
  const siTempText = await field(page, 'top.temperature_c').inputValue();
  const chartSi = await chartDigest(page);

  await andRecompute(page, () => page.locator('label:has(#units-us)').click());
  const usR = await shown(page, '#r-total');
  const tol = 0.5 * 10 ** -usR.decimals + 5.678263 * 0.5 * 10 ** -siR.decimals + 1e-9;
  assert.ok(Math.abs(usR.value - siR.value * 5.678263) <= tol, `US R ${usR.value} ≈ ${siR.value} × 5.678263`);
  assert.match(await page.locator('#r-total ~ .unit').textContent(), /ft²·°F·h\/Btu/);
  // In inches to the nearest 1/8 in, as boards are sold ("15 3/4").
  const shownIn = /^(\d+)(?: (\d+)\/(\d+))?$/.exec(await thick.inputValue());
  assert.ok(shownIn, await thick.inputValue());
  const inches = Number(shownIn[1]) + (shownIn[2] ? Number(shownIn[2]) / Number(shownIn[3]) : 0);
  assert.ok(Math.abs(inches - thicknessM / 0.0254) <= 1 / 16 + 1e-9, `thickness shown in inches (${inches})`);
  assert.equal((await thick.locator('xpath=following-sibling::*[1]').textContent()).trim(), 'in');
  const f = parseShown(await field(page, 'top.temperature_c').inputValue()).value;
  assert.ok(Math.abs(f - (parseShown(siTempText).value * 1.8 + 32)) < 0.05, 'temperature shown in °F');
  assert.notEqual(await chartDigest(page), chartSi, 'the chart is redrawn in US units');

  await andRecompute(page, () => page.locator('label:has(#units-si)').click());
  assert.equal(await page.locator('#r-total').textContent(), siText);
  assert.equal(await thick.inputValue(), siThickText);
  assert.equal(await field(page, 'top.temperature_c').inputValue(), siTempText);
}));

test('bad input is flagged beside its field and never lost', () => withPage(async (page) => {
  await pickExample(page, 'snow-block-wall');
  const thick = field(page, 'layers[0].thickness_m');
  const msg = msgFor(page, 'layers[0].thickness_m');
  const goodR = await page.locator('#r-total').textContent();

  await andRecompute(page, () => thick.fill('abc'));
  assert.match(await msg.textContent(), /thickness/i);
  assert.match(await msg.textContent(), /number/i);
  assert.equal(await thick.inputValue(), 'abc');
  assert.equal(await page.locator('#results').getAttribute('data-stale'), 'true');
  assert.equal(await page.locator('#r-total').textContent(), goodR, 'last good result still shown');
  assert.equal(await page.locator('#stale-note').isVisible(), true);

  // The typed text survives a unit switch and other edits.
  await andRecompute(page, () => page.locator('label:has(#units-us)').click());
  assert.equal(await thick.inputValue(), 'abc');
  await andRecompute(page, () => page.locator('label:has(#units-si)').click());
  assert.equal(await thick.inputValue(), 'abc');
  await andRecompute(page, () => field(page, 'layers[0].name').fill('Renamed wall'));
  assert.equal(await thick.inputValue(), 'abc');
  assert.match(await msg.textContent(), /number/i);

  // Empty is not a number either.
  await andRecompute(page, () => thick.fill(''));
  assert.match(await msg.textContent(), /thickness.*number/i);

  // A number the core rejects: its message, naming thickness, beside the field.
  await andRecompute(page, () => thick.fill('-5'));
  assert.equal(await thick.inputValue(), '-5');
  assert.match(await msg.textContent(), /thickness/i);
  assert.doesNotMatch(await msg.textContent(), /enter a number/i);
  assert.equal(await page.locator('#results').getAttribute('data-stale'), 'true');
  assert.equal(await thick.getAttribute('aria-invalid'), 'true');

  await andRecompute(page, () => thick.fill('40'));
  assert.equal((await msg.textContent()).trim(), '');
  assert.equal(await page.locator('#results').getAttribute('data-stale'), 'false');

  // Snow denser than ice.
  const density = field(page, 'layers[0].material.density_kg_m3');
  await andRecompute(page, () => density.fill('1200'));
  const dmsg = msgFor(page, 'layers[0].material.density_kg_m3');
  assert.ok((await dmsg.locator('.msg.error').count()) >= 1, 'an error beside the density field');
  assert.match(await dmsg.textContent(), /density/i);
  assert.equal(await density.inputValue(), '1200');
  assert.equal(await page.locator('#results').getAttribute('data-stale'), 'true');
  assert.match(await dmsg.textContent(), /denser than solid ice \(916\.7/);

  // In US units the same refusal is worded in lb/ft³ (916.7 kg/m³ = 57.23 lb/ft³, NIST SP 811).
  await andRecompute(page, () => page.locator('label:has(#units-us)').click());
  await andRecompute(page, () => density.fill('80'));
  const usText = await dmsg.textContent();
  assert.match(usText, /80\D+lb\/ft³ is denser than solid ice \(57\.2\d*\D+lb\/ft³\)/, usText);
  assert.doesNotMatch(usText, /kg\/m³/);
  // A thickness out of bounds is worded in inches.
  await andRecompute(page, () => thick.fill('-2'));
  assert.match(await msg.textContent(), /got -2\D+in\)/);
}));

test('layers can be added, moved and removed, and the results follow', () => withPage(async (page) => {
  await pickExample(page, 'snow-block-wall');
  const rows = page.locator('#layer-list > li');
  const resultRows = page.locator('#layer-results tbody tr');
  const n0 = await rows.count();
  const r0 = (await shown(page, '#r-total')).value;
  const firstName = await field(page, 'layers[0].name').inputValue();

  await andRecompute(page, () => page.click('#add-layer'));
  assert.equal(await rows.count(), n0 + 1);
  assert.equal(await resultRows.count(), n0 + 1);
  const r1 = (await shown(page, '#r-total')).value;
  assert.ok(r1 > r0, `adding a layer raises R (${r0} → ${r1})`);

  const newIdx = n0; // zero-based index of the added layer
  await andRecompute(page, () => field(page, `layers[${newIdx}].name`).fill('Added layer'));
  await andRecompute(page, () => page.locator(`#layer-list > li[data-index="${newIdx}"] [data-act="up"]`).click());
  assert.equal(await field(page, `layers[${newIdx - 1}].name`).inputValue(), 'Added layer');
  if (n0 === 1) assert.equal(await field(page, 'layers[1].name').inputValue(), firstName);
  assert.equal((await resultRows.nth(newIdx - 1).locator('th').textContent()).trim(), 'Added layer');
  assert.equal((await shown(page, '#r-total')).value, r1, 'order does not change a series R');

  await andRecompute(page, () => page.locator(`#layer-list > li[data-index="${newIdx - 1}"] [data-act="down"]`).click());
  assert.equal(await field(page, `layers[${newIdx}].name`).inputValue(), 'Added layer');

  // Change the added layer into insulation: material fields change.
  await andRecompute(page, () => field(page, `layers[${newIdx}].material.kind`).selectOption('insulation'));
  assert.equal(await field(page, `layers[${newIdx}].material.board`).count(), 1);
  const r2 = (await shown(page, '#r-total')).value;
  assert.ok(r2 > r1, `10 cm of insulation adds more R than 10 cm of snow (${r1} → ${r2})`);

  await andRecompute(page, () => page.locator(`#layer-list > li[data-index="${newIdx}"] [data-act="remove"]`).click());
  assert.equal(await rows.count(), n0);
  assert.equal(await resultRows.count(), n0);
  assert.equal((await shown(page, '#r-total')).value, r0);
}));

test('a layer name with markup is shown as text', () => withPage(async (page) => {
  const payload = '<img src=x onerror=alert(1)>';
  await andRecompute(page, () => field(page, 'layers[0].name').fill(payload));
  assert.equal(await page.locator('img').count(), 0, 'no img element created');
  assert.equal((await page.locator('#layer-results tbody tr').first().locator('th').textContent()).trim(), payload);
  // Also after a full re-render of the inputs.
  await andRecompute(page, () => page.locator('label:has(#units-us)').click());
  assert.equal(await field(page, 'layers[0].name').inputValue(), payload);
  assert.equal(await page.locator('img').count(), 0);
  await page.waitForTimeout(200); // give any onerror a chance to fire
}));

test('narrow screens: the page fits without sideways scrolling', () => withPage(async (page) => {
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  assert.ok(overflow <= 1, `page is ${overflow}px wider than a 390px screen`);
  const ink = await chartInkedPixels(page);
  assert.ok(ink.n > 200, 'chart drawn on a narrow screen');
}, { width: 390, height: 844 }));

test('face presets fill the film coefficient; a held surface has no film', () => withPage(async (page) => {
  const presets = await page.evaluate(() => wasm_bindgen.catalogue().surface_presets);
  const held = presets.find((p) => p.film_w_m2k == null);
  const air = presets.find((p) => typeof p.film_w_m2k === 'number');
  assert.ok(held && air, 'the catalogue has both kinds of preset');
  await andRecompute(page, () => field(page, 'top.kind').selectOption(air.id));
  const h = parseShown(await field(page, 'top.film_w_m2k').inputValue()).value;
  assert.ok(Math.abs(h - air.film_w_m2k) < 0.01, `film filled from the preset (${h})`);
  const rAir = (await shown(page, '#r-total')).value;
  await andRecompute(page, () => field(page, 'top.kind').selectOption(held.id));
  assert.equal(await field(page, 'top.film_w_m2k').count(), 0, 'no film input for a held surface');
  assert.match(await page.locator('label[for="f-top-temperature-c"]').textContent(), /surface/i);
  const rHeld = (await shown(page, '#r-total')).value;
  assert.ok(rHeld < rAir, `dropping the film lowers R (${rAir} → ${rHeld})`);
  // Typing a film that matches no preset shows the free-entry choice.
  await andRecompute(page, () => field(page, 'top.kind').selectOption(air.id));
  await andRecompute(page, () => field(page, 'top.film_w_m2k').fill('12.345'));
  const chosen = await field(page, 'top.kind').inputValue();
  assert.ok(!presets.some((p) => p.id === chosen), `free film entry is not a preset (${chosen})`);
}));

test('a snow density outside a regression\'s fitted range is warned about beside the field', () => withPage(async (page) => {
  await pickExample(page, 'snow-block-wall');
  const corr = await page.evaluate(() => wasm_bindgen.catalogue().snow_correlations.find((c) => c.id === 'sturm-1997-quadratic'));
  const low = Math.max(20, Math.floor(corr.range_kg_m3[0] / 2));
  await andRecompute(page, () => field(page, 'layers[0].material.density_kg_m3').fill(String(low)));
  assert.equal(await page.locator('#results').getAttribute('data-stale'), 'false', 'a warning still gives a result');
  const msg = msgFor(page, 'layers[0].material.density_kg_m3');
  assert.ok((await msg.locator('.msg.warning').count()) >= 1, 'a warning beside the density');
  assert.equal(await page.locator('#warnings-block').isVisible(), true);
}));

test('the page carries a policy that forbids network access', () => withPage(async (page) => {
  const csp = await page.locator('meta[http-equiv="Content-Security-Policy"]').getAttribute('content');
  assert.match(csp, /default-src 'none'/);
  assert.match(csp, /connect-src 'none'/);
  assert.equal(await page.locator('script[src], link[rel="stylesheet"], img[src]').count(), 0, 'nothing loaded from files');
}));

test('every material kind can be chosen, computes, and survives the unit switch', () => withPage(async (page) => {
  await pickExample(page, 'snow-block-wall');
  const kinds = await page.evaluate(() => wasm_bindgen.catalogue().material_kinds.map((k) => k.id));
  assert.ok(kinds.length >= 8, `kinds: ${kinds.join(', ')}`);
  for (const kind of kinds) {
    await andRecompute(page, () => field(page, 'layers[0].material.kind').selectOption(kind));
    for (const units of ['us', 'si']) {
      await andRecompute(page, () => page.locator(`label:has(#units-${units})`).click());
      assert.equal(await page.locator('#results').getAttribute('data-stale'), 'false',
        `${kind} in ${units}: the default inputs compute`);
      assert.ok(Number.isFinite((await shown(page, '#r-total')).value), `${kind}: an R-value is shown`);
    }
  }
}));

test('every results table saves as CSV, numbers bare and units in the heading', () => withPage(async (page) => {
  // Each table.data with an id has its own button; the layer table of the first example is
  // read back: a heading row with units in brackets, a row per layer, numbers that parse.
  const tables = await page.locator('table.data[id]').evaluateAll((ts) => ts.map((t) => t.id));
  const buttons = await page.locator('.csv-btn').evaluateAll((bs) => bs.map((b) => b.dataset.csvFor));
  assert.deepEqual(buttons.sort(), tables.sort(), 'a button for every table');
  const layers = await page.locator('#layer-list > li').count();
  const [dl] = await Promise.all([page.waitForEvent('download'), page.click('[data-csv-for="layer-results"]')]);
  const text = readFileSync(await dl.path(), 'utf8');
  const lines = text.trim().split(/\r\n/);
  assert.equal(lines.length, 1 + layers, text);
  assert.match(lines[0], /\[m²·K\/W\]|\[m²K\/W\]|\[m2K\/W\]|\[[^\]]*K[^\]]*W\]/, lines[0]);
  // RFC 4180 fields: quoted ones may hold commas.
  const fields = (l) => [...l.matchAll(/("(?:[^"]|"")*"|[^,]*)(,|$)/g)].slice(0, -1).map((m) => m[1].replace(/^"|"$/g, '').replace(/""/g, '"'));
  const head = fields(lines[0]);
  const rCol = head.findIndex((h) => /^R \[/.test(h));
  assert.ok(rCol >= 0, lines[0]);
  for (const l of lines.slice(1)) {
    const f = fields(l);
    assert.equal(f.length, head.length, l);
    assert.ok(Number(f[rCol]) > 0, l);
  }
  // In US units the same table says so in its heading.
  await andRecompute(page, () => page.check('#units-us'));
  const [dl2] = await Promise.all([page.waitForEvent('download'), page.click('[data-csv-for="layer-results"]')]);
  assert.match(readFileSync(await dl2.path(), 'utf8').split(/\r\n/)[0], /ft²·°F·h\/Btu|ft2/);
}));

test('a file of an older format version opens with a notice and saves as the current one', () => withPage(async (page) => {
  const v1 = {
    format: 'hibernal-scenario', version: 1, title: 'Old wall', notes: '',
    layers: [{ name: 'Board', thickness_m: 0.05, material: { kind: 'custom', label: 'Own', conductivity_w_m_k: 0.035, density_kg_m3: 30, specific_heat_j_kg_k: 1400 } }],
    top: { kind: 'air', temperature_c: -20, film_w_m2k: 25 },
    bottom: { kind: 'air', temperature_c: 20, film_w_m2k: 8 },
  };
  await andRecompute(page, () => page.setInputFiles('#open-file', { name: 'old.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(v1)) }));
  const current = await page.evaluate(() => wasm_bindgen.catalogue().format_version);
  assert.ok(current > 1);
  await page.waitForSelector('#format-note:not([hidden])');
  const note = await page.locator('#format-note').textContent();
  assert.match(note, new RegExp(`format version 1\\b.*writes version ${current}`), note);
  // R = 1/25 + 0.05/0.035 + 1/8, the file's own numbers, computed as before.
  assert.ok(Math.abs((await shown(page, '#r-total')).value - (1 / 25 + 0.05 / 0.035 + 1 / 8)) < 0.006);
  const [dl] = await Promise.all([page.waitForEvent('download'), page.click('#save-file')]);
  assert.equal(JSON.parse(readFileSync(await dl.path(), 'utf8')).version, current, 'saved as the current version');
  // A bundled example opens without the notice.
  await andRecompute(page, () => page.selectOption('#example-pick', { index: 0 }));
  assert.equal(await page.locator('#format-note').isHidden(), true);
}));

// Every visible control of the page, reached by Tab alone (no control the mouse can use
// and the keyboard cannot), and each with a name a screen reader reads out.
async function tabReachesEveryControl(page) {
  const controls = await page.evaluate(() => {
    // checkVisibility: also false inside a closed <details> (content-visibility).
    const vis = (e) => e.checkVisibility({ visibilityProperty: true, contentVisibilityAuto: true });
    for (const e of document.querySelectorAll('[data-kb]')) delete e.dataset.kb;
    const all = [...document.querySelectorAll('button, input, select, textarea, summary, a[href]')].filter((e) => !e.disabled && vis(e));
    all.forEach((e, i) => { e.dataset.kb = String(i); });
    const nameless = all.filter((e) => {
      const lab = e.labels && e.labels.length ? [...e.labels].map((l) => l.textContent).join(' ') : '';
      return !(e.getAttribute('aria-label') || lab.trim() || (e.tagName !== 'INPUT' && e.textContent.trim()) || e.title);
    }).map((e) => e.outerHTML.slice(0, 80));
    return { n: all.length, nameless };
  });
  assert.deepEqual(controls.nameless, [], 'every control has a name');
  const seen = new Set();
  await page.evaluate(() => { document.activeElement && document.activeElement.blur(); window.scrollTo(0, 0); });
  // Radio groups take one Tab stop (arrow keys move within them).
  const radios = await page.evaluate(() => [...document.querySelectorAll('input[type=radio]')].filter((e) => e.checkVisibility()).map((e) => e.dataset.kb));
  let first = null;
  for (let i = 0; i < 3 * controls.n + 40; i++) {
    await page.keyboard.press('Tab');
    const k = await page.evaluate(() => document.activeElement && document.activeElement.dataset.kb);
    if (k == null) continue;
    if (k === first) break; // round the page once
    if (first == null) first = k;
    seen.add(k);
  }
  const radioSeen = radios.some((r) => seen.has(r));
  for (const r of radios) if (radioSeen) seen.add(r);
  const missed = await page.evaluate((s) => [...document.querySelectorAll('[data-kb]')].filter((e) => !s.includes(e.dataset.kb)).map((e) => e.outerHTML.slice(0, 100)), [...seen]);
  assert.deepEqual(missed, [], `every control is reached by Tab (reached ${seen.size} of ${controls.n})`);
}

test('keyboard: every control is named and reached by Tab, in the winter, the shelter and the building edge', () => withPage(async (page) => {
  await andRecompute(page, () => page.selectOption('#example-pick', 'cabin-porch-slab-snowy-winter'));
  await tabReachesEveryControl(page);
  await andRecompute(page, () => page.selectOption('#example-pick', 'training-dome-four'));
  await tabReachesEveryControl(page);
  await andRecompute(page, () => page.selectOption('#example-pick', 'heated-workshop-edge'));
  await page.waitForFunction(() => document.querySelector('#edge-results').dataset.state === 'done', null, { timeout: 60000 });
  await page.click('#e-design > summary');
  await tabReachesEveryControl(page);
}));

test('a malformed or hostile scenario file is refused with the reason and the open work is kept', () => withPage(async (page) => {
  const title = await page.inputValue('#f-title');
  const open = (name, text) => page.setInputFiles('#open-file', { name, mimeType: 'application/json', buffer: Buffer.from(text) });
  await open('broken.json', '{"format": "hibernal-scenario", "layers": [');
  await page.waitForFunction(() => /not valid JSON/.test(document.querySelector('#file-msg').textContent));
  assert.equal(await page.inputValue('#f-title'), title, 'nothing replaced');
  await open('other.json', JSON.stringify({ hello: 'world', layers: 'x'.repeat(50) }));
  await page.waitForFunction(() => /not a Hibernal scenario/.test(document.querySelector('#file-msg').textContent));
  assert.equal(await page.inputValue('#f-title'), title, 'nothing replaced');
  // Shaped like a scenario but of a version no build knows: opened, and the core's refusal
  // is shown (naming the version) instead of a result.
  const future = { format: 'hibernal-scenario', version: 99, title: 'Future', layers: [{ name: 'x', thickness_m: 0.1, material: { kind: 'ice' } }], top: { kind: 'surface', temperature_c: -5 }, bottom: { kind: 'surface', temperature_c: 0 } };
  await andRecompute(page, () => open('future.json', JSON.stringify(future)));
  await page.waitForFunction(() => /version 99/.test(document.querySelector('#general-errors').textContent));
}));
