// The steady stack: the scenario's title and notes, the layer list, the two faces, the
// steady compute, its report (R-value, heat flow, the steady 0 °C plane, surface temperatures,
// the snow regression band, per-layer tables, warnings) and the temperature profile chart.
import { $, el, clear, idFor, jobChart } from './dom.js';
import { core } from './core.js';
import { state, flow, clone, scenarioWithout, layerMap } from './state.js';
import { bad, field, fmt, fmtU, freezeT, headCell, showUnitSymbols } from './fields.js';
import { defaultMaterial, materialFieldsOf } from './materials.js';
import { describePath, generalError, placeMessage } from './messages.js';
import { download, fileStem } from './downloads.js';

const MAX_LAYERS = 64;

// Earlier materials of a layer by kind, so switching kind back restores them.
const pastMaterials = new WeakMap();

// The [owner, path prefix] pairs of the stack's inputs.
export function stackOwners() {
  const s = state.scenario;
  return s.layers.map((L, i) => [L, 'layers[' + i + '].']).concat([[s.top, 'top.'], [s.bottom, 'bottom.']]);
}

export function renderStack() {
  $('f-title').value = state.scenario.title || '';
  $('f-notes').value = state.scenario.notes || '';
  renderLayers();
  renderFaces();
}

// ---------- layer list ----------
function renderLayers(focus) {
  const list = $('layer-list');
  clear(list);
  const layers = state.scenario.layers;
  layers.forEach((layer, i) => list.append(layerRow(layer, i, layers.length)));
  $('add-layer').disabled = layers.length >= MAX_LAYERS;
  if (focus) {
    const b = list.querySelector(focus);
    if (b && !b.disabled) b.focus();
  }
}

function layerRow(layer, i, n) {
  const base = 'layers[' + i + ']';
  const li = el('li', { class: 'layer kind-' + (layer.material && layer.material.kind), 'data-index': i });
  const nameLabel = () => (layer.name && layer.name.trim()) ? layer.name : 'layer ' + (i + 1);
  const relayout = (path) => () => { renderLayers('[data-field="' + path + '"]'); flow.run(); };
  const main = el('div', { class: 'layer-main' });
  main.append(el('span', { class: 'layer-no', 'aria-hidden': 'true', text: String(i + 1) }));
  main.append(field({
    path: base + '.name', label: 'Name', text: true, cls: 'name',
    get: () => layer.name, set: (v) => { layer.name = v; },
  }));
  main.append(field({
    path: base + '.material.kind', label: 'Material',
    options: core.CAT.material_kinds.map((k) => ({ value: k.id, text: k.name })),
    get: () => layer.material.kind,
    set: (v) => changeKind(layer, v),
    after: relayout(base + '.material.kind'),
  }));
  main.append(field({
    path: base + '.thickness_m', label: 'Thickness', q: 'thickness', owner: layer, key: 'thickness_m',
    get: () => layer.thickness_m, set: (v) => { layer.thickness_m = v; },
  }));
  const btns = el('div', { class: 'row-buttons', role: 'group', 'aria-label': 'Arrange layer ' + (i + 1) });
  btns.append(
    el('button', { type: 'button', class: 'icon-btn', 'data-act': 'up', disabled: i === 0, 'aria-label': 'Move layer ' + (i + 1) + ' (' + nameLabel() + ') up', title: 'Move up', onclick: () => moveLayer(i, -1), text: '▲' }),
    el('button', { type: 'button', class: 'icon-btn', 'data-act': 'down', disabled: i === n - 1, 'aria-label': 'Move layer ' + (i + 1) + ' (' + nameLabel() + ') down', title: 'Move down', onclick: () => moveLayer(i, 1), text: '▼' }),
    el('button', { type: 'button', class: 'icon-btn danger', 'data-act': 'remove', disabled: n <= 1, 'aria-label': 'Remove layer ' + (i + 1) + ' (' + nameLabel() + ')', title: 'Remove layer', onclick: () => removeLayer(i), text: '✕' }),
  );
  main.append(btns);
  li.append(main);

  const fields = materialFieldsOf(layer, base + '.', relayout);
  if (fields.length) li.append(el('div', { class: 'layer-material' }, ...fields));
  else li.append(el('div', { class: 'layer-material none', text: 'Properties from the built-in tables.' }));
  return li;
}

function changeKind(layer, kind) {
  let past = pastMaterials.get(layer);
  if (!past) { past = {}; pastMaterials.set(layer, past); }
  past[layer.material.kind] = layer.material;
  const store = bad(layer);
  for (const k of [...store.keys()]) if (k.startsWith('material.')) store.delete(k);
  layer.material = past[kind] || defaultMaterial(kind);
}

function moveLayer(i, d) {
  const L = state.scenario.layers;
  const j = i + d;
  if (j < 0 || j >= L.length) return;
  [L[i], L[j]] = [L[j], L[i]];
  const order = L.map((_, k) => k);
  [order[i], order[j]] = [order[j], order[i]];
  flow.layersMoved(layerMap(L.length, order));
  renderLayers('li[data-index="' + j + '"] [data-act="' + (d < 0 ? 'up' : 'down') + '"]');
  flow.run();
}
function removeLayer(i) {
  const L = state.scenario.layers;
  if (L.length <= 1) return;
  L.splice(i, 1);
  flow.layersMoved(layerMap(L.length + 1, L.map((_, k) => (k < i ? k : k + 1))));
  renderLayers('li[data-index="' + Math.min(i, L.length - 1) + '"] [data-act="remove"]');
  flow.run();
}
function addLayer() {
  const L = state.scenario.layers;
  if (L.length >= MAX_LAYERS) return;
  const last = L[L.length - 1];
  L.push({
    name: 'New layer',
    thickness_m: 0.1,
    material: last ? clone(last.material) : defaultMaterial('snow'),
  });
  flow.layersMoved(layerMap(L.length - 1, L.map((_, k) => (k < L.length - 1 ? k : -1))));
  renderLayers();
  const inputs = $('layer-list').querySelectorAll('li:last-child input[data-field$=".name"]');
  if (inputs[0]) inputs[0].focus();
  flow.run();
}

// ---------- faces ----------
const CUSTOM_AIR = '__air';
const FIXED_SURFACE = '__surface';

function presetList() {
  const list = core.CAT.surface_presets.map((p) => ({ value: p.id, text: p.name, title: p.source, film: p.film_w_m2k }));
  list.push({ value: CUSTOM_AIR, text: 'Air, film coefficient entered below', film: undefined });
  if (!core.CAT.surface_presets.some((p) => p.film_w_m2k == null)) {
    list.push({ value: FIXED_SURFACE, text: 'Fixed surface temperature (no film)', film: null });
  }
  return list;
}
function guessPreset(face) {
  const list = presetList();
  if (face.kind === 'surface') return list.find((p) => p.film === null).value;
  const hit = list.find((p) => typeof p.film === 'number' && Math.abs(p.film - face.film_w_m2k) < 1e-9);
  return hit ? hit.value : CUSTOM_AIR;
}

function renderFaces() {
  renderFace('top', 'Top face', 'the outer or upper side');
  renderFace('bottom', 'Bottom face', 'the inner or deep side');
}
function renderFace(which, title, sub) {
  const box = $('face-' + which);
  clear(box);
  const face = state.scenario[which];
  box.append(el('h3', { text: title }), el('p', { class: 'hint', text: 'Conditions on ' + sub + '.' }));
  const list = presetList();
  box.append(field({
    path: which + '.kind', label: 'Meets', cls: 'wide',
    options: list,
    get: () => state.preset[which],
    set: (v) => {
      state.preset[which] = v;
      const p = list.find((x) => x.value === v);
      if (p.film === null) {
        face.kind = 'surface';
        delete face.film_w_m2k;
        bad(face).delete('film_w_m2k');
      } else {
        face.kind = 'air';
        if (typeof p.film === 'number') { face.film_w_m2k = p.film; bad(face).delete('film_w_m2k'); }
        else if (typeof face.film_w_m2k !== 'number') face.film_w_m2k = 10;
      }
    },
    after: () => { renderFace(which, title, sub); $(idFor(which + '.kind')).focus(); flow.run(); },
  }));
  box.append(field({
    path: which + '.temperature_c', label: face.kind === 'air' ? 'Air temperature' : 'Surface temperature',
    q: 'temperature', owner: face, key: 'temperature_c',
    get: () => face.temperature_c, set: (v) => { face.temperature_c = v; },
  }));
  if (face.kind === 'air') {
    box.append(field({
      path: which + '.film_w_m2k', label: 'Surface film coefficient', q: 'film', owner: face, key: 'film_w_m2k',
      hint: 'h; its resistance is 1/h',
      get: () => face.film_w_m2k,
      set: (v) => { face.film_w_m2k = v; },
      after: () => {
        const sel = $(idFor(which + '.kind'));
        const g = bad(face).has('film_w_m2k') ? CUSTOM_AIR : guessPreset(face);
        state.preset[which] = g;
        sel.value = g;
      },
    }));
  }
}

// Another scenario opened: the faces' presets are guessed from it; no result yet.
export function adoptStack(scenario) {
  state.preset.top = guessPreset(scenario.top);
  state.preset.bottom = guessPreset(scenario.bottom);
  state.lastGood = null;
}

// ---------- compute ----------
export function stackStale(stale) {
  $('results').classList.toggle('is-stale', stale);
  $('results').dataset.stale = stale ? 'true' : 'false';
  $('stale-note').hidden = !stale || !state.lastGood;
  $('profile-chart').classList.toggle('is-stale', stale);
}

// Hands the scenario, once every typed number parses, to the core's edited scenario,
// which reads it once for the stack and every section's job, and solves the stack. Returns
// the stack's outcome ({ok, report} or {ok: false, errors}), or {failed} when the core
// failed unexpectedly.
export function setScenario() {
  try {
    return core.doc.set(state.scenario);
  } catch (err) {
    console.error(err);
    return { failed: err };
  }
}

// The steady compute of the stack, from the outcome setScenario() gave. Returns true when
// it gave a result, false when the core refused the inputs (their errors are placed), null
// when it failed unexpectedly.
export function computeStack(res) {
  if (res && res.failed) {
    const err = res.failed;
    generalError('The calculation failed unexpectedly: ' + String(err && err.message || err));
    stackStale(true);
    return null;
  }
  // The stack reads neither the shelter, nor the edge, nor the ranges study.
  const stackOnly = scenarioWithout('shelter', 'edge', 'ranges');
  if (!res || !res.ok) {
    const errors = (res && res.errors) || [];
    for (const e of errors) {
      if (!placeMessage(e.field, e.message, 'error', e)) generalError(describePath(e.field) + ': ' + e.message);
    }
    if (!errors.length) generalError('The inputs could not be used.');
    stackStale(true);
    return false;
  }
  state.lastGood = { scenario: clone(stackOnly), report: res.report };
  stackStale(false);
  renderStackReport();
  drawStack();
  return true;
}

// The last result again, in the units now chosen.
export function showStackUnits() {
  if (state.lastGood) { renderStackReport(); drawStack(); }
}

// ---------- report ----------
function renderStackReport() {
  if (!state.lastGood) return;
  const rep = state.lastGood.report;
  const scen = state.lastGood.scenario;
  showUnitSymbols();
  $('r-total').textContent = fmt('r_value', rep.r_total_m2k_w);
  $('r-layers').textContent = fmt('r_value', rep.r_layers_m2k_w);
  $('u-value').textContent = fmt('u_value', rep.u_w_m2k);
  const q = rep.heat_flux_w_m2;
  $('heat-flux').textContent = fmt('heat_flux', Math.abs(q));
  const shownZero = fmt('heat_flux', Math.abs(q)).replace(/[0.\u2212]/g, '') === '';
  $('heat-direction').textContent = shownZero ? 'No heat flow: both sides are at the same temperature.'
    : q > 0 ? 'Heat flows from the top face down to the bottom face.'
      : 'Heat flows from the bottom face up to the top face.';

  // 0 °C planes of the steady state (shown small: a frost depth needs a winter, which the
  // headline card above them gives)
  const zp = rep.zero_planes || [];
  const zd = $('zero-depth');
  const zdet = $('zero-detail');
  if (!zp.length) {
    zd.textContent = 'No ' + freezeT() + ' plane in the stack';
    const temps = [rep.top.surface_c, rep.bottom.surface_c];
    zdet.textContent = temps.every((t) => t < 0) ? 'Every layer is below ' + freezeT() + '.'
      : temps.every((t) => t > 0) ? 'Every layer is above ' + freezeT() + '.' : '';
  } else {
    zd.textContent = zp.map((z) => fmtU('depth', z.depth_m)).join(', ');
    zdet.textContent = zp.map((z) => {
      const L = rep.layers[z.layer];
      return 'In layer ' + (z.layer + 1) + (L ? ' (' + L.name + ')' : '') + '; frozen ' + (z.frozen_side === 'above' ? 'above' : 'below') + ' it.';
    }).join(' ');
  }

  // surface temperatures
  const st = $('surface-temps');
  clear(st);
  for (const [which, label] of [['top', 'Top face'], ['bottom', 'Bottom face']]) {
    const f = rep[which];
    st.append(el('dt', { text: label }));
    const parts = ['surface ' + fmtU('temperature', f.surface_c)];
    if (f.air_c != null) parts.push('air ' + fmtU('temperature', f.air_c));
    if (f.film_r_m2k_w) parts.push('film R ' + fmtU('r_value', f.film_r_m2k_w));
    st.append(el('dd', { id: 'surface-' + which, text: parts.join(' · ') }));
  }

  renderBand(rep, scen);
  renderLayerTables(rep);

  // warnings
  const wl = $('warnings');
  clear(wl);
  const warnings = rep.warnings || [];
  for (const w of warnings) {
    wl.append(el('li', { text: describePath(w.field) + ': ' + w.message }));
    placeMessage(w.field, w.message, 'warning');
  }
  $('warnings-block').hidden = !warnings.length;
}

function renderBand(rep, scen) {
  const block = $('band-block');
  const band = rep.band;
  if (!band) { block.hidden = true; return; }
  block.hidden = false;
  const n = band.by_correlation.length;
  const fluxes = [Math.abs(band.flux_min_w_m2), Math.abs(band.flux_max_w_m2)].sort((a, b) => a - b);
  let text = 'R ranges from ' + fmt('r_value', band.r_min_m2k_w) + ' to ' + fmtU('r_value', band.r_max_m2k_w) +
    ' across ' + n + ' published snow conductivity regressions; heat flux from ' + fmt('heat_flux', fluxes[0]) + ' to ' + fmtU('heat_flux', fluxes[1]) + '.';
  if (band.zero_depth_min_m != null && band.zero_depth_max_m != null) {
    text += ' The ' + freezeT() + ' plane lies between ' + fmt('depth', band.zero_depth_min_m) + ' and ' + fmtU('depth', band.zero_depth_max_m) + ' deep.';
  }
  $('band-summary').textContent = text;
  const skipped = Array.isArray(band.skipped) ? band.skipped : [];
  const sk = $('band-skipped');
  sk.textContent = skipped.length ? 'Left out here: ' + skipped.map((x) => {
    if (typeof x === 'string') return x;
    // Each is { field: regression id, message }.
    const id = x.id || x.field || '';
    const c = core.CAT.snow_correlations.find((k) => k.id === id);
    const name = x.name || (c ? c.name : id);
    const why = x.reason || x.message || '';
    return why ? name + ' (' + why + ')' : name;
  }).join('; ') + '.' : '';
  sk.hidden = !skipped.length;
  const used = new Set(scen.layers.filter((l) => l.material && l.material.kind === 'snow').map((l) => l.material.correlation));
  const table = $('band-table');
  const thead = table.tHead; clear(thead);
  thead.append(el('tr', null,
    headCell('Regression', null), headCell('R, air to air', 'r_value'),
    headCell('Heat flux', 'heat_flux'), headCell(freezeT() + ' plane', 'depth')));
  const tbody = table.tBodies[0]; clear(tbody);
  for (const c of band.by_correlation) {
    const inUse = used.has(c.id);
    tbody.append(el('tr', { class: inUse ? 'in-use' : null },
      el('th', { scope: 'row' }, c.name, inUse ? el('span', { class: 'tag', text: 'in use' }) : null),
      el('td', { class: 'num', text: fmt('r_value', c.r_total_m2k_w) }),
      el('td', { class: 'num', text: fmt('heat_flux', Math.abs(c.heat_flux_w_m2)) }),
      el('td', { class: 'num', text: c.zero_planes_m && c.zero_planes_m.length ? c.zero_planes_m.map((d) => fmt('depth', d)).join(', ') : 'none' })));
  }
}

function renderLayerTables(rep) {
  const cols = [
    ['#', null], ['Layer', null], ['Material', null],
    ['Thickness', 'thickness'], ['Depth, top to bottom', 'depth'], ['R', 'r_value'],
    ['Temperature at top', 'temperature'], ['Temperature at bottom', 'temperature'],
    ['Effective k', 'conductivity'], ['State', null],
  ];
  const t = $('layer-results');
  const head = t.tHead; clear(head);
  head.append(el('tr', null, ...cols.map(([h, q]) => headCell(h, q))));
  const body = t.tBodies[0]; clear(body);
  rep.layers.forEach((L, i) => {
    body.append(el('tr', null,
      el('td', { text: String(i + 1) }),
      el('th', { scope: 'row', class: 'layer-name', text: L.name }),
      el('td', { text: L.material }),
      el('td', { class: 'num', text: fmt('thickness', L.thickness_m) }),
      el('td', { class: 'num', text: fmt('depth', L.top_depth_m) + ' – ' + fmt('depth', L.bottom_depth_m) }),
      el('td', { class: 'num', text: fmt('r_value', L.r_m2k_w) }),
      el('td', { class: 'num', text: fmt('temperature', L.top_c) }),
      el('td', { class: 'num', text: fmt('temperature', L.bottom_c) }),
      el('td', { class: 'num', text: fmt('conductivity', L.conductivity_w_m_k) }),
      el('td', null, el('span', { class: 'state state-' + String(L.state).replace(/\s+/g, '-'), text: L.state }))));
  });

  const pcols = [
    ['#', null], ['Layer', null], ['k frozen', 'conductivity'], ['k unfrozen', 'conductivity'],
    ['Density', 'density'], ['Heat capacity, frozen', 'heat_capacity_vol'], ['Heat capacity, unfrozen', 'heat_capacity_vol'], ['Latent heat', 'latent_vol'],
  ];
  const p = $('layer-props');
  clear(p.tHead);
  p.tHead.append(el('tr', null, ...pcols.map(([h, q]) => headCell(h, q))));
  clear(p.tBodies[0]);
  rep.layers.forEach((L, i) => {
    const pr = L.properties || {};
    p.tBodies[0].append(el('tr', null,
      el('td', { text: String(i + 1) }),
      el('th', { scope: 'row', class: 'layer-name', text: L.name }),
      el('td', { class: 'num', text: fmt('conductivity', pr.k_frozen_w_m_k) }),
      el('td', { class: 'num', text: fmt('conductivity', pr.k_unfrozen_w_m_k) }),
      el('td', { class: 'num', text: fmt('density', pr.density_kg_m3) }),
      el('td', { class: 'num', text: fmt('heat_capacity_vol', pr.c_frozen_j_m3k) }),
      el('td', { class: 'num', text: fmt('heat_capacity_vol', pr.c_unfrozen_j_m3k) }),
      el('td', { class: 'num', text: fmt('latent_vol', pr.latent_j_m3) })));
  });
}

// ---------- chart ----------
// The profile of the last scenario that computed (kept, marked out of date, while the
// inputs do not compute).
export function drawStack() {
  jobChart('profile-chart', state.lastGood, (c, dpr) => core.doc.draw_profile(c, state.units, dpr));
}

export function setUpStack() {
  $('f-title').addEventListener('input', (e) => { state.scenario.title = e.target.value; flow.schedule(); });
  $('f-notes').addEventListener('input', (e) => { state.scenario.notes = e.target.value; flow.schedule(); });
  $('add-layer').addEventListener('click', addLayer);
  $('profile-csv').addEventListener('click', () => {
    // The last stack that computed (what the chart shows).
    if (state.lastGood) download(core.doc.profile_csv(state.units), fileStem('scenario') + '-profile.csv');
  });
}
