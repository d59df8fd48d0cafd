// Messages: the core's errors and warnings placed beside the input whose `data-field`
// matches their path, worded in the units shown; the ones with no input go to a list.
import { $, el, clear } from './dom.js';
import { core } from './core.js';
import { state } from './state.js';
import { unit, fmtInputU } from './fields.js';

export function clearMessages() {
  for (const m of document.querySelectorAll('.field-msg')) clear(m);
  for (const i of document.querySelectorAll('[aria-invalid]')) i.removeAttribute('aria-invalid');
  for (const f of document.querySelectorAll('.field.has-error, .field.has-warning')) f.classList.remove('has-error', 'has-warning');
  const g = $('general-errors');
  clear(g); g.hidden = true;
}

export function fieldLabel(path) {
  const input = document.querySelector('[data-field="' + CSS.escape(path) + '"]');
  if (!input) return null;
  const lab = document.querySelector('label[for="' + CSS.escape(input.id) + '"]');
  return lab ? lab.textContent : null;
}

// Human name of a field path, for lists away from the field.
export function describePath(path) {
  const m = /^layers\[(\d+)\](?:\.(.*))?$/.exec(path || '');
  const label = fieldLabel(path);
  if (m) {
    const L = state.scenario.layers[Number(m[1])];
    const nm = L && L.name && L.name.trim() ? L.name : '';
    return 'Layer ' + (Number(m[1]) + 1) + (nm ? ' (' + nm + ')' : '') + (label ? ', ' + label.toLowerCase() : m[2] ? ', ' + m[2] : '');
  }
  if (/^top\./.test(path)) return 'Top face' + (label ? ', ' + label.toLowerCase() : '');
  if (/^bottom\./.test(path)) return 'Bottom face' + (label ? ', ' + label.toLowerCase() : '');
  if (path === 'layers') return 'Layers';
  if (/^shelter\b/.test(path || '')) return 'Shelter' + (label ? ', ' + label.toLowerCase() : path.length > 8 ? ', ' + path.slice(8) : '');
  return label || path || 'Scenario';
}

function withLabel(label, message) {
  if (!label) return message;
  return message.toLowerCase().includes(label.toLowerCase()) ? message : label + ': ' + message;
}

// The core reports offending values and limits in SI; the error's kind, value, min and max
// let the page word them in the unit the user reads.
function inShownUnits(input, message, err) {
  const q = input && input.dataset.quantity;
  if (!q || !(core.CAT.units && core.CAT.units[q])) return message;
  const u = unit(q);
  if (u.factor === 1 && u.offset === 0) return message;
  const show = (v) => fmtInputU(q, v);
  if (err && err.value != null) {
    switch (err.kind) {
      case 'out_of_bounds':
        return 'must be between ' + show(err.min) + ' and ' + show(err.max) + ' (got ' + show(err.value) + ')';
      case 'not_positive':
        return 'must be greater than zero (got ' + show(err.value) + ')';
      case 'negative':
        return 'must not be negative (got ' + show(err.value) + ')';
      case 'denser_than_ice':
        return show(err.value) + ' is denser than solid ice (' + show(err.max) + ')';
      case 'denser_than_solids':
        return show(err.value) + ' is at or above the density of the solid grains (' + show(err.max) + ')';
      default:
    }
  }
  return message.replace(/\(got (-?\d+(?:\.\d+)?(?:e[+-]?\d+)?)\)/i, (all, num) => {
    const v = Number(num);
    return Number.isFinite(v) ? '(got ' + fmtInputU(q, v) + ')' : all;
  });
}

// Puts a message beside the field with that path; returns false if there is none.
export function placeMessage(path, message, level, err) {
  const box = document.querySelector('[data-msg-for="' + CSS.escape(path) + '"]');
  if (!box) return false;
  const input = document.querySelector('[data-field="' + CSS.escape(path) + '"]');
  box.append(el('span', { class: 'msg ' + level, text: withLabel(fieldLabel(path), inShownUnits(input, message, err)) }));
  if (input && level === 'error') input.setAttribute('aria-invalid', 'true');
  const f = box.closest('.field');
  if (f) f.classList.add(level === 'error' ? 'has-error' : 'has-warning');
  return true;
}

export function generalError(text) {
  const g = $('general-errors');
  g.append(el('li', { text }));
  g.hidden = false;
}

// The core's errors: each beside its field (unless `beside` is false), else in `list`
// named by `describe(path)`; the list shows when it holds any.
export function listErrors(list, errors, describe, beside = true) {
  for (const e of errors) {
    if (!(beside && placeMessage(e.field, e.message, 'error', e))) list.append(el('li', { text: describe(e.field) + ': ' + e.message }));
  }
  list.hidden = !list.firstChild;
}
