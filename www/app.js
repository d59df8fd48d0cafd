// Hibernal page logic. The scenario lives here in SI units; inputs show it in the
// chosen unit system. Numbers are parsed at the edge: text that is not a number is
// kept as typed and flagged beside its field, and the calculator is not called until
// it is fixed. The calculation itself runs in the WebAssembly core (global
// `wasm_bindgen`). All text from users goes into the page through textContent only.
'use strict';
(function () {
  const $ = (id) => document.getElementById(id);
  const MAX_LAYERS = 64;
  const DEBOUNCE_MS = 100;

  let W = null; // the wasm API
  let CAT = null;
  let EXAMPLES = [];

  const state = {
    scenario: null,
    units: 'si',
    lastGood: null, // { scenario, report } of the last successful compute
    preset: { top: '', bottom: '' },
    timer: 0,
  };

  // Raw text of inputs that did not parse, per owning object (a layer, a face).
  // Key: path relative to the owner, e.g. "thickness_m", "material.density_kg_m3".
  const badText = new WeakMap();
  // Earlier materials of a layer by kind, so switching kind back restores them.
  const pastMaterials = new WeakMap();

  function bad(owner) {
    let m = badText.get(owner);
    if (!m) { m = new Map(); badText.set(owner, m); }
    return m;
  }

  // ---------- DOM helpers ----------
  function el(tag, attrs, ...kids) {
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
  const clear = (e) => { while (e.firstChild) e.removeChild(e.firstChild); };
  const idFor = (path) => 'f-' + path.replace(/[^A-Za-z0-9]+/g, '-');
  const clone = (o) => JSON.parse(JSON.stringify(o));

  // ---------- units ----------
  // Units come from the core's table (catalogue().units): the page hard-codes no factor.
  function unit(q) {
    const u = CAT && CAT.units && CAT.units[q];
    if (!u) throw new Error('the unit table has no quantity "' + q + '"');
    return u[state.units] || u.si;
  }
  // The freezing point as the user reads it.
  const freezeT = () => (state.units === 'us' ? '32\u00a0°F' : '0\u00a0°C');
  const toDisplay = (q, si) => si * unit(q).factor + unit(q).offset;
  const fromDisplay = (q, d) => (d - unit(q).offset) / unit(q).factor;

  function fmtNum(v, decimals) {
    if (v == null || !Number.isFinite(v)) return '–';
    let s = v.toFixed(decimals);
    if (/^-0(\.0*)?$/.test(s)) s = s.slice(1); // no "-0.0"
    return s.replace(/^-/, '\u2212');
  }
  // A value for display, without unit.
  function fmt(q, si) {
    if (si == null || !Number.isFinite(si)) return '–';
    return fmtNum(toDisplay(q, si), unit(q).decimals);
  }
  // A value with its unit symbol.
  function fmtU(q, si) {
    const s = fmt(q, si);
    const sym = unit(q).symbol;
    return s === '–' || !sym ? s : s + '\u00a0' + sym;
  }
  // A value to place in an input: a little more precision than display, no trailing zeros.
  function fmtInput(q, si) {
    if (si == null || !Number.isFinite(si)) return '';
    const d = toDisplay(q, si);
    const places = Math.min(10, (unit(q).decimals || 0) + 2);
    return String(Number(d.toFixed(places)));
  }

  // Accepts "12", "-3.5", ".5", "1e-3", and a decimal comma ("1,5").
  function parseNumber(text) {
    let t = String(text).trim().replace(/^\u2212/, '-');
    if (/^[+-]?\d+,\d+$/.test(t)) t = t.replace(',', '.');
    if (!/^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(t)) return null;
    const v = Number(t);
    return Number.isFinite(v) ? v : null;
  }

  // ---------- material definitions ----------
  function nominalBoard(id) {
    const b = CAT.boards.find((x) => x.id === id);
    return b ? b.conductivity_w_m_k : null;
  }
  function defaultMaterial(kind) {
    const firstCorr = CAT.snow_correlations[0] ? CAT.snow_correlations[0].id : 'sturm-1997-quadratic';
    switch (kind) {
      case 'snow': return { kind, density_kg_m3: 300, correlation: firstCorr };
      case 'soil': return { kind, texture: 'silt', model: 'kersten-1949', dry_density_kg_m3: 1600, water_content_pct: 20, quartz_fraction: 0.3 };
      case 'insulation': return { kind, board: 'xps', conductivity_w_m_k: null, moisture_derating_pct: 0 };
      case 'concrete': return { kind, conductivity_w_m_k: null };
      case 'custom': return { kind, label: 'Own material', conductivity_w_m_k: 0.5, frozen_conductivity_w_m_k: null, density_kg_m3: 1000, specific_heat_j_kg_k: 1000 };
      default: return { kind };
    }
  }

  // Fields shown for each material kind (key is the property of `material`).
  function materialFields(m) {
    switch (m.kind) {
      case 'snow': return [
        { key: 'density_kg_m3', label: 'Density', q: 'density' },
        { key: 'correlation', label: 'Conductivity regression', cls: 'span2', options: CAT.snow_correlations.map((c) => ({ value: c.id, text: c.name, title: c.citation + ' (fitted to ' + fmt('density', c.range_kg_m3[0]) + '–' + fmtU('density', c.range_kg_m3[1]) + ')' })) },
      ];
      case 'soil': return [
        { key: 'texture', label: 'Texture', options: CAT.soil_textures.map((t) => ({ value: t.id, text: t.name })) },
        { key: 'model', label: 'Conductivity model', cls: 'span2', options: CAT.soil_models.map((s) => ({ value: s.id, text: s.textures.includes(m.texture) ? s.name : s.name + ' (not for this texture)', title: s.citation })) },
        { key: 'dry_density_kg_m3', label: 'Dry density', q: 'density' },
        { key: 'water_content_pct', label: 'Water content', q: 'water_content', hint: '% of dry mass' },
        { key: 'quartz_fraction', label: 'Quartz fraction', q: 'fraction', hint: m.model === 'kersten-1949' ? 'not used by this model' : '0 to 1 of solids' },
      ];
      case 'insulation': return [
        { key: 'board', label: 'Board type', cls: 'span2', options: CAT.boards.map((b) => ({ value: b.id, text: b.name, title: b.source })) },
        { key: 'conductivity_w_m_k', label: 'Conductivity', q: 'conductivity', optional: true, placeholder: () => fmt('conductivity', nominalBoard(m.board)), hint: 'blank: nominal' },
        { key: 'moisture_derating_pct', label: 'R lost to moisture', q: 'percent', hint: 'for buried boards' },
      ];
      case 'concrete': return [
        { key: 'conductivity_w_m_k', label: 'Conductivity', q: 'conductivity', optional: true, placeholder: () => 'nominal', hint: 'blank: nominal' },
      ];
      case 'custom': return [
        { key: 'label', label: 'Material name', text: true },
        { key: 'conductivity_w_m_k', label: 'Conductivity', q: 'conductivity' },
        { key: 'frozen_conductivity_w_m_k', label: 'Frozen conductivity', q: 'conductivity', optional: true, placeholder: () => 'same', hint: 'blank: same as unfrozen' },
        { key: 'density_kg_m3', label: 'Density', q: 'density' },
        { key: 'specific_heat_j_kg_k', label: 'Specific heat', q: 'specific_heat' },
      ];
      default: return [];
    }
  }

  // ---------- field building ----------
  // spec: { path, label, q?, options?, text?, optional?, placeholder?, hint?,
  //         owner, key (relative to owner), get(), set(v), after?() }
  function field(spec) {
    const id = idFor(spec.path);
    const u = spec.q ? unit(spec.q).symbol : '';
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
      input.addEventListener('change', () => { spec.set(input.value); if (spec.after) spec.after(); else schedule(); });
      wrap.append(input);
    } else if (spec.text) {
      input = el('input', { id, type: 'text', 'data-field': spec.path, autocomplete: 'off', spellcheck: 'false', 'aria-describedby': msgId });
      input.value = spec.get() == null ? '' : String(spec.get());
      input.addEventListener('input', () => { spec.set(input.value); schedule(); });
      wrap.append(input);
    } else {
      const store = bad(spec.owner);
      const raw = store.get(spec.key);
      input = el('input', {
        id, type: 'text', inputmode: 'decimal', 'data-field': spec.path, 'data-quantity': spec.q,
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
          const v = parseNumber(text);
          if (v == null) {
            store.set(spec.key, { text, label: spec.label });
          } else {
            store.delete(spec.key);
            spec.set(fromDisplay(spec.q, v));
          }
        }
        if (spec.after) spec.after();
        schedule();
      });
      const box = el('span', { class: 'with-unit' }, input);
      if (u) box.append(el('span', { class: 'unit-suffix', 'aria-hidden': 'true', text: u }));
      wrap.append(box);
      if (u) input.setAttribute('aria-label', spec.label + ' (' + u + ')');
    }
    if (spec.hint) wrap.append(el('span', { class: 'field-hint', text: spec.hint }));
    wrap.append(el('span', { class: 'field-msg', id: msgId, 'data-msg-for': spec.path, 'aria-live': 'polite' }));
    return wrap;
  }

  // ---------- layer list ----------
  function renderLayers(focus) {
    const list = $('layer-list');
    clear(list);
    const layers = state.scenario.layers;
    layers.forEach((layer, i) => list.append(layerRow(layer, i, layers.length)));
    $('add-layer').disabled = layers.length >= MAX_LAYERS;
    if (focus) {
      const b = list.querySelector(focus);
      if (b && !b.disabled) b.focus();
    }
  }

  function layerRow(layer, i, n) {
    const base = 'layers[' + i + ']';
    const li = el('li', { class: 'layer kind-' + (layer.material && layer.material.kind), 'data-index': i });
    const nameLabel = () => (layer.name && layer.name.trim()) ? layer.name : 'layer ' + (i + 1);
    const main = el('div', { class: 'layer-main' });
    main.append(el('span', { class: 'layer-no', 'aria-hidden': 'true', text: String(i + 1) }));
    main.append(field({
      path: base + '.name', label: 'Name', text: true, cls: 'name',
      get: () => layer.name, set: (v) => { layer.name = v; },
    }));
    main.append(field({
      path: base + '.material.kind', label: 'Material',
      options: CAT.material_kinds.map((k) => ({ value: k.id, text: k.name })),
      get: () => layer.material.kind,
      set: (v) => changeKind(layer, v),
      after: () => { renderLayers('[data-field="' + base + '.material.kind"]'); run(); },
    }));
    main.append(field({
      path: base + '.thickness_m', label: 'Thickness', q: 'thickness', owner: layer, key: 'thickness_m',
      get: () => layer.thickness_m, set: (v) => { layer.thickness_m = v; },
    }));
    const btns = el('div', { class: 'row-buttons', role: 'group', 'aria-label': 'Arrange layer ' + (i + 1) });
    btns.append(
      el('button', { type: 'button', class: 'icon-btn', 'data-act': 'up', disabled: i === 0, 'aria-label': 'Move layer ' + (i + 1) + ' (' + nameLabel() + ') up', title: 'Move up', onclick: () => moveLayer(i, -1), text: '▲' }),
      el('button', { type: 'button', class: 'icon-btn', 'data-act': 'down', disabled: i === n - 1, 'aria-label': 'Move layer ' + (i + 1) + ' (' + nameLabel() + ') down', title: 'Move down', onclick: () => moveLayer(i, 1), text: '▼' }),
      el('button', { type: 'button', class: 'icon-btn danger', 'data-act': 'remove', disabled: n <= 1, 'aria-label': 'Remove layer ' + (i + 1) + ' (' + nameLabel() + ')', title: 'Remove layer', onclick: () => removeLayer(i), text: '✕' }),
    );
    main.append(btns);
    li.append(main);

    const m = layer.material;
    const fields = materialFields(m);
    if (fields.length) {
      const mat = el('div', { class: 'layer-material' });
      for (const f of fields) {
        const relayout = (f.key === 'texture' || f.key === 'model' || f.key === 'board');
        mat.append(field(Object.assign({}, f, {
          path: base + '.material.' + f.key, owner: layer, key: 'material.' + f.key,
          get: () => layer.material[f.key],
          set: (v) => { layer.material[f.key] = v; },
          after: relayout ? () => { renderLayers('[data-field="' + base + '.material.' + f.key + '"]'); run(); } : null,
        })));
      }
      li.append(mat);
    } else {
      li.append(el('div', { class: 'layer-material none', text: 'Properties from the built-in tables.' }));
    }
    return li;
  }

  function changeKind(layer, kind) {
    let past = pastMaterials.get(layer);
    if (!past) { past = {}; pastMaterials.set(layer, past); }
    past[layer.material.kind] = layer.material;
    const store = bad(layer);
    for (const k of [...store.keys()]) if (k.startsWith('material.')) store.delete(k);
    layer.material = past[kind] || defaultMaterial(kind);
  }

  function moveLayer(i, d) {
    const L = state.scenario.layers;
    const j = i + d;
    if (j < 0 || j >= L.length) return;
    [L[i], L[j]] = [L[j], L[i]];
    renderLayers('li[data-index="' + j + '"] [data-act="' + (d < 0 ? 'up' : 'down') + '"]');
    run();
  }
  function removeLayer(i) {
    const L = state.scenario.layers;
    if (L.length <= 1) return;
    L.splice(i, 1);
    renderLayers('li[data-index="' + Math.min(i, L.length - 1) + '"] [data-act="remove"]');
    run();
  }
  function addLayer() {
    const L = state.scenario.layers;
    if (L.length >= MAX_LAYERS) return;
    const last = L[L.length - 1];
    L.push({
      name: 'New layer',
      thickness_m: 0.1,
      material: last ? clone(last.material) : defaultMaterial('snow'),
    });
    renderLayers();
    const inputs = $('layer-list').querySelectorAll('li:last-child input[data-field$=".name"]');
    if (inputs[0]) inputs[0].focus();
    run();
  }

  // ---------- faces ----------
  const CUSTOM_AIR = '__air';
  const FIXED_SURFACE = '__surface';

  function presetList() {
    const list = CAT.surface_presets.map((p) => ({ value: p.id, text: p.name, title: p.source, film: p.film_w_m2k }));
    list.push({ value: CUSTOM_AIR, text: 'Air, film coefficient entered below', film: undefined });
    if (!CAT.surface_presets.some((p) => p.film_w_m2k == null)) {
      list.push({ value: FIXED_SURFACE, text: 'Fixed surface temperature (no film)', film: null });
    }
    return list;
  }
  function guessPreset(face) {
    const list = presetList();
    if (face.kind === 'surface') return list.find((p) => p.film === null).value;
    const hit = list.find((p) => typeof p.film === 'number' && Math.abs(p.film - face.film_w_m2k) < 1e-9);
    return hit ? hit.value : CUSTOM_AIR;
  }

  function renderFaces() {
    renderFace('top', 'Top face', 'the outer or upper side');
    renderFace('bottom', 'Bottom face', 'the inner or deep side');
  }
  function renderFace(which, title, sub) {
    const box = $('face-' + which);
    clear(box);
    const face = state.scenario[which];
    box.append(el('h3', { text: title }), el('p', { class: 'hint', text: 'Conditions on ' + sub + '.' }));
    const list = presetList();
    box.append(field({
      path: which + '.kind', label: 'Meets', cls: 'wide',
      options: list,
      get: () => state.preset[which],
      set: (v) => {
        state.preset[which] = v;
        const p = list.find((x) => x.value === v);
        if (p.film === null) {
          face.kind = 'surface';
          delete face.film_w_m2k;
          bad(face).delete('film_w_m2k');
        } else {
          face.kind = 'air';
          if (typeof p.film === 'number') { face.film_w_m2k = p.film; bad(face).delete('film_w_m2k'); }
          else if (typeof face.film_w_m2k !== 'number') face.film_w_m2k = 10;
        }
      },
      after: () => { renderFace(which, title, sub); $(idFor(which + '.kind')).focus(); run(); },
    }));
    box.append(field({
      path: which + '.temperature_c', label: face.kind === 'air' ? 'Air temperature' : 'Surface temperature',
      q: 'temperature', owner: face, key: 'temperature_c',
      get: () => face.temperature_c, set: (v) => { face.temperature_c = v; },
    }));
    if (face.kind === 'air') {
      box.append(field({
        path: which + '.film_w_m2k', label: 'Surface film coefficient', q: 'film', owner: face, key: 'film_w_m2k',
        hint: 'h; its resistance is 1/h',
        get: () => face.film_w_m2k,
        set: (v) => { face.film_w_m2k = v; },
        after: () => {
          const sel = $(idFor(which + '.kind'));
          const g = bad(face).has('film_w_m2k') ? CUSTOM_AIR : guessPreset(face);
          state.preset[which] = g;
          sel.value = g;
        },
      }));
    }
  }

  function renderMeta() {
    $('f-title').value = state.scenario.title || '';
    $('f-notes').value = state.scenario.notes || '';
  }

  function renderInputs() {
    renderMeta();
    renderLayers();
    renderFaces();
    for (const e of document.querySelectorAll('[data-unit]')) e.textContent = unit(e.dataset.unit).symbol;
    for (const e of document.querySelectorAll('.freeze-t')) e.textContent = freezeT();
  }

  // ---------- messages ----------
  function clearMessages() {
    for (const m of document.querySelectorAll('.field-msg')) clear(m);
    for (const i of document.querySelectorAll('[aria-invalid]')) i.removeAttribute('aria-invalid');
    for (const f of document.querySelectorAll('.field.has-error, .field.has-warning')) f.classList.remove('has-error', 'has-warning');
    const g = $('general-errors');
    clear(g); g.hidden = true;
  }

  function fieldLabel(path) {
    const input = document.querySelector('[data-field="' + CSS.escape(path) + '"]');
    if (!input) return null;
    const lab = document.querySelector('label[for="' + CSS.escape(input.id) + '"]');
    return lab ? lab.textContent : null;
  }

  // Human name of a field path, for lists away from the field.
  function describePath(path) {
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
    if (!q || !(CAT.units && CAT.units[q])) return message;
    const u = unit(q);
    if (u.factor === 1 && u.offset === 0) return message;
    const show = (v) => fmtInput(q, v) + (u.symbol ? '\u00a0' + u.symbol : '');
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
      return Number.isFinite(v) ? '(got ' + fmtInput(q, v) + (u.symbol ? '\u00a0' + u.symbol : '') + ')' : all;
    });
  }

  // Puts a message beside the field with that path; returns false if there is none.
  function placeMessage(path, message, level, err) {
    const box = document.querySelector('[data-msg-for="' + CSS.escape(path) + '"]');
    if (!box) return false;
    const input = document.querySelector('[data-field="' + CSS.escape(path) + '"]');
    box.append(el('span', { class: 'msg ' + level, text: withLabel(fieldLabel(path), inShownUnits(input, message, err)) }));
    if (input && level === 'error') input.setAttribute('aria-invalid', 'true');
    const f = box.closest('.field');
    if (f) f.classList.add(level === 'error' ? 'has-error' : 'has-warning');
    return true;
  }

  function generalError(text) {
    const g = $('general-errors');
    g.append(el('li', { text }));
    g.hidden = false;
  }

  function localErrors() {
    const out = [];
    const add = (owner, prefix) => {
      const m = badText.get(owner);
      if (!m) return;
      for (const [key, v] of m) out.push({ field: prefix + key, label: v.label });
    };
    state.scenario.layers.forEach((L, i) => add(L, 'layers[' + i + '].'));
    add(state.scenario.top, 'top.');
    add(state.scenario.bottom, 'bottom.');
    return out;
  }

  function setStale(stale) {
    $('results').classList.toggle('is-stale', stale);
    $('results').dataset.stale = stale ? 'true' : 'false';
    $('stale-note').hidden = !stale || !state.lastGood;
    $('profile-chart').classList.toggle('is-stale', stale);
  }

  // ---------- compute ----------
  function schedule() {
    clearTimeout(state.timer);
    $('results').dataset.pending = 'true';
    state.timer = setTimeout(run, DEBOUNCE_MS);
  }

  function run() {
    clearTimeout(state.timer);
    clearMessages();
    const local = localErrors();
    if (local.length) {
      for (const e of local) {
        if (!placeMessage(e.field, 'enter a number', 'error')) generalError(describePath(e.field) + ': enter a number');
      }
      setStale(true);
      finish();
      return;
    }
    let res;
    try {
      res = W.compute(state.scenario);
    } catch (err) {
      console.error(err);
      generalError('The calculation failed unexpectedly: ' + String(err && err.message || err));
      setStale(true);
      finish();
      return;
    }
    if (!res || !res.ok) {
      const errors = (res && res.errors) || [];
      for (const e of errors) {
        if (!placeMessage(e.field, e.message, 'error', e)) generalError(describePath(e.field) + ': ' + e.message);
      }
      if (!errors.length) generalError('The inputs could not be used.');
      setStale(true);
      finish();
      return;
    }
    state.lastGood = { scenario: clone(state.scenario), report: res.report };
    setStale(false);
    renderReport();
    drawChart();
    finish();
  }
  function finish() {
    const r = $('results');
    r.dataset.pending = 'false';
    r.dataset.runs = String(Number(r.dataset.runs || 0) + 1);
  }

  // ---------- report ----------
  function renderReport() {
    if (!state.lastGood) return;
    const rep = state.lastGood.report;
    const scen = state.lastGood.scenario;
    for (const e of document.querySelectorAll('[data-unit]')) e.textContent = unit(e.dataset.unit).symbol;
    $('r-total').textContent = fmt('r_value', rep.r_total_m2k_w);
    $('r-layers').textContent = fmt('r_value', rep.r_layers_m2k_w);
    $('u-value').textContent = fmt('u_value', rep.u_w_m2k);
    const q = rep.heat_flux_w_m2;
    $('heat-flux').textContent = fmt('heat_flux', Math.abs(q));
    const shownZero = fmt('heat_flux', Math.abs(q)).replace(/[0.\u2212]/g, '') === '';
    $('heat-direction').textContent = shownZero ? 'No heat flow: both sides are at the same temperature.'
      : q > 0 ? 'Heat flows from the top face down to the bottom face.'
        : 'Heat flows from the bottom face up to the top face.';

    // 0 °C planes
    const zp = rep.zero_planes || [];
    const zd = $('zero-depth');
    const zdet = $('zero-detail');
    if (!zp.length) {
      zd.textContent = 'No ' + freezeT() + ' plane in the stack';
      zd.classList.add('small');
      const temps = [rep.top.surface_c, rep.bottom.surface_c];
      zdet.textContent = temps.every((t) => t < 0) ? 'Every layer is below ' + freezeT() + '.'
        : temps.every((t) => t > 0) ? 'Every layer is above ' + freezeT() + '.' : '';
    } else {
      zd.classList.remove('small');
      zd.textContent = zp.map((z) => fmtU('depth', z.depth_m)).join(', ');
      zdet.textContent = zp.map((z) => {
        const L = rep.layers[z.layer];
        return 'In layer ' + (z.layer + 1) + (L ? ' (' + L.name + ')' : '') + '; frozen ' + (z.frozen_side === 'above' ? 'above' : 'below') + ' it.';
      }).join(' ');
    }

    // surface temperatures
    const st = $('surface-temps');
    clear(st);
    for (const [which, label] of [['top', 'Top face'], ['bottom', 'Bottom face']]) {
      const f = rep[which];
      st.append(el('dt', { text: label }));
      const parts = ['surface ' + fmtU('temperature', f.surface_c)];
      if (f.air_c != null) parts.push('air ' + fmtU('temperature', f.air_c));
      if (f.film_r_m2k_w) parts.push('film R ' + fmtU('r_value', f.film_r_m2k_w));
      st.append(el('dd', { id: 'surface-' + which, text: parts.join(' · ') }));
    }

    renderBand(rep, scen);
    renderLayerTables(rep);

    // warnings
    const wl = $('warnings');
    clear(wl);
    const warnings = rep.warnings || [];
    for (const w of warnings) {
      wl.append(el('li', { text: describePath(w.field) + ': ' + w.message }));
      placeMessage(w.field, w.message, 'warning');
    }
    $('warnings-block').hidden = !warnings.length;
  }

  function renderBand(rep, scen) {
    const block = $('band-block');
    const band = rep.band;
    if (!band) { block.hidden = true; return; }
    block.hidden = false;
    const n = band.by_correlation.length;
    const fluxes = [Math.abs(band.flux_min_w_m2), Math.abs(band.flux_max_w_m2)].sort((a, b) => a - b);
    let text = 'R ranges from ' + fmt('r_value', band.r_min_m2k_w) + ' to ' + fmtU('r_value', band.r_max_m2k_w) +
      ' across ' + n + ' published snow conductivity regressions; heat flux from ' + fmt('heat_flux', fluxes[0]) + ' to ' + fmtU('heat_flux', fluxes[1]) + '.';
    if (band.zero_depth_min_m != null && band.zero_depth_max_m != null) {
      text += ' The ' + freezeT() + ' plane lies between ' + fmt('depth', band.zero_depth_min_m) + ' and ' + fmtU('depth', band.zero_depth_max_m) + ' deep.';
    }
    $('band-summary').textContent = text;
    const skipped = Array.isArray(band.skipped) ? band.skipped : [];
    const sk = $('band-skipped');
    sk.textContent = skipped.length ? 'Left out here: ' + skipped.map((x) => {
      if (typeof x === 'string') return x;
      // Each is { field: correlation id, message }.
      const id = x.id || x.field || '';
      const c = CAT.snow_correlations.find((k) => k.id === id);
      const name = x.name || (c ? c.name : id);
      const why = x.reason || x.message || '';
      return why ? name + ' (' + why + ')' : name;
    }).join('; ') + '.' : '';
    sk.hidden = !skipped.length;
    const used = new Set(scen.layers.filter((l) => l.material && l.material.kind === 'snow').map((l) => l.material.correlation));
    const table = $('band-table');
    const thead = table.tHead; clear(thead);
    thead.append(el('tr', null,
      headCell('Regression', null), headCell('R, air to air', 'r_value'),
      headCell('Heat flux', 'heat_flux'), headCell(freezeT() + ' plane', 'depth')));
    const tbody = table.tBodies[0]; clear(tbody);
    for (const c of band.by_correlation) {
      const inUse = used.has(c.id);
      tbody.append(el('tr', { class: inUse ? 'in-use' : null },
        el('th', { scope: 'row' }, c.name, inUse ? el('span', { class: 'tag', text: 'in use' }) : null),
        el('td', { class: 'num', text: fmt('r_value', c.r_total_m2k_w) }),
        el('td', { class: 'num', text: fmt('heat_flux', Math.abs(c.heat_flux_w_m2)) }),
        el('td', { class: 'num', text: c.zero_planes_m && c.zero_planes_m.length ? c.zero_planes_m.map((d) => fmt('depth', d)).join(', ') : 'none' })));
    }
  }

  // A column heading with its unit on a line of its own.
  function headCell(text, q) {
    const sym = q ? unit(q).symbol : '';
    return el('th', { scope: 'col', class: q ? 'num' : null }, text, sym ? el('span', { class: 'u', text: sym }) : null);
  }

  function renderLayerTables(rep) {
    const cols = [
      ['#', null], ['Layer', null], ['Material', null],
      ['Thickness', 'thickness'], ['Depth, top to bottom', 'depth'], ['R', 'r_value'],
      ['Temperature at top', 'temperature'], ['Temperature at bottom', 'temperature'],
      ['Effective k', 'conductivity'], ['State', null],
    ];
    const t = $('layer-results');
    const head = t.tHead; clear(head);
    head.append(el('tr', null, ...cols.map(([h, q]) => headCell(h, q))));
    const body = t.tBodies[0]; clear(body);
    rep.layers.forEach((L, i) => {
      body.append(el('tr', null,
        el('td', { text: String(i + 1) }),
        el('th', { scope: 'row', class: 'layer-name', text: L.name }),
        el('td', { text: L.material }),
        el('td', { class: 'num', text: fmt('thickness', L.thickness_m) }),
        el('td', { class: 'num', text: fmt('depth', L.top_depth_m) + ' – ' + fmt('depth', L.bottom_depth_m) }),
        el('td', { class: 'num', text: fmt('r_value', L.r_m2k_w) }),
        el('td', { class: 'num', text: fmt('temperature', L.top_c) }),
        el('td', { class: 'num', text: fmt('temperature', L.bottom_c) }),
        el('td', { class: 'num', text: fmt('conductivity', L.conductivity_w_m_k) }),
        el('td', null, el('span', { class: 'state state-' + String(L.state).replace(/\s+/g, '-'), text: L.state }))));
    });

    const pcols = [
      ['#', null], ['Layer', null], ['k frozen', 'conductivity'], ['k unfrozen', 'conductivity'],
      ['Density', 'density'], ['Heat capacity, frozen', 'heat_capacity_vol'], ['Heat capacity, unfrozen', 'heat_capacity_vol'], ['Latent heat', 'latent_vol'],
    ];
    const p = $('layer-props');
    clear(p.tHead);
    p.tHead.append(el('tr', null, ...pcols.map(([h, q]) => headCell(h, q))));
    clear(p.tBodies[0]);
    rep.layers.forEach((L, i) => {
      const pr = L.properties || {};
      p.tBodies[0].append(el('tr', null,
        el('td', { text: String(i + 1) }),
        el('th', { scope: 'row', class: 'layer-name', text: L.name }),
        el('td', { class: 'num', text: fmt('conductivity', pr.k_frozen_w_m_k) }),
        el('td', { class: 'num', text: fmt('conductivity', pr.k_unfrozen_w_m_k) }),
        el('td', { class: 'num', text: fmt('density', pr.density_kg_m3) }),
        el('td', { class: 'num', text: fmt('heat_capacity_vol', pr.c_frozen_j_m3k) }),
        el('td', { class: 'num', text: fmt('heat_capacity_vol', pr.c_unfrozen_j_m3k) }),
        el('td', { class: 'num', text: fmt('latent_vol', pr.latent_j_m3) })));
    });
  }

  // ---------- chart ----------
  let chartMsg = null;
  function drawChart() {
    const c = $('profile-chart');
    if (!state.lastGood || !W) return;
    const dpr = window.devicePixelRatio || 1;
    const rect = c.getBoundingClientRect();
    if (rect.width < 2 || rect.height < 2) return;
    c.width = Math.max(1, Math.round(rect.width * dpr));
    c.height = Math.max(1, Math.round(rect.height * dpr));
    let r;
    try {
      r = W.draw_profile(c, state.lastGood.scenario, state.units, dpr);
    } catch (err) {
      console.error(err);
      r = { ok: false, message: String(err && err.message || err) };
    }
    if (!chartMsg) {
      chartMsg = el('p', { class: 'msg error chart-msg', role: 'status' });
      c.after(chartMsg);
    }
    chartMsg.textContent = r && r.ok ? '' : 'The chart could not be drawn: ' + ((r && r.message) || 'unknown reason');
    c.dataset.draws = String(Number(c.dataset.draws || 0) + 1);
  }

  // ---------- scenario in and out ----------
  function adopt(scenario) {
    state.scenario = scenario;
    if (typeof state.scenario.title !== 'string') state.scenario.title = '';
    if (typeof state.scenario.notes !== 'string') state.scenario.notes = '';
    state.preset.top = guessPreset(scenario.top);
    state.preset.bottom = guessPreset(scenario.bottom);
    state.lastGood = null;
    renderInputs();
    run();
  }

  function looksLikeScenario(s) {
    const face = (f) => f && typeof f === 'object' && (f.kind === 'air' || f.kind === 'surface');
    return s && typeof s === 'object' && s.format === 'hibernal-scenario' && Array.isArray(s.layers) && s.layers.length >= 1 &&
      s.layers.every((l) => l && typeof l === 'object' && l.material && typeof l.material === 'object' && typeof l.material.kind === 'string') &&
      face(s.top) && face(s.bottom);
  }

  function saveFile() {
    const text = JSON.stringify(state.scenario, null, 2) + '\n';
    const blob = new Blob([text], { type: 'application/json' });
    const url = URL.createObjectURL(blob);
    const name = (state.scenario.title || 'scenario').replace(/[^A-Za-z0-9_-]+/g, '-').replace(/^-+|-+$/g, '').toLowerCase() || 'scenario';
    const a = el('a', { href: url, download: name + '.hibernal.json' });
    document.body.append(a);
    a.click();
    a.remove();
    setTimeout(() => URL.revokeObjectURL(url), 5000);
  }

  function openFile(ev) {
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
      adopt(s);
      msg.append(el('span', { class: 'msg ok', text: 'Opened ' + file.name + '.' }));
    };
    reader.onerror = () => msg.append(el('span', { class: 'msg error', text: 'The file could not be read.' }));
    reader.readAsText(file);
    ev.target.value = '';
  }

  // ---------- sources ----------
  function renderSources() {
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

  // ---------- start ----------
  function decodeBase64(b64) {
    const bin = atob(b64);
    const out = new Uint8Array(bin.length);
    for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
    return out;
  }

  async function start() {
    const status = $('load-status');
    try {
      if (typeof wasm_bindgen !== 'function') throw new Error('the calculator core is missing from this page');
      const data = $('hibernal-wasm');
      if (!data) throw new Error('the calculator module is missing from this page');
      await wasm_bindgen({ module_or_path: decodeBase64(data.textContent.trim()) });
      W = wasm_bindgen;
      CAT = W.catalogue();
      EXAMPLES = W.examples();
    } catch (err) {
      console.error(err);
      status.textContent = 'The calculator could not start: ' + String(err && err.message || err);
      status.classList.add('failed');
      return;
    }

    try {
      setUp();
    } catch (err) {
      console.error(err);
      status.textContent = 'The page could not be set up: ' + String(err && err.message || err);
      status.classList.add('failed');
    }
  }

  function setUp() {
    const pick = $('example-pick');
    for (const ex of EXAMPLES) pick.append(el('option', { value: ex.id, text: ex.title }));
    pick.addEventListener('change', () => loadExample(pick.value));

    for (const r of document.querySelectorAll('input[name="units"]')) {
      r.addEventListener('change', () => {
        if (!r.checked) return;
        state.units = r.value;
        document.documentElement.dataset.units = state.units;
        renderInputs();
        renderSources();
        // Shown at once in the new units; run() then recomputes if the inputs allow.
        if (state.lastGood) { renderReport(); drawChart(); }
        run();
      });
    }
    const checked = document.querySelector('input[name="units"]:checked');
    state.units = checked ? checked.value : 'si';
    document.documentElement.dataset.units = state.units;

    $('f-title').addEventListener('input', (e) => { state.scenario.title = e.target.value; schedule(); });
    $('f-notes').addEventListener('input', (e) => { state.scenario.notes = e.target.value; schedule(); });
    $('add-layer').addEventListener('click', addLayer);
    $('save-file').addEventListener('click', saveFile);
    $('open-file').addEventListener('change', openFile);

    let resizeTimer = 0;
    window.addEventListener('resize', () => {
      clearTimeout(resizeTimer);
      resizeTimer = setTimeout(drawChart, 120);
    });

    renderSources();
    $('load-status').hidden = true;
    $('app').hidden = false;
    if (EXAMPLES.length) loadExample(EXAMPLES[0].id);
    document.documentElement.dataset.ready = 'true';
  }

  function loadExample(id) {
    const ex = EXAMPLES.find((e) => e.id === id);
    $('example-pick').value = id;
    $('example-summary').textContent = ex ? ex.summary : '';
    adopt(W.example(id));
  }

  if (document.readyState === 'loading') document.addEventListener('DOMContentLoaded', start);
  else start();
})();
