// The document the page edits: the scenario (in SI, as the core reads it), the unit system
// it is shown in, the last good steady result, and the undo/redo history.
//
// `flow` is what the page does once the document changed: main.js, which imports every
// other module, fills it in at start; the modules below it call it instead of importing
// main.js (the bundle refuses import cycles).
import { $ } from './dom.js';

export const state = {
  scenario: null,
  units: 'si',
  lastGood: null, // { scenario, report } of the last successful compute
  preset: { top: '', bottom: '' }, // the surface preset shown for each face
  timer: 0, // the debounce of the recompute
};

const unwired = (name) => () => { throw new Error('flow.' + name + ' is used before main.js set it'); };
export const flow = {
  schedule: unwired('schedule'), // recompute after the debounce (an edit)
  run: unwired('run'), // recompute now
  adopt: unwired('adopt'), // open another scenario: adopt(scenario, from)
  layersMoved: unwired('layersMoved'), // the stack's layers changed order or number: layersMoved(map)
};

// Where each layer went after the stack changed: map[old index] is its new index, or -1
// where it was removed. `order` lists the layers now in the stack by their old index
// (a layer that is new: -1).
export function layerMap(oldCount, order) {
  const map = new Array(oldCount).fill(-1);
  order.forEach((old, now) => { if (old >= 0) map[old] = now; });
  return map;
}

export const clone = (o) => JSON.parse(JSON.stringify(o));

// The scenario without the named sections (each section's run reads only its own).
export function scenarioWithout(...keys) {
  const out = Object.assign({}, state.scenario);
  for (const k of keys) delete out[k];
  return out;
}

// ---------- undo and redo ----------
// Each recompute records the scenario (as JSON) when it differs from the last record; undo
// adopts the one before, redo the one after. A new edit after an undo drops what could be
// redone. At most HISTORY_MAX records.
const HISTORY_MAX = 200;
const history = { past: [], future: [], replaying: false };

export function remember() {
  if (!state.scenario || history.replaying) return;
  const now = JSON.stringify(state.scenario);
  if (history.past.length && history.past[history.past.length - 1] === now) return;
  history.past.push(now);
  if (history.past.length > HISTORY_MAX) history.past.shift();
  history.future = [];
  historyButtons();
}
function historyButtons() {
  $('undo').disabled = history.past.length < 2;
  $('redo').disabled = !history.future.length;
}
// Adopts a record without recording it again.
function replay(text) {
  history.replaying = true;
  try {
    const example = $('example-pick').value;
    flow.adopt(JSON.parse(text));
    $('example-pick').value = example;
  } finally {
    history.replaying = false;
  }
  historyButtons();
}
function undo() {
  if (history.past.length < 2) return;
  history.future.push(history.past.pop());
  replay(history.past[history.past.length - 1]);
}
function redo() {
  if (!history.future.length) return;
  const next = history.future.pop();
  history.past.push(next);
  replay(next);
}

export function setUpHistory() {
  $('undo').addEventListener('click', undo);
  $('redo').addEventListener('click', redo);
  document.addEventListener('keydown', (e) => {
    if (!(e.ctrlKey || e.metaKey) || e.altKey) return;
    const t = e.target;
    // Inside a text box the browser's own undo of the typing applies.
    if (t && (t.tagName === 'TEXTAREA' || (t.tagName === 'INPUT' && /^(text|search|number|)$/.test(t.type || '')))) return;
    const k = e.key.toLowerCase();
    if (k === 'z' && !e.shiftKey) { e.preventDefault(); undo(); }
    else if ((k === 'z' && e.shiftKey) || k === 'y') { e.preventDefault(); redo(); }
  });
}
