// Where a scenario is kept and comes from besides the examples: the autosave in this
// browser's storage (and the work a link's case set aside), a link that carries it in its
// fragment (the page's address or the "Open a link" box), and scenario files.
import { $, el, clear } from './dom.js';
import { state, flow, clone } from './state.js';
import { core } from './core.js';
import { download, fileStem } from './downloads.js';

export function looksLikeScenario(s) {
  const face = (f) => f && typeof f === 'object' && (f.kind === 'air' || f.kind === 'surface');
  return s && typeof s === 'object' && s.format === 'hibernal-scenario' && Array.isArray(s.layers) && s.layers.length >= 1 &&
    s.layers.every((l) => l && typeof l === 'object' && l.material && typeof l.material === 'object' && typeof l.material.kind === 'string') &&
    face(s.top) && face(s.bottom);
}

// ---------- the work kept in this browser ----------
// The scenario (SI, as edited) and the unit system go into this browser's storage whenever
// the case or the units change (`saved_at`: the time of that change), so a reload or a
// closed tab loses nothing; the page opens on it next time, saying so. A link's case never
// silently takes the saved work's place: see openAtStart and openPastedLink. Work a link's
// case replaced is set aside under a second key (the last few cases), with a button that
// brings one back (setting the open case aside in its turn). Storage that is full or
// switched off is skipped quietly.
const AUTOSAVE_KEY = 'hibernal.autosave.1';
const ASIDE_KEY = 'hibernal.set-aside.1';

function readKept(key) {
  let kept = null;
  try { kept = JSON.parse(localStorage.getItem(key) || 'null'); } catch (e) { kept = null; }
  return kept && typeof kept === 'object' && looksLikeScenario(kept.scenario) ? kept : null;
}
function writeKept(key, record) {
  try { localStorage.setItem(key, JSON.stringify(record)); return true; } catch (e) { return false; }
}

// A scenario as text with its keys sorted, its format version left out and a missing title
// or notes read as empty: two scenarios with the same text are the same case.
function caseText(s) {
  const sorted = (v) => {
    if (Array.isArray(v)) return v.map(sorted);
    if (!v || typeof v !== 'object') return v;
    const out = {};
    for (const k of Object.keys(v).sort()) if (v[k] !== undefined) out[k] = sorted(v[k]);
    return out;
  };
  return JSON.stringify(sorted(Object.assign({}, s, { version: undefined, title: s.title || '', notes: s.notes || '' })));
}
const sameCase = (a, b) => caseText(a) === caseText(b);
// An example as bundled, untouched: nothing of one's own to keep (the examples hold it).
const isPlainExample = (s) => core.EXAMPLES.some((ex) => sameCase(core.W.example(ex.id), s));
// Whether the kept `s` is work worth asking about (or setting aside) before `incoming` replaces it.
const worthKeeping = (s, incoming) => !!s && !sameCase(s, incoming) && !isPlainExample(s);

const titleOf = (s) => (s && typeof s.title === 'string' && s.title.trim() ? '“' + s.title.trim() + '”' : 'an untitled case');
const whenOf = (iso) => (typeof iso === 'string' && /^\d{4}-\d\d-\d\dT\d\d:\d\d/.test(iso) ? iso.slice(0, 16).replace('T', ' ') + ' UTC' : 'earlier');
const short = (t, n) => (t.length > n ? t.slice(0, n - 1) + '…' : t);

let lastSaved = ''; // the units and case last written, to write again only on a change
const savedText = (units, scenario) => units + '\n' + caseText(scenario);
export function autosave() {
  if (!state.scenario) return;
  const now = savedText(state.units, state.scenario);
  if (now === lastSaved) return;
  if (writeKept(AUTOSAVE_KEY, { saved_at: new Date().toISOString(), units: state.units, scenario: state.scenario })) lastSaved = now;
}

function applyUnits(units) {
  if (units !== 'us' && units !== 'si') return;
  const r = $('units-' + units);
  if (r) { r.checked = true; state.units = units; document.documentElement.dataset.units = state.units; }
}

// Opens the saved scenario, if there is one; returns whether it did.
function restoreAutosave() {
  const saved = readKept(AUTOSAVE_KEY);
  if (!saved) return false;
  applyUnits(saved.units);
  lastSaved = savedText(state.units, saved.scenario);
  flow.adopt(saved.scenario);
  $('example-pick').value = '';
  $('restore-text').textContent = 'Your last work in this browser is back (saved ' + whenOf(saved.saved_at) + ').';
  $('restore-note').hidden = false;
  return true;
}

// The work set aside: up to ASIDE_MAX cases, newest first, each a record (set_aside_at,
// saved_at, units, scenario). When storage is short the oldest give way.
const ASIDE_MAX = 5;
function asideList() {
  let kept = null;
  try { kept = JSON.parse(localStorage.getItem(ASIDE_KEY) || 'null'); } catch (e) { kept = null; }
  const cases = kept && Array.isArray(kept.cases) ? kept.cases : [];
  return cases.filter((r) => r && typeof r === 'object' && looksLikeScenario(r.scenario));
}
// Writes the list (what storage cannot hold of it, the oldest, gives way); false when not
// even its newest case fits, the list kept before left as it was.
function writeAside(cases) {
  if (!cases.length) {
    try { localStorage.removeItem(ASIDE_KEY); } catch (e) { /* no storage */ }
    return true;
  }
  for (let n = Math.min(cases.length, ASIDE_MAX); n > 0; n--) if (writeKept(ASIDE_KEY, { cases: cases.slice(0, n) })) return true;
  return false;
}
// Sets `record` (saved_at, units, scenario) aside, newest first (the same case set aside
// before moves up instead of being kept twice); returns whether it was kept.
function setAside(record) {
  const cases = asideList().filter((r) => !sameCase(r.scenario, record.scenario));
  const ok = writeAside([{ set_aside_at: new Date().toISOString(), saved_at: record.saved_at, units: record.units, scenario: record.scenario }].concat(cases));
  return ok && asideList().some((r) => sameCase(r.scenario, record.scenario));
}
// The list of the work set aside and its button show while there is some.
function showAside() {
  const cases = asideList();
  $('aside-row').hidden = !cases.length;
  const pick = $('aside-pick');
  clear(pick);
  cases.forEach((r, i) => pick.append(el('option', { value: String(i), text: short(titleOf(r.scenario), 48) + ', set aside ' + whenOf(r.set_aside_at) })));
}
const openRecord = () => ({ saved_at: (readKept(AUTOSAVE_KEY) || {}).saved_at || new Date().toISOString(), units: state.units, scenario: clone(state.scenario) });

// Brings back the chosen case set aside; the case open now is set aside in its place.
function bringBack() {
  const msg = $('file-msg');
  clear(msg);
  const cases = asideList();
  const back = cases[Number($('aside-pick').value) || 0];
  if (!back) { showAside(); return; }
  const open = openRecord();
  const swapped = worthKeeping(open.scenario, back.scenario);
  const rest = cases.filter((r) => r !== back && !(swapped && sameCase(r.scenario, open.scenario)));
  writeAside(swapped ? [Object.assign({ set_aside_at: new Date().toISOString() }, open)].concat(rest) : rest);
  const kept = swapped && asideList().some((r) => sameCase(r.scenario, open.scenario));
  // The units shown stay as they are: a display choice, not part of the case.
  flow.adopt(back.scenario, 'set-aside case');
  $('example-pick').value = '';
  $('restore-note').hidden = true;
  showAside();
  msg.append(el('span', { class: 'msg ok', text: 'Brought back ' + titleOf(back.scenario) + '.' +
    (kept ? ' The case that was open, ' + titleOf(open.scenario) + ', is set aside in its place.' : '') }));
}

// ---------- the link ----------
// A link that carries the scenario: its JSON, deflated (the browser's CompressionStream,
// RFC 1951) and base64url-encoded (RFC 4648 §5), in the fragment after "#s=", which never
// leaves the browser. Opening the page with such a fragment opens that scenario (asking
// first when it would replace saved work), and the fragment is then taken off the address,
// so a reload opens the work as edited since. The fragment alone carries the case: a link
// pasted into the page's box opens whatever address comes before its "#".
const b64url = (bytes) => {
  let bin = '';
  for (let i = 0; i < bytes.length; i += 0x8000) bin += String.fromCharCode.apply(null, bytes.subarray(i, i + 0x8000));
  return btoa(bin).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
};
const unb64url = (text) => {
  if (!/^[A-Za-z0-9_-]*$/.test(text)) throw new Error('it holds characters a link to a case never has');
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

// The scenario the text after "#s=" carries; throws with the reason when it carries none.
async function unpack(text) {
  if (!text) throw new Error('nothing follows “#s=”');
  let packed;
  try { packed = unb64url(text); } catch (e) {
    throw /^it holds/.test(e.message) ? e : new Error('its packed part is damaged or cut short');
  }
  if (packed.length > MAX_LINK_BYTES) throw new Error('it is too long');
  // The browser's own reasons here name its internals ("Failed to fetch"): put in words.
  let json;
  try { json = await through(new DecompressionStream('deflate-raw'), packed); } catch (e) { throw new Error('its packed part is damaged or cut short'); }
  if (json.length > 20 * MAX_LINK_BYTES) throw new Error('it unpacks too large');
  let s;
  try { s = JSON.parse(new TextDecoder().decode(json)); } catch (e) { throw new Error('what it unpacks to is not a scenario\'s text'); }
  if (!looksLikeScenario(s)) throw new Error('what it carries is not a scenario');
  return s;
}

// The scenario the page's own address carries, or null (with the reason shown) when it
// carries none or a broken one.
async function scenarioFromLink() {
  const h = location.hash || '';
  if (!h.startsWith('#s=')) return null;
  try {
    return await unpack(h.slice(3));
  } catch (e) {
    $('restore-text').textContent = 'The link this page was opened with does not carry a scenario it can read (' + String(e && e.message || e) + ').';
    $('restore-note').hidden = false;
    return null;
  }
}

// Takes the fragment off the address (the case it carried is open, or declined), so a
// reload opens the saved work.
function dropFragment() {
  try { history.replaceState(history.state, '', location.href.split('#')[0]); } catch (e) { location.hash = ''; }
}

// Opens a link's case; `aside`, when given, is the work it replaces, set aside first.
function openLinked(linked, aside) {
  const kept = aside ? setAside(aside) : false;
  flow.adopt(linked, 'link');
  $('example-pick').value = '';
  $('restore-text').textContent = 'Opened the scenario this link carries.' + (kept
    ? ' Your work before it, ' + titleOf(aside.scenario) + ' (saved ' + whenOf(aside.saved_at) + '), is set aside in this browser: “Bring it back” under Scenario file returns it, and so does Undo.'
    : '');
  $('restore-note').hidden = false;
  showAside();
  dropFragment();
}

// The page's start: the case of the link it was opened with, the saved work, or (`fallback`)
// the first example. A link whose case differs from saved work of one's own asks first
// (until then the saved work is open and stays saved as it was).
export async function openAtStart(fallback) {
  showAside();
  const linked = await scenarioFromLink();
  if (!linked) {
    // A broken link's note is kept, followed by what opened instead.
    const linkNote = $('restore-note').hidden ? '' : $('restore-text').textContent;
    const restored = restoreAutosave();
    if (!restored) fallback();
    if (linkNote) {
      $('restore-text').textContent = linkNote + ' ' + (restored ? $('restore-text').textContent : 'The first example is open instead.');
      $('restore-note').hidden = false;
    }
    return;
  }
  const saved = readKept(AUTOSAVE_KEY);
  if (!saved || !worthKeeping(saved.scenario, linked)) {
    if (saved) applyUnits(saved.units);
    openLinked(linked, null);
    return;
  }
  restoreAutosave();
  askAboutLink(linked, saved);
}

// The question put when a link's case would replace saved work: in the page, both choices
// in words, and nothing replaced until one is made (Escape keeps the work).
function askAboutLink(linked, saved) {
  const d = $('link-ask');
  $('link-ask-mine').textContent = 'This browser keeps your work ' + titleOf(saved.scenario) + ', last changed ' + whenOf(saved.saved_at) +
    '. The link carries another case, ' + titleOf(linked) + '.';
  clear($('link-ask-msg'));
  const decide = (open) => {
    d.removeEventListener('cancel', onCancel);
    $('link-ask-open').onclick = null;
    $('link-ask-keep').onclick = null;
    $('link-ask-save').onclick = null;
    if (d.open) d.close();
    if (open) { openLinked(linked, readKept(AUTOSAVE_KEY) || saved); return; }
    const link = location.href;
    dropFragment();
    $('link-paste').value = link;
    $('restore-text').textContent = 'Your work ' + titleOf(saved.scenario) + ' is open, as saved at ' + whenOf(saved.saved_at) +
      '. The link\'s case was not opened: its link waits in the “Open a link” box under Scenario file (until you leave the page), or open the link again.';
    $('restore-note').hidden = false;
  };
  const onCancel = (e) => { e.preventDefault(); decide(false); };
  // The open case is the saved work until a choice is made.
  $('link-ask-save').onclick = () => {
    saveFile();
    clear($('link-ask-msg'));
    $('link-ask-msg').append(el('span', { class: 'msg ok', text: 'Your work is saved as ' + fileStem('scenario') + '.hibernal.json in your downloads.' }));
  };
  d.addEventListener('cancel', onCancel);
  $('link-ask-open').onclick = () => decide(true);
  $('link-ask-keep').onclick = () => decide(false);
  if (typeof d.showModal === 'function') d.showModal(); else d.setAttribute('open', '');
  $('link-ask-keep').focus();
}

// A link put into the address bar of the page already open changes only the fragment (no
// reload): its case opens by the same rule as at the start, asking first when the open
// work is one's own and differs.
async function linkInAddress() {
  if (!(location.hash || '').startsWith('#s=')) return;
  if ($('link-ask').open) return;
  const linked = await scenarioFromLink();
  if (!linked) return;
  const open = openRecord();
  if (worthKeeping(open.scenario, linked)) askAboutLink(linked, open);
  else openLinked(linked, null);
}

// The "Open a link" box: a whole link (any address before its "#") or its fragment alone.
// Its case replaces the open work, which is set aside first (and Undo brings it back too);
// text that carries no case says why beside the box and changes nothing.
async function openPastedLink() {
  const box = $('link-paste');
  const msg = $('link-paste-msg');
  clear(msg);
  const say = (cls, text) => msg.append(el('span', { class: 'msg ' + cls, text }));
  const text = box.value.replace(/\s+/g, '');
  if (!text) { say('error', 'Paste a link first: a link to a case ends in “#s=” and a long run of letters and digits.'); return; }
  const at = text.indexOf('#');
  const frag = at >= 0 ? text.slice(at + 1) : text;
  if (!frag.startsWith('s=')) {
    say('error', 'That is not a link to a case: it has no part that starts “#s=”. The open work is unchanged.');
    return;
  }
  let linked;
  try { linked = await unpack(frag.slice(2)); } catch (e) {
    say('error', 'That link does not carry a case this page can read (' + String(e && e.message || e) + '). The open work is unchanged.');
    return;
  }
  const open = openRecord();
  const kept = worthKeeping(open.scenario, linked) && setAside(open);
  flow.adopt(linked, 'link');
  $('example-pick').value = '';
  $('restore-note').hidden = true;
  showAside();
  box.value = '';
  say('ok', 'Opened ' + titleOf(linked) + ' from the link.' + (kept ? ' The work open before, ' + titleOf(open.scenario) +
    ', is set aside: “Bring it back” above returns it, and so does Undo.' : ''));
}

export function setUpLinks() {
  $('aside-back').addEventListener('click', bringBack);
  window.addEventListener('hashchange', linkInAddress);
  $('link-paste-open').addEventListener('click', openPastedLink);
  $('link-paste').addEventListener('keydown', (e) => { if (e.key === 'Enter') { e.preventDefault(); openPastedLink(); } });
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
