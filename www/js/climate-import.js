// The import of a daily climate record from a CSV file into the winter's climate: the
// file chosen (kept, so that any change of an import option, units included, reads it
// again), the units its header named, the problems of its lines, and the summary of the
// record in the scenario (its winters, design values, and the design winter built from
// them). The winter section calls `setUpImport` once and `renderClimateSummary` on each
// render; `forgetChosenFile` when another scenario is opened.
import { $, el, clear } from './dom.js';
import { core } from './core.js';
import { state } from './state.js';
import { fmt, fmtU, headCell } from './fields.js';

const imp = {
  memory: null, // the winter section's memory ({ summary, past })
  changed: null, // called after the climate changed (re-render and recompute)
  file: null, // the file chosen: { name, text }
};

// The options chosen on the page, as the core's import reads them.
function importOptions() {
  return {
    temperature: $('imp-temp').value,
    snow_depth: $('imp-depth').value,
    snow_density: $('imp-density').value,
    skip_bad_lines: $('imp-skip').checked,
    fill_gaps_days: $('imp-fill').checked ? 7 : 0,
    season_start_month: Number($('imp-month').value),
  };
}

// The line under the options naming the units the header gave (created on first use).
function unitsLine() {
  let p = $('imp-units');
  if (!p) {
    p = el('p', { id: 'imp-units', class: 'hint', hidden: true });
    $('imp-problems').before(p);
  }
  return p;
}

function showHeaderUnits(units) {
  const p = unitsLine();
  clear(p);
  p.hidden = !units || !units.length;
  if (p.hidden) return;
  p.append('Units read from the file\'s header: ');
  units.forEach((u, i) => {
    if (i) p.append(', ');
    p.append(u.column + ' in ' + u.unit);
    if (u.overrides) p.append(el('strong', { class: 'overrides', text: ' (not ' + u.chosen + ' as chosen above)' }));
  });
  p.append('.');
}

// Reads the chosen file with the options shown; nothing before a file is chosen.
function readChosen() {
  const list = $('imp-problems');
  clear(list); list.hidden = true;
  const f = imp.file;
  if (!f) { showHeaderUnits(null); return; }
  const res = core.W.import_climate_csv(f.text, importOptions());
  if (!res.ok) {
    showHeaderUnits(null);
    for (const e of res.errors || []) list.append(el('li', { text: e.message }));
    for (const p of res.problems || []) list.append(el('li', { text: p.message }));
    if (res.more_problems) list.append(el('li', { text: '… and ' + res.more_problems + ' more' }));
    list.prepend(el('li', { class: 'lead', text: f.name + ' was not read:' }));
    list.hidden = false;
    return;
  }
  const w = state.scenario.winter;
  if (!w) return;
  w.climate = { kind: 'daily', days: res.days };
  delete w.duration_days;
  imp.memory.summary = Object.assign({ file: f.name }, res.summary);
  showHeaderUnits(res.summary.header_units);
  if (res.problems && res.problems.length) {
    list.append(el('li', { class: 'lead', text: 'Read, leaving out ' + res.summary.skipped_lines + ' bad line(s):' }));
    for (const p of res.problems) list.append(el('li', { text: p.message }));
    list.hidden = false;
  }
  imp.changed();
}

function fileChosen(ev) {
  const file = ev.target.files && ev.target.files[0];
  if (!file) return;
  const reader = new FileReader();
  reader.onload = () => {
    ev.target.value = '';
    imp.file = { name: file.name, text: String(reader.result) };
    readChosen();
  };
  reader.onerror = () => {
    const list = $('imp-problems');
    clear(list);
    list.append(el('li', { text: 'The file could not be read.' }));
    list.hidden = false;
  };
  reader.readAsText(file);
}

// `memory`: the winter section's memory; `changed()`: re-render and recompute.
export function setUpImport(memory, changed) {
  imp.memory = memory;
  imp.changed = changed;
  $('imp-file').addEventListener('change', fileChosen);
  for (const id of ['imp-temp', 'imp-depth', 'imp-density', 'imp-skip', 'imp-fill']) {
    $(id).addEventListener('change', readChosen);
  }
  $('imp-month').addEventListener('change', () => {
    if (imp.file) { readChosen(); return; }
    memory.summary = null;
    if (state.scenario.winter) renderClimateSummary();
  });
}

// Another scenario was opened: the file chosen for the last one is not read again.
export function forgetChosenFile() {
  imp.file = null;
  const list = $('imp-problems');
  clear(list); list.hidden = true;
  showHeaderUnits(null);
}

// The summary of the daily record in the scenario, under the climate's inputs.
export function renderClimateSummary() {
  const box = $('w-climate-summary');
  clear(box);
  const mem = imp.memory;
  const c = state.scenario.winter.climate;
  if (c.kind !== 'daily') { mem.summary = null; return; }
  const days = c.days || [];
  if (!days.length) { box.append(el('p', { class: 'hint', id: 'w-record-none', text: 'No records yet: choose a CSV file.' })); return; }
  let s = mem.summary;
  if (!s || s.first_date !== days[0].date || s.days !== days.length) {
    const r = core.W.summarise_days(days, Number($('imp-month').value));
    s = mem.summary = r && r.ok ? r.summary : null;
    if (!s) { box.append(el('p', { class: 'msg error', text: (r && r.errors && r.errors.map((e) => e.message).join('; ')) || 'The records could not be summarised.' })); return; }
  }
  box.append(el('p', { id: 'w-record-span', text: (s.file ? s.file + ': ' : '') + s.days + ' days, ' + s.first_date + ' to ' + s.last_date + (s.has_snow ? ', with snow depths' : ', no snow depths') + (s.filled_days ? '; ' + s.filled_days + ' missing days filled in' : '') + '.' }));
  const t = el('table', { class: 'data', id: 'w-winters' });
  t.append(el('caption', { class: 'sr-only', text: 'Freezing index and freezing season of each winter in the record' }));
  t.append(el('thead', null, el('tr', null, el('th', { text: 'Winter' }), headCell('Freezing index', 'degree_days'), headCell('Days below 0 °C'), el('th', { text: 'Complete' }))));
  const tb = el('tbody');
  for (const x of s.winters) {
    tb.append(el('tr', null,
      el('td', { text: x.start.slice(0, 4) + '–' + x.end.slice(0, 4) }),
      el('td', { class: 'num', text: fmt('degree_days', x.freezing_index_c_days) }),
      el('td', { class: 'num season', text: String(x.freezing_season_days) }),
      el('td', { text: x.complete ? 'yes' : 'part (' + x.days_present + ' days)' })));
  }
  t.append(tb);
  box.append(el('div', { class: 'table-wrap' }, t));
  const d = el('p', { id: 'w-design' });
  if (s.design) {
    d.append(el('strong', { text: 'Design freezing index: ' }), 'mean of the three coldest winters ' + fmtU('degree_days', s.design.mean_of_three_coldest_c_days) + '; the coldest winter ' + fmtU('degree_days', s.design.coldest_c_days) + ' (of ' + s.design.complete_winters + ' complete winters).');
    for (const wmsg of s.design.warnings) d.append(el('span', { class: 'msg warning block', text: ' ' + wmsg }));
    const fit = s.design_winter;
    const useBtn = el('button', { type: 'button', class: 'btn small', id: 'w-use-design', text: 'Build a design winter from the mean of the three coldest' });
    useBtn.addEventListener('click', () => {
      const w = state.scenario.winter;
      (mem.past.climate = mem.past.climate || {}).daily = w.climate;
      const r1 = (x) => Math.round(x * 10) / 10;
      const dw = { kind: 'design-winter', freezing_index_c_days: Math.round(fit.freezing_index_c_days), season_days: Math.round(fit.season_days), mean_annual_c: r1(fit.mean_annual_c) };
      if (fit.snow) {
        const sn = fit.snow;
        dw.snow = { start_day: sn.start_day, peak_day: sn.peak_day, end_day: sn.end_day, peak_depth_m: Math.round(sn.peak_depth_m * 100) / 100, fresh_density_kg_m3: Math.round(sn.fresh_density_kg_m3), settled_density_kg_m3: Math.round(sn.settled_density_kg_m3) };
      }
      w.climate = dw;
      imp.changed();
    });
    box.append(d, useBtn, el('p', { class: 'hint', id: 'w-design-fit', text: 'It takes a freezing season of ' + Math.round(fit.season_days) + ' days (the mean days below 0 °C of those winters)' + (fit.snow ? ' and a snow season fitted to ' + fit.snow_winters + ' snowy winters: deepest ' + fmtU('thickness', fit.snow.peak_depth_m) + '.' : ', and no snow: the record has none.') }));
  } else {
    d.append(el('span', { class: 'hint', text: 'No design values: ' + (s.design_note || 'too few complete winters') + '.' }));
    box.append(d);
  }
}
