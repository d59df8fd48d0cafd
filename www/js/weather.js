// The weather inputs shared by the winter and the building edge: the climate, the snow
// season, how the ground surface meets the weather and the deep boundary; and a day of a
// climate in words. Each editor takes the section object, the path prefix of its fields and
// `keep`, the section's memory ({ past: sub-sections switched away from, by kind }).
import { el, clear } from './dom.js';
import { core, coreDefault } from './core.js';
import { badText, field, numField, switchPart } from './fields.js';

// ---------- new weather inputs (the core's defaults, with their sources) ----------
// The snow season of a sine year, or of a design winter.
export const defaultSnowSeason = (kind) => coreDefault('snow_seasons', kind === 'design-winter' ? kind : 'sinusoid');
export const defaultClimate = (kind) => coreDefault('climates', kind === 'design-winter' || kind === 'daily' ? kind : 'sinusoid');
// A surface (an air film or n-factors) and a deep boundary (the geothermal flux or a
// temperature) of each kind.
export const defaultSurface = (kind) => coreDefault('surfaces', kind);
export const defaultBottom = (kind) => coreDefault('bottoms', kind);

// ---------- editors ----------
// The climate of a section (`sect.climate`, paths under `prefix`): its kind and numbers.
// `allowDaily`: offer daily records (the winter imports them from a CSV file).
export function climateEditor(box, sect, prefix, keep, rerender, allowDaily) {
  const c = sect.climate;
  clear(box);
  const kinds = [
    { value: 'sinusoid', text: 'A year of sine-shaped air temperature' },
    { value: 'design-winter', text: 'A design winter from a freezing index' },
  ];
  if (allowDaily || c.kind === 'daily') kinds.push({ value: 'daily', text: allowDaily ? 'Daily records from a CSV file' : 'Daily records (from the scenario file)' });
  const P = prefix + 'climate.';
  const grid = el('div', { class: 'w-fields' });
  grid.append(field({
    path: P + 'kind', label: 'Climate from', options: kinds, cls: 'wide',
    get: () => c.kind,
    set: (v) => switchPart(sect, 'climate', keep.past, v, defaultClimate),
    after: rerender(P + 'kind'),
  }));
  if (c.kind === 'sinusoid') {
    grid.append(
      numField(c, 'mean_c', P + 'mean_c', 'Mean annual air temperature', 'temperature'),
      numField(c, 'amplitude_k', P + 'amplitude_k', 'Swing either side of the mean', 'temperature_difference'),
      numField(c, 'coldest_day_of_year', P + 'coldest_day_of_year', 'Coldest day of the year (1 = 1 January)', 'days'),
    );
  } else if (c.kind === 'design-winter') {
    grid.append(
      numField(c, 'freezing_index_c_days', P + 'freezing_index_c_days', 'Air freezing index', 'degree_days'),
      numField(c, 'season_days', P + 'season_days', 'Length of the freezing season', 'days'),
      numField(c, 'mean_annual_c', P + 'mean_annual_c', 'Mean annual air temperature', 'temperature'),
    );
  } else if (!allowDaily) {
    grid.append(el('p', { class: 'hint', text: (c.days ? c.days.length : 0) + ' days of records, as the scenario file gives them.' }));
  }
  box.append(grid, el('span', { class: 'field-msg block', 'data-msg-for': P.slice(0, -1) }));
}

// The snow season of a sine year or a design winter (a daily record carries its own snow).
export function snowEditor(sb, c, prefix, checkId, keep, rerender, note) {
  clear(sb);
  if (c.kind === 'daily') return;
  const past = keep.past;
  const P = prefix + 'climate.snow';
  const on = !!c.snow;
  const check = el('input', { type: 'checkbox', id: checkId, 'data-field': P, checked: on, title: 'Lay a season of snow on the ground: it comes, deepens, settles and melts as set below' });
  check.addEventListener('change', () => {
    if (check.checked) c.snow = (past.snow && past.snow[c.kind]) || defaultSnowSeason(c.kind);
    else { past.snow = past.snow || {}; past.snow[c.kind] = c.snow; delete c.snow; }
    rerender(P)();
  });
  sb.append(el('label', { class: 'check', for: checkId }, check, ' Snow lies on the ground'));
  if (on) {
    const s = c.snow;
    const dayHint = c.kind === 'design-winter' ? 'days after freeze-up' : 'day of the year, 0 = 1 January';
    const g = el('div', { class: 'w-fields' });
    g.append(
      numField(s, 'start_day', P + '.start_day', 'First snow', 'days', { hint: dayHint }),
      numField(s, 'peak_day', P + '.peak_day', 'Deepest on', 'days'),
      numField(s, 'end_day', P + '.end_day', 'Melted by', 'days'),
      numField(s, 'peak_depth_m', P + '.peak_depth_m', 'Greatest depth', 'thickness'),
      numField(s, 'fresh_density_kg_m3', P + '.fresh_density_kg_m3', 'Density when fresh', 'density'),
      numField(s, 'settled_density_kg_m3', P + '.settled_density_kg_m3', 'Density when settled', 'density'),
    );
    sb.append(g, el('p', { class: 'hint', text: 'Depth rises in a straight line from the first snow to the deepest day, then falls to nothing; density rises from fresh to settled over the season. ' + note }));
  }
  sb.append(el('span', { class: 'field-msg block', 'data-msg-for': P }));
}

// How the ground surface meets the weather (`sect[key]`): a film (snow on top of it) or
// n-factors, with the surface chosen for them (`preset`) kept in the document.
export function surfaceEditor(su, sect, key, prefix, keep, rerender) {
  clear(su);
  const s = sect[key];
  const P = prefix + key + '.';
  const sg = el('div', { class: 'w-fields' });
  sg.append(field({
    path: P + 'kind', label: 'Top of the ground meets the weather', cls: 'wide',
    options: [
      { value: 'film', text: 'Through an air film (snow adds its own layers)' },
      { value: 'n-factor', text: 'Surface temperature = n-factor × air temperature' },
    ],
    get: () => s.kind,
    set: (v) => switchPart(sect, key, keep.past, v, defaultSurface),
    after: rerender(P + 'kind'),
  }));
  su.append(sg);
  if (s.kind === 'film') {
    sg.append(
      numField(s, 'film_w_m2k', P + 'film_w_m2k', 'Film coefficient', 'film'),
      field({
        path: P + 'snow_correlation', label: 'Snow conductivity from', cls: 'wide',
        options: core.CAT.snow_correlations.map((x) => ({ value: x.id, text: x.name, title: x.citation })),
        get: () => s.snow_correlation, set: (v) => { s.snow_correlation = v; },
      }),
    );
    return;
  }
  // The surface chosen travels in the document (`preset`); a freezing n-factor edited away
  // from it, or one that never came from a preset, is the user's own value.
  const presets = core.CAT.n_factor_presets || [];
  const same = (p) => p && Math.abs(p.freezing - s.freezing) < 1e-9;
  const chosen = presets.find((p) => p.id === s.preset);
  const match = same(chosen) ? chosen : null;
  if (s.preset !== undefined && !match) delete s.preset;
  const presetField = field({
      path: P + 'preset', label: 'Surface (freezing n-factor)', cls: 'wide',
      options: [{ value: '', text: 'Own value' }].concat(presets.map((p) => ({ value: p.id, text: p.name + ' — ' + p.freezing, title: p.source }))),
      get: () => (match ? match.id : ''),
      set: (v) => {
        const p = presets.find((x) => x.id === v);
        if (p) { s.freezing = p.freezing; s.preset = p.id; badText.delete(s); } else delete s.preset;
      },
      after: rerender(P + 'preset'),
    });
  const presetSelect = presetField.querySelector('select');
  sg.append(
    presetField,
    // Typed away from the surface's value, the n-factor is one's own at once.
    numField(s, 'freezing', P + 'freezing', 'Freezing n-factor', 'fraction', {
      after: () => {
        if (s.preset !== undefined && !same(presets.find((p) => p.id === s.preset))) {
          delete s.preset;
          if (presetSelect) presetSelect.value = '';
        }
      },
    }),
    numField(s, 'thawing', P + 'thawing', 'Thawing n-factor', 'fraction'),
  );
  su.append(el('p', { class: 'hint', text: 'Freezing n-factors: ' + ((presets[0] && presets[0].source) || '') + '. With n-factors, snow cover is taken as part of the factor and not simulated.' }));
}

// The deep boundary (`sect.bottom`): a geothermal flux or a held temperature.
export function bottomEditor(bo, sect, prefix, keep, rerender) {
  clear(bo);
  const b = sect.bottom;
  const P = prefix + 'bottom.';
  const bg = el('div', { class: 'w-fields' });
  bg.append(field({
    path: P + 'kind', label: 'At the bottom face', cls: 'wide',
    options: [
      { value: 'flux', text: 'Heat rising from deep ground (geothermal flux)' },
      { value: 'temperature', text: 'Held at a fixed temperature' },
    ],
    get: () => b.kind,
    set: (v) => switchPart(sect, 'bottom', keep.past, v, defaultBottom),
    after: rerender(P + 'kind'),
  }));
  if (b.kind === 'flux') bg.append(numField(b, 'upward_w_m2', P + 'upward_w_m2', 'Heat flux from below', 'heat_flux'));
  else bg.append(numField(b, 'temperature_c', P + 'temperature_c', 'Bottom temperature', 'temperature'));
  // Where the condition acts: by default below ground the run adds under the deepest layer,
  // deep enough for the year's wave to die; held on purpose at the layers' own bottom.
  const holdId = prefix.replace(/\W/g, '-') + 'bottom-held';
  const where = prefix.startsWith('edge') ? 'the section' : 'the layers';
  const hold = el('input', {
    type: 'checkbox', id: holdId, 'data-field': P + 'at_layers_bottom', checked: !!b.at_layers_bottom,
    title: 'Apply it at the bottom of ' + where + ' as given, with no ground added below (for a temperature measured at that depth, or rock of known heat flow)',
  });
  hold.addEventListener('change', () => {
    if (hold.checked) b.at_layers_bottom = true; else delete b.at_layers_bottom;
    rerender(P + 'at_layers_bottom')();
  });
  const holdLabel = el('label', { class: 'check wide', for: holdId }, hold,
    el('span', { text: ' Hold it at the bottom of ' + where + ' (add no ground below)' }));
  bg.append(holdLabel);
  bg.append(el('p', { class: 'hint wide', text: hold.checked
    ? 'Held at the bottom of ' + where + ' as given: frost that reaches it is reported as "at least".'
    : 'Acts below ground the run adds under the deepest layer, deep enough for the year\'s temperature wave to die out (about three damping depths).' }));
  bo.append(bg);
}

// ---------- days in words ----------
// A day of a run in words: a date for a daily record, the calendar for a sine year, days
// after freeze-up for a design winter.
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
export function dayWords(day, c) {
  const n = Math.round(day);
  if (c.kind === 'daily' && c.days && c.days.length) {
    const d0 = new Date(c.days[0].date + 'T00:00:00Z');
    const d = new Date(d0.getTime() + n * 86400000);
    return d.toISOString().slice(0, 10) + ' (day ' + n + ')';
  }
  if (c.kind === 'sinusoid') {
    const d = new Date(Date.UTC(2001, 0, 1) + (n % 365) * 86400000);
    return 'day ' + n + ' (about ' + d.getUTCDate() + ' ' + MONTHS[d.getUTCMonth()] + ')';
  }
  return 'day ' + n + ' after freeze-up';
}
