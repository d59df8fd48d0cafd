// End-to-end tests of links to a case: a link never costs saved work (the page asks first,
// and sets the replaced work aside), the fragment leaves the address once its case is open
// (so a reload keeps the edits), and the "Open a link" box opens a pasted link from any
// address, or says why it cannot.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { deflateRawSync } from 'node:zlib';
import { browserForFile, andRecompute, PAGE_URL } from './helpers.mjs';

const { withPage } = browserForFile();
const SCREENS = [{ width: 1366, height: 900 }, { width: 390, height: 844 }];
const AUTOSAVE = 'hibernal.autosave.1';
const ASIDE = 'hibernal.set-aside.1';
const EXAMPLE = 'cabin-porch-slab-snowy-winter';

// The fragment a link carries for `scenario`: its JSON deflated (RFC 1951) and base64url
// encoded (RFC 4648 §5), as the page writes it — built here by Node's zlib, not the page.
const fragmentFor = (scenario) => '#s=' + deflateRawSync(Buffer.from(JSON.stringify(scenario))).toString('base64url');

// An example's scenario with a title of its own: the case a colleague sends.
async function colleagueCase(page, title) {
  const s = await page.evaluate((id) => wasm_bindgen.example(id), EXAMPLE);
  s.title = title;
  return s;
}

const stored = (page, key) => page.evaluate((k) => localStorage.getItem(k), key);
// The titles of the cases set aside, newest first.
const asideTitles = async (page) => (JSON.parse(await stored(page, ASIDE) || '{"cases": []}').cases).map((r) => r.scenario.title);

// Opens this same page afresh at `url` (only the fragment differs: reload to start again).
async function openAt(page, url) {
  await page.goto(url);
  await page.reload();
  await page.waitForSelector('html[data-ready="true"]', { state: 'attached' });
  await page.waitForFunction(() => document.querySelector('#results').dataset.pending === 'false');
}

// Work of one's own: the first example with another title and a thicker first layer.
async function makeOwnWork(page, title) {
  await andRecompute(page, () => page.fill('#f-title', title));
  await andRecompute(page, () => page.fill('[data-field="layers[0].thickness_m"]', '23'));
  const saved = JSON.parse(await stored(page, AUTOSAVE));
  assert.equal(saved.scenario.title, title, 'the own work is saved');
}

for (const screen of SCREENS) test(`at ${screen.width} px, a link asks before it replaces saved work; keeping it changes nothing, opening it sets the work aside`, () => withPage(async (page) => {
  await makeOwnWork(page, 'My own shed floor');
  const before = await stored(page, AUTOSAVE);
  const link = PAGE_URL + fragmentFor(await colleagueCase(page, 'Porch from a colleague'));
  await openAt(page, link);
  const ask = page.locator('#link-ask');
  assert.ok(await ask.isVisible(), 'the page asks');
  const question = await ask.textContent();
  assert.match(question, /My own shed floor/, 'it names the saved work');
  assert.match(question, /last changed \d{4}-\d\d-\d\d \d\d:\d\d UTC/, 'and when it was saved');
  assert.match(question, /Porch from a colleague/, 'and the link\'s case');
  assert.match(question, /Open the link's case[\s\S]*set aside[\s\S]*Keep my work[\s\S]*not opened/, 'each choice says what it does');
  assert.equal(await page.inputValue('#f-title'), 'My own shed floor', 'the saved work is what is open meanwhile');
  await page.waitForTimeout(300); // a recompute that would write the autosave has had its time
  assert.equal(await stored(page, AUTOSAVE), before, 'the autosave is untouched until a choice');
  if (screen.width === 390) {
    const box = await ask.boundingBox();
    assert.ok(box.x >= 0 && box.x + box.width <= 390, `the question fits the screen: ${JSON.stringify(box)}`);
  }

  // Keep my work: nothing changes, and the link waits in the box.
  await page.click('#link-ask-keep');
  assert.ok(await ask.isHidden());
  assert.equal(await page.inputValue('#f-title'), 'My own shed floor');
  assert.equal(await stored(page, AUTOSAVE), before, 'the autosave is intact');
  assert.deepEqual(await asideTitles(page), [], 'nothing set aside');
  assert.ok(!(await page.evaluate(() => location.href)).includes('#'), 'the fragment left the address');
  assert.equal(await page.inputValue('#link-paste'), link, 'the link waits in the box');
  assert.match(await page.locator('#restore-text').textContent(), /was not opened.*Open a link/);

  // The same link again, and this time its case: the work is set aside, and comes back.
  await openAt(page, link);
  assert.ok(await ask.isVisible(), 'asked again');
  assert.equal(await stored(page, AUTOSAVE), before);
  await andRecompute(page, () => page.click('#link-ask-open'));
  assert.ok(await ask.isHidden());
  assert.equal(await page.inputValue('#f-title'), 'Porch from a colleague', 'the link\'s case is open');
  assert.equal(JSON.parse(await stored(page, AUTOSAVE)).scenario.title, 'Porch from a colleague', 'and saved');
  const aside = JSON.parse(await stored(page, ASIDE)).cases;
  assert.equal(aside.length, 1);
  assert.equal(aside[0].scenario.title, 'My own shed floor', 'the work before it is set aside');
  assert.equal(aside[0].scenario.layers[0].thickness_m, 0.23, 'with its edit (23 cm)');
  assert.match(await page.locator('#restore-text').textContent(), /set aside/);
  // Undo goes back to it in this visit, redo forward again.
  await andRecompute(page, () => page.click('#undo'));
  assert.equal(await page.inputValue('#f-title'), 'My own shed floor', 'undone');
  await andRecompute(page, () => page.click('#redo'));
  assert.equal(await page.inputValue('#f-title'), 'Porch from a colleague', 'redone');
  // After a reload, the list of work set aside brings it back.
  await page.reload();
  await page.waitForSelector('html[data-ready="true"]', { state: 'attached' });
  assert.equal(await page.inputValue('#f-title'), 'Porch from a colleague', 'the link\'s case is what a reload opens');
  assert.ok(await page.locator('#aside-row').isVisible());
  assert.match(await page.locator('#aside-pick option:checked').textContent(), /“My own shed floor”, set aside \d{4}-\d\d-\d\d \d\d:\d\d UTC/);
  await andRecompute(page, () => page.click('#aside-back'));
  assert.equal(await page.inputValue('#f-title'), 'My own shed floor', 'brought back');
  assert.equal(await page.inputValue('[data-field="layers[0].thickness_m"]'), '23');
  assert.deepEqual(await asideTitles(page), ['Porch from a colleague'], 'the link\'s case is set aside in its turn');
  assert.match(await page.locator('#file-msg').textContent(), /Brought back “My own shed floor”.*“Porch from a colleague”, is set aside/);
}, screen));

for (const screen of SCREENS) test(`at ${screen.width} px, after a link's case opens, edits survive a reload; a link to the saved case opens without asking`, () => withPage(async (page) => {
  // No work of one's own (the first example as opened): the link opens without asking.
  const link = PAGE_URL + fragmentFor(await colleagueCase(page, 'Porch from a colleague'));
  await openAt(page, link);
  assert.ok(await page.locator('#link-ask').isHidden(), 'nothing to ask about');
  assert.equal(await page.inputValue('#f-title'), 'Porch from a colleague');
  assert.match(await page.locator('#restore-text').textContent(), /this link carries/);
  assert.equal(await page.evaluate(() => location.hash), '', 'the fragment left the address');
  assert.ok(!(await page.evaluate(() => location.href)).includes('#'));
  await andRecompute(page, () => page.fill('#f-title', 'Porch, my changes'));
  await andRecompute(page, () => page.fill('[data-field="layers[1].thickness_m"]', '9'));
  await page.reload();
  await page.waitForSelector('html[data-ready="true"]', { state: 'attached' });
  assert.equal(await page.inputValue('#f-title'), 'Porch, my changes', 'the edit is back after the reload');
  assert.equal(await page.inputValue('[data-field="layers[1].thickness_m"]'), '9');
  assert.match(await page.locator('#restore-text').textContent(), /last work in this browser is back/);
  // A link to the very case saved here replaces nothing: no question.
  await page.click('#share-make');
  await page.waitForFunction(() => /#s=/.test(document.querySelector('#share-link').value));
  const own = await page.inputValue('#share-link');
  await openAt(page, own);
  assert.ok(await page.locator('#link-ask').isHidden(), 'the same case: not asked');
  assert.equal(await page.inputValue('#f-title'), 'Porch, my changes');
  assert.equal(await page.evaluate(() => location.hash), '');
  // A broken link still says so, and the saved work opens.
  await openAt(page, PAGE_URL + '#s=not-a-scenario');
  assert.match(await page.locator('#restore-text').textContent(), /does not carry a scenario it can read.*last work in this browser is back/);
  assert.equal(await page.inputValue('#f-title'), 'Porch, my changes');
}, screen));

for (const screen of SCREENS) test(`at ${screen.width} px, a link pasted into the box opens its case whatever address precedes its fragment, and sets the open work aside`, () => withPage(async (page) => {
  await makeOwnWork(page, 'My own shed floor');
  const fragment = fragmentFor(await colleagueCase(page, 'Porch from a colleague'));
  await page.fill('#link-paste', 'file:///somewhere/else/hibernal.html' + fragment);
  await andRecompute(page, () => page.click('#link-paste-open'));
  assert.equal(await page.inputValue('#f-title'), 'Porch from a colleague', 'the case opens');
  assert.match(await page.locator('#link-paste-msg').textContent(), /Opened “Porch from a colleague”.*set aside/);
  assert.deepEqual(await asideTitles(page), ['My own shed floor'], 'the work open before is set aside');
  assert.equal(await page.inputValue('#link-paste'), '', 'the box is emptied');
  // Undo brings the work before it back too.
  await andRecompute(page, () => page.click('#undo'));
  assert.equal(await page.inputValue('#f-title'), 'My own shed floor');
  // A web address before it, and the fragment alone (with a line break, as mail wraps it).
  const other = await colleagueCase(page, 'Second porch');
  await page.fill('#link-paste', 'https://files.example.invalid/tools/page.html?x=1' + fragmentFor(other));
  await andRecompute(page, () => page.press('#link-paste', 'Enter'));
  assert.equal(await page.inputValue('#f-title'), 'Second porch');
  const third = fragmentFor(await colleagueCase(page, 'Third porch'));
  await page.fill('#link-paste', third.slice(0, 40) + '\n' + third.slice(40));
  await andRecompute(page, () => page.click('#link-paste-open'));
  assert.equal(await page.inputValue('#f-title'), 'Third porch');
  // Each case it replaced is set aside, newest first, once (the own work, set aside again
  // after the undo, is not listed twice); any of them comes back.
  assert.deepEqual(await asideTitles(page), ['Second porch', 'My own shed floor']);
  assert.equal(await page.locator('#aside-pick option').count(), 2);
  await page.selectOption('#aside-pick', { index: 1 });
  await andRecompute(page, () => page.click('#aside-back'));
  assert.equal(await page.inputValue('#f-title'), 'My own shed floor');
  assert.deepEqual(await asideTitles(page), ['Third porch', 'Second porch']);
  // The list keeps the last five.
  for (let i = 1; i <= 5; i++) {
    await page.fill('#link-paste', fragmentFor(await colleagueCase(page, 'Porch ' + i)));
    await andRecompute(page, () => page.click('#link-paste-open'));
  }
  assert.deepEqual(await asideTitles(page), ['Porch 4', 'Porch 3', 'Porch 2', 'Porch 1', 'My own shed floor']);
}, screen));

for (const screen of SCREENS) test(`at ${screen.width} px, a pasted link that carries nothing readable says why beside the box and keeps the open work`, () => withPage(async (page) => {
  await makeOwnWork(page, 'My own shed floor');
  const saved = await stored(page, AUTOSAVE);
  const msg = page.locator('#link-paste-msg');
  const good = fragmentFor(await colleagueCase(page, 'Porch from a colleague'));
  const cases = [
    ['file:///elsewhere/hibernal.html', /no part that starts “#s=”/],
    ['just some words', /no part that starts “#s=”/],
    ['file:///elsewhere/hibernal.html#s=%%%', /does not carry a case.*characters a link to a case never has/],
    ['file:///elsewhere/hibernal.html' + good.slice(0, good.length / 2), /does not carry a case.*damaged or cut short/],
    ['#s=' + deflateRawSync(Buffer.from('{"hello": "world"}')).toString('base64url'), /what it carries is not a scenario/],
    ['#s=' + deflateRawSync(Buffer.from('not json at all')).toString('base64url'), /not a scenario's text/],
    ['#s=', /nothing follows “#s=”/],
    ['', /Paste a link first/],
  ];
  for (const [text, why] of cases) {
    await page.fill('#link-paste', text);
    await page.click('#link-paste-open');
    await page.waitForFunction(() => document.querySelector('#link-paste-msg .msg.error'));
    assert.match(await msg.textContent(), why, text);
    assert.match(await msg.textContent(), /Paste a link first|The open work is unchanged/);
    assert.equal(await page.inputValue('#f-title'), 'My own shed floor', 'the open work is kept: ' + text);
    assert.deepEqual(await asideTitles(page), [], 'nothing set aside');
  }
  assert.equal(await stored(page, AUTOSAVE), saved, 'the saved work is untouched');
  // The message sits beside the box.
  const box = await page.locator('#link-paste').boundingBox();
  const m = await msg.boundingBox();
  assert.ok(m.y >= box.y && m.y - (box.y + box.height) < 60, `message below the box: ${JSON.stringify([box, m])}`);
}, screen));

for (const screen of SCREENS) test(`at ${screen.width} px, a link put into the address of the page already open asks the same way, and Escape keeps the work`, () => withPage(async (page) => {
  await makeOwnWork(page, 'My own shed floor');
  const before = await stored(page, AUTOSAVE);
  const fragment = fragmentFor(await colleagueCase(page, 'Porch from a colleague'));
  await page.evaluate((f) => { location.hash = f; }, fragment);
  const ask = page.locator('#link-ask');
  await ask.waitFor({ state: 'visible' });
  await page.keyboard.press('Escape');
  await ask.waitFor({ state: 'hidden' });
  assert.equal(await page.inputValue('#f-title'), 'My own shed floor', 'Escape keeps the work');
  assert.equal(await stored(page, AUTOSAVE), before);
  assert.equal(await page.evaluate(() => location.hash), '');
  assert.match(await page.inputValue('#link-paste'), /#s=/, 'the link waits in the box');
  await page.evaluate((f) => { location.hash = f; }, fragment);
  await ask.waitFor({ state: 'visible' });
  await andRecompute(page, () => page.click('#link-ask-open'));
  assert.equal(await page.inputValue('#f-title'), 'Porch from a colleague');
  assert.deepEqual(await asideTitles(page), ['My own shed floor']);
  assert.equal(await page.evaluate(() => location.hash), '');
}, screen));

test('at 390 px, the link controls fit the screen without sideways scrolling', () => withPage(async (page) => {
  await makeOwnWork(page, 'A title long enough to test how the button that brings it back wraps on a phone');
  await page.fill('#link-paste', 'file:///somewhere/else/hibernal.html' + fragmentFor(await colleagueCase(page, 'Porch from a colleague')));
  await andRecompute(page, () => page.click('#link-paste-open'));
  await page.click('#share-make');
  await page.waitForFunction(() => /#s=/.test(document.querySelector('#share-link').value));
  const boxes = await page.evaluate(() => ['.link-open', '#link-paste', '#link-paste-open', '#link-paste-msg', '#aside-row', '#aside-pick', '#aside-back', '#share-box', '.file-actions']
    .map((sel) => { const r = document.querySelector(sel).getBoundingClientRect(); return { sel, left: r.left, right: r.right, w: r.width }; }));
  for (const b of boxes) assert.ok(b.w > 0 && b.left >= 0 && b.right <= 390, `${b.sel} fits: ${JSON.stringify(b)}`);
  // Nothing inside the controls scrolls sideways either.
  const inner = await page.evaluate(() => [...document.querySelectorAll('.file-panel *')].filter((e) => e.scrollWidth > e.clientWidth + 1 && getComputedStyle(e).overflowX !== 'visible' && e.tagName !== 'INPUT').map((e) => e.id || e.className));
  assert.deepEqual(inner, []);
}, { width: 390, height: 844 }));
