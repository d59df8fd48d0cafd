// DOM helpers. Every element is built with textContent, never innerHTML, so text from
// users never becomes markup.

export const $ = (id) => document.getElementById(id);

export function el(tag, attrs, ...kids) {
  const e = document.createElement(tag);
  if (attrs) {
    for (const [k, v] of Object.entries(attrs)) {
      if (v == null || v === false) continue;
      if (k === 'text') e.textContent = v;
      else if (k === 'class') e.className = v;
      else if (k.startsWith('on')) e.addEventListener(k.slice(2), v);
      else if (v === true) e.setAttribute(k, '');
      else e.setAttribute(k, String(v));
    }
  }
  for (const kid of kids) {
    if (kid == null || kid === false) continue;
    e.append(kid instanceof Node ? kid : document.createTextNode(String(kid)));
  }
  return e;
}

export const clear = (e) => { while (e.firstChild) e.removeChild(e.firstChild); };

// The id of the input of a field path ("layers[0].name" → "f-layers-0-name").
export const idFor = (path) => 'f-' + path.replace(/[^A-Za-z0-9]+/g, '-');

// Focuses the input of a field path, when there is one.
export function focusField(path) {
  if (!path) return;
  const f = document.querySelector('[data-field="' + CSS.escape(path) + '"]');
  if (f) f.focus();
}

// ---------- charts ----------
// A canvas's backing store follows its CSS size and devicePixelRatio, so charts stay sharp.
// Returns the ratio, or null while the canvas has no size (hidden).
export function sizeCanvas(c) {
  const dpr = window.devicePixelRatio || 1;
  const rect = c.getBoundingClientRect();
  if (rect.width < 2 || rect.height < 2) return null;
  c.width = Math.max(1, Math.round(rect.width * dpr));
  c.height = Math.max(1, Math.round(rect.height * dpr));
  return dpr;
}

// Draws one chart from a finished job (`draw(canvas, dpr)` returns {ok, message}); a
// chart that fails says why under its canvas. Without a job the canvas is left as it is
// (it keeps the last chart, marked out of date by its section).
export function jobChart(id, job, draw) {
  if (!job) return;
  const c = $(id);
  const dpr = sizeCanvas(c);
  if (!dpr) return;
  let r;
  try { r = draw(c, dpr); } catch (err) { console.error(err); r = { ok: false, message: String(err && err.message || err) }; }
  let msg = c.parentElement.querySelector('.chart-msg');
  if (!msg) { msg = el('p', { class: 'msg error chart-msg', role: 'status' }); c.after(msg); }
  msg.textContent = r && r.ok ? '' : 'The chart could not be drawn: ' + ((r && r.message) || 'unknown reason');
  c.dataset.draws = String(Number(c.dataset.draws || 0) + 1);
}
