// The building edge section (#edge): scenario.edge (SI, as the core reads it), a
// cross-section in the plane through a heated or unheated building's slab, wall and
// footing, boards and soil bands; its inputs (the weather ones are the winter's own editors,
// shared), and its run: the core's edge job, started 400 ms after each recompute and
// advanced a slice at a time, like the winter's; any newer input cancels the run under
// way. Its report and charts (the day slider shows the kept field nearest that day) and the
// least-insulation search (#e-design).
import { $, el, clear, focusField, jobChart } from './dom.js';
import { core, coreDefault } from './core.js';
import { state, flow, clone } from './state.js';
import { badText, field, numField, fmtU, fmtUpU, aboutU, typedErrors, switchPart, showUnitSymbols, fieldGrid, fillBox } from './fields.js';
import { materialFieldsOf } from './materials.js';
import { describePath } from './messages.js';
import { slicedRun, searchBox } from './jobs.js';
import { download, fileStem } from './downloads.js';
import { section } from './section.js';
import { climateEditor, snowEditor, surfaceEditor, bottomEditor, dayWords } from './weather.js';

// ---------- a new edge section and its parts (the core's defaults) ----------
// A heated building on a shallow footing with a board against the wall and a wing board,
// in silt, through a design winter with snow.
const defaultEdge = () => coreDefault('edge');
// A board against the wall, reaching down to `depth_m`.
const defaultWallBoard = (depth_m) => Object.assign(coreDefault('edge_wall_board'), { depth_m });
const defaultWing = () => coreDefault('edge_wing');
const defaultInside = (kind) => coreDefault('edge_insides', kind);
// The core's grid, shown until changed.
const defaultGrid = () => coreDefault('edge_grid');
// What the least-insulation search can vary, with the quantity its values are shown in,
// the board it needs, and the range and resolution it starts with.
const leastQuantities = () => core.CAT.defaults.edge_least_quantities;
const edgeQuantity = (id) => leastQuantities().find((x) => x.id === id) || leastQuantities()[0];
// The search starts on the wing's width when there is a wing, else on the footing's depth.
// Its range and step are the core's for the units shown (round in them: a wing in 6 in
// steps, a footing in 2 in steps), so the values tried are round.
const inUnits = (q) => (state.units === 'us' && q.us ? q.us : q);
function defaultLeast(e) {
  const q = edgeQuantity(e && e.wing ? 'wing-width' : 'footing-depth');
  const r = inUnits(q);
  return { quantity: q.id, min: r.min, max: r.max, resolution: r.resolution };
}

const EDGE_DEBOUNCE_MS = 400;

const edge = {
  day: null, // the day the field map shows
  past: {}, // earlier sub-sections by kind, so switching back restores them
  least: null, // the search being set up (copied into the scenario when run)
};

const edgeRun = slicedRun({
  key: 'edge', results: 'edge-results', errors: 'e-errors', bar: 'e-progress', status: 'e-status',
  busy: 'Running the cross-section…', what: 'The building edge', delayMs: EDGE_DEBOUNCE_MS,
  make: () => core.doc.start('edge'),
  describe: describePath,
  render: () => { renderEdgeReport(); drawEdge(); },
});

const search = searchBox({
  id: 'e-design',
  draft: leastDraft,
  typed: (d) => typedErrors([[d, '']]),
  keep: (d) => { state.scenario.edge.least = clone(d); },
  // The search kept into the scenario is an edit: the core reads the scenario again.
  make: () => { core.doc.set(state.scenario); return core.doc.start('edge-least'); },
  describe: describePath,
  render: renderLeastReport,
});

function edgeOwners() {
  const e = state.scenario.edge;
  if (!e) return [];
  const out = [[e, 'edge.'], [e.slab, 'edge.slab.'], [e.slab.material, 'edge.slab.material.'], [e.wall, 'edge.wall.'], [e.wall.material, 'edge.wall.material.'],
    [e.inside, 'edge.inside.'], [e.outside, 'edge.outside.'], [e.climate, 'edge.climate.'], [e.bottom, 'edge.bottom.'], [e.start, 'edge.start.']];
  if (e.wall_board) out.push([e.wall_board, 'edge.wall_board.']);
  if (e.wing) out.push([e.wing, 'edge.wing.']);
  if (e.climate.snow) out.push([e.climate.snow, 'edge.climate.snow.']);
  if (e.grid) out.push([e.grid, 'edge.grid.']);
  e.soil.forEach((s, i) => out.push([s, 'edge.soil[' + i + '].']));
  return out;
}

// ---------- inputs ----------
function renderEdge() {
  const e = state.scenario.edge;
  $('edge-off').hidden = !!e;
  $('edge-on').hidden = !e;
  if (!e) return;
  const rerender = (focus) => () => { renderEdge(); focusField(focus); flow.run(); };

  // building
  const inside = e.inside;
  const bg = fieldGrid(field({
    path: 'edge.inside.kind', label: 'Inside the building', cls: 'wide',
    options: [
      { value: 'heated', text: 'Heated: the floor meets warm air' },
      { value: 'closed', text: 'Unheated: no heat through the floor' },
    ],
    get: () => inside.kind,
    set: (v) => switchPart(e, 'inside', edge.past, v, defaultInside),
    after: rerender('edge.inside.kind'),
  }));
  if (inside.kind === 'heated') {
    bg.append(
      numField(inside, 'air_c', 'edge.inside.air_c', 'Air inside', 'temperature'),
      numField(inside, 'film_w_m2k', 'edge.inside.film_w_m2k', 'Floor surface film', 'film'),
    );
  }
  bg.append(
    numField(e, 'inside_half_width_m', 'edge.inside_half_width_m', 'Half the building width', 'length', { hint: 'from the centre to the inner face of the wall' }),
    numField(e.slab, 'thickness_m', 'edge.slab.thickness_m', 'Slab thickness', 'thickness'),
    ...materialFieldsOf(e.slab, 'edge.slab.', rerender),
  );
  fillBox('e-building', bg, el('p', { class: 'hint', text: 'An unheated building is taken as giving no heat to the ground at all, the cautious reading.' }));

  // wall and footing
  fillBox('e-wall', fieldGrid(
    numField(e.wall, 'width_m', 'edge.wall.width_m', 'Wall and footing width', 'thickness'),
    numField(e.wall, 'base_depth_m', 'edge.wall.base_depth_m', 'Footing base below grade', 'depth'),
    ...materialFieldsOf(e.wall, 'edge.wall.', rerender),
  ), el('p', { class: 'hint', text: 'The wall and its footing are drawn as one block from grade down to the base.' }));

  // boards
  const bb = [];
  const boardToggle = (key, label, make) => {
    const id = 'e-' + key.replace('_', '-') + '-on';
    const check = el('input', { type: 'checkbox', id, 'data-field': 'edge.' + key, checked: !!e[key], title: label });
    check.addEventListener('change', () => {
      if (check.checked) e[key] = (edge.past[key] && edge.past[key].board) || make();
      else { edge.past[key] = { board: e[key] }; e[key] = null; }
      rerender('edge.' + key)();
    });
    return el('label', { class: 'check', for: id }, check, ' ' + label);
  };
  bb.push(boardToggle('wall_board', 'A board against the outer face of the wall', () => defaultWallBoard(e.wall.base_depth_m)));
  if (e.wall_board) {
    const b = e.wall_board;
    bb.push(fieldGrid(
      numField(b, 'thickness_m', 'edge.wall_board.thickness_m', 'Board thickness', 'thickness'),
      numField(b, 'depth_m', 'edge.wall_board.depth_m', 'Reaches down to', 'depth'),
      ...materialFieldsOf(b, 'edge.wall_board.', rerender),
    ));
  }
  bb.push(boardToggle('wing', 'A wing board running out from the wall under the ground', defaultWing));
  if (e.wing) {
    const b = e.wing;
    bb.push(fieldGrid(
      numField(b, 'thickness_m', 'edge.wing.thickness_m', 'Board thickness', 'thickness'),
      numField(b, 'width_m', 'edge.wing.width_m', 'Width out from the wall', 'length'),
      numField(b, 'depth_m', 'edge.wing.depth_m', 'Top of the board below grade', 'depth'),
      ...materialFieldsOf(b, 'edge.wing.', rerender),
    ));
  }
  bb.push(el('p', { class: 'hint', text: 'Buried boards take up water and lose part of their R-value over the years: the moisture share entered is taken off in the run.' }));
  fillBox('e-boards', ...bb);

  // soil bands
  const sl = el('ol', { class: 'layer-list soil-list' });
  e.soil.forEach((s, i) => {
    const base = 'edge.soil[' + i + '].';
    const li = el('li', { class: 'layer kind-soil', 'data-index': i });
    const main = el('div', { class: 'layer-main' });
    main.append(
      el('span', { class: 'layer-no', 'aria-hidden': 'true', text: String(i + 1) }),
      field({ path: base + 'name', label: 'Name', text: true, cls: 'name', get: () => s.name, set: (v) => { s.name = v; } }),
      numField(s, 'thickness_m', base + 'thickness_m', 'Thickness', 'thickness'),
      el('button', {
        type: 'button', class: 'icon-btn danger', 'data-act': 'remove', disabled: e.soil.length <= 1,
        'aria-label': 'Remove soil band ' + (i + 1), title: 'Remove this band',
        onclick: () => { e.soil.splice(i, 1); rerender('edge.soil[0].thickness_m')(); }, text: '✕',
      }),
    );
    li.append(main, el('div', { class: 'layer-material' }, ...materialFieldsOf(s, base, rerender)));
    sl.append(li);
  });
  const add = el('button', { type: 'button', class: 'btn', id: 'e-add-soil', text: 'Add a soil band below' });
  add.addEventListener('click', () => {
    const last = e.soil[e.soil.length - 1];
    e.soil.push({ name: '', thickness_m: 2, material: clone(last.material) });
    rerender('edge.soil[' + (e.soil.length - 1) + '].thickness_m')();
  });
  fillBox('e-soil', sl, add, el('p', { class: 'hint', text: 'Bands run level under the building and beside it; the bands should reach the bottom of the section.' }));

  // climate, surface, deep ground
  climateEditor($('e-climate'), e, 'edge.', edge, rerender, false);
  snowEditor($('e-snow'), e.climate, 'edge.', 'e-snow-on', edge, rerender, 'In the cross-section the snow insulates the open ground but stores no heat of its own.');
  surfaceEditor($('e-surface'), e, 'outside', 'edge.', edge, rerender);
  bottomEditor($('e-bottom'), e, 'edge.', edge, rerender);

  // section and run
  const grd = e.grid || defaultGrid();
  const ensureGrid = () => { if (!e.grid) e.grid = grd; };
  const det = el('details', { class: 'grid-opts' }, el('summary', { text: 'Grid' }), fieldGrid(
    numField(grd, 'fine_m', 'edge.grid.fine_m', 'Finest cell', 'thickness', { after: ensureGrid, hint: 'at grade, the slab, the wall, the footing and the boards' }),
    numField(grd, 'growth_ratio', 'edge.grid.growth_ratio', 'Growth from cell to cell', 'fraction', { after: ensureGrid }),
    numField(grd, 'max_cell_m', 'edge.grid.max_cell_m', 'Largest cell', 'thickness', { after: ensureGrid }),
  ));
  fillBox('e-run', fieldGrid(
    numField(e, 'outside_extent_m', 'edge.outside_extent_m', 'Ground beside the wall', 'length', { hint: 'far enough that its edge is open ground' }),
    numField(e, 'depth_m', 'edge.depth_m', 'Depth of the section', 'depth'),
    numField(e.start, 'surface_c', 'edge.start.surface_c', 'Ground at the start, at grade', 'temperature'),
    numField(e.start, 'gradient_k_per_m', 'edge.start.gradient_k_per_m', 'Warming with depth at the start', 'gradient'),
    numField(e, 'step_s', 'edge.step_s', 'Time step', 'step'),
    numField(e, 'duration_days', 'edge.duration_days', 'Length of the run', 'days', { optional: true, placeholder: () => 'the climate\'s' }),
    numField(e, 'field_every_days', 'edge.field_every_days', 'Keep the field every', 'days'),
  ), det);
  renderLeastFields();
  showUnitSymbols($('edge'));
}

function renderEdgeCautions(rep) {
  const ul = $('e-caution-list');
  clear(ul);
  for (const c of (rep && rep.cautions) || []) {
    const text = typeof c === 'string' ? c : c.text;
    ul.append(el('li', { 'data-caution': typeof c === 'string' ? '' : (c.id || '') }, text));
  }
}

// ---------- report ----------
function edgeDayWords(day) {
  const c = state.scenario.edge && state.scenario.edge.climate;
  if (!c) return 'day ' + Math.round(day);
  return dayWords(day, c);
}

// The frost against the footing base in words: below it by so much, or above it.
function belowBaseWords(m) {
  if (m == null || !Number.isFinite(m)) return '–';
  return m > 0 ? fmtU('depth', m) + ' below the base' : fmtU('depth', -m) + ' above the base';
}

function renderEdgeReport() {
  const rep = edgeRun.report;
  if (!rep) return;
  const below = rep.max_frost_below_base_m;
  // The core reports −base when no part of the footing's column freezes at all.
  const none = below <= -rep.base_depth_m + 1e-6;
  const out = $('e-below');
  out.textContent = none ? 'No frost at the footing' : belowBaseWords(below);
  out.classList.toggle('bad', below > 0);
  out.classList.toggle('good', !(below > 0));
  $('e-below-sub').textContent = below > 0
    ? 'Frost gets under the footing (deepest on ' + edgeDayWords(rep.max_frost_below_base_day) + '). Frost-susceptible soil there would heave.'
    : none ? 'The ground under the footing does not freeze at any depth this winter (base ' + fmtU('depth', rep.base_depth_m) + ' below grade).'
      : 'Frost stays above the footing base all winter (closest on ' + edgeDayWords(rep.max_frost_below_base_day) + ').';
  // Frost that reached the section's bottom is a lower bound, never a depth.
  $('e-far').textContent = (rep.frost_at_bottom ? 'at least ' : '') + fmtU('depth', rep.far_frost_depth_m);
  $('e-far-sub').textContent = rep.column_frost_depth_m != null
    ? 'A single column of the same soil gives ' + fmtU('depth', rep.column_frost_depth_m) + '.'
    : '';
  const closed = state.scenario.edge && state.scenario.edge.inside.kind === 'closed';
  $('e-heat').textContent = closed ? 'None' : fmtU('linear_heat', rep.mean_slab_heat_w_m);
  // The first days carry the warm-up from the start temperature; the 30 coldest days say
  // what the slab loses in deep winter.
  const cold = (rep.daily || []).slice().sort((a, b) => a.air_c - b.air_c).slice(0, 30);
  const coldMean = cold.length ? cold.reduce((t, d) => t + d.slab_heat_w_m, 0) / cold.length : null;
  $('e-heat-sub').textContent = closed ? 'An unheated building is taken as giving no heat to the ground through its floor.'
    : 'Mean over the run, per length of wall' + (coldMean != null ? '; ' + fmtU('linear_heat', coldMean) + ' over the 30 coldest days.' : '.');
  $('e-solver').textContent = rep.nx + ' × ' + rep.nz + ' cells, ' + rep.steps + ' steps' +
    (rep.iterations != null ? ', ' + rep.iterations + ' passes' : '') +
    '; energy balance closes to ' + Number(rep.energy_imbalance_relative).toExponential(1) + ' of the heat through the boundaries.';
  const hb = $('e-hand').querySelector('tbody');
  clear(hb);
  for (const h of rep.hand_methods || []) {
    hb.append(el('tr', { 'data-method': h.method },
      el('th', { scope: 'row', text: h.name }),
      el('td', { class: 'num', text: h.depth_m != null ? fmtU('depth', h.depth_m) : 'does not apply' }),
      el('td', { text: h.note })));
  }
  $('e-hand').hidden = !hb.firstChild;
  const wl = $('e-warnings');
  clear(wl);
  for (const w of rep.warnings || []) wl.append(el('li', { text: describePath(w.field) + ': ' + w.message }));
  wl.hidden = !wl.firstChild;
  renderEdgeCautions(rep);
  const days = rep.field_days || [];
  const slider = $('e-day');
  const last = days.length ? days[days.length - 1] : 0;
  slider.max = String(Math.max(0, Math.floor(last)));
  if (edge.day == null || edge.day > last) {
    // The day frost is deepest under the footing, or, where it never gets there, the day
    // it is deepest in open ground.
    let day = rep.max_frost_below_base_day;
    if (none && rep.daily && rep.daily.length) day = rep.daily.reduce((b, d) => (d.far_frost_depth_m > b.far_frost_depth_m ? d : b)).day;
    edge.day = nearestFieldDay(day);
  }
  slider.value = String(edge.day);
  $('e-day-out').textContent = edgeDayWords(edge.day);
  $('e-csv').disabled = false;
  $('e-field-csv').disabled = false;
}

// The kept field nearest a day (the map shows kept fields only, every few days).
function nearestFieldDay(day) {
  const days = (edgeRun.report && edgeRun.report.field_days) || [];
  if (!days.length) return 0;
  return days.reduce((b, d) => (Math.abs(d - day) < Math.abs(b - day) ? d : b));
}

// ---------- charts ----------
const edgeChart = (id, draw) => jobChart(id, edgeRun.job, draw);
function drawEdgeField() {
  const job = edgeRun.job;
  if (!job) return;
  edgeChart('e-field-chart', (c, dpr) => job.draw('field', c, edge.day || 0, state.units, dpr));
}
function drawEdge() {
  const job = edgeRun.job;
  if (!job) return;
  drawEdgeField();
  edgeChart('e-series-chart', (c, dpr) => job.draw('series', c, 0, state.units, dpr));
}

// ---------- least insulation ----------
function leastDraft() {
  const e = state.scenario.edge;
  if (!edge.least) {
    if (e && e.least) edge.least = clone(e.least);
    else edge.least = defaultLeast(e);
    edge.leastUntouched = e && e.least ? null : JSON.stringify(edge.least);
  }
  return edge.least;
}

function renderLeastFields() {
  const box = $('e-design-fields');
  clear(box);
  const d = leastDraft();
  const q = edgeQuantity(d.quantity);
  const e = state.scenario.edge;
  const redraw = () => { renderLeastFields(); search.stale(); };
  box.append(field({
    path: 'edge.least.quantity', label: 'Quantity to size', cls: 'wide',
    options: leastQuantities().map((x) => ({ value: x.id, text: x.name + (x.needs && e && !e[x.needs] ? ' (add that board first)' : '') })),
    get: () => d.quantity,
    set: (v) => { const n = edgeQuantity(v); const r = inUnits(n); d.quantity = n.id; d.min = r.min; d.max = r.max; d.resolution = r.resolution; badText.delete(d); },
    after: redraw,
  }));
  box.append(
    numField(d, 'min', 'edge.least.min', 'Least to try', q.quantity, { after: search.stale }),
    numField(d, 'max', 'edge.least.max', 'Most to try', q.quantity, { after: search.stale }),
    numField(d, 'resolution', 'edge.least.resolution', 'Found to within', q.quantity, { after: search.stale }),
  );
}

function renderLeastReport() {
  const r = search.report;
  const ans = $('e-design-answer');
  ans.classList.remove('is-stale');
  const tb = $('e-design-trials').querySelector('tbody');
  clear(tb);
  if (!r) { ans.textContent = ''; $('e-design-trials').hidden = true; return; }
  const q = edgeQuantity(r.quantity);
  const name = q.name.charAt(0).toLowerCase() + q.name.slice(1);
  let text;
  if (r.outcome === 'found' || r.outcome === 'run-limit') {
    const v = r.frost_below_base_m;
    const at = v > 0 || Math.abs(v) < 0.0005 ? 'frost just reaches the base' : 'frost stays ' + fmtU('depth', -v) + ' above the base';
    text = 'The least ' + name + ' that keeps frost at or above the footing base is ' + fmtUpU(q.quantity, r.value) +
      ' (with it, ' + at + ')' + (r.outcome === 'found' ? ', found to within ' + fmtU(q.quantity, r.resolution) + '.' : '; the search ran out of tries before narrowing it to ' + fmtU(q.quantity, r.resolution) + ', so a little less may do.');
    if (r.slope != null && Number.isFinite(r.slope) && r.slope < 0) {
      // In US units the quantity's own round step (6 in of wing, 2 in of depth, R-1), the
      // lift in inches or feet and inches.
      const step = state.units === 'us' && q.us ? q.us.resolution : q.quantity === 'r_value' ? 0.1 : 0.05;
      text += ' Sensitivity: just short of the answer, each ' + fmtU(q.quantity, step) + ' more lifts the frost by ' + aboutU('depth', -r.slope * step) + '.';
    }
    if (r.jump_m != null && r.jump_m > 0.02) {
      text += ' Across the answer the frost line jumps by ' + fmtU('depth', r.jump_m) + ' (the last frozen ground under the footing thaws at once), so the answer is sharp: allow a margin for a colder winter.';
    }
  } else if (r.outcome === 'smallest-suffices') {
    text = 'Even ' + fmtU(q.quantity, r.value) + ' (the least tried) keeps frost above the footing base.';
  } else if (r.outcome === 'not-reachable') {
    text = 'Even the most tried (' + fmtU(q.quantity, r.value) + ') lets frost get ' + belowBaseWords(r.frost_below_base_m) + '. Try a wider range, another board, or a deeper footing.';
  } else {
    text = 'Frost reached deeper with more of this quantity between two tries, so no least value can be named here; look at the table.';
  }
  ans.textContent = text;
  r.trials.forEach((t, i) => {
    const ok = !(t.frost_below_base_m > 0);
    tb.append(el('tr', {},
      el('td', { text: String(i + 1) }),
      el('td', { text: fmtU(q.quantity, t.value) }),
      el('td', { text: belowBaseWords(t.frost_below_base_m) }),
      el('td', { text: ok ? 'yes' : 'no', class: ok ? 'ok' : 'no' })));
  });
  $('e-design-trials').hidden = false;
}

function dropEdgeResult() {
  edgeRun.drop();
  edge.day = null;
  $('e-csv').disabled = true;
  $('e-field-csv').disabled = true;
}

function setUp() {
  $('e-day').addEventListener('input', (ev) => {
    edge.day = nearestFieldDay(Number(ev.target.value));
    $('e-day-out').textContent = edgeDayWords(edge.day);
    drawEdgeField();
  });
  $('e-csv').addEventListener('click', () => { if (edgeRun.job) download(edgeRun.job.csv('daily', state.units, 0), fileStem('edge') + '-daily.csv'); });
  $('e-field-csv').addEventListener('click', () => {
    if (edgeRun.job) download(edgeRun.job.csv('field', state.units, edge.day || 0), fileStem('edge') + '-field-day-' + Math.round(edge.day || 0) + '.csv');
  });
  $('e-design-go').addEventListener('click', search.start);
}

export const edgeSection = section({
  key: 'edge',
  firstField: 'edge.inside.kind',
  byHand: false,
  needsStack: false,
  inView: true,
  fresh: defaultEdge,
  setUp,
  render: renderEdge,
  owners: edgeOwners,
  edited: () => search.edited(),
  run: (blocked) => edgeRun.schedule(blocked),
  showUnits() {
    // A search set up by default and never edited nor run starts again from the round
    // range of the new units.
    const e = state.scenario.edge;
    if (edge.least && JSON.stringify(edge.least) === edge.leastUntouched && e && !e.least) {
      edge.least = null;
      renderLeastFields();
    }
    if (edgeRun.report) { renderEdgeReport(); drawEdge(); }
    // The answer in the new units, as fresh as it was.
    search.show();
  },
  draw: drawEdge,
  drop: dropEdgeResult,
  adopt() {
    dropEdgeResult();
    edge.past = {};
    edge.least = null;
    search.reset();
  },
  // Its inputs name no layer of the stack.
  layersMoved() {},
});
