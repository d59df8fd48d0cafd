// Files handed to the browser's download: CSV of the tables and of the core's series,
// PNG of the charts. Nothing leaves the computer (blob: URLs).
import { el } from './dom.js';
import { state } from './state.js';

export function saveBlob(blob, name) {
  const url = URL.createObjectURL(blob);
  const a = el('a', { href: url, download: name });
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 5000);
}
export const download = (text, name, type = 'text/csv') => saveBlob(new Blob([text], { type }), name);
// A file name from the scenario's title.
export const fileStem = (fallback) => (state.scenario.title || fallback).replace(/[^A-Za-z0-9_-]+/g, '-').replace(/^-+|-+$/g, '').toLowerCase() || fallback;

// Every results table can be saved as CSV (RFC 4180) of what it shows. A column whose
// cells all read "number unit" with one unit gets the unit in its heading and bare numbers
// (ASCII minus, point decimals) in its cells, so a spreadsheet reads them as numbers.
function textOf(node) {
  const parts = [];
  // A heading's unit (headCell's span.u) goes in brackets.
  for (const n of node.childNodes) parts.push(n.nodeType !== 1 ? n.textContent : n.classList.contains('u') ? '[' + textOf(n) + ']' : textOf(n));
  return parts.join(' ').replace(/\s+/g, ' ').trim();
}
const csvCell = (t) => (/[",\r\n]/.test(t) ? '"' + t.replace(/"/g, '""') + '"' : t);
function tableCsv(table) {
  const head = [...table.querySelectorAll('thead tr')].map((tr) => [...tr.children].map(textOf));
  const body = [...table.querySelectorAll('tbody tr')].map((tr) => [...tr.children].map(textOf));
  const NUM = /^([\u2212-]?\d+(?:\.\d+)?(?:e[\u2212+-]?\d+)?)\s+(\S.*)$/i;
  const cols = Math.max(0, ...head.concat(body).map((r) => r.length));
  for (let j = 0; j < cols; j++) {
    const cells = body.map((r) => r[j]).filter((t) => t != null && t !== '' && t !== '–');
    const m = cells.map((t) => NUM.exec(t));
    if (!cells.length || m.some((x) => !x) || new Set(m.map((x) => x[2])).size !== 1) continue;
    const u = m[0][2];
    if (head.length && head[head.length - 1][j] != null) head[head.length - 1][j] += ' [' + u + ']';
    for (const r of body) {
      const x = r[j] != null ? NUM.exec(r[j]) : null;
      if (x) r[j] = x[1].replace('\u2212', '-');
    }
  }
  const lines = head.concat(body).map((r) => r.map((t) => csvCell(t.replace(/\u2212/g, '-'))).join(','));
  const cap = table.querySelector('caption');
  return (cap ? '# ' + textOf(cap) + '\r\n' : '') + lines.join('\r\n') + '\r\n';
}
function tableName(t) {
  const cap = t.querySelector('caption');
  if (cap) return textOf(cap).toLowerCase();
  const h = t.closest('div, details, section') && t.closest('div, details, section').querySelector('h3, summary, h2');
  return h ? textOf(h).toLowerCase() : t.id;
}
export function setUpTableSaving() {
  for (const t of document.querySelectorAll('table.data[id]')) {
    const b = el('button', {
      type: 'button', class: 'btn subtle csv-btn', 'data-csv-for': t.id,
      text: 'Save table as CSV', 'aria-label': 'Save the table (' + tableName(t) + ') as a CSV file',
    });
    b.addEventListener('click', () => download(tableCsv(t), fileStem('hibernal') + '-' + t.id + '.csv'));
    t.after(b);
  }
}

// Every chart can be saved as a PNG of what it shows (its canvas, at the screen's
// resolution), named after the scenario and the chart. Done once at start: a chart added
// later needs only an id.
export function setUpChartSaving() {
  for (const c of document.querySelectorAll('canvas[id]')) {
    const what = (c.getAttribute('aria-label') || c.id).toLowerCase();
    const b = el('button', {
      type: 'button', class: 'btn subtle png-btn', 'data-png-for': c.id,
      text: 'Save chart as PNG', 'aria-label': 'Save the chart (' + what + ') as a PNG image',
    });
    b.addEventListener('click', () => {
      c.toBlob((blob) => { if (blob) saveBlob(blob, fileStem('hibernal') + '-' + c.id + '.png'); }, 'image/png');
    });
    c.after(b);
  }
}
