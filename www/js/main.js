// The page's entry: starts the core, wires the controls, and runs the page's main flow,
// the recompute after each edit, adopting another scenario (an example, a file, a link, the
// autosave, undo and redo), a change of units and a redraw, over the list of sections.
// The calculation itself runs in the WebAssembly core (core.js).
import { $, el, focusField } from './dom.js';
import { core, startCore } from './core.js';
import { state, flow, remember, setUpHistory } from './state.js';
import { typedErrors, showUnitSymbols, freezeT } from './fields.js';
import { clearMessages, describePath, generalError, placeMessage } from './messages.js';
import { stackOwners, renderStack, adoptStack, stackStale, setScenario, computeStack, showStackUnits, drawStack, setUpStack } from './stack.js';
import { autosave, openAtStart, setUpLinks, makeShareLink, saveFile, openFile } from './persist.js';
import { setUpChartSaving, setUpTableSaving } from './downloads.js';
import { printStamp, setUpPrinting, renderSources } from './print.js';
import { winterSection } from './winter.js';
import { shelterSection } from './shelter.js';
import { edgeSection } from './edge.js';
import { rangesSection } from './ranges.js';

// The sections, in page order (see section.js for what each offers).
const SECTIONS = [winterSection, shelterSection, edgeSection, rangesSection];

const DEBOUNCE_MS = 100;

// Sections removed by hand, by key, kept for putting back (until another scenario opens).
const removed = new Map();

// The example the scenario was opened from, as the first recompute after opening it saw it
// ('pending' until then; null: not opened from an example), to mark its summary and notes
// once the case departs from it. Its title, notes and format version are left out of the
// comparison (editing the notes is not a departure from the case).
let exampleBase = null;
const asCase = (s) => JSON.stringify(Object.assign({}, s, { title: undefined, notes: undefined, version: undefined }));
function markDeparture() {
  if (exampleBase === 'pending') exampleBase = asCase(state.scenario);
  $('example-changed').hidden = exampleBase === null || asCase(state.scenario) === exampleBase;
}

Object.assign(flow, { schedule, run, adopt, layersMoved });

// The stack's layers were added, removed or reordered: each section moves the references it
// holds to layers with them, and shows its lists of layers again.
function layersMoved(map) {
  for (const s of SECTIONS) s.layersMoved(map);
}

// ---------- the recompute ----------
function schedule() {
  clearTimeout(state.timer);
  $('results').dataset.pending = 'true';
  state.timer = setTimeout(run, DEBOUNCE_MS);
}

// The inputs holding text that is not a number yet (a section run by hand checks its own).
function localErrors() {
  return typedErrors(SECTIONS.filter((s) => !s.byHand).reduce((pairs, s) => pairs.concat(s.owners()), stackOwners()));
}

function run() {
  clearTimeout(state.timer);
  clearMessages();
  for (const s of SECTIONS) s.edited();
  markDeparture();
  printStamp();
  autosave();
  remember();
  const local = localErrors();
  if (local.length) {
    for (const e of local) {
      if (!placeMessage(e.field, 'enter a number', 'error')) generalError(describePath(e.field) + ': enter a number');
    }
    stackStale(true);
    for (const s of SECTIONS) s.run(true);
    finish();
    return;
  }
  // Read once by the core, which serves every part from it. The sections that do not read
  // the stack's result are computed on their own, so an error in the stack never blocks
  // them (nor one of theirs the stack).
  const outcome = setScenario();
  for (const s of SECTIONS) if (!s.needsStack) s.run(false);
  const steady = computeStack(outcome);
  // An unexpected failure (null) leaves the sections that need the stack as they are.
  if (steady !== null) for (const s of SECTIONS) if (s.needsStack) s.run(!steady);
  finish();
}

function finish() {
  const r = $('results');
  r.dataset.pending = 'false';
  r.dataset.runs = String(Number(r.dataset.runs || 0) + 1);
}

function renderInputs() {
  renderStack();
  for (const s of SECTIONS) s.render();
  showUnitSymbols();
  for (const e of document.querySelectorAll('.freeze-t')) e.textContent = freezeT();
}

// ---------- another scenario ----------
// `from`: where an outside scenario came from ('file', 'link'), to name it in the notice
// shown when it is of an older format version; bundled examples open without one. Either
// way the page holds, saves and shares it as the current version (every older document
// reads the same as the current version: the versions only added sections).
function adopt(scenario, from) {
  state.scenario = scenario;
  const note = $('format-note');
  note.hidden = true;
  if (from) {
    // A file or a link: not an example (whatever the picker last showed).
    exampleBase = null;
    $('example-summary').textContent = '';
  }
  if (from && Number.isInteger(scenario.version) && scenario.version < core.CAT.format_version) {
    note.textContent = 'This ' + from + ' holds format version ' + scenario.version + '; this page reads it unchanged and writes version ' +
      core.CAT.format_version + ' when you save or share it (older versions of the page may not open that).';
    note.hidden = false;
  }
  if (Number.isInteger(scenario.version) && scenario.version < core.CAT.format_version) scenario.version = core.CAT.format_version;
  if (typeof state.scenario.title !== 'string') state.scenario.title = '';
  if (typeof state.scenario.notes !== 'string') state.scenario.notes = '';
  adoptStack(scenario);
  removed.clear();
  for (const s of SECTIONS) s.adopt();
  renderInputs();
  run();
}

function loadExample(id) {
  const ex = core.EXAMPLES.find((e) => e.id === id);
  $('restore-note').hidden = true;
  $('example-pick').value = id;
  $('example-summary').textContent = ex ? ex.summary : '';
  exampleBase = ex ? 'pending' : null;
  adopt(core.W.example(id));
  // A shelter example is about the shelter: bring its section into view. So is an edge example.
  const about = SECTIONS.find((s) => s.inView && state.scenario && state.scenario[s.key]);
  const box = about && $(about.key);
  if (box && typeof box.scrollIntoView === 'function') box.scrollIntoView({ block: 'start' });
}

// ---------- adding and removing a section ----------
function setUpAddRemove(s) {
  // A section run by hand needs no recompute now: the debounced one saves and records it.
  const recompute = () => (s.byHand ? schedule() : run());
  $(s.key + '-add').addEventListener('click', () => {
    state.scenario[s.key] = removed.get(s.key) || s.fresh();
    // A section needs the current format version (older files load without one).
    state.scenario.version = core.CAT.format_version;
    s.render();
    recompute();
    focusField(s.firstField);
  });
  $(s.key + '-remove').addEventListener('click', () => {
    removed.set(s.key, state.scenario[s.key]);
    delete state.scenario[s.key];
    s.drop();
    s.render();
    recompute();
    $(s.key + '-add').focus();
  });
}

// ---------- start ----------
async function start() {
  const status = $('load-status');
  try {
    await startCore();
  } catch (err) {
    console.error(err);
    status.textContent = 'The calculator could not start: ' + String(err && err.message || err);
    status.classList.add('failed');
    return;
  }

  try {
    setUp();
  } catch (err) {
    console.error(err);
    status.textContent = 'The page could not be set up: ' + String(err && err.message || err);
    status.classList.add('failed');
  }
}

function setUp() {
  const EXAMPLES = core.EXAMPLES;
  const pick = $('example-pick');
  for (const ex of EXAMPLES) pick.append(el('option', { value: ex.id, text: ex.title }));
  // The gallery: every example as a card with what it shows.
  const gl = $('gallery-list');
  for (const ex of EXAMPLES) {
    const b = el('button', { type: 'button', class: 'gallery-card', 'data-example': ex.id },
      el('strong', { text: ex.title }), el('span', { text: ex.summary }));
    b.addEventListener('click', () => { loadExample(ex.id); $('gallery').open = false; });
    gl.append(el('li', {}, b));
  }
  $('gallery').hidden = !EXAMPLES.length;
  pick.addEventListener('change', () => loadExample(pick.value));

  for (const r of document.querySelectorAll('input[name="units"]')) {
    r.addEventListener('change', () => {
      if (!r.checked) return;
      state.units = r.value;
      document.documentElement.dataset.units = state.units;
      renderInputs();
      renderSources();
      // Shown at once in the new units; run() then recomputes if the inputs allow.
      showStackUnits();
      for (const s of SECTIONS) s.showUnits();
      run();
    });
  }
  const checked = document.querySelector('input[name="units"]:checked');
  state.units = checked ? checked.value : 'si';
  document.documentElement.dataset.units = state.units;

  setUpStack();
  $('save-file').addEventListener('click', saveFile);
  $('open-file').addEventListener('change', openFile);
  for (const s of SECTIONS) {
    s.setUp();
    setUpAddRemove(s);
  }
  setUpChartSaving();
  setUpTableSaving();
  setUpPrinting();
  setUpHistory();

  let resizeTimer = 0;
  window.addEventListener('resize', () => {
    clearTimeout(resizeTimer);
    resizeTimer = setTimeout(() => { drawStack(); for (const s of SECTIONS) s.draw(); }, 120);
  });

  renderSources();
  $('load-status').hidden = true;
  $('app').hidden = false;
  $('start-fresh').addEventListener('click', () => {
    $('restore-note').hidden = true;
    if (EXAMPLES.length) loadExample(EXAMPLES[0].id);
  });
  $('share-make').addEventListener('click', makeShareLink);
  setUpLinks();
  openAtStart(() => { if (EXAMPLES.length) loadExample(EXAMPLES[0].id); }).then(() => {
    document.documentElement.dataset.ready = 'true';
  }).catch((err) => {
    console.error(err);
    $('load-status').hidden = false;
    $('load-status').textContent = 'The page could not be set up: ' + String(err && err.message || err);
  });
}

if (document.readyState === 'loading') document.addEventListener('DOMContentLoaded', start);
else start();
