// The shelter section (#shelter): scenario.shelter (SI, as the core reads it), its inputs
// and its results. The whole computation (steady balance, band, night, least wall, series)
// takes well under 100 ms, so it runs in one go inside the debounced recompute, on the
// scenario without its winter (an error in one never blocks the other); the newest input
// always wins because each run replaces the last.
import { $, el, clear, focusField, jobChart } from './dom.js';
import { core, coreDefault } from './core.js';
import { state, flow } from './state.js';
import { field, numField, fmt, fmtU, fmtNum, fmtInput, freezeT, toDisplay, unit, headCell, switchPart, showUnitSymbols, fieldGrid, fillBox } from './fields.js';
import { describePath, listErrors, placeMessage } from './messages.js';
import { download, fileStem } from './downloads.js';
import { section } from './section.js';

// ---------- a new shelter and its parts (the core's defaults) ----------
const defaultExposedFace = () => coreDefault('exposed_face');
const defaultShape = (kind) => coreDefault('shapes', kind) || coreDefault('shapes', 'block-dome');
const defaultFloor = (kind) => coreDefault('floors', kind === 'ground' ? kind : 'snow');
const defaultEntrance = (kind) => coreDefault('entrances', kind === 'level' ? kind : 'cold-trap');
// What is asked of the night and the least wall, given to a shelter that has neither.
const defaultAsk = {
  night: () => ({ duration_h: 12 }),
  design: () => ({ target_c: -5 }),
};
// A dome for two on a calm −15 °C night.
const defaultShelter = () => coreDefault('shelter');

const shelter = {
  job: null, // the shelter job drawn from, or null
  report: null,
  past: {}, // earlier sub-sections by kind, so switching back restores them
  ms: 0,
};

function shelterOwners() {
  const s = state.scenario.shelter;
  if (!s) return [];
  const out = [[s, 'shelter.'], [s.shape, 'shelter.shape.'], [s.floor, 'shelter.floor.'], [s.entrance, 'shelter.entrance.'], [s.conditions, 'shelter.conditions.']];
  if (s.shape.exposed_face) out.push([s.shape.exposed_face, 'shelter.shape.exposed_face.']);
  if (s.night) out.push([s.night, 'shelter.night.']);
  if (s.design) out.push([s.design, 'shelter.design.']);
  return out;
}

// ---------- inputs ----------
function renderShelter() {
  const s = state.scenario.shelter;
  $('shelter-off').hidden = !!s;
  $('shelter-on').hidden = !s;
  if (!s) return;
  if (!s.night) s.night = defaultAsk.night();
  if (!s.design) s.design = defaultAsk.design();
  const rerender = (focus) => () => { renderShelter(); focusField(focus); flow.run(); };
  const sh = s.shape;
  const P = 'shelter.shape.';

  const shapeFields = [field({
    path: P + 'kind', label: 'Shape', cls: 'wide',
    options: (core.CAT.shelter_shapes || []).map((x) => ({ value: x.id, text: x.name })),
    get: () => sh.kind,
    set: (v) => switchPart(s, 'shape', shelter.past, v, defaultShape),
    after: rerender(P + 'kind'),
  })];
  const radiusLabel = sh.kind === 'drift-cave' ? 'Chamber radius (half its width)' : 'Inner radius (half the width inside)';
  if (sh.kind !== 'trench') shapeFields.push(numField(sh, 'inner_radius_m', P + 'inner_radius_m', radiusLabel, 'length'));
  if (sh.kind === 'block-dome') shapeFields.push(numField(sh, 'wall_thickness_m', P + 'wall_thickness_m', 'Wall thickness', 'thickness'));
  if (sh.kind === 'hollowed-pile') {
    shapeFields.push(
      numField(sh, 'crown_thickness_m', P + 'crown_thickness_m', 'Roof thickness at the top', 'thickness'),
      numField(sh, 'base_thickness_m', P + 'base_thickness_m', 'Wall thickness at the base', 'thickness'));
  }
  if (sh.kind === 'trench') {
    shapeFields.push(
      numField(sh, 'length_m', P + 'length_m', 'Length', 'length'),
      numField(sh, 'width_m', P + 'width_m', 'Width', 'length'),
      numField(sh, 'depth_m', P + 'depth_m', 'Depth below the roof', 'length'),
      numField(sh, 'roof_thickness_m', P + 'roof_thickness_m', 'Roof thickness', 'thickness'));
  }
  const shapeBox = [fieldGrid(...shapeFields)];
  if (sh.kind === 'drift-cave') {
    const on = !!sh.exposed_face;
    const check = el('input', { type: 'checkbox', id: 's-face-on', 'data-field': P + 'exposed_face', checked: on });
    check.addEventListener('change', () => {
      if (check.checked) sh.exposed_face = shelter.past.face || defaultExposedFace();
      else { shelter.past.face = sh.exposed_face; delete sh.exposed_face; }
      rerender(P + 'exposed_face')();
    });
    shapeBox.push(el('label', { class: 'check', for: 's-face-on' }, check, ' One side faces the outside air through a thinner wall'));
    if (on) {
      const f = sh.exposed_face;
      shapeBox.push(fieldGrid(
        numField(f, 'share', P + 'exposed_face.share', 'Share of the chamber wall facing out', 'fraction', { hint: '0 to 1' }),
        numField(f, 'thickness_m', P + 'exposed_face.thickness_m', 'Snow between it and the air', 'thickness')));
    }
  }
  fillBox('s-shape', ...shapeBox);

  fillBox('s-snow', fieldGrid(
    numField(s, 'snow_density_kg_m3', 'shelter.snow_density_kg_m3', 'Snow density', 'density'),
    field({
      path: 'shelter.snow_correlation', label: 'Snow conductivity from', cls: 'wide',
      options: core.CAT.snow_correlations.map((x) => ({ value: x.id, text: x.name, title: x.citation + ' (fitted to ' + fmt('density', x.range_kg_m3[0]) + '–' + fmtU('density', x.range_kg_m3[1]) + ')' })),
      get: () => s.snow_correlation, set: (v) => { s.snow_correlation = v; },
    })));

  const openings = [field({
    path: 'shelter.floor.kind', label: 'Floor', cls: 'wide',
    options: [{ value: 'snow', text: 'Snow, over the snowpack' }, { value: 'ground', text: 'Bare ground or rock' }],
    get: () => s.floor.kind,
    set: (v) => switchPart(s, 'floor', shelter.past, v, defaultFloor),
    after: rerender('shelter.floor.kind'),
  })];
  if (s.floor.kind === 'ground') {
    openings.push(
      numField(s.floor, 'conductivity_w_m_k', 'shelter.floor.conductivity_w_m_k', 'Ground conductivity', 'conductivity'),
      numField(s.floor, 'heat_capacity_j_m3_k', 'shelter.floor.heat_capacity_j_m3_k', 'Ground heat capacity', 'heat_capacity_vol'),
      numField(s.floor, 'temperature_c', 'shelter.floor.temperature_c', 'Ground temperature', 'temperature'));
  }
  openings.push(numField(s, 'floor_cover_m2k_per_w', 'shelter.floor_cover_m2k_per_w', 'Mats on the floor (R, averaged over the floor)', 'r_value', { cls: 'span2', hint: '0: bare floor' }));
  openings.push(field({
    path: 'shelter.entrance.kind', label: 'Entrance', cls: 'wide',
    options: [{ value: 'cold-trap', text: 'Dips below the floor (cold air stays in it)' }, { value: 'level', text: 'Level with the floor' }],
    get: () => s.entrance.kind,
    set: (v) => switchPart(s, 'entrance', shelter.past, v, defaultEntrance),
    after: rerender('shelter.entrance.kind'),
  }));
  if (s.entrance.kind === 'level') {
    openings.push(
      numField(s.entrance, 'opening_width_m', 'shelter.entrance.opening_width_m', 'Opening left open, width', 'thickness'),
      numField(s.entrance, 'opening_height_m', 'shelter.entrance.opening_height_m', 'Opening left open, height', 'thickness'));
  }
  openings.push(
    numField(s, 'vent_diameter_m', 'shelter.vent_diameter_m', 'Vent hole diameter', 'thickness', { hint: 'keep it open' }),
    numField(s, 'lining_m2k_per_w', 'shelter.lining_m2k_per_w', 'A lining to compare (R)', 'r_value', { cls: 'span2', hint: 'fabric hung in front of the walls; 0: none' }),
    numField(s, 'inside_film_w_m2k', 'shelter.inside_film_w_m2k', 'Inside surface film', 'film', { cls: 'span2', hint: 'about ' + fmt('film', 6) + '–' + fmtU('film', 8) }));
  fillBox('s-openings', fieldGrid(...openings));

  const c = s.conditions;
  const C = 'shelter.conditions.';
  fillBox('s-inside', fieldGrid(
    numField(c, 'people', C + 'people', 'People inside', 'count'),
    field({
      path: C + 'activity', label: 'Doing', cls: 'span2',
      options: (core.CAT.activities || []).map((a) => ({ value: a.id, text: a.name + ' (' + a.met + ' met)', title: a.source })),
      get: () => c.activity, set: (v) => { c.activity = v; },
    }),
    numField(c, 'body_area_m2', C + 'body_area_m2', 'Body surface of one person', 'area', { hint: 'about ' + fmtU('area', 1.8) + ' for an adult' }),
    numField(c, 'candles', C + 'candles', 'Candles burning', 'count'),
    numField(c, 'stove_w', C + 'stove_w', 'Stove burning (fuel power)', 'power', { hint: '0: none' }),
    numField(c, 'stove_heat_share', C + 'stove_heat_share', 'Share of the stove heating the air', 'fraction', { hint: 'the rest goes into the pot' })));

  fillBox('s-weather', fieldGrid(
    numField(c, 'outside_c', C + 'outside_c', 'Outside air', 'temperature'),
    numField(c, 'wind_m_s', C + 'wind_m_s', 'Wind', 'speed'),
    numField(c, 'snowpack_c', C + 'snowpack_c', 'Deep snowpack', 'temperature')));

  fillBox('s-ask', fieldGrid(
    numField(s.design, 'target_c', 'shelter.design.target_c', 'Air inside wanted', 'temperature', { hint: 'for the least wall' }),
    numField(s.night, 'duration_h', 'shelter.night.duration_h', 'Length of the night', 'time_h'),
    numField(s.night, 'snow_start_c', 'shelter.night.snow_start_c', 'Snow at the start', 'temperature', {
      optional: true, placeholder: () => fmtInput('temperature', sh.kind === 'block-dome' || sh.kind === 'hollowed-pile' ? Math.min(0, c.outside_c) : c.snowpack_c),
      hint: 'blank: the outside air for a dome or pile, the snowpack for a cave or trench',
    }),
    numField(s.night, 'air_start_c', 'shelter.night.air_start_c', 'Air inside at the start', 'temperature', {
      optional: true, placeholder: () => fmtInput('temperature', c.outside_c), hint: 'blank: the outside air',
    })));
  showUnitSymbols($('shelter'));
}


// The cautions of snow shelters, from the catalogue: always shown while the section is open.
function renderCautions() {
  const ul = $('s-caution-list');
  clear(ul);
  for (const c of core.CAT.cautions || []) {
    ul.append(el('li', { 'data-caution': c.id }, c.text, ' ', el('span', { class: 'src', text: '(' + c.source + ')' })));
  }
}

// ---------- the run ----------
function shelterStale(stale, why) {
  const res = $('shelter-results');
  res.classList.toggle('is-stale', stale);
  res.dataset.state = stale ? 'stale' : 'done';
  res.dataset.outcomes = String(Number(res.dataset.outcomes || 0) + 1);
  if (stale && why) { const l = $('s-errors'); l.append(el('li', { text: why })); l.hidden = false; }
}

function dropShelterResult() {
  if (shelter.job) { shelter.job.free(); shelter.job = null; }
  shelter.report = null;
  $('s-night-csv').disabled = true;
  $('s-sweeps-csv').disabled = true;
}

// Computes the shelter of the current scenario (its part of the recompute). `#shelter-results`
// carries data-state (idle, done, stale), data-outcomes and data-ms for the tests.
function runShelter(blocked) {
  const res = $('shelter-results');
  const list = $('s-errors');
  clear(list); list.hidden = true;
  if (!state.scenario.shelter) { res.dataset.state = 'idle'; dropShelterResult(); return; }
  if (blocked) { shelterStale(true, 'Out of date: fix the marked inputs.'); return; }
  let job;
  const t0 = performance.now();
  try {
    job = core.doc.start('shelter');
  } catch (err) {
    console.error(err);
    shelterStale(true, 'The shelter could not be computed: ' + String(err && err.message || err));
    return;
  }
  shelter.ms = performance.now() - t0;
  res.dataset.ms = String(Math.round(shelter.ms));
  const errs = job.errors();
  if (errs.length) {
    job.free();
    listErrors(list, errs, describePath);
    shelterStale(true, list.firstChild ? null : 'Out of date: fix the marked inputs.');
    return;
  }
  dropShelterResult();
  shelter.job = job;
  shelter.report = job.report();
  shelterStale(false);
  renderShelterReport();
  drawShelter();
}

// ---------- report ----------
function hoursText(s) {
  if (s == null || !Number.isFinite(s)) return '–';
  const h = s / 3600;
  return h < 1 ? Math.round(h * 60) + '\u00a0min' : fmtNum(h, 1) + '\u00a0h';
}

function renderShelterReport() {
  const r = shelter.report;
  if (!r) return;
  const scen = state.scenario.shelter;
  $('s-interior').textContent = fmt('temperature', r.interior_c);
  const rise = r.interior_c - r.outside_c;
  const endOfNight = r.night.samples.length ? r.night.samples[r.night.samples.length - 1].interior_c : null;
  $('s-interior-sub').textContent = fmtU('temperature', endOfNight) + ' at the end of the first ' + hoursText(r.night.duration_s) + '; in the steady state ' +
    fmtU('temperature_difference', rise) + ' warmer than the ' + fmtU('temperature', r.outside_c) + ' outside.';
  const surf = $('s-surface');
  surf.classList.toggle('melting', r.surface_state === 'melting');
  surf.classList.toggle('frozen', r.surface_state !== 'melting');
  surf.dataset.state = r.surface_state;
  if (r.surface_state === 'melting') {
    surf.textContent = 'At ' + freezeT() + ' and melting';
    $('s-surface-sub').textContent = 'About ' + fmtU('mass_rate', r.melt_kg_per_h) + ' of snow melts: the surface will drip and glaze to ice. Less heat inside keeps it frozen.';
  } else {
    surf.textContent = 'Frozen';
    $('s-surface-sub').textContent = 'Warmest ' + fmtU('temperature', r.warmest_surface_c) + '. It would start to melt with the air above ' + fmtU('temperature', r.melt_free_limit_c) + '.';
  }
  const flow = r.vent_flow_m3_s + r.door_flow_m3_s;
  $('s-co2').textContent = r.co2_ppm == null ? 'rising' : fmtNum(r.co2_ppm, 0);
  $('s-co2-sub').textContent = (r.co2_ppm == null ? 'No air is exchanged, so CO₂ keeps rising: open a vent. '
    : r.co2_ppm > r.co2_limit_ppm ? 'Above the ' + r.co2_limit_ppm + ' ppm workplace limit: open the vent wider. ' : '') +
    'Vent and doorway exchange ' + fmtU('air_flow', flow) + ' of air.';
  $('s-co2').classList.toggle('melting', r.co2_ppm == null || r.co2_ppm > r.co2_limit_ppm);

  // least wall, worded in the units shown
  const lw = r.least_wall;
  const thicknessName = r.sweeps[0] ? r.sweeps[0].x_label : 'wall';
  const least = $('s-least');
  least.dataset.answer = lw.answer;
  const strength = ' Build walls and roof at least about ' + fmtNum(Math.round(toDisplay('thickness', 0.3)), 0) + '\u00a0' + unit('thickness').symbol + ' thick all the same, for strength.';
  switch (lw.answer) {
    case 'reached':
      least.textContent = fmtU('thickness', Math.ceil(lw.thickness_m * 100) / 100);
      $('s-least-sub').textContent = 'The ' + thicknessName + ' that keeps the air at ' + fmtU('temperature', lw.target_c) + '.' + (lw.thickness_m < 0.3 ? strength : '');
      break;
    case 'thinnest-suffices':
      least.textContent = 'Any';
      $('s-least-sub').textContent = 'Even ' + fmtU('thickness', lw.thickness_m) + ' keeps the air at ' + fmtU('temperature', lw.interior_c) + ', above the ' + fmtU('temperature', lw.target_c) + ' wanted.' + strength;
      break;
    case 'not-reachable':
      least.textContent = 'Not reachable';
      $('s-least-sub').textContent = lw.reason === 'melt-limit'
        ? 'The inner snow surface reaches ' + freezeT() + ' first and melts, so the air stays near ' + fmtU('temperature', lw.interior_c) + ' however thick the wall. A lining in front of the snow would let it get warmer.'
        : 'Even behind the thickest wall the air stays at ' + fmtU('temperature', lw.interior_c) + ': the vent, doorway and floor take most of the heat. More people, a smaller chamber, a dipping entrance or mats on the floor help more than more snow.';
      break;
    default:
      least.textContent = 'No wall to choose';
      $('s-least-sub').textContent = 'This cave has no side facing the outside air: the snowpack around it is all the wall.';
  }
  const lin = $('s-lining');
  if (r.with_lining) {
    lin.hidden = false;
    lin.textContent = 'With a lining of R\u00a0' + fmtU('r_value', r.with_lining.lining_m2k_per_w) + ' hung in front of the walls, the air could reach ' + fmtU('temperature', r.with_lining.interior_c) +
      (r.with_lining.melt_kg_per_h > 0 ? ', with ' + fmtU('mass_rate', r.with_lining.melt_kg_per_h) + ' still melting.' : ' with the snow behind it frozen.');
  } else lin.hidden = true;

  // the main wall laid flat, at the shelter's own outside air
  const fw = r.flat_wall;
  $('s-flat-wall').hidden = !fw;
  if (fw) {
    $('s-flat-what').textContent = fmtU('thickness', fw.thickness_m) + ' of snow between the ' + fmtU('temperature', fw.outside_c) + ' outside air and the ' + fmtU('temperature', fw.inside_c) + ' air inside:';
    $('s-flat-r').textContent = fmtU('r_value', fw.r_m2k_w);
    $('s-flat-q').textContent = fmtU('heat_flux', fw.heat_flux_w_m2);
  }

  // losses
  const lt = $('s-losses');
  clear(lt.tHead); clear(lt.tBodies[0]);
  lt.tHead.append(el('tr', null, headCell('Path', null), headCell('Heat', 'power'), headCell('Share', null)));
  for (const l of r.losses) {
    if (l.id === 'doorway' && scen && scen.entrance.kind !== 'level') continue;
    lt.tBodies[0].append(el('tr', { 'data-path': l.id },
      el('th', { scope: 'row', text: l.name.charAt(0).toUpperCase() + l.name.slice(1) }),
      el('td', { class: 'num', text: fmt('power', l.heat_w) }),
      el('td', { class: 'num' }, el('span', { class: 'share-bar', style: 'width:' + Math.max(0, Math.min(100, l.share * 100)).toFixed(0) + 'px' }), fmtNum(l.share * 100, 0) + '\u00a0%')));
  }
  const parts = [['people', r.people_w], ['candles', r.candles_w], ['stove', r.stove_w]].filter((x) => x[1] > 0).map((x) => x[0] + ' ' + fmtU('power', x[1]));
  $('s-gains').textContent = 'Heat given off inside: ' + fmtU('power', r.gains_w) + (parts.length ? ' (' + parts.join(', ') + ')' : '') + '.';

  const st = $('s-surfaces');
  clear(st.tHead); clear(st.tBodies[0]);
  st.tHead.append(el('tr', null, headCell('Surface', null), headCell('Area', 'area'), headCell('Temperature', 'temperature'), headCell('State', null)));
  for (const z of r.surfaces) {
    st.tBodies[0].append(el('tr', null,
      el('th', { scope: 'row', text: z.name }),
      el('td', { class: 'num', text: fmt('area', z.area_m2) }),
      el('td', { class: 'num', text: fmt('temperature', z.surface_c) }),
      el('td', null, el('span', { class: 'state ' + (z.melting ? 'state-unfrozen' : 'state-frozen'), text: z.melting ? 'melting' : 'frozen' }))));
  }

  const b = r.band;
  const nameOf = (id) => { const x = core.CAT.snow_correlations.find((k) => k.id === id); return x ? x.name : id; };
  $('s-band').textContent = 'Across the ' + b.by_correlation.length + ' published snow conductivity regressions the air inside lies between ' + fmt('temperature', b.coldest_c) + ' and ' + fmtU('temperature', b.warmest_c) +
    ' (coldest with ' + nameOf(b.coldest_id) + ', warmest with ' + nameOf(b.warmest_id) + '): snow conducts heat about twice as well in some measurements as in others.' +
    (scen && scen.snow_correlation === b.warmest_id && b.warmest_c - b.coldest_c > 0.05 ? ' The regression in use gives the warmest answer of them all: plan for the colder end.'
      : scen && scen.snow_correlation === b.coldest_id && b.warmest_c - b.coldest_c > 0.05 ? ' The regression in use gives the coldest answer of them all.' : '');
  const bt = $('s-band-table');
  clear(bt.tHead); clear(bt.tBodies[0]);
  bt.tHead.append(el('tr', null, headCell('Regression', null), headCell('Snow conductivity', 'conductivity'), headCell('Air inside', 'temperature'), headCell('Melting', 'mass_rate')));
  for (const e of b.by_correlation) {
    const inUse = scen && e.id === scen.snow_correlation;
    bt.tBodies[0].append(el('tr', { class: inUse ? 'in-use' : null },
      el('th', { scope: 'row' }, e.name, inUse ? el('span', { class: 'tag', text: 'in use' }) : null, e.in_range ? null : el('span', { class: 'tag', text: 'outside its density range' })),
      el('td', { class: 'num', text: fmt('conductivity', e.conductivity_w_m_k) }),
      el('td', { class: 'num', text: fmt('temperature', e.interior_c) }),
      el('td', { class: 'num', text: fmt('mass_rate', e.melt_kg_per_h) })));
  }

  const n = r.night;
  const lastN = n.samples[n.samples.length - 1];
  let nt = 'With the snow starting at ' + fmtU('temperature', n.snow_start_c) + ' and the air at ' + fmtU('temperature', n.air_start_c) + ': after ' + hoursText(n.duration_s) + ' the air inside is at ' + fmtU('temperature', lastN ? lastN.interior_c : null) + ', on its way to ' + fmtU('temperature', n.steady_interior_c) + '. ';
  nt += n.warmup_time_s != null ? 'It covers 90 % of that rise in ' + hoursText(n.warmup_time_s) + '. '
    : 'It does not get within 90 % of that rise during the night: the walls take days to warm through. ';
  nt += n.target_time_s != null ? 'It reaches the ' + fmtU('temperature', lw.target_c) + ' wanted after ' + hoursText(n.target_time_s) + '.'
    : 'It does not reach the ' + fmtU('temperature', lw.target_c) + ' wanted during the night.';
  if (n.melted_kg >= 0.005) nt += ' About ' + fmtU('mass', n.melted_kg) + ' of snow melts over the night.';
  $('s-night').textContent = nt;

  const wl = $('s-warnings');
  clear(wl);
  for (const w of r.warnings || []) {
    const text = shelterWarning(w);
    wl.append(el('li', { text: (w.field === 'shelter' ? 'Shelter' : describePath(w.field)) + ': ' + text }));
    placeMessage(w.field, text, 'warning');
  }
  wl.hidden = !wl.firstChild;
  $('s-night-csv').disabled = false;
  $('s-sweeps-csv').disabled = false;
}

// The warnings whose numbers the core gives in SI, worded in the units shown.
function shelterWarning(w) {
  const sc = state.scenario.shelter;
  switch (w.kind) {
    case 'melting':
      return 'the inner snow surface would pass ' + freezeT() + ': it is held there and about ' + fmtU('mass_rate', w.value) + ' of snow melts; the surface will drip and glaze with ice';
    case 'thin_wall':
      return fmtU('thickness', w.value) + ' is thinner than about ' + fmtNum(Math.round(toDisplay('thickness', w.max)), 0) + '\u00a0' + unit('thickness').symbol +
        ', the least the field manuals give for caves and hollowed piles (US Army FM 21-76); light showing through means it is too thin';
    case 'density_range': {
      const c = core.CAT.snow_correlations.find((k) => sc && k.id === sc.snow_correlation);
      return fmtU('density', w.value) + ' is outside the ' + fmt('density', w.min) + '–' + fmtU('density', w.max) + ' range ' + (c ? c.name : 'the regression') + ' was fitted to';
    }
    default: return w.message;
  }
}

function drawShelter() {
  const job = shelter.job;
  if (!job) return;
  jobChart('s-night-chart', job, (c, dpr) => job.draw('night', c, 0, state.units, dpr));
  for (let i = 0; i < 3; i++) jobChart('s-sweep-' + i, job, (c, dpr) => job.draw('sweep', c, i, state.units, dpr));
}

function setUp() {
  renderCautions();
  $('s-night-csv').addEventListener('click', () => { if (shelter.job) download(shelter.job.csv('night', state.units, 0), fileStem('shelter') + '-night.csv'); });
  $('s-sweeps-csv').addEventListener('click', () => { if (shelter.job) download(shelter.job.csv('sweeps', state.units, 0), fileStem('shelter') + '-series.csv'); });
}

export const shelterSection = section({
  key: 'shelter',
  firstField: 'shelter.shape.kind',
  byHand: false,
  needsStack: false,
  inView: true,
  fresh: defaultShelter,
  setUp,
  render: renderShelter,
  owners: shelterOwners,
  // Nothing of the shelter is computed by hand.
  edited() {},
  run: runShelter,
  showUnits() {
    if (shelter.report) { renderShelterReport(); drawShelter(); }
  },
  draw: drawShelter,
  drop: dropShelterResult,
  adopt() {
    dropShelterResult();
    shelter.past = {};
  },
  // Its inputs name no layer of the stack.
  layersMoved() {},
});
