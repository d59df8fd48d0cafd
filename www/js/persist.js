// Where a scenario is kept and comes from besides the examples: the autosave in this
// browser's storage, a link that carries it in its fragment, and scenario files.
import { $, el, clear } from './dom.js';
import { state, flow } from './state.js';
import { download, fileStem } from './downloads.js';

export function looksLikeScenario(s) {
  const face = (f) => f && typeof f === 'object' && (f.kind === 'air' || f.kind === 'surface');
  return s && typeof s === 'object' && s.format === 'hibernal-scenario' && Array.isArray(s.layers) && s.layers.length >= 1 &&
    s.layers.every((l) => l && typeof l === 'object' && l.material && typeof l.material === 'object' && typeof l.material.kind === 'string') &&
    face(s.top) && face(s.bottom);
}

// ---------- autosave ----------
// The scenario (SI, as edited) and the unit system go into this browser's storage on every
// recompute, so a reload or a closed tab loses nothing; the page opens on it next time,
// saying so. Storage that is full or switched off is skipped quietly.
const AUTOSAVE_KEY = 'hibernal.autosave.1';
export function autosave() {
  if (!state.scenario) return;
  try {
    localStorage.setItem(AUTOSAVE_KEY, JSON.stringify({ saved_at: new Date().toISOString(), units: state.units, scenario: state.scenario }));
  } catch (e) { /* no storage: nothing to do */ }
}

// Opens the saved scenario, if there is one; returns whether it did.
export function restoreAutosave() {
  let saved = null;
  try { saved = JSON.parse(localStorage.getItem(AUTOSAVE_KEY) || 'null'); } catch (e) { saved = null; }
  if (!saved || !looksLikeScenario(saved.scenario)) return false;
  if (saved.units === 'us' || saved.units === 'si') {
    const r = $('units-' + saved.units);
    if (r) { r.checked = true; state.units = saved.units; document.documentElement.dataset.units = state.units; }
  }
  flow.adopt(saved.scenario);
  $('example-pick').value = '';
  const when = typeof saved.saved_at === 'string' ? saved.saved_at.slice(0, 16).replace('T', ' ') + ' UTC' : 'earlier';
  $('restore-text').textContent = 'Your last work in this browser is back (saved ' + when + ').';
  $('restore-note').hidden = false;
  return true;
}

// ---------- the link ----------
// A link that carries the scenario: its JSON, deflated (the browser's CompressionStream,
// RFC 1951) and base64url-encoded (RFC 4648 §5), in the fragment after "#s=", which never
// leaves the browser. Opening the page with such a fragment opens that scenario.
const b64url = (bytes) => {
  let bin = '';
  for (let i = 0; i < bytes.length; i += 0x8000) bin += String.fromCharCode.apply(null, bytes.subarray(i, i + 0x8000));
  return btoa(bin).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
};
const unb64url = (text) => {
  const b = atob(text.replace(/-/g, '+').replace(/_/g, '/') + '==='.slice((text.length + 3) % 4));
  const out = new Uint8Array(b.length);
  for (let i = 0; i < b.length; i++) out[i] = b.charCodeAt(i);
  return out;
};
async function through(stream, bytes) {
  const s = new Blob([bytes]).stream().pipeThrough(stream);
  return new Uint8Array(await new Response(s).arrayBuffer());
}
const MAX_LINK_BYTES = 2_000_000;

export async function makeShareLink() {
  const msg = $('file-msg');
  clear(msg);
  try {
    const json = new TextEncoder().encode(JSON.stringify(state.scenario));
    const packed = await through(new CompressionStream('deflate-raw'), json);
    const url = location.href.split('#')[0] + '#s=' + b64url(packed);
    $('share-box').hidden = false;
    const box = $('share-link');
    box.value = url;
    box.focus();
    box.select();
    let copied = false;
    try { if (navigator.clipboard) { await navigator.clipboard.writeText(url); copied = true; } } catch (e) { copied = false; }
    msg.append(el('span', { class: 'msg ok', text: (copied ? 'Link copied' : 'Link made: copy it from the box') + ' (' + url.length + ' characters).' }));
  } catch (e) {
    msg.append(el('span', { class: 'msg error', text: 'This browser could not make the link: ' + String(e && e.message || e) }));
  }
}

// The scenario a link carries, or null (with the reason shown) when it carries none or a
// broken one.
export async function scenarioFromLink() {
  const h = location.hash || '';
  if (!h.startsWith('#s=')) return null;
  const note = (text) => { $('restore-text').textContent = text; $('restore-note').hidden = false; };
  try {
    const packed = unb64url(h.slice(3));
    if (packed.length > MAX_LINK_BYTES) throw new Error('it is too long');
    const json = await through(new DecompressionStream('deflate-raw'), packed);
    if (json.length > 20 * MAX_LINK_BYTES) throw new Error('it unpacks too large');
    const s = JSON.parse(new TextDecoder().decode(json));
    if (!looksLikeScenario(s)) throw new Error('what it carries is not a scenario');
    return s;
  } catch (e) {
    note('The link this page was opened with does not carry a scenario it can read (' + String(e && e.message || e) + ').');
    return null;
  }
}

// ---------- scenario files ----------
export function saveFile() {
  download(JSON.stringify(state.scenario, null, 2) + '\n', fileStem('scenario') + '.hibernal.json', 'application/json');
}

export function openFile(ev) {
  const msg = $('file-msg');
  clear(msg);
  const file = ev.target.files && ev.target.files[0];
  if (!file) return;
  const reader = new FileReader();
  reader.onload = () => {
    let s;
    try { s = JSON.parse(String(reader.result)); } catch (e) {
      msg.append(el('span', { class: 'msg error', text: 'That file is not valid JSON: ' + e.message }));
      return;
    }
    if (!looksLikeScenario(s)) {
      msg.append(el('span', { class: 'msg error', text: 'That file is not a Hibernal scenario (needs format "hibernal-scenario", layers, top and bottom).' }));
      return;
    }
    // `from` names where it came from in the notice shown for an older format version.
    flow.adopt(s, 'file');
    msg.append(el('span', { class: 'msg ok', text: 'Opened ' + file.name + '.' }));
  };
  reader.onerror = () => msg.append(el('span', { class: 'msg error', text: 'The file could not be read.' }));
  reader.readAsText(file);
  ev.target.value = '';
}
