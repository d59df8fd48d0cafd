// Printing and the page's sources. The print style sheet leaves out the controls and keeps
// inputs, results, charts, methods with their sources and the cautions; a stamp names the
// scenario, the tool's version and the date.
import { $, el, clear } from './dom.js';
import { core } from './core.js';
import { state } from './state.js';
import { fmt, fmtU } from './fields.js';

export function printStamp() {
  const CAT = core.CAT;
  const sc = state.scenario || {};
  const title = sc.title && sc.title.trim() ? sc.title : 'Untitled scenario';
  const units = state.units === 'us' ? 'US customary units' : 'SI units';
  $('print-stamp').textContent = title + ' — printed ' + new Date().toISOString().slice(0, 16).replace('T', ' ') +
    ' UTC from Hibernal ' + (CAT ? CAT.version : '?') + ' (scenario format ' + (CAT ? CAT.format_version : '?') + '), in ' + units +
    '. Engineering estimates: follow local codes and have a licensed engineer or qualified instructor check a design.';
}

export function setUpPrinting() {
  window.addEventListener('beforeprint', printStamp);
  $('print-report').addEventListener('click', () => { printStamp(); window.print(); });
}

// The methods and their sources, from the catalogue, in the units shown.
export function renderSources() {
  const CAT = core.CAT;
  const fill = (id, items) => {
    const ul = $(id); clear(ul);
    for (const [name, detail] of items) ul.append(el('li', null, el('strong', { text: name }), detail ? ' — ' + detail : ''));
  };
  const cap = (t) => t.charAt(0).toUpperCase() + t.slice(1);
  const src = (x) => (x && x !== '—' && x !== '-' ? cap(x) + '.' : '');
  fill('src-snow', CAT.snow_correlations.map((c) => [c.name, (c.citation && c.citation !== c.name ? c.citation + '. ' : '') + 'Fitted to ' + fmt('density', c.range_kg_m3[0]) + '–' + fmtU('density', c.range_kg_m3[1]) + '.']));
  fill('src-soil', CAT.soil_models.map((m) => [m.name, m.citation + '. Textures: ' + m.textures.map((t) => {
    const x = CAT.soil_textures.find((s) => s.id === t); return x ? x.name.toLowerCase() : t;
  }).join(', ') + '.']));
  fill('src-boards', CAT.boards.map((b) => [b.name, (b.conductivity_w_m_k != null ? fmtU('conductivity', b.conductivity_w_m_k) + ' nominal. ' : '') + src(b.source)]));
  fill('src-films', CAT.surface_presets.map((p) => [p.name, (p.film_w_m2k == null ? 'no film resistance. ' : 'h = ' + fmtU('film', p.film_w_m2k) + ', R = ' + fmtU('r_value', 1 / p.film_w_m2k) + '. ') + src(p.source)]));
  $('core-version').textContent = String(CAT.version);
}
