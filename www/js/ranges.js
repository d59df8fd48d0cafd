// The ranges study (#ranges): scenario.ranges, the uncertain inputs (what, where, ends,
// spread and its parameters), runs, seed and which results; Run and Stop. Unlike the other
// sections it runs only when asked: startStudy makes a RangesStudy (wasm) on the page, then
// hands its tasks to Web Workers, one at a time each (pulled, so a slow task never holds the
// others); the page records each outcome and the last one makes the report. Without
// workers (none, or the blob refused) the tasks run on the page in slices.
import { $, el, clear, focusField, jobChart } from './dom.js';
import { core } from './core.js';
import { state, flow, clone, scenarioWithout } from './state.js';
import { bad, field, numField, fmtU, typedErrors } from './fields.js';
import { describePath, generalError, listErrors } from './messages.js';
import { SLICE_MS, msWords } from './jobs.js';
import { download, fileStem } from './downloads.js';
import { section } from './section.js';
import { text as WORKER_SCRIPT } from './ranges-worker.js?text';

// ---------- the page's own tables and defaults for the ranges section ----------
// What an uncertain input can stand for: the quantity its ends are shown in and the
// material kind a layer must have for it (null: no layer choice).
const RANGED = [
  { value: 'snow-density', text: 'Snow density', q: 'density', kind: 'snow' },
  { value: 'water-content', text: 'Soil water content', q: 'water_content', kind: 'soil' },
  { value: 'soil-conductivity-factor', text: 'Soil conductivity factor', q: 'fraction', kind: 'soil' },
  { value: 'insulation-derating', text: 'Insulation derating', q: 'percent', kind: 'insulation' },
  { value: 'freezing-index', text: 'Freezing index', q: 'degree_days', kind: null },
];
const rangedOf = (id) => RANGED.find((x) => x.value === id) || RANGED[0];
const RANGE_RESULTS = [
  { value: 'r-value', text: 'R-value of the stack', has: (s) => s.layers && s.layers.length > 0 },
  { value: 'frost-depth', text: 'Deepest frost over the winter', has: (s) => !!s.winter },
  { value: 'frost-below-footing', text: 'Frost below the footing', has: (s) => !!s.edge },
  { value: 'shelter-interior', text: 'Shelter interior', has: (s) => !!s.shelter },
  { value: 'shelter-melt', text: 'Melt inside the shelter', has: (s) => !!s.shelter },
];
const SPREADS = [
  { value: 'uniform', text: 'Even (uniform)' },
  { value: 'triangular', text: 'Peaked (triangular)' },
  { value: 'normal', text: 'Bell (normal, cut at the ends)' },
];
// ---------- the study ----------
const ranges = {
  gen: 0,
  workers: [],
  url: null,
  main: null, // the RangesStudy under way on the page
  study: null, // the RangesStudy that finished last (charts and CSV), or null
  report: null,
  ranWith: '', // the scenario (JSON) the finished study read
  pick: 0, // index of the charted result in the report
  pickId: null, // its id, kept across studies; null: the default
};
const workerCount = () => Math.max(1, Math.min(8, Number(navigator.hardwareConcurrency) || 2));

function baseValueOf(what, layer) {
  try {
    const v = core.W.ranges_base_value(scenarioWithout('ranges'), what, layer == null ? -1 : layer);
    return typeof v === 'number' && isFinite(v) ? v : null;
  } catch (err) {
    console.error(err);
    return null;
  }
}

// A range around the scenario's own value (or a common one where it has none).
function defaultRange(what, layer) {
  const b = baseValueOf(what, layer);
  const round = (v, step) => Math.round(v / step) * step;
  switch (what) {
    case 'snow-density': return b ? [round(Math.max(100, b * 0.75), 5), round(Math.min(550, b * 1.25), 5)] : [200, 350];
    case 'water-content': return b ? [round(b * 0.8, 0.5), round(b * 1.15, 0.5)] : [10, 25];
    case 'soil-conductivity-factor': return [0.8, 1.25];
    case 'insulation-derating': return b != null ? [Math.max(0, round(b - 10, 1)), Math.min(60, round(b + 15, 1))] : [0, 25];
    default: return b ? [round(b * 0.8, 10), round(b * 1.2, 10)] : [500, 1500];
  }
}

function defaultRangedInput(what) {
  const [low, high] = defaultRange(what, null);
  return { what, low, high, distribution: { kind: 'uniform' } };
}

function firstUsefulKind() {
  const s = state.scenario;
  for (const r of RANGED) if (baseValueOf(r.value, null) != null) return r.value;
  return s.winter || s.edge ? 'freezing-index' : 'snow-density';
}

function defaultRanges() {
  // The core's number of runs; the inputs from the scenario's own values, a fresh seed.
  return { runs: core.CAT.defaults.ranges.runs, seed: 1 + Math.floor(Math.random() * 999999), inputs: [defaultRangedInput(firstUsefulKind())] };
}

function rangesOwners() {
  const r = state.scenario.ranges;
  if (!r) return [];
  const out = [[r, 'ranges.']];
  r.inputs.forEach((inp, i) => {
    out.push([inp, 'ranges.inputs[' + i + '].']);
    if (inp.distribution) out.push([inp.distribution, 'ranges.inputs[' + i + '].distribution.']);
  });
  return out;
}

function layerChoices(kind) {
  const out = [{ value: '', text: kind === null ? 'Every winter' : 'Everywhere' }];
  if (kind === null) return out;
  state.scenario.layers.forEach((L, i) => {
    if (L.material && L.material.kind === kind) out.push({ value: String(i), text: 'Layer ' + (i + 1) + (L.name ? ': ' + L.name : '') });
  });
  return out;
}

function renderRanges(focusPath) {
  const r = state.scenario.ranges;
  $('ranges-off').hidden = !!r;
  $('ranges-on').hidden = !r;
  const body = $('r-inputs').querySelector('tbody');
  clear(body);
  clear($('r-fields'));
  clear($('r-which'));
  if (!r) return;
  const rerender = (path) => () => { renderRanges(path); flow.schedule(); };
  r.inputs.forEach((inp, i) => {
    const base = 'ranges.inputs[' + i + '].';
    const def = rangedOf(inp.what);
    const d = inp.distribution || (inp.distribution = { kind: 'uniform' });
    const tr = el('tr');
    const cell = (node) => tr.append(el('td', {}, node));
    cell(field({
      path: base + 'what', label: 'Uncertain input ' + (i + 1), options: RANGED, owner: inp, key: 'what',
      get: () => inp.what,
      set: (v) => {
        inp.what = v;
        delete inp.layer;
        [inp.low, inp.high] = defaultRange(v, null);
        bad(inp).clear();
        if (d.kind !== 'uniform') inp.distribution = { kind: 'uniform' };
      },
      after: rerender(base + 'what'),
    }));
    cell(field({
      path: base + 'layer', label: 'Where input ' + (i + 1) + ' applies', options: layerChoices(def.kind), owner: inp, key: 'layer',
      get: () => (inp.layer == null ? '' : String(inp.layer)),
      set: (v) => { if (v === '') delete inp.layer; else inp.layer = Number(v); },
      after: rerender(base + 'layer'),
    }));
    cell(numField(inp, 'low', base + 'low', 'Low end of input ' + (i + 1), def.q));
    cell(numField(inp, 'high', base + 'high', 'High end of input ' + (i + 1), def.q));
    cell(field({
      path: base + 'distribution.kind', label: 'Spread of input ' + (i + 1), options: SPREADS, owner: inp, key: 'distribution.kind',
      get: () => d.kind,
      set: (v) => {
        const mid = (Number(inp.low) + Number(inp.high)) / 2;
        if (v === 'triangular') inp.distribution = { kind: v, mode: mid };
        else if (v === 'normal') inp.distribution = { kind: v, mean: mid, sd: (Number(inp.high) - Number(inp.low)) / 4 };
        else inp.distribution = { kind: 'uniform' };
      },
      after: rerender(base + 'distribution.kind'),
    }));
    if (d.kind === 'triangular') cell(numField(d, 'mode', base + 'distribution.mode', 'Most likely value of input ' + (i + 1), def.q));
    else if (d.kind === 'normal') cell(numField(d, 'mean', base + 'distribution.mean', 'Mean of input ' + (i + 1), def.q));
    else tr.append(el('td', { class: 'muted', text: '–' }));
    if (d.kind === 'normal') {
      // A spread is a difference: shown without the unit's offset.
      const dq = def.q === 'temperature' ? 'temperature_difference' : def.q;
      cell(numField(d, 'sd', base + 'distribution.sd', 'Standard deviation of input ' + (i + 1), dq));
    } else tr.append(el('td', { class: 'muted', text: '–' }));
    tr.append(el('td', {}, el('button', {
      type: 'button', class: 'btn subtle icon', 'aria-label': 'Remove uncertain input ' + (i + 1), title: 'Remove this input',
      disabled: r.inputs.length <= 1, text: '✕',
      onclick: () => { r.inputs.splice(i, 1); rerender('ranges.inputs[0].what')(); },
    })));
    body.append(tr);
  });
  $('r-add-input').disabled = r.inputs.length >= 32;
  const f = $('r-fields');
  f.append(numField(r, 'runs', 'ranges.runs', 'Runs', 'count', { hint: '2 to 10 000' }));
  f.append(numField(r, 'seed', 'ranges.seed', 'Seed', 'count', { hint: 'the same seed draws the same values' }));
  // Which results: all the scenario has, unless some are unticked.
  const avail = RANGE_RESULTS.filter((x) => x.has(state.scenario));
  const chosen = Array.isArray(r.results) && r.results.length ? r.results : avail.map((x) => x.value);
  const which = $('r-which');
  which.append(el('span', { class: 'field-label', text: 'Results to give as ranges' }));
  for (const x of avail) {
    const id = 'r-result-' + x.value;
    const box = el('input', { type: 'checkbox', id, 'data-field': 'ranges.results.' + x.value, checked: chosen.includes(x.value) });
    box.addEventListener('change', () => {
      const now = avail.filter((y) => (y.value === x.value ? box.checked : chosen.includes(y.value))).map((y) => y.value);
      if (now.length === 0) { box.checked = true; return; }
      if (now.length === avail.length) delete r.results; else r.results = now;
      renderRanges('ranges.results.' + x.value);
      flow.schedule();
    });
    which.append(el('label', { class: 'check', for: id }, box, ' ' + x.text));
  }
  which.append(el('span', { class: 'field-msg', 'data-msg-for': 'ranges.results' }));
  focusField(focusPath);
}

function rangesStale() {
  const stale = !!ranges.report && JSON.stringify(state.scenario) !== ranges.ranWith;
  $('r-stale').hidden = !stale;
  $('ranges-results').classList.toggle('is-stale', stale);
}

function stopWorkers() {
  for (const w of ranges.workers) w.terminate();
  ranges.workers = [];
  if (ranges.url) { URL.revokeObjectURL(ranges.url); ranges.url = null; }
}

// Stop the study under way (a newer one, the Stop button, another scenario).
function stopStudy(words) {
  ranges.gen++;
  stopWorkers();
  if (ranges.main) {
    const done = ranges.main.recorded();
    const all = ranges.main.task_count();
    ranges.main.free();
    ranges.main = null;
    if (words) {
      $('r-status').textContent = 'Stopped after ' + done + ' of ' + all + ' trials.';
      $('ranges-results').dataset.state = 'stopped';
    }
  }
  $('r-go').disabled = false;
  $('r-stop').disabled = true;
}

function dropRangesResult() {
  stopStudy(false);
  if (ranges.study) { ranges.study.free(); ranges.study = null; }
  ranges.report = null;
  ranges.ranWith = '';
  $('ranges-results').dataset.state = 'idle';
  $('r-status').textContent = 'Not run yet.';
  $('r-progress').value = 0;
  renderRangesReport();
}

// One Web Worker per core (at most 8) runs the study's tasks: its script is the page's own
// wasm-bindgen glue (<script id="hibernal-glue">) followed by ranges-worker.js, from a
// blob: URL; each gets the compiled module and the scenario and makes its own study.
function startWorkers(scen, main, gen, onDone, onFail) {
  const glue = $('hibernal-glue');
  if (typeof Worker !== 'function' || !glue || !core.module) return false;
  try {
    const src = glue.textContent + '\n;' + WORKER_SCRIPT + '\n';
    ranges.url = URL.createObjectURL(new Blob([src], { type: 'text/javascript' }));
    const n = Math.min(workerCount(), main.task_count());
    let next = 0;
    const feed = (w) => {
      if (gen !== ranges.gen) return;
      if (next < main.task_count()) w.postMessage({ type: 'task', k: next++ });
    };
    for (let i = 0; i < n; i++) {
      const w = new Worker(ranges.url);
      w.onmessage = (ev) => {
        if (gen !== ranges.gen) return;
        const m = ev.data;
        // Two tasks in hand, so a worker never waits on the page between tasks.
        if (m.type === 'ready') {
          feed(w);
          feed(w);
        } else if (m.type === 'done') {
          if (!main.record(m.k, m.outcome)) { onFail('an outcome came back that the study could not take'); return; }
          feed(w);
          onDone();
        } else if (m.type === 'failed') onFail(m.message);
      };
      w.onerror = (ev) => { if (gen === ranges.gen) { ev.preventDefault(); onFail(ev.message || 'a worker stopped'); } };
      w.postMessage({ type: 'init', module: core.module, scenario: scen });
      ranges.workers.push(w);
    }
    return true;
  } catch (err) {
    console.error(err);
    stopWorkers();
    return false;
  }
}

function startStudy() {
  if ($('results').dataset.pending === 'true') flow.run();
  stopStudy(false);
  const list = $('r-errors');
  clear(list); list.hidden = true;
  for (const m of document.querySelectorAll('#ranges .field-msg')) clear(m);
  for (const f of document.querySelectorAll('#ranges .has-error')) f.classList.remove('has-error');
  // The study's inputs that are not numbers yet.
  const typed = typedErrors(rangesOwners());
  if (typed.length) {
    for (const b of typed) list.append(el('li', { text: b.label + ': enter a number' }));
    list.hidden = false;
    $('r-status').textContent = 'Fix the marked inputs.';
    return;
  }
  const scen = clone(state.scenario);
  let main;
  try {
    main = new core.W.RangesStudy(scen);
  } catch (err) {
    console.error(err);
    generalError('The study failed unexpectedly: ' + String(err && err.message || err));
    return;
  }
  const errs = main.errors();
  if (errs && errs.length) {
    main.free();
    listErrors(list, errs, describePath);
    $('r-status').textContent = 'Fix the marked inputs.';
    $('ranges-results').dataset.state = 'refused';
    return;
  }
  const gen = ranges.gen;
  ranges.main = main;
  const all = main.task_count();
  const box = $('ranges-results');
  box.dataset.state = 'running';
  $('r-go').disabled = true;
  $('r-stop').disabled = false;
  const t0 = performance.now();
  const progress = (where) => {
    const k = main.recorded();
    $('r-progress').value = k / all;
    const s = (performance.now() - t0) / 1000;
    const left = k > 0 ? s * (all - k) / k : NaN;
    $('r-status').textContent = k + ' of ' + all + ' trials ' + where + (isFinite(left) && k < all ? ', about ' + Math.ceil(left) + ' s left' : '') + '…';
  };
  const finishStudy = () => {
    const ms = performance.now() - t0;
    stopWorkers();
    ranges.main = null;
    if (ranges.study) ranges.study.free();
    ranges.study = main;
    const rep = main.report();
    ranges.report = rep;
    ranges.ranWith = JSON.stringify(scen);
    $('r-go').disabled = false;
    $('r-stop').disabled = true;
    box.dataset.runs = String(Number(box.dataset.runs || 0) + 1);
    box.dataset.ms = String(Math.round(ms));
    box.dataset.state = 'done';
    $('r-status').textContent = 'Done: ' + rep.runs + ' runs and ' + (all - rep.runs) + ' more trials (the base case, each input at its ends, each snow regression) in ' + msWords(ms) + (box.dataset.workers !== '0' ? ' on ' + box.dataset.workers + ' workers' : ' on this page') + '.';
    renderRangesReport();
    rangesStale();
  };
  const fail = (message) => {
    stopStudy(false);
    list.append(el('li', { text: 'The study stopped: ' + message }));
    list.hidden = false;
    $('r-status').textContent = 'The study stopped.';
    box.dataset.state = 'failed';
  };
  const where = 'on ' + workerCount() + ' workers';
  const onDone = () => {
    if (main.recorded() === all && main.report() !== null) finishStudy();
    else progress(where);
  };
  if (startWorkers(scen, main, gen, onDone, fail)) {
    box.dataset.workers = String(ranges.workers.length);
    progress(where);
    return;
  }
  // No workers here: run the tasks on the page, a slice at a time.
  box.dataset.workers = '0';
  const slice = () => {
    if (gen !== ranges.gen) return;
    const st = main.advance(SLICE_MS);
    if (!st.ok) { fail((st.errors || []).map((e) => e.message).join('; ') || 'unknown reason'); return; }
    if (st.finished) { finishStudy(); return; }
    progress('on this page');
    setTimeout(slice, 0);
  };
  slice();
}

function rangesHeadCell(text) { return el('th', { scope: 'col', text }); }

function renderRangesReport() {
  const rep = ranges.report;
  const t = $('r-summary');
  const head = t.querySelector('thead');
  const body = t.querySelector('tbody');
  clear(head); clear(body);
  const pick = $('r-pick');
  clear(pick);
  $('r-summary-csv').disabled = !rep;
  $('r-trials-csv').disabled = !rep;
  t.hidden = !rep;
  $('r-pick-wrap').hidden = !rep;
  $('r-failed').textContent = '';
  clear($('r-limits'));
  $('r-limits').hidden = true;
  if (!rep) {
    for (const id of ['r-spread-chart', 'r-sensitivity-chart']) { const c = $(id); const g = c.getContext('2d'); if (g) g.clearRect(0, 0, c.width, c.height); }
    return;
  }
  head.append(el('tr', {}, rangesHeadCell('Result'), rangesHeadCell('Base case'), rangesHeadCell('P10'), rangesHeadCell('P50'),
    rangesHeadCell('P90'), rangesHeadCell('Snow regressions, base case'), rangesHeadCell('Runs'), rangesHeadCell('Moved most by')));
  const notes = [];
  const limits = $('r-limits');
  rep.results.forEach((res, i) => {
    const q = res.quantity;
    const v = (x) => (x == null ? '–' : fmtU(q, x));
    const sp = res.spread;
    const band = sp && sp.min != null ? v(sp.min) + ' to ' + v(sp.max) : 'no snow';
    // The input with the largest swing, if any moved the answer at all.
    const top = res.sensitivity.find((s) => s.swing != null && s.swing > 0);
    body.append(el('tr', { 'data-result': res.id },
      el('th', { scope: 'row', text: res.name }),
      el('td', { 'data-col': 'base', text: v(res.base) }),
      el('td', { 'data-col': 'p10', text: v(res.p10) }),
      el('td', { 'data-col': 'p50', text: v(res.p50) }),
      el('td', { 'data-col': 'p90', text: v(res.p90) }),
      el('td', { 'data-col': 'band', text: band }),
      el('td', { 'data-col': 'runs', text: res.runs_ok + (res.runs_failed ? ' (' + res.runs_failed + ' failed)' : '') }),
      el('td', { 'data-col': 'top', text: top ? top.name : 'none of the inputs' })));
    pick.append(el('option', { value: String(i), text: res.name }));
    const past = res.past_limit;
    if (past && past.of > 0) {
      const pct = Math.round(100 * past.runs / past.of);
      limits.append(el('li', { 'data-result': res.id, text: res.name + ': ' + past.meaning + ' in ' + past.runs + ' of ' + past.of + ' runs (' + pct + ' %)'
        + (past.base_past == null ? '.' : past.base_past ? ', the base case among them.' : '; not in the base case.') }));
    }
    if (res.runs_failed) {
      const first = res.failures[0];
      notes.push(res.name + ': ' + res.runs_failed + ' of ' + rep.runs + ' runs gave no value' + (first ? ' (first, ' + first.field + ': ' + first.message + ')' : '') + '; the percentiles are of the others.');
    }
  });
  if (rep.results.some((x) => x.id === 'frost-below-footing')) notes.push('Frost below the footing: a negative value is how far above the footing\'s base the frost stays.');
  notes.push('Seed ' + rep.seed + ', ' + rep.runs + ' runs: the same seed and inputs give the same numbers.');
  $('r-failed').textContent = notes.join(' ');
  $('r-limits').hidden = !$('r-limits').firstChild;
  // The result chosen before, if this study has it; else the first that is not the
  // steady R-value (a winter, an edge or a shelter is what a range study is usually for).
  let at = rep.results.findIndex((x) => x.id === ranges.pickId);
  if (at < 0) at = Math.max(0, rep.results.findIndex((x) => x.id !== 'r-value'));
  ranges.pick = at;
  pick.value = String(ranges.pick);
  drawRanges();
}

function drawRanges() {
  if (!ranges.study || !ranges.report) return;
  jobChart('r-spread-chart', ranges.study, (c, dpr) => ranges.study.draw_spread(c, ranges.pick, state.units, dpr));
  jobChart('r-sensitivity-chart', ranges.study, (c, dpr) => ranges.study.draw_sensitivity(c, ranges.pick, state.units, dpr));
}

function setUp() {
  $('r-add-input').addEventListener('click', () => {
    const r = state.scenario.ranges;
    const used = new Set(r.inputs.map((x) => x.what + '/' + (x.layer == null ? '' : x.layer)));
    const next = RANGED.find((x) => !used.has(x.value + '/') && baseValueOf(x.value, null) != null) || RANGED.find((x) => !used.has(x.value + '/')) || RANGED[0];
    r.inputs.push(defaultRangedInput(next.value));
    renderRanges('ranges.inputs[' + (r.inputs.length - 1) + '].what');
    flow.schedule();
  });
  $('r-go').addEventListener('click', startStudy);
  $('r-stop').addEventListener('click', () => stopStudy(true));
  $('r-pick').addEventListener('change', (ev) => {
    ranges.pick = Number(ev.target.value) || 0;
    const res = ranges.report && ranges.report.results[ranges.pick];
    ranges.pickId = res ? res.id : null;
    drawRanges();
  });
  $('r-summary-csv').addEventListener('click', () => { if (ranges.study) download(ranges.study.summary_csv(state.units), fileStem('ranges') + '-summary.csv'); });
  $('r-trials-csv').addEventListener('click', () => { if (ranges.study) download(ranges.study.trials_csv(state.units), fileStem('ranges') + '-runs.csv'); });
}

export const rangesSection = section({
  key: 'ranges',
  firstField: 'ranges.inputs[0].what',
  byHand: true,
  needsStack: false,
  inView: false,
  fresh: defaultRanges,
  setUp,
  render: () => renderRanges(),
  owners: rangesOwners,
  edited: rangesStale,
  // The study runs from its Run button only.
  run() {},
  showUnits() {
    if (ranges.report) renderRangesReport();
  },
  draw: drawRanges,
  drop: dropRangesResult,
  adopt() {
    dropRangesResult();
    ranges.pickId = null;
  },
  layersMoved,
});

// The stack changed: an input that applies to one layer follows that layer; one whose
// layer was removed goes with it (the undo brings both back).
function layersMoved(map) {
  const r = state.scenario.ranges;
  if (!r) return;
  r.inputs = r.inputs.filter((inp) => inp.layer == null || (map[inp.layer] ?? -1) >= 0);
  for (const inp of r.inputs) if (inp.layer != null) inp.layer = map[inp.layer];
  renderRanges();
}
