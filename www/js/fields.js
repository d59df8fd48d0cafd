// Units, numbers in and out, and the field builder. The page keeps the scenario in SI;
// inputs show it in the chosen unit system. Numbers are parsed at the edge: text that is
// not a number is kept as typed (per owning object, see `badText`) and flagged beside its
// field, and the calculator is not called until it is fixed.
import { $, el, clear, idFor } from './dom.js';
import { core } from './core.js';
import { state, flow } from './state.js';

// ---------- units ----------
// Units come from the core's table (catalogue().units): the page hard-codes no factor.
export function unit(q) {
  const u = core.CAT && core.CAT.units && core.CAT.units[q];
  if (!u) throw new Error('the unit table has no quantity "' + q + '"');
  return u[state.units] || u.si;
}
// The freezing point as the user reads it.
export const freezeT = () => (state.units === 'us' ? '32\u00a0°F' : '0\u00a0°C');
export const toDisplay = (q, si) => si * unit(q).factor + unit(q).offset;
export const fromDisplay = (q, d) => (d - unit(q).offset) / unit(q).factor;

// How the quantity's values are written in the units chosen (the core's rule, see
// `physics::units::written`): 'decimal', 'inch-fractions' (3 7/8 in) or 'feet-inches'
// (2 ft 2 in). The last two are written and read by the core.
export const written = (q) => unit(q).written || 'decimal';
// Whether values of the quantity are converted for the units chosen (US units that differ
// from SI): those inputs show the value as written, at its precision, nothing more.
function converted(q) {
  const u = core.CAT.units[q];
  return state.units !== 'si' && !!u && (u.us.factor !== u.si.factor || u.us.offset !== u.si.offset || u.us.symbol !== u.si.symbol);
}
const byCore = (q, si, up, input) => core.W.write_value(q, state.units, si, up, input);
// Inches per metre, from the core's table (the US unit of a thickness).
const inchesPerM = () => core.CAT.units.thickness.us.factor;

export function fmtNum(v, decimals) {
  if (v == null || !Number.isFinite(v)) return '–';
  let s = v.toFixed(decimals);
  if (/^-0(\.0*)?$/.test(s)) s = s.slice(1); // no "-0.0"
  return s.replace(/^-/, '\u2212');
}
// A value for display, without unit.
export function fmt(q, si) {
  if (si == null || !Number.isFinite(si)) return '–';
  // Feet and inches carry their units; inches alone do not (the column or box says "in").
  if (written(q) === 'feet-inches') return byCore(q, si, false, false);
  if (written(q) === 'inch-fractions') return byCore(q, si, false, true).replace(/ /g, '\u00a0').replace(/^-/, '\u2212');
  return fmtNum(toDisplay(q, si), unit(q).decimals);
}
// A value with its unit symbol.
export function fmtU(q, si) {
  if (si != null && Number.isFinite(si) && written(q) !== 'decimal') return byCore(q, si, false, false);
  const s = fmt(q, si);
  const sym = unit(q).symbol;
  return s === '–' || !sym ? s : s + '\u00a0' + sym;
}
// A least value that is enough, for display: rounded up at the shown precision (a value
// rounded down could fall short of the answer), with its unit.
export function fmtUpU(q, si) {
  if (si == null || !Number.isFinite(si)) return '–';
  if (written(q) !== 'decimal') return byCore(q, si, true, false);
  const d = unit(q).decimals;
  const shown = toDisplay(q, si);
  const up = Math.ceil(shown * 10 ** d - 1e-9) / 10 ** d;
  const sym = unit(q).symbol;
  return fmtNum(up, d) + (sym ? '\u00a0' + sym : '');
}
// "about X" for a change (the frost lifted by a step more of board): a US change too small
// for its inches reads "less than 1/2 in" rather than "about 0 in".
export function aboutU(q, si) {
  if (written(q) === 'feet-inches' && Number.isFinite(si) && Math.abs(si) * inchesPerM() < 0.5) return 'less than 1/2\u00a0in';
  return 'about ' + fmtU(q, si);
}
// A value to place in an input, no trailing zeros: a converted value (US units) as it is
// written, at its precision and no more (3 7/8, 2 ft 2 in, 118.6); a value in the units it
// is stored in (SI) with a little more precision than display. Showing it never changes the
// value kept: only an edit does.
export function fmtInput(q, si) {
  if (si == null || !Number.isFinite(si)) return '';
  if (written(q) !== 'decimal') return byCore(q, si, false, true);
  const d = toDisplay(q, si);
  const places = Math.min(10, (unit(q).decimals || 0) + (converted(q) ? 0 : 2));
  return String(Number(d.toFixed(places)));
}
// The same with its unit, for a message; a value too small for the written form's step
// (a limit of 1 mm, in feet and inches) in decimal inches, so that it does not read as 0.
export function fmtInputU(q, si) {
  if (si == null || !Number.isFinite(si)) return '–';
  const w = written(q);
  if (w !== 'decimal' && si !== 0 && Math.abs(si) * inchesPerM() < 1 / 16) return fmtNum(si * inchesPerM(), 3) + '\u00a0in';
  if (w === 'feet-inches') return byCore(q, si, false, false);
  if (w === 'inch-fractions') return fmtInput(q, si) + '\u00a0in';
  const sym = unit(q).symbol;
  return fmtInput(q, si) + (sym ? '\u00a0' + sym : '');
}
// Text typed into an input of the quantity, in SI (null: not a number yet). In feet and
// inches or inches, the core reads it (2 ft 3 in, 2' 3", 27 in, 3 1/2) and converts
// exactly; otherwise a number in the unit shown.
export function parseInput(q, text) {
  if (written(q) !== 'decimal') {
    const v = core.W.read_value(q, state.units, String(text));
    return v == null || !Number.isFinite(v) ? null : v;
  }
  const v = parseNumber(text);
  return v == null ? null : fromDisplay(q, v);
}

// Accepts "12", "-3.5", ".5", "1e-3", and a decimal comma ("1,5").
export function parseNumber(text) {
  let t = String(text).trim().replace(/^\u2212/, '-');
  if (/^[+-]?\d+,\d+$/.test(t)) t = t.replace(',', '.');
  if (!/^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(t)) return null;
  const v = Number(t);
  return Number.isFinite(v) ? v : null;
}

// Every shown unit symbol and freezing point, in the units now chosen (within `root`).
export function showUnitSymbols(root = document) {
  for (const e of root.querySelectorAll('[data-unit]')) e.textContent = unit(e.dataset.unit).symbol;
}

// A column heading with its unit on a line of its own.
export function headCell(text, q) {
  // Feet and inches carry their units in each cell.
  const sym = q && written(q) !== 'feet-inches' ? unit(q).symbol : '';
  return el('th', { scope: 'col', class: q ? 'num' : null }, text, sym ? el('span', { class: 'u', text: sym }) : null);
}

// ---------- typed text that is not a number yet ----------
// Raw text of inputs that did not parse, per owning object (a layer, a face, a sub-section).
// Key: path relative to the owner, e.g. "thickness_m", "material.density_kg_m3".
export const badText = new WeakMap();

export function bad(owner) {
  let m = badText.get(owner);
  if (!m) { m = new Map(); badText.set(owner, m); }
  return m;
}

// The inputs of these owners ([owner, path prefix] pairs) that hold text that is not a
// number yet, as { field, label }.
export function typedErrors(pairs) {
  const out = [];
  for (const [owner, prefix] of pairs) {
    const m = badText.get(owner);
    if (!m) continue;
    for (const [key, v] of m) out.push({ field: prefix + key, label: v.label });
  }
  return out;
}

// Switches `owner[part]` to another kind; the one left is kept in `past[part]` by kind, so
// switching back restores it. `make(kind)` builds a kind not seen before.
export function switchPart(owner, part, past, kind, make) {
  const kept = (past[part] = past[part] || {});
  kept[owner[part].kind] = owner[part];
  owner[part] = kept[kind] || make(kind);
  badText.delete(owner[part]);
}

// ---------- the field builder ----------
// spec: { path, label, q?, options?, text?, optional?, placeholder?, hint?, cls?,
//         owner, key (relative to owner), get(), set(v), after?() }
// `path` is the field's path in the scenario (`data-field`), so the core's errors land
// beside it. A select or a number calls after() when given; every edit schedules the
// recompute, except a select with after() (which does what it needs itself).
export function field(spec) {
  const id = idFor(spec.path);
  const u = spec.q ? unit(spec.q).symbol : '';
  // Feet and inches are typed with their units: no unit beside the box.
  const feetInches = !!spec.q && !spec.options && !spec.text && written(spec.q) === 'feet-inches';
  // A long unit symbol needs a wider box to leave room for the number.
  const cls = spec.cls || (u.length > 9 ? 'span2' : '');
  const wrap = el('div', { class: 'field' + (cls ? ' ' + cls : '') });
  wrap.append(el('label', { for: id, text: spec.label }));
  const msgId = id + '-msg';
  let input;
  if (spec.options) {
    input = el('select', { id, 'data-field': spec.path, 'aria-describedby': msgId });
    const val = spec.get();
    let found = false;
    for (const o of spec.options) {
      const opt = el('option', { value: o.value, title: o.title, text: o.text });
      if (o.value === val) { opt.selected = true; found = true; }
      input.append(opt);
    }
    if (!found && val != null) {
      input.prepend(el('option', { value: val, selected: true, text: String(val) + ' (unknown)' }));
    }
    input.addEventListener('change', () => { spec.set(input.value); if (spec.after) spec.after(); else flow.schedule(); });
    wrap.append(input);
  } else if (spec.text) {
    input = el('input', { id, type: 'text', 'data-field': spec.path, autocomplete: 'off', spellcheck: 'false', 'aria-describedby': msgId });
    input.value = spec.get() == null ? '' : String(spec.get());
    input.addEventListener('input', () => { spec.set(input.value); flow.schedule(); });
    wrap.append(input);
  } else {
    const store = bad(spec.owner);
    const raw = store.get(spec.key);
    input = el('input', {
      id, type: 'text', inputmode: feetInches ? 'text' : 'decimal', 'data-field': spec.path, 'data-quantity': spec.q,
      autocomplete: 'off', spellcheck: 'false', 'aria-describedby': msgId,
      placeholder: spec.placeholder ? spec.placeholder() : null,
    });
    input.value = raw != null ? raw.text : fmtInput(spec.q, spec.get());
    input.addEventListener('input', () => {
      const text = input.value;
      if (spec.optional && text.trim() === '') {
        store.delete(spec.key);
        spec.set(null);
      } else {
        const v = parseInput(spec.q, text);
        if (v == null) {
          store.set(spec.key, { text, label: spec.label });
        } else {
          store.delete(spec.key);
          spec.set(v);
        }
      }
      if (spec.after) spec.after();
      flow.schedule();
    });
    const box = el('span', { class: 'with-unit' }, input);
    if (u && !feetInches) box.append(el('span', { class: 'unit-suffix', 'aria-hidden': 'true', text: u }));
    wrap.append(box);
    if (u) input.setAttribute('aria-label', spec.label + ' (' + (feetInches ? 'ft and in' : u) + ')');
  }
  if (spec.hint) wrap.append(el('span', { class: 'field-hint', text: spec.hint }));
  wrap.append(el('span', { class: 'field-msg', id: msgId, 'data-msg-for': spec.path, 'aria-live': 'polite' }));
  // The tooltip: what the input is and its unit.
  const typing = !spec.q || spec.options || spec.text ? ''
    : feetInches ? '. Feet and inches: 2 ft 3 in, 2\' 3", 27 in; a number alone is feet.'
      : written(spec.q) === 'inch-fractions' ? '. Inches, with a fraction if you like: 3 1/2, 7/8.'
        : '. Decimal comma or point.';
  input.title = spec.label + (u ? ', in ' + (feetInches ? 'ft and in' : u) : '') + (spec.hint ? ' — ' + spec.hint : '') + typing;
  return wrap;
}

// A number field for `owner[key]`.
export function numField(owner, key, path, label, q, extra) {
  return field(Object.assign({
    path, label, q, owner, key,
    get: () => owner[key], set: (v) => { owner[key] = v; },
  }, extra || {}));
}

// A grid of fields, and a box (by id) filled anew.
export const fieldGrid = (...kids) => el('div', { class: 'w-fields' }, ...kids);
export function fillBox(id, ...kids) {
  const b = $(id);
  clear(b);
  b.append(...kids);
}
