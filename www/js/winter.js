// The winter section (#winter): scenario.winter (SI, as the core reads it), its inputs,
// and its run: the core's winter job, started 200 ms after each good steady compute and
// advanced a slice at a time (see jobs.js); any newer input cancels the run under way. Its
// report and charts (the day slider redraws only the profile of that day, from the
// profiles kept in the finished run) and the least-thickness search (#w-design); the
// import of a daily record from a CSV file is in climate-import.js.
import { $, el, clear, focusField, jobChart } from './dom.js';
import { core, coreDefault } from './core.js';
import { state, flow, clone } from './state.js';
import { field, numField, fmt, fmtU, fmtUpU, fmtNum, aboutU, headCell, typedErrors, switchPart, showUnitSymbols } from './fields.js';
import { describePath, fieldLabel } from './messages.js';
import { slicedRun, searchBox } from './jobs.js';
import { download, fileStem } from './downloads.js';
import { section } from './section.js';
import { climateEditor, snowEditor, surfaceEditor, bottomEditor, dayWords } from './weather.js';
import { setUpImport, renderClimateSummary, forgetChosenFile } from './climate-import.js';
import { showFrostHeadline, setUpFrostHeadline } from './headline.js';

// ---------- a new winter section and its parts (the core's defaults) ----------
const defaultInitial = (kind) => coreDefault('initials', kind);
const defaultWinter = () => coreDefault('winter');
// The core's default grid, shown until changed.
const defaultGrid = () => coreDefault('winter_grid');
// The least-thickness search: the first insulation layer, frost kept above its bottom; the
// range and step the core gives for the units shown (round in them: 2 mm steps, or 1/2 in),
// so the thicknesses tried are round. A unit switch later leaves the search as it is.
const leastRange = () => core.CAT.defaults.least_thickness[state.units] || core.CAT.defaults.least_thickness.si;
function defaultLeast() {
  const L = state.scenario.layers;
  let i = L.findIndex((l) => l.material && l.material.kind === 'insulation');
  if (i < 0) i = 0;
  const r = leastRange();
  return { layer: i, keep_frost_above: { kind: 'layer-bottom', layer: i }, min_m: r.min, max_m: r.max, resolution_m: r.resolution };
}

const WINTER_DEBOUNCE_MS = 200;

const winter = {
  day: null, // the day the profile chart shows
  past: {}, // earlier sub-sections by kind, so switching back restores them
  summary: null, // summary of a daily record: { first_date, winters, design, ... }
  least: null, // the least-thickness search being set up (applied to the scenario when run)
};

const winterRun = slicedRun({
  key: 'winter', results: 'winter-results', errors: 'w-errors', bar: 'w-progress', status: 'w-status',
  busy: 'Running…', what: 'The winter run', delayMs: WINTER_DEBOUNCE_MS, clearFirst: '#winter',
  make: () => core.doc.start('winter'),
  describe: describeWinterPath,
  render: () => { renderWinterReport(); drawWinter(); },
  changed: headline,
});

const search = searchBox({
  id: 'w-design',
  draft: leastDraft,
  typed: (d) => typedErrors([[d, ''], [d.keep_frost_above, '']]),
  keep: (d) => { state.scenario.winter.least_thickness = clone(d); },
  // The search kept into the scenario is an edit: the core reads the scenario again.
  make: () => { core.doc.set(state.scenario); return core.doc.start('least-thickness'); },
  describe: describeWinterPath,
  render: renderLeastReport,
});

function describeWinterPath(path) {
  if (/^winter\.climate\.days/.test(path || '')) return 'Daily records';
  if (path === 'winter') return 'Winter run';
  if (path === 'winter.surface') return 'Surface';
  if (/^winter\.initial/.test(path || '') && !fieldLabel(path)) return 'Start';
  return describePath(path);
}

function winterOwners() {
  const w = state.scenario.winter;
  if (!w) return [];
  const out = [[w.climate, 'winter.climate.'], [w.surface, 'winter.surface.'], [w.bottom, 'winter.bottom.'], [w.initial, 'winter.initial.'], [w, 'winter.']];
  if (w.climate.snow) out.push([w.climate.snow, 'winter.climate.snow.']);
  if (w.grid) out.push([w.grid, 'winter.grid.']);
  return out;
}

// ---------- inputs ----------
function renderWinter() {
  const w = state.scenario.winter;
  $('winter-off').hidden = !!w;
  $('winter-on').hidden = !w;
  if (!w) return;
  const rerender = (focus) => () => { renderWinter(); focusField(focus); flow.run(); };

  // climate, snow, surface, deep ground (the same inputs as the building edge's)
  const c = w.climate;
  climateEditor($('w-climate'), w, 'winter.', winter, rerender, true);
  $('w-import').hidden = c.kind !== 'daily';
  renderClimateSummary();
  snowEditor($('w-snow'), c, 'winter.', 'w-snow-on', winter, rerender, 'The snow is simulated as layers of its own above the ground.');
  surfaceEditor($('w-surface'), w, 'surface', 'winter.', winter, rerender);
  bottomEditor($('w-bottom'), w, 'winter.', winter, rerender);

  const ini = $('w-initial');
  clear(ini);
  const ig = el('div', { class: 'w-fields' });
  const initialKinds = [
    { value: 'spin-up', text: 'Repeat the year until it repeats itself' },
    { value: 'uniform', text: 'Uniform temperature' },
  ];
  if (core.CAT.initial_kinds && core.CAT.initial_kinds.includes('periodic')) initialKinds.push({ value: 'periodic', text: 'Yearly cycle from the mean annual temperature' });
  ig.append(field({
    path: 'winter.initial.kind', label: 'The ground starts', cls: 'wide', options: initialKinds,
    get: () => w.initial.kind,
    set: (v) => switchPart(w, 'initial', winter.past, v, defaultInitial),
    after: rerender('winter.initial.kind'),
  }));
  if (w.initial.kind === 'uniform') ig.append(numField(w.initial, 'temperature_c', 'winter.initial.temperature_c', 'Temperature everywhere', 'temperature'));
  if (w.initial.kind === 'spin-up') {
    ig.append(
      numField(w.initial, 'start_c', 'winter.initial.start_c', 'First guess, everywhere', 'temperature'),
      numField(w.initial, 'max_years', 'winter.initial.max_years', 'At most this many years', 'fraction'),
    );
  }
  ini.append(ig);

  // run
  const ru = $('w-run');
  clear(ru);
  const rg = el('div', { class: 'w-fields' });
  rg.append(
    numField(w, 'step_s', 'winter.step_s', 'Time step', 'step'),
    numField(w, 'duration_days', 'winter.duration_days', 'Length of the run', 'days', {
      optional: true, placeholder: () => (c.kind === 'daily' ? 'the whole record' : '365'),
    }),
  );
  ru.append(rg);
  const grd = w.grid || defaultGrid();
  const det = el('details', { class: 'grid-opts' }, el('summary', { text: 'Grid' }));
  const gg = el('div', { class: 'w-fields' });
  const ensureGrid = () => { if (!w.grid) w.grid = grd; };
  gg.append(
    numField(grd, 'surface_cell_m', 'winter.grid.surface_cell_m', 'Cell at the surface', 'thickness', { after: ensureGrid }),
    numField(grd, 'growth_ratio', 'winter.grid.growth_ratio', 'Growth from cell to cell', 'fraction', { after: ensureGrid }),
    numField(grd, 'max_cell_m', 'winter.grid.max_cell_m', 'Largest cell', 'thickness', { after: ensureGrid }),
  );
  det.append(gg);
  ru.append(det);
  renderLeastFields();
  showUnitSymbols($('winter'));
}

// ---------- least thickness ----------
// The stack changed: the search's layer and the layer whose bottom frost must stay above
// follow their layers; where one was removed, the search sizes the layer a new search
// would, and keeps frost above that layer's bottom.
function layersMoved(map) {
  const follow = (d) => {
    if (!d) return;
    const bottom = d.keep_frost_above && d.keep_frost_above.kind === 'layer-bottom';
    d.layer = map[d.layer] ?? -1;
    if (d.layer < 0) d.layer = defaultLeast().layer;
    if (bottom) {
      const b = map[d.keep_frost_above.layer] ?? -1;
      d.keep_frost_above.layer = b < 0 ? d.layer : b;
    }
  };
  follow(winter.least);
  const w = state.scenario.winter;
  if (w && w.least_thickness) follow(w.least_thickness);
  if (w) renderLeastFields();
}

function leastDraft() {
  const w = state.scenario.winter;
  if (!winter.least) {
    winter.least = w && w.least_thickness ? JSON.parse(JSON.stringify(w.least_thickness)) : defaultLeast();
    winter.leastUntouched = w && w.least_thickness ? null : JSON.stringify(winter.least);
  }
  const d = winter.least;
  const n = state.scenario.layers.length;
  if (d.layer >= n) d.layer = n - 1;
  if (d.keep_frost_above.kind === 'layer-bottom' && d.keep_frost_above.layer >= n) d.keep_frost_above.layer = n - 1;
  return d;
}

function renderLeastFields() {
  const box = $('w-design-fields');
  clear(box);
  const d = leastDraft();
  const layerOptions = state.scenario.layers.map((l, i) => ({ value: String(i), text: (i + 1) + '. ' + (l.name && l.name.trim() ? l.name : 'layer ' + (i + 1)) }));
  const redraw = () => { renderLeastFields(); search.stale(); };
  box.append(field({
    path: 'winter.least_thickness.layer', label: 'Layer to size', cls: 'wide', options: layerOptions,
    get: () => String(d.layer), set: (v) => { d.layer = Number(v); }, after: redraw,
  }));
  box.append(field({
    path: 'winter.least_thickness.keep_frost_above.kind', label: 'Keep frost above', cls: 'wide',
    options: [
      { value: 'layer-bottom', text: 'the bottom of a layer (nothing below it freezes)' },
      { value: 'depth', text: 'a depth below the top face' },
    ],
    get: () => d.keep_frost_above.kind,
    set: (v) => { d.keep_frost_above = v === 'depth' ? { kind: 'depth', depth_m: 1.0 } : { kind: 'layer-bottom', layer: d.layer }; },
    after: redraw,
  }));
  if (d.keep_frost_above.kind === 'depth') {
    box.append(numField(d.keep_frost_above, 'depth_m', 'winter.least_thickness.keep_frost_above.depth_m', 'Depth', 'depth', { after: search.stale }));
  } else {
    box.append(field({
      path: 'winter.least_thickness.keep_frost_above.layer', label: 'Bottom of layer', cls: 'wide', options: layerOptions,
      get: () => String(d.keep_frost_above.layer), set: (v) => { d.keep_frost_above.layer = Number(v); }, after: redraw,
    }));
  }
  box.append(
    numField(d, 'min_m', 'winter.least_thickness.min_m', 'Thinnest to try', 'thickness', { after: search.stale }),
    numField(d, 'max_m', 'winter.least_thickness.max_m', 'Thickest to try', 'thickness', { after: search.stale }),
  );
}

function renderLeastReport() {
  const r = search.report;
  const ans = $('w-design-answer');
  ans.classList.remove('is-stale');
  const tb = $('w-design-trials').querySelector('tbody');
  clear(tb);
  if (!r) { ans.textContent = ''; $('w-design-trials').hidden = true; return; }
  const name = r.layer_name && r.layer_name.trim() ? r.layer_name : 'layer ' + (r.layer + 1);
  const limitWords = 'above ' + fmtU('depth', r.limit_m);
  let text;
  if (r.outcome === 'found') {
    text = 'At least ' + fmtUpU('thickness', r.thickness_m) + ' of ' + name + (r.r_value_m2k_w != null ? ' (R-value ' + fmtUpU('r_value', r.r_value_m2k_w) + ' as derated)' : '') + ' keeps the deepest frost ' + limitWords +
      (r.frost_depth_m > 0 ? ' (with it, frost reaches ' + fmtU('depth', r.frost_depth_m) + ')' : ' (with it, the ground below does not freeze)') + ', found to within ' + fmtU('thickness', r.resolution_m) + '.';
    if (r.slope != null && r.slope < 0) {
      // In US units a step a builder buys (1/2 in of board) and the lift in inches or feet
      // and inches; in SI 1 cm and the lift in m.
      const extra = state.units === 'us' ? core.CAT.defaults.least_thickness.us.resolution : 0.01;
      text += ' Near the answer each extra ' + fmtU('thickness', extra) + ' of ' + name + ' lifts the frost by ' + aboutU('depth', -r.slope * extra) + '.';
    } else if (r.frost_depth_m === 0) {
      text += ' From this thickness on the ground below does not freeze at all, so the answer is sharp: a little less lets frost in.';
    }
  } else if (r.outcome === 'smallest-suffices') {
    text = 'Even ' + fmtU('thickness', r.thickness_m) + ' of ' + name + ' (the thinnest tried) keeps the frost ' + limitWords + '.';
  } else if (r.outcome === 'not-reachable') {
    text = 'Even the thickest tried lets frost reach ' + fmtU('depth', r.frost_depth_m) + ', below the limit (' + fmtU('depth', r.limit_m) + '). Try a thicker range, another layer, or more cover.';
  } else {
    text = 'Frost reached deeper with more of this layer between two tries, so no least thickness can be named here; look at the table.';
  }
  ans.textContent = text;
  r.trials.forEach((t, i) => {
    const ok = t.frost_depth_m <= t.limit_m;
    tb.append(el('tr', {},
      el('td', { text: String(i + 1) }),
      el('td', { text: fmtU('thickness', t.thickness_m) }),
      el('td', { text: t.frost_depth_m > 0 ? fmtU('depth', t.frost_depth_m) : 'none' }),
      el('td', { text: fmtU('depth', t.limit_m) }),
      el('td', { text: ok ? 'yes' : 'no', class: ok ? 'ok' : 'no' })));
  });
  $('w-design-trials').hidden = false;
}

// ---------- a daily record ----------
// The import itself and the record's summary are in climate-import.js. Until a record is
// read, a daily climate has no days: the run waits for one, with a hint and no error.
const awaitingRecord = () => {
  const w = state.scenario.winter;
  return !!w && w.climate.kind === 'daily' && !(w.climate.days && w.climate.days.length);
};

function runOrWait(blocked) {
  if (!awaitingRecord()) { winterRun.schedule(blocked); return; }
  winterRun.cancel();
  const list = $('w-errors');
  clear(list); list.hidden = true;
  winterRun.stale(true, 'Waiting for a daily record: choose a CSV file under Climate.');
}

// ---------- report ----------
const winterDay = (day) => dayWords(day, state.scenario.winter.climate);

function layerAt(depth, rep) {
  const f = rep.layer_faces_m;
  for (let i = 0; i + 1 < f.length; i++) if (depth <= f[i + 1] + 1e-9) return i;
  return f.length - 2;
}

// The deepest frost of a report in words, { value, when }: shown in #w-max-frost and, the
// same text, in the first screen's headline.
function frostWords(rep) {
  const mf = rep.max_frost_depth_m;
  // Frost that reached the bottom of the modelled ground is a lower bound, never a depth.
  const value = mf > 0 ? (rep.frost_at_bottom ? 'at least ' : '') + fmtU('depth', mf) : 'None';
  if (rep.frost_at_bottom) return { value, when: 'The bottom of the modelled ground: frost may go deeper (see the warning in the winter section).' };
  if (!(mf > 0)) return { value, when: 'The ground does not freeze in this run.' };
  const given = rep.layer_faces_m[rep.layer_faces_m.length - 1];
  const i = layerAt(mf, rep);
  const where = mf > given + 1e-9
    ? 'in the ground added below the layers (' + rep.layer_names[i] + ' continued)'
    : 'in layer ' + (i + 1) + ' (' + rep.layer_names[i] + ')';
  return {
    value,
    when: 'On ' + winterDay(rep.max_frost_day) + ', ' + where + '.' +
      (rep.frozen_all_year ? ' Not a seasonal frost depth: some ground stayed frozen all year (see the warning in the winter section).' : ''),
  };
}

// The first screen's headline follows the run: its answer once done, else what it waits for.
function headline(st) {
  if (!state.scenario.winter) showFrostHeadline({ state: 'no-winter' });
  else if (st === 'done' && winterRun.report) showFrostHeadline(Object.assign({ state: 'done' }, frostWords(winterRun.report)));
  else showFrostHeadline({ state: st === 'stale' ? 'stale' : 'running' });
}

function renderWinterReport() {
  const rep = winterRun.report;
  if (!rep) return;
  const words = frostWords(rep);
  $('w-max-frost').textContent = words.value;
  $('w-max-frost').dataset.bound = rep.frost_at_bottom ? 'at-least' : '';
  $('w-max-frost-when').textContent = words.when;
  $('w-air-fi').textContent = fmtU('degree_days', rep.air_freezing_index_c_days);
  $('w-surf-fi').textContent = fmtU('degree_days', rep.surface_freezing_index_c_days);
  const ratio = rep.air_freezing_index_c_days > 0 ? rep.surface_freezing_index_c_days / rep.air_freezing_index_c_days : null;
  $('w-air-fi-sub').textContent = 'Range of the cumulative degree-day curve of the air.';
  $('w-surf-fi-sub').textContent = ratio != null ? 'At the ground surface: ' + fmtNum(ratio, 2) + ' × the air index.' : '';
  $('w-solver').textContent = rep.cells + ' cells, ' + rep.steps + ' steps, ' + fmtNum(rep.iterations_per_step, 2) + ' passes per step' +
    (rep.split_steps ? ', ' + rep.split_steps + ' steps split' : '') + (rep.spin_up_years ? ', ' + rep.spin_up_years + ' years to settle' : '') +
    '; energy balance closes to ' + rep.energy_imbalance_relative.toExponential(1) + ' of the heat through the faces.';
  const hb = $('w-hand').querySelector('tbody');
  clear(hb);
  for (const h of rep.hand_methods || []) {
    hb.append(el('tr', { 'data-method': h.method },
      el('th', { scope: 'row', text: h.name }),
      el('td', { class: 'num', text: h.depth_m != null ? fmtU('depth', h.depth_m) : 'does not apply' }),
      el('td', { text: h.note })));
  }
  $('w-hand').hidden = !hb.firstChild;
  const wl = $('w-warnings');
  clear(wl);
  for (const w of rep.warnings || []) wl.append(el('li', { text: describeWinterPath(w.field) + ': ' + w.message }));
  wl.hidden = !wl.firstChild;
  const days = rep.daily.length ? rep.daily[rep.daily.length - 1].day : 0;
  const slider = $('w-day');
  slider.max = String(Math.max(0, Math.floor(days)));
  if (winter.day == null || winter.day > days) winter.day = Math.min(Math.round(rep.max_frost_day), Math.floor(days));
  slider.value = String(winter.day);
  $('w-day-out').textContent = winterDay(winter.day);
  $('w-csv').disabled = false;
  $('w-profiles-csv').disabled = false;
}

// ---------- charts ----------
const winterChart = (id, draw) => jobChart(id, winterRun.job, draw);

function drawDayChart() {
  const job = winterRun.job;
  if (!job) return;
  winterChart('day-chart', (c, dpr) => job.draw('day-profile', c, winter.day || 0, state.units, dpr));
}

function drawWinter() {
  const job = winterRun.job;
  if (!job) return;
  winterChart('frost-chart', (c, dpr) => job.draw('frost-depth', c, 0, state.units, dpr));
  drawDayChart();
  winterChart('series-chart', (c, dpr) => job.draw('series', c, 0, state.units, dpr));
}

function setUp() {
  setUpFrostHeadline();
  $('w-design-go').addEventListener('click', search.start);
  setUpImport(winter, () => { renderWinter(); flow.run(); });
  $('w-day').addEventListener('input', (e) => {
    winter.day = Number(e.target.value);
    $('w-day-out').textContent = winterDay(winter.day);
    drawDayChart();
  });
  $('w-csv').addEventListener('click', () => { if (winterRun.job) download(winterRun.job.csv('daily', state.units, 0), fileStem('winter') + '-daily.csv'); });
  $('w-profiles-csv').addEventListener('click', () => { if (winterRun.job) download(winterRun.job.csv('profiles', state.units, 0), fileStem('winter') + '-profiles.csv'); });
}

export const winterSection = section({
  key: 'winter',
  firstField: 'winter.climate.kind',
  byHand: false,
  needsStack: true,
  inView: false,
  fresh: defaultWinter,
  setUp,
  render: renderWinter,
  owners: winterOwners,
  edited: () => search.edited(),
  run: runOrWait,
  showUnits() {
    // A search set up by default and never edited nor run starts again from the round
    // range of the new units (one that was edited or run is kept as it is).
    if (winter.least && JSON.stringify(winter.least) === winter.leastUntouched && state.scenario.winter && !state.scenario.winter.least_thickness) {
      winter.least = null;
      renderLeastFields();
    }
    if (winterRun.report) { renderWinterReport(); drawWinter(); }
    // The search's answer in the new units; a change of units leaves it as fresh as it was.
    search.show();
    if (winterRun.report && $('winter-results').dataset.state === 'done') headline('done');
  },
  draw: drawWinter,
  drop: () => winterRun.drop(),
  adopt() {
    winterRun.drop();
    winter.day = null;
    winter.past = {};
    winter.summary = null;
    forgetChosenFile();
    winter.least = null;
    search.reset();
    $('w-csv').disabled = true;
    $('w-profiles-csv').disabled = true;
  },
  layersMoved,
});
