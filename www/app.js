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
  // A least value that is enough, for display: rounded up at the shown precision (a value
  // rounded down could fall short of the answer), with its unit.
  function fmtUpU(q, si) {
    if (si == null || !Number.isFinite(si)) return '–';
    const d = unit(q).decimals;
    const shown = toDisplay(q, si);
    const up = Math.ceil(shown * 10 ** d - 1e-9) / 10 ** d;
    const sym = unit(q).symbol;
    return fmtNum(up, d) + (sym ? '\u00a0' + sym : '');
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
    // The tooltip: what the input is and its unit.
    input.title = spec.label + (u ? ', in ' + u : '') + (spec.hint ? ' — ' + spec.hint : '') +
      (spec.q && !spec.options && !spec.text ? '. Decimal comma or point.' : '');
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
    renderWinter();
    renderShelter();
    renderEdge();
    renderRanges();
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
    for (const [owner, prefix] of winterOwners()) add(owner, prefix);
    for (const [owner, prefix] of shelterOwners()) add(owner, prefix);
    for (const [owner, prefix] of edgeOwners()) add(owner, prefix);
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
    designStale();
    edgeDesignStale();
    rangesStale();
    printStamp();
    autosave();
    remember();
    const local = localErrors();
    if (local.length) {
      for (const e of local) {
        if (!placeMessage(e.field, 'enter a number', 'error')) generalError(describePath(e.field) + ': enter a number');
      }
      setStale(true);
      cancelWinter();
      if (state.scenario.winter) setWinterStale(true);
      runShelter(true);
      scheduleEdge(true);
      finish();
      return;
    }
    // The shelter is computed on its own: it does not read the layers, and the layers do
    // not read it.
    runShelter(false);
    scheduleEdge(false);
    const stackOnly = scenarioWithout('shelter', 'edge', 'ranges');
    let res;
    try {
      res = W.compute(stackOnly);
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
      cancelWinter();
      if (state.scenario.winter) setWinterStale(true);
      finish();
      return;
    }
    state.lastGood = { scenario: clone(stackOnly), report: res.report };
    setStale(false);
    renderReport();
    drawChart();
    scheduleWinter();
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

  // ---------- winter (transient) ----------
  // The winter section of the scenario (SI, as the core reads it), its inputs, and the run:
  // a WinterRun in the core advanced a slice at a time from timers, so the page stays
  // responsive and shows progress. A newer input cancels the run under way.
  const WINTER_DEBOUNCE_MS = 200;
  const SLICE_MS = 14;
  const winter = {
    design: null, // the least-thickness search being set up (applied to the scenario when run)
    designRun: null, // the DesignRun under way
    designGen: 0,
    designReport: null,
    job: null, // the WinterRun that finished last (drawn from), or null
    running: null, // the WinterRun under way
    generation: 0,
    timer: 0,
    report: null,
    day: null, // the day the profile chart shows
    past: {}, // earlier sub-sections by kind, so switching back restores them
    summary: null, // summary of a daily record: { first_date, winters, design, ... }
  };

  function defaultSnowSeason(kind) {
    // Invented defaults: for a calendar year (day 0 = 1 January) snow from mid-November to
    // mid-April; for a design winter (day 0 = freeze-up) from day 10 to day 160.
    return kind === 'design-winter'
      ? { start_day: 10, peak_day: 100, end_day: 160, peak_depth_m: 0.4, fresh_density_kg_m3: 150, settled_density_kg_m3: 320 }
      : { start_day: 320, peak_day: 50, end_day: 105, peak_depth_m: 0.4, fresh_density_kg_m3: 150, settled_density_kg_m3: 320 };
  }
  function defaultClimate(kind) {
    switch (kind) {
      case 'design-winter': return { kind, freezing_index_c_days: 1000, season_days: 150, mean_annual_c: 3 };
      case 'daily': return { kind, days: [] };
      default: return { kind: 'sinusoid', mean_c: 3, amplitude_k: 14, coldest_day_of_year: 20 };
    }
  }
  function defaultWinter() {
    const corr = CAT.snow_correlations[0] ? CAT.snow_correlations[0].id : 'sturm-1997-quadratic';
    return {
      climate: defaultClimate('sinusoid'),
      // Film coefficient of open ground in light wind, 20 W/m²K (common practice, no source);
      // geothermal flux 0.06 W/m² (a typical continental value, from memory).
      surface: { kind: 'film', film_w_m2k: 20, snow_correlation: corr },
      bottom: { kind: 'flux', upward_w_m2: 0.06 },
      initial: { kind: 'spin-up', start_c: 4, max_years: 10 },
      step_s: 3600,
    };
  }

  const W_SUB = {
    surface: {
      film: (w) => ({ kind: 'film', film_w_m2k: 20, snow_correlation: CAT.snow_correlations[0].id }),
      'n-factor': () => ({ kind: 'n-factor', freezing: 0.7, thawing: 1.0 }),
    },
    bottom: {
      flux: () => ({ kind: 'flux', upward_w_m2: 0.06 }),
      temperature: () => ({ kind: 'temperature', temperature_c: 4 }),
    },
    initial: {
      'spin-up': () => ({ kind: 'spin-up', start_c: 4, max_years: 10 }),
      uniform: () => ({ kind: 'uniform', temperature_c: 4 }),
      periodic: () => ({ kind: 'periodic' }),
    },
  };

  function switchSub(part, kind, make) {
    const w = state.scenario.winter;
    const past = (winter.past[part] = winter.past[part] || {});
    past[w[part].kind] = w[part];
    w[part] = past[kind] || make();
    badText.delete(w[part]);
  }

  function numField(owner, key, path, label, q, extra) {
    return field(Object.assign({
      path, label, q, owner, key,
      get: () => owner[key], set: (v) => { owner[key] = v; },
    }, extra || {}));
  }

  function renderWinter() {
    const w = state.scenario.winter;
    $('winter-off').hidden = !!w;
    $('winter-on').hidden = !w;
    if (!w) return;
    const rerender = (focus) => () => { renderWinter(); if (focus) { const f = document.querySelector('[data-field="' + CSS.escape(focus) + '"]'); if (f) f.focus(); } run(); };

    // climate, snow, surface, deep ground (the same inputs as the building edge's)
    const c = w.climate;
    climateEditor($('w-climate'), w, 'winter.', winter.past, rerender, true);
    $('w-import').hidden = c.kind !== 'daily';
    renderClimateSummary();
    snowEditor($('w-snow'), c, 'winter.', 'w-snow-on', winter.past, rerender, 'The snow is simulated as layers of its own above the ground.');
    surfaceEditor($('w-surface'), w, 'surface', 'winter.', winter, (v) => switchSub('surface', v, W_SUB.surface[v]), rerender);
    bottomEditor($('w-bottom'), w, 'winter.', (v) => switchSub('bottom', v, W_SUB.bottom[v]), rerender);

    const ini = $('w-initial');
    clear(ini);
    const ig = el('div', { class: 'w-fields' });
    const initialKinds = [
      { value: 'spin-up', text: 'Repeat the year until it repeats itself' },
      { value: 'uniform', text: 'Uniform temperature' },
    ];
    if (CAT.initial_kinds && CAT.initial_kinds.includes('periodic')) initialKinds.push({ value: 'periodic', text: 'Yearly cycle from the mean annual temperature' });
    ig.append(field({
      path: 'winter.initial.kind', label: 'The ground starts', cls: 'wide', options: initialKinds,
      get: () => w.initial.kind,
      set: (v) => switchSub('initial', v, W_SUB.initial[v]),
      after: rerender('winter.initial.kind'),
    }));
    if (w.initial.kind === 'uniform') ig.append(numField(w.initial, 'temperature_c', 'winter.initial.temperature_c', 'Temperature everywhere', 'temperature'));
    if (w.initial.kind === 'spin-up') {
      ig.append(
        numField(w.initial, 'start_c', 'winter.initial.start_c', 'First guess, everywhere', 'temperature'),
        numField(w.initial, 'max_years', 'winter.initial.max_years', 'At most this many years', 'fraction'),
      );
    }
    ini.append(ig);

    // run
    const ru = $('w-run');
    clear(ru);
    const rg = el('div', { class: 'w-fields' });
    rg.append(
      numField(w, 'step_s', 'winter.step_s', 'Time step', 'step'),
      numField(w, 'duration_days', 'winter.duration_days', 'Length of the run', 'days', {
        optional: true, placeholder: () => (c.kind === 'daily' ? 'the whole record' : '365'),
      }),
    );
    ru.append(rg);
    const grd = w.grid || { surface_cell_m: 0.01, growth_ratio: 1.05, max_cell_m: 0.25 };
    const det = el('details', { class: 'grid-opts' }, el('summary', { text: 'Grid' }));
    const gg = el('div', { class: 'w-fields' });
    const ensureGrid = () => { if (!w.grid) w.grid = grd; };
    gg.append(
      numField(grd, 'surface_cell_m', 'winter.grid.surface_cell_m', 'Cell at the surface', 'thickness', { after: ensureGrid }),
      numField(grd, 'growth_ratio', 'winter.grid.growth_ratio', 'Growth from cell to cell', 'fraction', { after: ensureGrid }),
      numField(grd, 'max_cell_m', 'winter.grid.max_cell_m', 'Largest cell', 'thickness', { after: ensureGrid }),
    );
    det.append(gg);
    ru.append(det);
    renderDesignFields();
    for (const e of document.querySelectorAll('#winter [data-unit]')) e.textContent = unit(e.dataset.unit).symbol;
  }

  // ---------- weather inputs shared by the winter and the building edge ----------
  // The climate of a section (`sect.climate`, paths under `prefix`): its kind and numbers.
  // `allowDaily`: offer daily records (the winter imports them from a CSV file).
  function climateEditor(box, sect, prefix, past, rerender, allowDaily) {
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
      set: (v) => {
        const p = (past.climate = past.climate || {});
        p[c.kind] = c;
        sect.climate = p[v] || defaultClimate(v);
        badText.delete(sect.climate);
      },
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
  function snowEditor(sb, c, prefix, checkId, past, rerender, note) {
    clear(sb);
    if (c.kind === 'daily') return;
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
  // n-factors. `memo.nPreset` keeps the preset chosen.
  function surfaceEditor(su, sect, key, prefix, memo, switchTo, rerender) {
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
      set: switchTo,
      after: rerender(P + 'kind'),
    }));
    su.append(sg);
    if (s.kind === 'film') {
      sg.append(
        numField(s, 'film_w_m2k', P + 'film_w_m2k', 'Film coefficient', 'film'),
        field({
          path: P + 'snow_correlation', label: 'Snow conductivity from', cls: 'wide',
          options: CAT.snow_correlations.map((x) => ({ value: x.id, text: x.name, title: x.citation })),
          get: () => s.snow_correlation, set: (v) => { s.snow_correlation = v; },
        }),
      );
      return;
    }
    const presets = CAT.n_factor_presets || [];
    const same = (p) => p && Math.abs(p.freezing - s.freezing) < 1e-9;
    const chosen = presets.find((p) => p.id === memo.nPreset);
    const match = same(chosen) ? chosen : presets.find(same);
    sg.append(
      field({
        path: P + 'preset', label: 'Surface (freezing n-factor)', cls: 'wide',
        options: [{ value: '', text: 'Own value' }].concat(presets.map((p) => ({ value: p.id, text: p.name + ' — ' + p.freezing, title: p.source }))),
        get: () => (match ? match.id : ''),
        set: (v) => { const p = presets.find((x) => x.id === v); memo.nPreset = v; if (p) { s.freezing = p.freezing; badText.delete(s); } },
        after: rerender(P + 'preset'),
      }),
      numField(s, 'freezing', P + 'freezing', 'Freezing n-factor', 'fraction'),
      numField(s, 'thawing', P + 'thawing', 'Thawing n-factor', 'fraction'),
    );
    su.append(el('p', { class: 'hint', text: 'Freezing n-factors: ' + ((presets[0] && presets[0].source) || '') + '. With n-factors, snow cover is taken as part of the factor and not simulated.' }));
  }

  // The deep boundary (`sect.bottom`): a geothermal flux or a held temperature.
  function bottomEditor(bo, sect, prefix, switchTo, rerender) {
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
      set: switchTo,
      after: rerender(P + 'kind'),
    }));
    if (b.kind === 'flux') bg.append(numField(b, 'upward_w_m2', P + 'upward_w_m2', 'Heat flux from below', 'heat_flux'));
    else bg.append(numField(b, 'temperature_c', P + 'temperature_c', 'Bottom temperature', 'temperature'));
    bo.append(bg);
  }

  // ---------- least thickness ----------
  function defaultDesign() {
    const L = state.scenario.layers;
    let i = L.findIndex((l) => l.material && l.material.kind === 'insulation');
    if (i < 0) i = 0;
    return { layer: i, keep_frost_above: { kind: 'layer-bottom', layer: i }, min_m: 0, max_m: 0.3, resolution_m: 0.002 };
  }

  function designDraft() {
    const w = state.scenario.winter;
    if (!winter.design) winter.design = w && w.least_thickness ? JSON.parse(JSON.stringify(w.least_thickness)) : defaultDesign();
    const d = winter.design;
    const n = state.scenario.layers.length;
    if (d.layer >= n) d.layer = n - 1;
    if (d.keep_frost_above.kind === 'layer-bottom' && d.keep_frost_above.layer >= n) d.keep_frost_above.layer = n - 1;
    return d;
  }

  function renderDesignFields() {
    const box = $('w-design-fields');
    clear(box);
    const d = designDraft();
    const layerOptions = state.scenario.layers.map((l, i) => ({ value: String(i), text: (i + 1) + '. ' + (l.name && l.name.trim() ? l.name : 'layer ' + (i + 1)) }));
    const redraw = () => { renderDesignFields(); designStale(); };
    box.append(field({
      path: 'winter.least_thickness.layer', label: 'Layer to size', cls: 'wide', options: layerOptions,
      get: () => String(d.layer), set: (v) => { d.layer = Number(v); }, after: redraw,
    }));
    box.append(field({
      path: 'winter.least_thickness.keep_frost_above.kind', label: 'Keep frost above', cls: 'wide',
      options: [
        { value: 'layer-bottom', text: 'the bottom of a layer (nothing below it freezes)' },
        { value: 'depth', text: 'a depth below the top face' },
      ],
      get: () => d.keep_frost_above.kind,
      set: (v) => { d.keep_frost_above = v === 'depth' ? { kind: 'depth', depth_m: 1.0 } : { kind: 'layer-bottom', layer: d.layer }; },
      after: redraw,
    }));
    if (d.keep_frost_above.kind === 'depth') {
      box.append(numField(d.keep_frost_above, 'depth_m', 'winter.least_thickness.keep_frost_above.depth_m', 'Depth', 'depth', { after: designStale }));
    } else {
      box.append(field({
        path: 'winter.least_thickness.keep_frost_above.layer', label: 'Bottom of layer', cls: 'wide', options: layerOptions,
        get: () => String(d.keep_frost_above.layer), set: (v) => { d.keep_frost_above.layer = Number(v); }, after: redraw,
      }));
    }
    box.append(
      numField(d, 'min_m', 'winter.least_thickness.min_m', 'Thinnest to try', 'thickness', { after: designStale }),
      numField(d, 'max_m', 'winter.least_thickness.max_m', 'Thickest to try', 'thickness', { after: designStale }),
    );
  }

  function designStale() {
    const box = $('w-design');
    if (winter.designRun) { winter.designGen++; winter.designRun.free(); winter.designRun = null; }
    if (box.dataset.state === 'done' || box.dataset.state === 'running') {
      box.dataset.state = 'stale';
      $('w-design-status').textContent = 'Out of date: the scenario changed since this search. Run it again.';
      $('w-design-answer').classList.add('is-stale');
    }
  }

  function startDesign() {
    const d = searchDraftReady('w-design', designDraft, (x) => [...bad(x).values(), ...bad(x.keep_frost_above).values()]);
    if (!d) return;
    // The search is part of the scenario from now on (saved with it).
    state.scenario.winter.least_thickness = clone(d);
    startSearch({ id: 'w-design', holder: winter, make: () => new W.DesignRun(scenarioWithout('ranges')), describe: describeWinterPath, render: renderDesignReport });
  }

  function renderDesignReport() {
    const r = winter.designReport;
    const ans = $('w-design-answer');
    ans.classList.remove('is-stale');
    const tb = $('w-design-trials').querySelector('tbody');
    clear(tb);
    if (!r) { ans.textContent = ''; $('w-design-trials').hidden = true; return; }
    const name = r.layer_name && r.layer_name.trim() ? r.layer_name : 'layer ' + (r.layer + 1);
    const limitWords = 'above ' + fmtU('depth', r.limit_m);
    let text;
    if (r.outcome === 'found') {
      text = 'At least ' + fmtUpU('thickness', r.thickness_m) + ' of ' + name + (r.r_value_m2k_w != null ? ' (R-value ' + fmtUpU('r_value', r.r_value_m2k_w) + ' as derated)' : '') + ' keeps the deepest frost ' + limitWords +
        (r.frost_depth_m > 0 ? ' (with it, frost reaches ' + fmtU('depth', r.frost_depth_m) + ')' : ' (with it, the ground below does not freeze)') + ', found to within ' + fmtU('thickness', r.resolution_m) + '.';
      if (r.slope != null && r.slope < 0) {
        text += ' Near the answer each extra ' + fmtU('thickness', 0.01) + ' lifts the frost by about ' + fmtU('depth', -r.slope * 0.01) + '.';
      } else if (r.frost_depth_m === 0) {
        text += ' From this thickness on the ground below does not freeze at all, so the answer is sharp: a little less lets frost in.';
      }
    } else if (r.outcome === 'smallest-suffices') {
      text = 'Even ' + fmtU('thickness', r.thickness_m) + ' of ' + name + ' (the thinnest tried) keeps the frost ' + limitWords + '.';
    } else if (r.outcome === 'not-reachable') {
      text = 'Even the thickest tried lets frost reach ' + fmtU('depth', r.frost_depth_m) + ', below the limit (' + fmtU('depth', r.limit_m) + '). Try a thicker range, another layer, or more cover.';
    } else {
      text = 'Frost reached deeper with more of this layer between two tries, so no least thickness can be named here; look at the table.';
    }
    ans.textContent = text;
    r.trials.forEach((t, i) => {
      const ok = t.frost_depth_m <= t.limit_m;
      tb.append(el('tr', {},
        el('td', { text: String(i + 1) }),
        el('td', { text: fmtU('thickness', t.thickness_m) }),
        el('td', { text: t.frost_depth_m > 0 ? fmtU('depth', t.frost_depth_m) : 'none' }),
        el('td', { text: fmtU('depth', t.limit_m) }),
        el('td', { text: ok ? 'yes' : 'no', class: ok ? 'ok' : 'no' })));
    });
    $('w-design-trials').hidden = false;
  }

  function winterOwners() {
    const w = state.scenario.winter;
    if (!w) return [];
    const out = [[w.climate, 'winter.climate.'], [w.surface, 'winter.surface.'], [w.bottom, 'winter.bottom.'], [w.initial, 'winter.initial.'], [w, 'winter.']];
    if (w.climate.snow) out.push([w.climate.snow, 'winter.climate.snow.']);
    if (w.grid) out.push([w.grid, 'winter.grid.']);
    return out;
  }

  // ---------- a daily record ----------
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

  function importCsv(ev) {
    const file = ev.target.files && ev.target.files[0];
    const list = $('imp-problems');
    clear(list); list.hidden = true;
    if (!file) return;
    const reader = new FileReader();
    reader.onload = () => {
      const res = W.import_climate_csv(String(reader.result), importOptions());
      ev.target.value = '';
      if (!res.ok) {
        for (const e of res.errors || []) list.append(el('li', { text: e.message }));
        for (const p of res.problems || []) list.append(el('li', { text: p.message }));
        if (res.more_problems) list.append(el('li', { text: '… and ' + res.more_problems + ' more' }));
        list.prepend(el('li', { class: 'lead', text: file.name + ' was not read:' }));
        list.hidden = false;
        return;
      }
      state.scenario.winter.climate = { kind: 'daily', days: res.days };
      delete state.scenario.winter.duration_days;
      winter.summary = Object.assign({ file: file.name }, res.summary);
      if (res.problems && res.problems.length) {
        list.append(el('li', { class: 'lead', text: 'Read, leaving out ' + res.summary.skipped_lines + ' bad line(s):' }));
        for (const p of res.problems) list.append(el('li', { text: p.message }));
        list.hidden = false;
      }
      renderWinter();
      run();
    };
    reader.onerror = () => { list.append(el('li', { text: 'The file could not be read.' })); list.hidden = false; };
    reader.readAsText(file);
  }

  function renderClimateSummary() {
    const box = $('w-climate-summary');
    clear(box);
    const c = state.scenario.winter.climate;
    if (c.kind !== 'daily') { winter.summary = null; return; }
    const days = c.days || [];
    if (!days.length) { box.append(el('p', { class: 'hint', text: 'No records yet: read a CSV file.' })); return; }
    let s = winter.summary;
    if (!s || s.first_date !== days[0].date || s.days !== days.length) {
      const r = W.summarise_days(days, Number($('imp-month').value));
      s = winter.summary = r && r.ok ? r.summary : null;
      if (!s) { box.append(el('p', { class: 'msg error', text: (r && r.errors && r.errors.map((e) => e.message).join('; ')) || 'The records could not be summarised.' })); return; }
    }
    box.append(el('p', { id: 'w-record-span', text: (s.file ? s.file + ': ' : '') + s.days + ' days, ' + s.first_date + ' to ' + s.last_date + (s.has_snow ? ', with snow depths' : ', no snow depths') + (s.filled_days ? '; ' + s.filled_days + ' missing days filled in' : '') + '.' }));
    const t = el('table', { class: 'data', id: 'w-winters' });
    t.append(el('caption', { class: 'sr-only', text: 'Freezing index of each winter in the record' }));
    t.append(el('thead', null, el('tr', null, el('th', { text: 'Winter' }), headCell('Freezing index', 'degree_days'), el('th', { text: 'Complete' }))));
    const tb = el('tbody');
    for (const x of s.winters) {
      tb.append(el('tr', null, el('td', { text: x.start.slice(0, 4) + '–' + x.end.slice(0, 4) }), el('td', { class: 'num', text: fmt('degree_days', x.freezing_index_c_days) }), el('td', { text: x.complete ? 'yes' : 'part (' + x.days_present + ' days)' })));
    }
    t.append(tb);
    box.append(el('div', { class: 'table-wrap' }, t));
    const d = el('p', { id: 'w-design' });
    if (s.design) {
      d.append(el('strong', { text: 'Design freezing index: ' }), 'mean of the three coldest winters ' + fmtU('degree_days', s.design.mean_of_three_coldest_c_days) + '; the coldest winter ' + fmtU('degree_days', s.design.coldest_c_days) + ' (of ' + s.design.complete_winters + ' complete winters).');
      for (const wmsg of s.design.warnings) d.append(el('span', { class: 'msg warning block', text: ' ' + wmsg }));
      const useBtn = el('button', { type: 'button', class: 'btn small', id: 'w-use-design', text: 'Build a design winter from the mean of the three coldest' });
      useBtn.addEventListener('click', () => {
        const w = state.scenario.winter;
        (winter.past.climate = winter.past.climate || {}).daily = w.climate;
        const mean = days.reduce((a, x) => a + x.mean_air_c, 0) / days.length;
        w.climate = { kind: 'design-winter', freezing_index_c_days: Math.round(s.design.mean_of_three_coldest_c_days), season_days: 150, mean_annual_c: Math.round(mean * 10) / 10 };
        renderWinter(); run();
      });
      box.append(d, useBtn);
    } else {
      d.append(el('span', { class: 'hint', text: 'No design values: ' + (s.design_note || 'too few complete winters') + '.' }));
      box.append(d);
    }
  }

  // ---------- sliced jobs ----------
  // Drives a sliced core job (`advance(ms)` → {ok, fraction, finished, errors?}) from
  // timers, so the page stays responsive: `live()` false stops it (a newer input won, and
  // `stopped()` tidies up); `bar` and `status` (ids) show the progress, `busy` in words;
  // `failed(errors)` or `done(ms)` end it.
  function driveJob(job, o) {
    const t0 = performance.now();
    const slice = () => {
      if (!o.live()) { if (o.stopped) o.stopped(); return; }
      const st = job.advance(SLICE_MS);
      $(o.bar).value = st.fraction;
      if (!st.ok) { o.failed(st.errors || []); return; }
      if (!st.finished) {
        $(o.status).textContent = o.busy + ' ' + Math.round(st.fraction * 100) + ' %';
        setTimeout(slice, 0);
        return;
      }
      o.done(performance.now() - t0);
    };
    $(o.status).textContent = o.busy;
    $(o.bar).value = 0;
    slice();
  }
  const msWords = (ms) => (ms < 1000 ? Math.round(ms) + ' ms' : (ms / 1000).toFixed(1) + ' s');
  // A run's results box (`data-state` done, counters for the tests) and its status line.
  function runDone(res, status, ms) {
    res.classList.remove('is-stale');
    res.dataset.state = 'done';
    res.dataset.runs = String(Number(res.dataset.runs || 0) + 1);
    res.dataset.outcomes = String(Number(res.dataset.outcomes || 0) + 1);
    res.dataset.ms = String(Math.round(ms));
    $(status).textContent = 'Done in ' + msWords(ms) + '.';
  }
  // A search's box and its status line.
  function searchDone(box, status, ms, runs) {
    box.dataset.state = 'done';
    box.dataset.runs = String(Number(box.dataset.runs || 0) + 1);
    $(status).textContent = 'Done in ' + (ms / 1000).toFixed(1) + ' s, ' + runs + ' winters run.';
  }

  // Starts a section's run (the winter, the edge): `holder` keeps {running, job, report,
  // generation} (a newer generation cancels this run), `make()` builds the core's job,
  // `showErrors(errors)` and `stale(true, why)` report a refusal, `render()` the result.
  function startRun(o) {
    const res = $(o.results);
    const list = $(o.errors);
    clear(list); list.hidden = true;
    const h = o.holder;
    const gen = ++h.generation;
    let job;
    try {
      job = o.make();
    } catch (err) {
      console.error(err);
      generalError(o.what + ' failed unexpectedly: ' + String(err && err.message || err));
      return;
    }
    const errs = job.errors();
    if (errs && errs.length) {
      job.free();
      o.showErrors(errs);
      o.stale(true);
      return;
    }
    h.running = job;
    res.dataset.state = 'running';
    driveJob(job, {
      bar: o.bar, status: o.status, busy: o.busy,
      live: () => gen === h.generation,
      failed: (errors) => {
        h.running = null;
        job.free();
        o.showErrors(errors);
        o.stale(true, 'The run stopped.');
      },
      done: (ms) => {
        h.running = null;
        if (h.job) h.job.free();
        h.job = job;
        h.report = job.report();
        runDone(res, o.status, ms);
        o.render();
      },
    });
  }

  // The scenario without the named sections (each section's run reads only its own).
  function scenarioWithout(...keys) {
    const out = Object.assign({}, state.scenario);
    for (const k of keys) delete out[k];
    return out;
  }

  // ---------- search boxes ----------
  // A search box (`id`: 'w-design' or 'e-design', with parts `${id}-errors`, `-go`,
  // `-status`, `-progress`): its draft once every typed number parses (else the labels that
  // do not, listed in the box, and null). An edit still waiting for its recompute would mark
  // the new search out of date as soon as it started: recompute first.
  function searchDraftReady(id, draft, typed) {
    if ($('results').dataset.pending === 'true') run();
    const list = $(id + '-errors');
    clear(list); list.hidden = true;
    for (const m of document.querySelectorAll('#' + id + ' .field-msg')) clear(m);
    const d = draft();
    const badText = typed(d);
    if (badText.length) {
      for (const b of badText) list.append(el('li', { text: b.label + ': enter a number' }));
      list.hidden = false;
      return null;
    }
    return d;
  }

  // Runs a search box's job: `holder` keeps {designRun, designGen, designReport}, `make()`
  // builds the job from the scenario, `describe(path)` names a field away from its input,
  // `render()` shows the report.
  function startSearch(o) {
    const box = $(o.id);
    const list = $(o.id + '-errors');
    const go = $(o.id + '-go');
    const status = $(o.id + '-status');
    const h = o.holder;
    if (h.designRun) { h.designRun.free(); h.designRun = null; }
    const gen = ++h.designGen;
    let job;
    try {
      job = o.make();
    } catch (err) {
      console.error(err);
      generalError('The search failed unexpectedly: ' + String(err && err.message || err));
      return;
    }
    const listErrors = (errors, beside) => {
      for (const e of errors) {
        if (!(beside && placeMessage(e.field, e.message, 'error', e))) list.append(el('li', { text: o.describe(e.field) + ': ' + e.message }));
      }
      list.hidden = !list.firstChild;
      box.dataset.state = 'stale';
    };
    const errs = job.errors();
    if (errs && errs.length) {
      job.free();
      listErrors(errs, true);
      status.textContent = 'Fix the marked inputs.';
      return;
    }
    h.designRun = job;
    box.dataset.state = 'running';
    go.disabled = true;
    driveJob(job, {
      bar: o.id + '-progress', status: o.id + '-status', busy: 'Searching…',
      live: () => gen === h.designGen,
      stopped: () => { go.disabled = false; },
      failed: (errors) => {
        listErrors(errors, false);
        status.textContent = 'The search stopped.';
        go.disabled = false;
        job.free(); h.designRun = null;
      },
      done: (ms) => {
        h.designReport = job.report();
        job.free(); h.designRun = null;
        go.disabled = false;
        searchDone(box, o.id + '-status', ms, h.designReport.trials.length);
        o.render();
      },
    });
  }

  // ---------- running ----------
  function cancelWinter() {
    clearTimeout(winter.timer);
    winter.generation++;
    if (winter.running) { winter.running.free(); winter.running = null; }
  }

  function scheduleWinter() {
    cancelWinter();
    const res = $('winter-results');
    if (!state.scenario.winter) { res.dataset.state = 'idle'; return; }
    res.dataset.state = 'pending';
    winter.timer = setTimeout(startWinter, WINTER_DEBOUNCE_MS);
  }

  function winterErrors(errors) {
    const list = $('w-errors');
    for (const e of errors) {
      if (!placeMessage(e.field, e.message, 'error', e)) list.append(el('li', { text: describeWinterPath(e.field) + ': ' + e.message }));
    }
    list.hidden = !list.firstChild;
  }

  function describeWinterPath(path) {
    if (/^winter\.climate\.days/.test(path || '')) return 'Daily records';
    if (path === 'winter') return 'Winter run';
    if (path === 'winter.surface') return 'Surface';
    if (/^winter\.initial/.test(path || '') && !fieldLabel(path)) return 'Start';
    return describePath(path);
  }

  function setWinterStale(stale, why) {
    const res = $('winter-results');
    res.classList.toggle('is-stale', stale);
    if (stale) {
      res.dataset.state = 'stale';
      res.dataset.outcomes = String(Number(res.dataset.outcomes || 0) + 1);
      $('w-status').textContent = why || 'Out of date: fix the marked inputs.';
    }
  }

  function startWinter() {
    for (const m of document.querySelectorAll('#winter .field-msg')) clear(m);
    startRun({
      holder: winter, results: 'winter-results', errors: 'w-errors', bar: 'w-progress', status: 'w-status', busy: 'Running…',
      what: 'The winter run', make: () => new W.WinterRun(scenarioWithout('shelter', 'edge', 'ranges')),
      showErrors: winterErrors, stale: setWinterStale,
      render: () => { renderWinterReport(); drawWinter(); },
    });
  }

  // A day of the run in words: a date for a record, the calendar for a sine year.
  const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
  function dayWords(day, scen) {
    const c = (scen || state.scenario).winter.climate;
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

  function layerAt(depth, rep) {
    const f = rep.layer_faces_m;
    for (let i = 0; i + 1 < f.length; i++) if (depth <= f[i + 1] + 1e-9) return i;
    return f.length - 2;
  }

  function renderWinterReport() {
    const rep = winter.report;
    if (!rep) return;
    const mf = rep.max_frost_depth_m;
    $('w-max-frost').textContent = mf > 0 ? fmtU('depth', mf) : 'None';
    if (mf > 0) {
      const i = layerAt(mf, rep);
      $('w-max-frost-when').textContent = 'On ' + dayWords(rep.max_frost_day) + ', in layer ' + (i + 1) + ' (' + rep.layer_names[i] + ').';
    } else {
      $('w-max-frost-when').textContent = 'The ground does not freeze in this run.';
    }
    $('w-air-fi').textContent = fmtU('degree_days', rep.air_freezing_index_c_days);
    $('w-surf-fi').textContent = fmtU('degree_days', rep.surface_freezing_index_c_days);
    const ratio = rep.air_freezing_index_c_days > 0 ? rep.surface_freezing_index_c_days / rep.air_freezing_index_c_days : null;
    $('w-air-fi-sub').textContent = 'Range of the cumulative degree-day curve of the air.';
    $('w-surf-fi-sub').textContent = ratio != null ? 'At the ground surface: ' + fmtNum(ratio, 2) + ' × the air index.' : '';
    $('w-solver').textContent = rep.cells + ' cells, ' + rep.steps + ' steps, ' + fmtNum(rep.iterations_per_step, 2) + ' passes per step' +
      (rep.split_steps ? ', ' + rep.split_steps + ' steps split' : '') + (rep.spin_up_years ? ', ' + rep.spin_up_years + ' years to settle' : '') +
      '; energy balance closes to ' + rep.energy_imbalance_relative.toExponential(1) + ' of the heat through the faces.';
    const hb = $('w-hand').querySelector('tbody');
    clear(hb);
    for (const h of rep.hand_methods || []) {
      hb.append(el('tr', { 'data-method': h.method },
        el('th', { scope: 'row', text: h.name }),
        el('td', { class: 'num', text: h.depth_m != null ? fmtU('depth', h.depth_m) : 'does not apply' }),
        el('td', { text: h.note })));
    }
    $('w-hand').hidden = !hb.firstChild;
    const wl = $('w-warnings');
    clear(wl);
    for (const w of rep.warnings || []) wl.append(el('li', { text: describeWinterPath(w.field) + ': ' + w.message }));
    wl.hidden = !wl.firstChild;
    const days = rep.daily.length ? rep.daily[rep.daily.length - 1].day : 0;
    const slider = $('w-day');
    slider.max = String(Math.max(0, Math.floor(days)));
    if (winter.day == null || winter.day > days) winter.day = Math.min(Math.round(rep.max_frost_day), Math.floor(days));
    slider.value = String(winter.day);
    $('w-day-out').textContent = dayWords(winter.day);
    $('w-csv').disabled = false;
    $('w-profiles-csv').disabled = false;
  }

  function sizeCanvas(c) {
    const dpr = window.devicePixelRatio || 1;
    const rect = c.getBoundingClientRect();
    if (rect.width < 2 || rect.height < 2) return null;
    c.width = Math.max(1, Math.round(rect.width * dpr));
    c.height = Math.max(1, Math.round(rect.height * dpr));
    return dpr;
  }

  // Draw one chart from a finished job (`draw(canvas, dpr)` returns {ok, message}); a
  // chart that fails says why under its canvas.
  function jobChart(id, job, draw) {
    const c = $(id);
    const dpr = sizeCanvas(c);
    if (!dpr || !job) return;
    let r;
    try { r = draw(c, dpr); } catch (err) { console.error(err); r = { ok: false, message: String(err && err.message || err) }; }
    let msg = c.parentElement.querySelector('.chart-msg');
    if (!msg) { msg = el('p', { class: 'msg error chart-msg', role: 'status' }); c.after(msg); }
    msg.textContent = r && r.ok ? '' : 'The chart could not be drawn: ' + ((r && r.message) || 'unknown reason');
    c.dataset.draws = String(Number(c.dataset.draws || 0) + 1);
  }

  const winterChart = (id, draw) => jobChart(id, winter.job, draw);

  function drawDayChart() {
    if (!winter.job || typeof winter.job.draw_day_profile !== 'function') return;
    winterChart('day-chart', (c, dpr) => winter.job.draw_day_profile(c, winter.day || 0, state.units, dpr));
  }

  function drawWinter() {
    if (!winter.job) return;
    winterChart('frost-chart', (c, dpr) => winter.job.draw_frost_depth(c, state.units, dpr));
    drawDayChart();
    if (typeof winter.job.draw_series === 'function') winterChart('series-chart', (c, dpr) => winter.job.draw_series(c, state.units, dpr));
  }

  function downloadCsv() {
    if (!winter.job) return;
    download(winter.job.csv(state.units), fileStem('winter') + '-daily.csv');
  }

  function setUpWinter() {
    $('w-design-go').addEventListener('click', startDesign);
    $('winter-add').addEventListener('click', () => {
      state.scenario.winter = winter.past.whole || defaultWinter();
      // A winter section needs the current format version (older files load without one).
      state.scenario.version = CAT.format_version;
      renderWinter();
      run();
      const f = document.querySelector('[data-field="winter.climate.kind"]');
      if (f) f.focus();
    });
    $('winter-remove').addEventListener('click', () => {
      winter.past.whole = state.scenario.winter;
      delete state.scenario.winter;
      cancelWinter();
      if (winter.job) { winter.job.free(); winter.job = null; }
      winter.report = null;
      renderWinter();
      run();
      $('winter-add').focus();
    });
    $('imp-file').addEventListener('change', importCsv);
    $('imp-month').addEventListener('change', () => { winter.summary = null; if (state.scenario.winter) renderClimateSummary(); });
    $('w-day').addEventListener('input', (e) => {
      winter.day = Number(e.target.value);
      $('w-day-out').textContent = dayWords(winter.day);
      drawDayChart();
    });
    $('w-csv').addEventListener('click', downloadCsv);
    $('w-profiles-csv').addEventListener('click', () => { if (winter.job) download(winter.job.profiles_csv(state.units), fileStem('winter') + '-profiles.csv'); });
  }

  // ---------- snow shelter ----------
  // The shelter section of the scenario (SI, as the core reads it), its inputs and its
  // results. The whole computation (steady balance, band, night, least wall, series) takes
  // well under 100 ms, so it runs in one go inside the debounced run(); the newest input
  // always wins because each run replaces the last.
  const shelter = {
    job: null, // the ShelterRun drawn from, or null
    report: null,
    past: {}, // earlier sub-sections by kind, so switching back restores them
    ms: 0,
  };

  function defaultShape(kind) {
    switch (kind) {
      case 'hollowed-pile': return { kind, inner_radius_m: 1.2, crown_thickness_m: 0.4, base_thickness_m: 0.7 };
      case 'drift-cave': return { kind, inner_radius_m: 1.0, exposed_face: { share: 0.3, thickness_m: 0.5 } };
      case 'trench': return { kind, length_m: 2.2, width_m: 0.9, depth_m: 1.0, roof_thickness_m: 0.3 };
      default: return { kind: 'block-dome', inner_radius_m: 1.1, wall_thickness_m: 0.35 };
    }
  }
  // An invented dome for two on a calm −15 °C night.
  function defaultShelter() {
    return {
      shape: defaultShape('block-dome'),
      snow_density_kg_m3: 300,
      snow_correlation: CAT.snow_correlations[0] ? CAT.snow_correlations[0].id : 'sturm-1997-quadratic',
      floor: { kind: 'snow' },
      entrance: { kind: 'cold-trap' },
      vent_diameter_m: 0.08,
      inside_film_w_m2k: 7,
      lining_m2k_per_w: 0.2,
      floor_cover_m2k_per_w: 0.3,
      conditions: { outside_c: -15, wind_m_s: 3, snowpack_c: -8, people: 2, activity: 'sleeping', body_area_m2: 1.8, candles: 0, stove_w: 0, stove_heat_share: 1 },
      night: { duration_h: 12, step_s: 60 },
      design: { target_c: -5 },
    };
  }

  function shelterOwners() {
    const s = state.scenario.shelter;
    if (!s) return [];
    const out = [[s, 'shelter.'], [s.shape, 'shelter.shape.'], [s.floor, 'shelter.floor.'], [s.entrance, 'shelter.entrance.'], [s.conditions, 'shelter.conditions.']];
    if (s.shape.exposed_face) out.push([s.shape.exposed_face, 'shelter.shape.exposed_face.']);
    if (s.night) out.push([s.night, 'shelter.night.']);
    if (s.design) out.push([s.design, 'shelter.design.']);
    return out;
  }

  function switchShelterPart(part, kind, make) {
    const s = state.scenario.shelter;
    const past = (shelter.past[part] = shelter.past[part] || {});
    past[s[part].kind] = s[part];
    s[part] = past[kind] || make(kind);
    badText.delete(s[part]);
  }

  function renderShelter() {
    const s = state.scenario.shelter;
    $('shelter-off').hidden = !!s;
    $('shelter-on').hidden = !s;
    if (!s) return;
    if (!s.night) s.night = { duration_h: 12 };
    if (!s.design) s.design = { target_c: -5 };
    const rerender = (focus) => () => { renderShelter(); const f = document.querySelector('[data-field="' + CSS.escape(focus) + '"]'); if (f) f.focus(); run(); };
    const grid = (...kids) => el('div', { class: 'w-fields' }, ...kids);
    const box = (id, ...kids) => { const b = $(id); clear(b); b.append(...kids); };
    const sh = s.shape;
    const P = 'shelter.shape.';

    const shapeFields = [field({
      path: P + 'kind', label: 'Shape', cls: 'wide',
      options: (CAT.shelter_shapes || []).map((x) => ({ value: x.id, text: x.name })),
      get: () => sh.kind,
      set: (v) => switchShelterPart('shape', v, defaultShape),
      after: rerender(P + 'kind'),
    })];
    const radiusLabel = sh.kind === 'drift-cave' ? 'Chamber radius (half its width)' : 'Inner radius (half the width inside)';
    if (sh.kind !== 'trench') shapeFields.push(numField(sh, 'inner_radius_m', P + 'inner_radius_m', radiusLabel, 'length'));
    if (sh.kind === 'block-dome') shapeFields.push(numField(sh, 'wall_thickness_m', P + 'wall_thickness_m', 'Wall thickness', 'thickness'));
    if (sh.kind === 'hollowed-pile') {
      shapeFields.push(
        numField(sh, 'crown_thickness_m', P + 'crown_thickness_m', 'Roof thickness at the top', 'thickness'),
        numField(sh, 'base_thickness_m', P + 'base_thickness_m', 'Wall thickness at the base', 'thickness'));
    }
    if (sh.kind === 'trench') {
      shapeFields.push(
        numField(sh, 'length_m', P + 'length_m', 'Length', 'length'),
        numField(sh, 'width_m', P + 'width_m', 'Width', 'length'),
        numField(sh, 'depth_m', P + 'depth_m', 'Depth below the roof', 'length'),
        numField(sh, 'roof_thickness_m', P + 'roof_thickness_m', 'Roof thickness', 'thickness'));
    }
    const shapeBox = [grid(...shapeFields)];
    if (sh.kind === 'drift-cave') {
      const on = !!sh.exposed_face;
      const check = el('input', { type: 'checkbox', id: 's-face-on', 'data-field': P + 'exposed_face', checked: on });
      check.addEventListener('change', () => {
        if (check.checked) sh.exposed_face = shelter.past.face || { share: 0.3, thickness_m: 0.5 };
        else { shelter.past.face = sh.exposed_face; delete sh.exposed_face; }
        rerender(P + 'exposed_face')();
      });
      shapeBox.push(el('label', { class: 'check', for: 's-face-on' }, check, ' One side faces the outside air through a thinner wall'));
      if (on) {
        const f = sh.exposed_face;
        shapeBox.push(grid(
          numField(f, 'share', P + 'exposed_face.share', 'Share of the chamber wall facing out', 'fraction', { hint: '0 to 1' }),
          numField(f, 'thickness_m', P + 'exposed_face.thickness_m', 'Snow between it and the air', 'thickness')));
      }
    }
    box('s-shape', ...shapeBox);

    box('s-snow', grid(
      numField(s, 'snow_density_kg_m3', 'shelter.snow_density_kg_m3', 'Snow density', 'density'),
      field({
        path: 'shelter.snow_correlation', label: 'Snow conductivity from', cls: 'wide',
        options: CAT.snow_correlations.map((x) => ({ value: x.id, text: x.name, title: x.citation + ' (fitted to ' + fmt('density', x.range_kg_m3[0]) + '–' + fmtU('density', x.range_kg_m3[1]) + ')' })),
        get: () => s.snow_correlation, set: (v) => { s.snow_correlation = v; },
      })));

    const openings = [field({
      path: 'shelter.floor.kind', label: 'Floor', cls: 'wide',
      options: [{ value: 'snow', text: 'Snow, over the snowpack' }, { value: 'ground', text: 'Bare ground or rock' }],
      get: () => s.floor.kind,
      set: (v) => switchShelterPart('floor', v, (k) => (k === 'ground' ? { kind: 'ground', conductivity_w_m_k: 1.5, heat_capacity_j_m3_k: 2.2e6, temperature_c: -2 } : { kind: 'snow' })),
      after: rerender('shelter.floor.kind'),
    })];
    if (s.floor.kind === 'ground') {
      openings.push(
        numField(s.floor, 'conductivity_w_m_k', 'shelter.floor.conductivity_w_m_k', 'Ground conductivity', 'conductivity'),
        numField(s.floor, 'heat_capacity_j_m3_k', 'shelter.floor.heat_capacity_j_m3_k', 'Ground heat capacity', 'heat_capacity_vol'),
        numField(s.floor, 'temperature_c', 'shelter.floor.temperature_c', 'Ground temperature', 'temperature'));
    }
    openings.push(numField(s, 'floor_cover_m2k_per_w', 'shelter.floor_cover_m2k_per_w', 'Mats on the floor (R, averaged over the floor)', 'r_value', { cls: 'span2', hint: '0: bare floor' }));
    openings.push(field({
      path: 'shelter.entrance.kind', label: 'Entrance', cls: 'wide',
      options: [{ value: 'cold-trap', text: 'Dips below the floor (cold air stays in it)' }, { value: 'level', text: 'Level with the floor' }],
      get: () => s.entrance.kind,
      set: (v) => switchShelterPart('entrance', v, (k) => (k === 'level' ? { kind: 'level', opening_width_m: 0.5, opening_height_m: 0.3 } : { kind: 'cold-trap' })),
      after: rerender('shelter.entrance.kind'),
    }));
    if (s.entrance.kind === 'level') {
      openings.push(
        numField(s.entrance, 'opening_width_m', 'shelter.entrance.opening_width_m', 'Opening left open, width', 'thickness'),
        numField(s.entrance, 'opening_height_m', 'shelter.entrance.opening_height_m', 'Opening left open, height', 'thickness'));
    }
    openings.push(
      numField(s, 'vent_diameter_m', 'shelter.vent_diameter_m', 'Vent hole diameter', 'thickness', { hint: 'keep it open' }),
      numField(s, 'lining_m2k_per_w', 'shelter.lining_m2k_per_w', 'A lining to compare (R)', 'r_value', { cls: 'span2', hint: 'fabric hung in front of the walls; 0: none' }),
      numField(s, 'inside_film_w_m2k', 'shelter.inside_film_w_m2k', 'Inside surface film', 'film', { cls: 'span2', hint: 'about ' + fmt('film', 6) + '–' + fmtU('film', 8) }));
    box('s-openings', grid(...openings));

    const c = s.conditions;
    const C = 'shelter.conditions.';
    box('s-inside', grid(
      numField(c, 'people', C + 'people', 'People inside', 'count'),
      field({
        path: C + 'activity', label: 'Doing', cls: 'span2',
        options: (CAT.activities || []).map((a) => ({ value: a.id, text: a.name + ' (' + a.met + ' met)', title: a.source })),
        get: () => c.activity, set: (v) => { c.activity = v; },
      }),
      numField(c, 'body_area_m2', C + 'body_area_m2', 'Body surface of one person', 'area', { hint: 'about ' + fmtU('area', 1.8) + ' for an adult' }),
      numField(c, 'candles', C + 'candles', 'Candles burning', 'count'),
      numField(c, 'stove_w', C + 'stove_w', 'Stove burning (fuel power)', 'power', { hint: '0: none' }),
      numField(c, 'stove_heat_share', C + 'stove_heat_share', 'Share of the stove heating the air', 'fraction', { hint: 'the rest goes into the pot' })));

    box('s-weather', grid(
      numField(c, 'outside_c', C + 'outside_c', 'Outside air', 'temperature'),
      numField(c, 'wind_m_s', C + 'wind_m_s', 'Wind', 'speed'),
      numField(c, 'snowpack_c', C + 'snowpack_c', 'Deep snowpack', 'temperature')));

    box('s-ask', grid(
      numField(s.design, 'target_c', 'shelter.design.target_c', 'Air inside wanted', 'temperature', { hint: 'for the least wall' }),
      numField(s.night, 'duration_h', 'shelter.night.duration_h', 'Length of the night', 'time_h'),
      numField(s.night, 'snow_start_c', 'shelter.night.snow_start_c', 'Snow at the start', 'temperature', {
        optional: true, placeholder: () => fmtInput('temperature', sh.kind === 'block-dome' || sh.kind === 'hollowed-pile' ? Math.min(0, c.outside_c) : c.snowpack_c),
        hint: 'blank: the outside air for a dome or pile, the snowpack for a cave or trench',
      }),
      numField(s.night, 'air_start_c', 'shelter.night.air_start_c', 'Air inside at the start', 'temperature', {
        optional: true, placeholder: () => fmtInput('temperature', c.outside_c), hint: 'blank: the outside air',
      })));
    for (const e of document.querySelectorAll('#shelter [data-unit]')) e.textContent = unit(e.dataset.unit).symbol;
  }

  function renderCautions() {
    const ul = $('s-caution-list');
    clear(ul);
    for (const c of CAT.cautions || []) {
      ul.append(el('li', { 'data-caution': c.id }, c.text, ' ', el('span', { class: 'src', text: '(' + c.source + ')' })));
    }
  }

  function shelterStale(stale, why) {
    const res = $('shelter-results');
    res.classList.toggle('is-stale', stale);
    res.dataset.state = stale ? 'stale' : 'done';
    res.dataset.outcomes = String(Number(res.dataset.outcomes || 0) + 1);
    if (stale && why) { const l = $('s-errors'); l.append(el('li', { text: why })); l.hidden = false; }
  }

  function dropShelterResult() {
    if (shelter.job) { shelter.job.free(); shelter.job = null; }
    shelter.report = null;
    $('s-night-csv').disabled = true;
    $('s-sweeps-csv').disabled = true;
  }

  // Compute the shelter of the current scenario (called from run(), after its debounce).
  function runShelter(blocked) {
    const res = $('shelter-results');
    const list = $('s-errors');
    clear(list); list.hidden = true;
    if (!state.scenario.shelter) { res.dataset.state = 'idle'; dropShelterResult(); return; }
    if (blocked) { shelterStale(true, 'Out of date: fix the marked inputs.'); return; }
    const scen = scenarioWithout('winter', 'edge', 'ranges');
    let job;
    const t0 = performance.now();
    try {
      job = new W.ShelterRun(scen);
    } catch (err) {
      console.error(err);
      shelterStale(true, 'The shelter could not be computed: ' + String(err && err.message || err));
      return;
    }
    shelter.ms = performance.now() - t0;
    res.dataset.ms = String(Math.round(shelter.ms));
    const errs = job.errors();
    if (errs.length) {
      job.free();
      for (const e of errs) {
        if (!placeMessage(e.field, e.message, 'error', e)) list.append(el('li', { text: describePath(e.field) + ': ' + e.message }));
      }
      list.hidden = !list.firstChild;
      shelterStale(true, list.firstChild ? null : 'Out of date: fix the marked inputs.');
      return;
    }
    dropShelterResult();
    shelter.job = job;
    shelter.report = job.report();
    shelterStale(false);
    renderShelterReport();
    drawShelter();
  }

  function hoursText(s) {
    if (s == null || !Number.isFinite(s)) return '–';
    const h = s / 3600;
    return h < 1 ? Math.round(h * 60) + '\u00a0min' : fmtNum(h, 1) + '\u00a0h';
  }

  function renderShelterReport() {
    const r = shelter.report;
    if (!r) return;
    const scen = state.scenario.shelter;
    $('s-interior').textContent = fmt('temperature', r.interior_c);
    const rise = r.interior_c - r.outside_c;
    const endOfNight = r.night.samples.length ? r.night.samples[r.night.samples.length - 1].interior_c : null;
    $('s-interior-sub').textContent = fmtU('temperature', endOfNight) + ' at the end of the first ' + hoursText(r.night.duration_s) + '; in the steady state ' +
      fmtU('temperature_difference', rise) + ' warmer than the ' + fmtU('temperature', r.outside_c) + ' outside.';
    const surf = $('s-surface');
    surf.classList.toggle('melting', r.surface_state === 'melting');
    surf.classList.toggle('frozen', r.surface_state !== 'melting');
    surf.dataset.state = r.surface_state;
    if (r.surface_state === 'melting') {
      surf.textContent = 'At ' + freezeT() + ' and melting';
      $('s-surface-sub').textContent = 'About ' + fmtU('mass_rate', r.melt_kg_per_h) + ' of snow melts: the surface will drip and glaze to ice. Less heat inside keeps it frozen.';
    } else {
      surf.textContent = 'Frozen';
      $('s-surface-sub').textContent = 'Warmest ' + fmtU('temperature', r.warmest_surface_c) + '. It would start to melt with the air above ' + fmtU('temperature', r.melt_free_limit_c) + '.';
    }
    const flow = r.vent_flow_m3_s + r.door_flow_m3_s;
    $('s-co2').textContent = r.co2_ppm == null ? 'rising' : fmtNum(r.co2_ppm, 0);
    $('s-co2-sub').textContent = (r.co2_ppm == null ? 'No air is exchanged, so CO₂ keeps rising: open a vent. '
      : r.co2_ppm > r.co2_limit_ppm ? 'Above the ' + r.co2_limit_ppm + ' ppm workplace limit: open the vent wider. ' : '') +
      'Vent and doorway exchange ' + fmtU('air_flow', flow) + ' of air.';
    $('s-co2').classList.toggle('melting', r.co2_ppm == null || r.co2_ppm > r.co2_limit_ppm);

    // least wall, worded in the units shown
    const lw = r.least_wall;
    const thicknessName = r.sweeps[0] ? r.sweeps[0].x_label : 'wall';
    const least = $('s-least');
    least.dataset.answer = lw.answer;
    const strength = ' Build walls and roof at least about ' + fmtNum(Math.round(toDisplay('thickness', 0.3)), 0) + '\u00a0' + unit('thickness').symbol + ' thick all the same, for strength.';
    switch (lw.answer) {
      case 'reached':
        least.textContent = fmtU('thickness', Math.ceil(lw.thickness_m * 100) / 100);
        $('s-least-sub').textContent = 'The ' + thicknessName + ' that keeps the air at ' + fmtU('temperature', lw.target_c) + '.' + (lw.thickness_m < 0.3 ? strength : '');
        break;
      case 'thinnest-suffices':
        least.textContent = 'Any';
        $('s-least-sub').textContent = 'Even ' + fmtU('thickness', lw.thickness_m) + ' keeps the air at ' + fmtU('temperature', lw.interior_c) + ', above the ' + fmtU('temperature', lw.target_c) + ' wanted.' + strength;
        break;
      case 'not-reachable':
        least.textContent = 'Not reachable';
        $('s-least-sub').textContent = lw.reason === 'melt-limit'
          ? 'The inner snow surface reaches ' + freezeT() + ' first and melts, so the air stays near ' + fmtU('temperature', lw.interior_c) + ' however thick the wall. A lining in front of the snow would let it get warmer.'
          : 'Even behind the thickest wall the air stays at ' + fmtU('temperature', lw.interior_c) + ': the vent, doorway and floor take most of the heat. More people, a smaller chamber, a dipping entrance or mats on the floor help more than more snow.';
        break;
      default:
        least.textContent = 'No wall to choose';
        $('s-least-sub').textContent = 'This cave has no side facing the outside air: the snowpack around it is all the wall.';
    }
    const lin = $('s-lining');
    if (r.with_lining) {
      lin.hidden = false;
      lin.textContent = 'With a lining of R\u00a0' + fmtU('r_value', r.with_lining.lining_m2k_per_w) + ' hung in front of the walls, the air could reach ' + fmtU('temperature', r.with_lining.interior_c) +
        (r.with_lining.melt_kg_per_h > 0 ? ', with ' + fmtU('mass_rate', r.with_lining.melt_kg_per_h) + ' still melting.' : ' with the snow behind it frozen.');
    } else lin.hidden = true;

    // losses
    const lt = $('s-losses');
    clear(lt.tHead); clear(lt.tBodies[0]);
    lt.tHead.append(el('tr', null, headCell('Path', null), headCell('Heat', 'power'), headCell('Share', null)));
    for (const l of r.losses) {
      if (l.id === 'doorway' && scen && scen.entrance.kind !== 'level') continue;
      lt.tBodies[0].append(el('tr', { 'data-path': l.id },
        el('th', { scope: 'row', text: l.name.charAt(0).toUpperCase() + l.name.slice(1) }),
        el('td', { class: 'num', text: fmt('power', l.heat_w) }),
        el('td', { class: 'num' }, el('span', { class: 'share-bar', style: 'width:' + Math.max(0, Math.min(100, l.share * 100)).toFixed(0) + 'px' }), fmtNum(l.share * 100, 0) + '\u00a0%')));
    }
    const parts = [['people', r.people_w], ['candles', r.candles_w], ['stove', r.stove_w]].filter((x) => x[1] > 0).map((x) => x[0] + ' ' + fmtU('power', x[1]));
    $('s-gains').textContent = 'Heat given off inside: ' + fmtU('power', r.gains_w) + (parts.length ? ' (' + parts.join(', ') + ')' : '') + '.';

    const st = $('s-surfaces');
    clear(st.tHead); clear(st.tBodies[0]);
    st.tHead.append(el('tr', null, headCell('Surface', null), headCell('Area', 'area'), headCell('Temperature', 'temperature'), headCell('State', null)));
    for (const z of r.surfaces) {
      st.tBodies[0].append(el('tr', null,
        el('th', { scope: 'row', text: z.name }),
        el('td', { class: 'num', text: fmt('area', z.area_m2) }),
        el('td', { class: 'num', text: fmt('temperature', z.surface_c) }),
        el('td', null, el('span', { class: 'state ' + (z.melting ? 'state-unfrozen' : 'state-frozen'), text: z.melting ? 'melting' : 'frozen' }))));
    }

    const b = r.band;
    const nameOf = (id) => { const x = CAT.snow_correlations.find((k) => k.id === id); return x ? x.name : id; };
    $('s-band').textContent = 'Across the ' + b.by_correlation.length + ' published snow conductivity regressions the air inside lies between ' + fmt('temperature', b.coldest_c) + ' and ' + fmtU('temperature', b.warmest_c) +
      ' (coldest with ' + nameOf(b.coldest_id) + ', warmest with ' + nameOf(b.warmest_id) + '): snow conducts heat about twice as well in some measurements as in others.' +
      (scen && scen.snow_correlation === b.warmest_id && b.warmest_c - b.coldest_c > 0.05 ? ' The regression in use gives the warmest answer of them all: plan for the colder end.'
        : scen && scen.snow_correlation === b.coldest_id && b.warmest_c - b.coldest_c > 0.05 ? ' The regression in use gives the coldest answer of them all.' : '');
    const bt = $('s-band-table');
    clear(bt.tHead); clear(bt.tBodies[0]);
    bt.tHead.append(el('tr', null, headCell('Regression', null), headCell('Snow conductivity', 'conductivity'), headCell('Air inside', 'temperature'), headCell('Melting', 'mass_rate')));
    for (const e of b.by_correlation) {
      const inUse = scen && e.id === scen.snow_correlation;
      bt.tBodies[0].append(el('tr', { class: inUse ? 'in-use' : null },
        el('th', { scope: 'row' }, e.name, inUse ? el('span', { class: 'tag', text: 'in use' }) : null, e.in_range ? null : el('span', { class: 'tag', text: 'outside its density range' })),
        el('td', { class: 'num', text: fmt('conductivity', e.conductivity_w_m_k) }),
        el('td', { class: 'num', text: fmt('temperature', e.interior_c) }),
        el('td', { class: 'num', text: fmt('mass_rate', e.melt_kg_per_h) })));
    }

    const n = r.night;
    const lastN = n.samples[n.samples.length - 1];
    let nt = 'With the snow starting at ' + fmtU('temperature', n.snow_start_c) + ' and the air at ' + fmtU('temperature', n.air_start_c) + ': after ' + hoursText(n.duration_s) + ' the air inside is at ' + fmtU('temperature', lastN ? lastN.interior_c : null) + ', on its way to ' + fmtU('temperature', n.steady_interior_c) + '. ';
    nt += n.warmup_time_s != null ? 'It covers 90 % of that rise in ' + hoursText(n.warmup_time_s) + '. '
      : 'It does not get within 90 % of that rise during the night: the walls take days to warm through. ';
    nt += n.target_time_s != null ? 'It reaches the ' + fmtU('temperature', lw.target_c) + ' wanted after ' + hoursText(n.target_time_s) + '.'
      : 'It does not reach the ' + fmtU('temperature', lw.target_c) + ' wanted during the night.';
    if (n.melted_kg >= 0.005) nt += ' About ' + fmtU('mass', n.melted_kg) + ' of snow melts over the night.';
    $('s-night').textContent = nt;

    const wl = $('s-warnings');
    clear(wl);
    for (const w of r.warnings || []) {
      const text = shelterWarning(w);
      wl.append(el('li', { text: (w.field === 'shelter' ? 'Shelter' : describePath(w.field)) + ': ' + text }));
      placeMessage(w.field, text, 'warning');
    }
    wl.hidden = !wl.firstChild;
    $('s-night-csv').disabled = false;
    $('s-sweeps-csv').disabled = false;
  }

  // The warnings whose numbers the core gives in SI, worded in the units shown.
  function shelterWarning(w) {
    const sc = state.scenario.shelter;
    switch (w.kind) {
      case 'melting':
        return 'the inner snow surface would pass ' + freezeT() + ': it is held there and about ' + fmtU('mass_rate', w.value) + ' of snow melts; the surface will drip and glaze with ice';
      case 'thin_wall':
        return fmtU('thickness', w.value) + ' is thinner than about ' + fmtNum(Math.round(toDisplay('thickness', w.max)), 0) + '\u00a0' + unit('thickness').symbol +
          ', the least the field manuals give for caves and hollowed piles (US Army FM 21-76); light showing through means it is too thin';
      case 'density_range': {
        const c = CAT.snow_correlations.find((k) => sc && k.id === sc.snow_correlation);
        return fmtU('density', w.value) + ' is outside the ' + fmt('density', w.min) + '–' + fmtU('density', w.max) + ' range ' + (c ? c.name : 'the regression') + ' was fitted to';
      }
      default: return w.message;
    }
  }

  const shelterChart = (id, draw) => jobChart(id, shelter.job, draw);

  function drawShelter() {
    if (!shelter.job) return;
    shelterChart('s-night-chart', (c, dpr) => shelter.job.draw_night(c, state.units, dpr));
    for (let i = 0; i < 3; i++) shelterChart('s-sweep-' + i, (c, dpr) => shelter.job.draw_sweep(c, i, state.units, dpr));
  }

  // Hand a file to the browser's download (a blob URL; nothing leaves the computer).
  function saveBlob(blob, name) {
    const url = URL.createObjectURL(blob);
    const a = el('a', { href: url, download: name });
    document.body.append(a);
    a.click();
    a.remove();
    setTimeout(() => URL.revokeObjectURL(url), 5000);
  }
  const download = (text, name, type = 'text/csv') => saveBlob(new Blob([text], { type }), name);
  const fileStem = (fallback) => (state.scenario.title || fallback).replace(/[^A-Za-z0-9_-]+/g, '-').replace(/^-+|-+$/g, '').toLowerCase() || fallback;

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
  async function makeShareLink() {
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
  async function scenarioFromLink() {
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

  // Undo and redo: each recompute records the scenario (as JSON) when it differs from the
  // last record; undo adopts the one before, redo the one after. A new edit after an undo
  // drops what could be redone. At most HISTORY_MAX records.
  const HISTORY_MAX = 200;
  const history = { past: [], future: [], replaying: false };
  function remember() {
    if (!state.scenario || history.replaying) return;
    const now = JSON.stringify(state.scenario);
    if (history.past.length && history.past[history.past.length - 1] === now) return;
    history.past.push(now);
    if (history.past.length > HISTORY_MAX) history.past.shift();
    history.future = [];
    historyButtons();
  }
  function historyButtons() {
    $('undo').disabled = history.past.length < 2;
    $('redo').disabled = !history.future.length;
  }
  function replay(text) {
    history.replaying = true;
    try {
      const example = $('example-pick').value;
      adopt(JSON.parse(text));
      $('example-pick').value = example;
    } finally {
      history.replaying = false;
    }
    historyButtons();
  }
  function undo() {
    if (history.past.length < 2) return;
    history.future.push(history.past.pop());
    replay(history.past[history.past.length - 1]);
  }
  function redo() {
    if (!history.future.length) return;
    const next = history.future.pop();
    history.past.push(next);
    replay(next);
  }
  function setUpHistory() {
    $('undo').addEventListener('click', undo);
    $('redo').addEventListener('click', redo);
    document.addEventListener('keydown', (e) => {
      if (!(e.ctrlKey || e.metaKey) || e.altKey) return;
      const t = e.target;
      // Inside a text box the browser's own undo of the typing applies.
      if (t && (t.tagName === 'TEXTAREA' || (t.tagName === 'INPUT' && /^(text|search|number|)$/.test(t.type || '')))) return;
      const k = e.key.toLowerCase();
      if (k === 'z' && !e.shiftKey) { e.preventDefault(); undo(); }
      else if ((k === 'z' && e.shiftKey) || k === 'y') { e.preventDefault(); redo(); }
    });
  }

  // Autosave: the scenario (SI, as edited) and the unit system go into this browser's
  // storage on every recompute, so a reload or a closed tab loses nothing; the page opens on
  // it next time, saying so. Storage that is full or switched off is skipped quietly.
  const AUTOSAVE_KEY = 'hibernal.autosave.1';
  function autosave() {
    if (!state.scenario) return;
    try {
      localStorage.setItem(AUTOSAVE_KEY, JSON.stringify({ saved_at: new Date().toISOString(), units: state.units, scenario: state.scenario }));
    } catch (e) { /* no storage: nothing to do */ }
  }

  function restoreAutosave() {
    let saved = null;
    try { saved = JSON.parse(localStorage.getItem(AUTOSAVE_KEY) || 'null'); } catch (e) { saved = null; }
    if (!saved || !looksLikeScenario(saved.scenario)) return false;
    if (saved.units === 'us' || saved.units === 'si') {
      const r = $('units-' + saved.units);
      if (r) { r.checked = true; state.units = saved.units; document.documentElement.dataset.units = state.units; }
    }
    adopt(saved.scenario);
    $('example-pick').value = '';
    const when = typeof saved.saved_at === 'string' ? saved.saved_at.slice(0, 16).replace('T', ' ') + ' UTC' : 'earlier';
    $('restore-text').textContent = 'Your last work in this browser is back (saved ' + when + ').';
    $('restore-note').hidden = false;
    return true;
  }

  // Printing: the page's print style sheet leaves out the controls and keeps inputs,
  // results, charts, methods with their sources and the cautions; a stamp names the
  // scenario, the tool's version and the date.
  function printStamp() {
    const sc = state.scenario || {};
    const title = sc.title && sc.title.trim() ? sc.title : 'Untitled scenario';
    const units = state.units === 'us' ? 'US customary units' : 'SI units';
    $('print-stamp').textContent = title + ' — printed ' + new Date().toISOString().slice(0, 16).replace('T', ' ') +
      ' UTC from Hibernal ' + (CAT ? CAT.version : '?') + ' (scenario format ' + (CAT ? CAT.format_version : '?') + '), in ' + units +
      '. Engineering estimates: follow local codes and have a licensed engineer or qualified instructor check a design.';
  }

  function setUpPrinting() {
    window.addEventListener('beforeprint', printStamp);
    $('print-report').addEventListener('click', () => { printStamp(); window.print(); });
  }

  // Every chart can be saved as a PNG of what it shows (its canvas, at the screen's
  // resolution), named after the scenario and the chart.
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
  function setUpTableSaving() {
    for (const t of document.querySelectorAll('table.data[id]')) {
      const b = el('button', {
        type: 'button', class: 'btn subtle csv-btn', 'data-csv-for': t.id,
        text: 'Save table as CSV', 'aria-label': 'Save the table (' + tableName(t) + ') as a CSV file',
      });
      b.addEventListener('click', () => download(tableCsv(t), fileStem('hibernal') + '-' + t.id + '.csv'));
      t.after(b);
    }
  }

  function setUpChartSaving() {
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

  function setUpShelter() {
    renderCautions();
    $('shelter-add').addEventListener('click', () => {
      state.scenario.shelter = shelter.past.whole || defaultShelter();
      // A shelter section needs the current format version (older files load without one).
      state.scenario.version = CAT.format_version;
      renderShelter();
      run();
      const f = document.querySelector('[data-field="shelter.shape.kind"]');
      if (f) f.focus();
    });
    $('shelter-remove').addEventListener('click', () => {
      shelter.past.whole = state.scenario.shelter;
      delete state.scenario.shelter;
      dropShelterResult();
      renderShelter();
      run();
      $('shelter-add').focus();
    });
    $('s-night-csv').addEventListener('click', () => { if (shelter.job) download(shelter.job.night_csv(state.units), fileStem('shelter') + '-night.csv'); });
    $('s-sweeps-csv').addEventListener('click', () => { if (shelter.job) download(shelter.job.sweeps_csv(state.units), fileStem('shelter') + '-series.csv'); });
  }

  // ---------- building edge (a cross-section in the plane) ----------
  // The edge section of the scenario (SI, as the core reads it), its inputs and its run: an
  // EdgeRun in the core advanced a slice at a time from timers, like the winter run. A
  // newer input cancels the run under way.
  const EDGE_DEBOUNCE_MS = 400;
  const edge = {
    job: null, // the EdgeRun that finished last (drawn from), or null
    running: null, // the EdgeRun under way
    generation: 0,
    timer: 0,
    report: null,
    day: null, // the day the field map shows
    past: {}, // earlier sub-sections by kind, so switching back restores them
    nPreset: null,
    design: null, // the search being set up (copied into the scenario when run)
    designRun: null,
    designGen: 0,
    designReport: null,
  };

  // Invented defaults: a heated building on a shallow footing with a board against the
  // wall and a wing board, in silt, through a design winter of 1500 °C·days with snow.
  function defaultBoard(extra) {
    return Object.assign({ material: { kind: 'insulation', board: 'xps', conductivity_w_m_k: null, moisture_derating_pct: 10 }, thickness_m: 0.05 }, extra);
  }
  function defaultEdge() {
    const corr = CAT.snow_correlations[0] ? CAT.snow_correlations[0].id : 'sturm-1997-quadratic';
    return {
      inside_half_width_m: 5,
      outside_extent_m: 8,
      depth_m: 8,
      slab: { thickness_m: 0.1, material: { kind: 'concrete', conductivity_w_m_k: null } },
      wall: { width_m: 0.2, base_depth_m: 0.6, material: { kind: 'concrete', conductivity_w_m_k: null } },
      wall_board: defaultBoard({ depth_m: 0.6 }),
      wing: defaultBoard({ width_m: 0.6, depth_m: 0.3 }),
      soil: [{ name: 'silt', thickness_m: 8, material: defaultMaterial('soil') }],
      // Film on a floor, heat flowing down: about 6 W/m²K (common practice, no source).
      inside: { kind: 'heated', air_c: 20, film_w_m2k: 6 },
      outside: { kind: 'film', film_w_m2k: 20, snow_correlation: corr },
      climate: { kind: 'design-winter', freezing_index_c_days: 1500, season_days: 160, mean_annual_c: 2, snow: defaultSnowSeason('design-winter') },
      bottom: { kind: 'flux', upward_w_m2: 0.06 },
      start: { surface_c: 5, gradient_k_per_m: 0.03 },
      step_s: 86400,
      // The freezing season and some weeks of thaw after it: frost under a footing is
      // deepest near the end of the season.
      duration_days: 200,
      field_every_days: 7,
    };
  }

  function edgeOwners() {
    const e = state.scenario.edge;
    if (!e) return [];
    const out = [[e, 'edge.'], [e.slab, 'edge.slab.'], [e.slab.material, 'edge.slab.material.'], [e.wall, 'edge.wall.'], [e.wall.material, 'edge.wall.material.'],
      [e.inside, 'edge.inside.'], [e.outside, 'edge.outside.'], [e.climate, 'edge.climate.'], [e.bottom, 'edge.bottom.'], [e.start, 'edge.start.']];
    if (e.wall_board) out.push([e.wall_board, 'edge.wall_board.']);
    if (e.wing) out.push([e.wing, 'edge.wing.']);
    if (e.climate.snow) out.push([e.climate.snow, 'edge.climate.snow.']);
    if (e.grid) out.push([e.grid, 'edge.grid.']);
    e.soil.forEach((s, i) => out.push([s, 'edge.soil[' + i + '].']));
    return out;
  }

  function switchEdgePart(part, kind, make) {
    const e = state.scenario.edge;
    const past = (edge.past[part] = edge.past[part] || {});
    past[e[part].kind] = e[part];
    e[part] = past[kind] || make(kind);
    badText.delete(e[part]);
  }

  // Fields of a material held at `owner.material` (paths under `prefix`), as in the layer list.
  function materialFieldsOf(owner, prefix, rerender) {
    return materialFields(owner.material).map((f) => {
      const relayout = (f.key === 'texture' || f.key === 'model' || f.key === 'board');
      return field(Object.assign({}, f, {
        path: prefix + 'material.' + f.key, owner, key: 'material.' + f.key,
        get: () => owner.material[f.key],
        set: (v) => { owner.material[f.key] = v; },
        after: relayout ? rerender(prefix + 'material.' + f.key) : null,
      }));
    });
  }

  function renderEdge() {
    const e = state.scenario.edge;
    $('edge-off').hidden = !!e;
    $('edge-on').hidden = !e;
    if (!e) return;
    const rerender = (focus) => () => { renderEdge(); const f = document.querySelector('[data-field="' + CSS.escape(focus) + '"]'); if (f) f.focus(); run(); };
    const grid = (...kids) => el('div', { class: 'w-fields' }, ...kids);
    const box = (id, ...kids) => { const b = $(id); clear(b); b.append(...kids); };

    // building
    const inside = e.inside;
    const bg = grid(field({
      path: 'edge.inside.kind', label: 'Inside the building', cls: 'wide',
      options: [
        { value: 'heated', text: 'Heated: the floor meets warm air' },
        { value: 'closed', text: 'Unheated: no heat through the floor' },
      ],
      get: () => inside.kind,
      set: (v) => switchEdgePart('inside', v, (k) => (k === 'heated' ? { kind: k, air_c: 20, film_w_m2k: 6 } : { kind: k })),
      after: rerender('edge.inside.kind'),
    }));
    if (inside.kind === 'heated') {
      bg.append(
        numField(inside, 'air_c', 'edge.inside.air_c', 'Air inside', 'temperature'),
        numField(inside, 'film_w_m2k', 'edge.inside.film_w_m2k', 'Floor surface film', 'film'),
      );
    }
    bg.append(
      numField(e, 'inside_half_width_m', 'edge.inside_half_width_m', 'Half the building width', 'length', { hint: 'from the centre to the inner face of the wall' }),
      numField(e.slab, 'thickness_m', 'edge.slab.thickness_m', 'Slab thickness', 'thickness'),
      ...materialFieldsOf(e.slab, 'edge.slab.', rerender),
    );
    box('e-building', bg, el('p', { class: 'hint', text: 'An unheated building is taken as giving no heat to the ground at all, the cautious reading.' }));

    // wall and footing
    box('e-wall', grid(
      numField(e.wall, 'width_m', 'edge.wall.width_m', 'Wall and footing width', 'thickness'),
      numField(e.wall, 'base_depth_m', 'edge.wall.base_depth_m', 'Footing base below grade', 'depth'),
      ...materialFieldsOf(e.wall, 'edge.wall.', rerender),
    ), el('p', { class: 'hint', text: 'The wall and its footing are drawn as one block from grade down to the base.' }));

    // boards
    const bb = [];
    const boardToggle = (key, label, make) => {
      const id = 'e-' + key.replace('_', '-') + '-on';
      const check = el('input', { type: 'checkbox', id, 'data-field': 'edge.' + key, checked: !!e[key], title: label });
      check.addEventListener('change', () => {
        if (check.checked) e[key] = (edge.past[key] && edge.past[key].board) || make();
        else { edge.past[key] = { board: e[key] }; e[key] = null; }
        rerender('edge.' + key)();
      });
      return el('label', { class: 'check', for: id }, check, ' ' + label);
    };
    bb.push(boardToggle('wall_board', 'A board against the outer face of the wall', () => defaultBoard({ depth_m: e.wall.base_depth_m })));
    if (e.wall_board) {
      const b = e.wall_board;
      bb.push(grid(
        numField(b, 'thickness_m', 'edge.wall_board.thickness_m', 'Board thickness', 'thickness'),
        numField(b, 'depth_m', 'edge.wall_board.depth_m', 'Reaches down to', 'depth'),
        ...materialFieldsOf(b, 'edge.wall_board.', rerender),
      ));
    }
    bb.push(boardToggle('wing', 'A wing board running out from the wall under the ground', () => defaultBoard({ width_m: 0.6, depth_m: 0.3 })));
    if (e.wing) {
      const b = e.wing;
      bb.push(grid(
        numField(b, 'thickness_m', 'edge.wing.thickness_m', 'Board thickness', 'thickness'),
        numField(b, 'width_m', 'edge.wing.width_m', 'Width out from the wall', 'length'),
        numField(b, 'depth_m', 'edge.wing.depth_m', 'Top of the board below grade', 'depth'),
        ...materialFieldsOf(b, 'edge.wing.', rerender),
      ));
    }
    bb.push(el('p', { class: 'hint', text: 'Buried boards take up water and lose part of their R-value over the years: the moisture share entered is taken off in the run.' }));
    box('e-boards', ...bb);

    // soil bands
    const sl = el('ol', { class: 'layer-list soil-list' });
    e.soil.forEach((s, i) => {
      const base = 'edge.soil[' + i + '].';
      const li = el('li', { class: 'layer kind-soil', 'data-index': i });
      const main = el('div', { class: 'layer-main' });
      main.append(
        el('span', { class: 'layer-no', 'aria-hidden': 'true', text: String(i + 1) }),
        field({ path: base + 'name', label: 'Name', text: true, cls: 'name', get: () => s.name, set: (v) => { s.name = v; } }),
        numField(s, 'thickness_m', base + 'thickness_m', 'Thickness', 'thickness'),
        el('button', {
          type: 'button', class: 'icon-btn danger', 'data-act': 'remove', disabled: e.soil.length <= 1,
          'aria-label': 'Remove soil band ' + (i + 1), title: 'Remove this band',
          onclick: () => { e.soil.splice(i, 1); rerender('edge.soil[0].thickness_m')(); }, text: '✕',
        }),
      );
      li.append(main, el('div', { class: 'layer-material' }, ...materialFieldsOf(s, base, rerender)));
      sl.append(li);
    });
    const add = el('button', { type: 'button', class: 'btn', id: 'e-add-soil', text: 'Add a soil band below' });
    add.addEventListener('click', () => {
      const last = e.soil[e.soil.length - 1];
      e.soil.push({ name: '', thickness_m: 2, material: clone(last.material) });
      rerender('edge.soil[' + (e.soil.length - 1) + '].thickness_m')();
    });
    box('e-soil', sl, add, el('p', { class: 'hint', text: 'Bands run level under the building and beside it; the bands should reach the bottom of the section.' }));

    // climate, surface, deep ground
    climateEditor($('e-climate'), e, 'edge.', edge.past, rerender, false);
    snowEditor($('e-snow'), e.climate, 'edge.', 'e-snow-on', edge.past, rerender, 'In the cross-section the snow insulates the open ground but stores no heat of its own.');
    surfaceEditor($('e-surface'), e, 'outside', 'edge.', edge, (v) => switchEdgePart('outside', v, W_SUB.surface[v]), rerender);
    bottomEditor($('e-bottom'), e, 'edge.', (v) => switchEdgePart('bottom', v, W_SUB.bottom[v]), rerender);

    // section and run
    // The core's default grid (scenario_edge::DEFAULT_GRID), shown until changed.
    const grd = e.grid || { fine_m: 0.02, growth_ratio: 1.15, max_cell_m: 0.4 };
    const ensureGrid = () => { if (!e.grid) e.grid = grd; };
    const det = el('details', { class: 'grid-opts' }, el('summary', { text: 'Grid' }), grid(
      numField(grd, 'fine_m', 'edge.grid.fine_m', 'Finest cell', 'thickness', { after: ensureGrid, hint: 'at grade, the slab, the wall, the footing and the boards' }),
      numField(grd, 'growth_ratio', 'edge.grid.growth_ratio', 'Growth from cell to cell', 'fraction', { after: ensureGrid }),
      numField(grd, 'max_cell_m', 'edge.grid.max_cell_m', 'Largest cell', 'thickness', { after: ensureGrid }),
    ));
    box('e-run', grid(
      numField(e, 'outside_extent_m', 'edge.outside_extent_m', 'Ground beside the wall', 'length', { hint: 'far enough that its edge is open ground' }),
      numField(e, 'depth_m', 'edge.depth_m', 'Depth of the section', 'depth'),
      numField(e.start, 'surface_c', 'edge.start.surface_c', 'Ground at the start, at grade', 'temperature'),
      numField(e.start, 'gradient_k_per_m', 'edge.start.gradient_k_per_m', 'Warming with depth at the start', 'gradient'),
      numField(e, 'step_s', 'edge.step_s', 'Time step', 'step'),
      numField(e, 'duration_days', 'edge.duration_days', 'Length of the run', 'days', { optional: true, placeholder: () => 'the climate\'s' }),
      numField(e, 'field_every_days', 'edge.field_every_days', 'Keep the field every', 'days'),
    ), det);
    renderEdgeDesignFields();
    for (const u of document.querySelectorAll('#edge [data-unit]')) u.textContent = unit(u.dataset.unit).symbol;
  }

  function renderEdgeCautions(rep) {
    const ul = $('e-caution-list');
    clear(ul);
    for (const c of (rep && rep.cautions) || []) {
      const text = typeof c === 'string' ? c : c.text;
      ul.append(el('li', { 'data-caution': typeof c === 'string' ? '' : (c.id || '') }, text));
    }
  }

  // ---------- running the edge ----------
  function cancelEdge() {
    clearTimeout(edge.timer);
    edge.generation++;
    if (edge.running) { edge.running.free(); edge.running = null; }
  }

  function edgeStale(stale, why) {
    const res = $('edge-results');
    res.classList.toggle('is-stale', stale);
    if (stale) {
      res.dataset.state = 'stale';
      res.dataset.outcomes = String(Number(res.dataset.outcomes || 0) + 1);
      $('e-status').textContent = why || 'Out of date: fix the marked inputs.';
    }
  }

  function dropEdgeResult() {
    cancelEdge();
    if (edge.job) { edge.job.free(); edge.job = null; }
    edge.report = null;
    edge.day = null;
    $('e-csv').disabled = true;
    $('e-field-csv').disabled = true;
  }

  // Called from run() after its debounce: starts the edge run a little later, so typing
  // several characters runs it once.
  function scheduleEdge(blocked) {
    cancelEdge();
    const res = $('edge-results');
    if (!state.scenario.edge) { res.dataset.state = 'idle'; return; }
    if (blocked) { edgeStale(true); return; }
    res.dataset.state = 'pending';
    edge.timer = setTimeout(startEdge, EDGE_DEBOUNCE_MS);
  }

  function edgeErrors(errors) {
    const list = $('e-errors');
    for (const e of errors) {
      if (!placeMessage(e.field, e.message, 'error', e)) list.append(el('li', { text: describePath(e.field) + ': ' + e.message }));
    }
    list.hidden = !list.firstChild;
  }

  const edgeScenario = () => scenarioWithout('winter', 'shelter', 'ranges');

  function startEdge() {
    startRun({
      holder: edge, results: 'edge-results', errors: 'e-errors', bar: 'e-progress', status: 'e-status', busy: 'Running the cross-section…',
      what: 'The building edge', make: () => new W.EdgeRun(edgeScenario()),
      showErrors: edgeErrors, stale: edgeStale,
      render: () => { renderEdgeReport(); drawEdge(); },
    });
  }

  function edgeDayWords(day) {
    const c = state.scenario.edge && state.scenario.edge.climate;
    if (!c) return 'day ' + Math.round(day);
    return dayWords(day, { winter: { climate: c } });
  }

  // The frost against the footing base in words: below it by so much, or above it.
  function belowBaseWords(m) {
    if (m == null || !Number.isFinite(m)) return '–';
    return m > 0 ? fmtU('depth', m) + ' below the base' : fmtU('depth', -m) + ' above the base';
  }

  function renderEdgeReport() {
    const rep = edge.report;
    if (!rep) return;
    const below = rep.max_frost_below_base_m;
    // The core reports −base when no part of the footing's column freezes at all.
    const none = below <= -rep.base_depth_m + 1e-6;
    const out = $('e-below');
    out.textContent = none ? 'No frost at the footing' : belowBaseWords(below);
    out.classList.toggle('bad', below > 0);
    out.classList.toggle('good', !(below > 0));
    $('e-below-sub').textContent = below > 0
      ? 'Frost gets under the footing (deepest on ' + edgeDayWords(rep.max_frost_below_base_day) + '). Frost-susceptible soil there would heave.'
      : none ? 'The ground under the footing does not freeze at any depth this winter (base ' + fmtU('depth', rep.base_depth_m) + ' below grade).'
        : 'Frost stays above the footing base all winter (closest on ' + edgeDayWords(rep.max_frost_below_base_day) + ').';
    $('e-far').textContent = fmtU('depth', rep.far_frost_depth_m);
    $('e-far-sub').textContent = rep.column_frost_depth_m != null
      ? 'A single column of the same soil gives ' + fmtU('depth', rep.column_frost_depth_m) + '.'
      : '';
    const closed = state.scenario.edge && state.scenario.edge.inside.kind === 'closed';
    $('e-heat').textContent = closed ? 'None' : fmtU('linear_heat', rep.mean_slab_heat_w_m);
    // The first days carry the warm-up from the start temperature; the 30 coldest days say
    // what the slab loses in deep winter.
    const cold = (rep.daily || []).slice().sort((a, b) => a.air_c - b.air_c).slice(0, 30);
    const coldMean = cold.length ? cold.reduce((t, d) => t + d.slab_heat_w_m, 0) / cold.length : null;
    $('e-heat-sub').textContent = closed ? 'An unheated building is taken as giving no heat to the ground through its floor.'
      : 'Mean over the run, per length of wall' + (coldMean != null ? '; ' + fmtU('linear_heat', coldMean) + ' over the 30 coldest days.' : '.');
    $('e-solver').textContent = rep.nx + ' × ' + rep.nz + ' cells, ' + rep.steps + ' steps' +
      (rep.iterations != null ? ', ' + rep.iterations + ' passes' : '') +
      '; energy balance closes to ' + Number(rep.energy_imbalance_relative).toExponential(1) + ' of the heat through the boundaries.';
    const hb = $('e-hand').querySelector('tbody');
    clear(hb);
    for (const h of rep.hand_methods || []) {
      hb.append(el('tr', { 'data-method': h.method },
        el('th', { scope: 'row', text: h.name }),
        el('td', { class: 'num', text: h.depth_m != null ? fmtU('depth', h.depth_m) : 'does not apply' }),
        el('td', { text: h.note })));
    }
    $('e-hand').hidden = !hb.firstChild;
    const wl = $('e-warnings');
    clear(wl);
    for (const w of rep.warnings || []) wl.append(el('li', { text: describePath(w.field) + ': ' + w.message }));
    wl.hidden = !wl.firstChild;
    renderEdgeCautions(rep);
    const days = rep.field_days || [];
    const slider = $('e-day');
    const last = days.length ? days[days.length - 1] : 0;
    slider.max = String(Math.max(0, Math.floor(last)));
    if (edge.day == null || edge.day > last) {
      // The day frost is deepest under the footing, or, where it never gets there, the day
      // it is deepest in open ground.
      let day = rep.max_frost_below_base_day;
      if (none && rep.daily && rep.daily.length) day = rep.daily.reduce((b, d) => (d.far_frost_depth_m > b.far_frost_depth_m ? d : b)).day;
      edge.day = nearestFieldDay(day);
    }
    slider.value = String(edge.day);
    $('e-day-out').textContent = edgeDayWords(edge.day);
    $('e-csv').disabled = false;
    $('e-field-csv').disabled = false;
  }

  // The kept field nearest a day (the map shows kept fields only, every few days).
  function nearestFieldDay(day) {
    const days = (edge.report && edge.report.field_days) || [];
    if (!days.length) return 0;
    return days.reduce((b, d) => (Math.abs(d - day) < Math.abs(b - day) ? d : b));
  }

  const edgeChart = (id, draw) => jobChart(id, edge.job, draw);
  function drawEdgeField() {
    if (!edge.job) return;
    edgeChart('e-field-chart', (c, dpr) => edge.job.draw_field(c, edge.day || 0, state.units, dpr));
  }
  function drawEdge() {
    if (!edge.job) return;
    drawEdgeField();
    edgeChart('e-series-chart', (c, dpr) => edge.job.draw_series(c, state.units, dpr));
  }

  function setUpEdge() {
    $('edge-add').addEventListener('click', () => {
      state.scenario.edge = edge.past.whole || defaultEdge();
      state.scenario.version = CAT.format_version;
      renderEdge();
      run();
      const f = document.querySelector('[data-field="edge.inside.kind"]');
      if (f) f.focus();
    });
    $('edge-remove').addEventListener('click', () => {
      edge.past.whole = state.scenario.edge;
      delete state.scenario.edge;
      dropEdgeResult();
      renderEdge();
      run();
      $('edge-add').focus();
    });
    $('e-day').addEventListener('input', (ev) => {
      edge.day = nearestFieldDay(Number(ev.target.value));
      $('e-day-out').textContent = edgeDayWords(edge.day);
      drawEdgeField();
    });
    $('e-csv').addEventListener('click', () => { if (edge.job) download(edge.job.csv(state.units), fileStem('edge') + '-daily.csv'); });
    $('e-field-csv').addEventListener('click', () => {
      if (edge.job) download(edge.job.field_csv(edge.day || 0, state.units), fileStem('edge') + '-field-day-' + Math.round(edge.day || 0) + '.csv');
    });
    $('e-design-go').addEventListener('click', startEdgeDesign);
  }

  // ---------- least insulation at the edge ----------
  // What the search can vary, with the quantity its values are shown in.
  const EDGE_QUANTITIES = [
    { value: 'wing-width', text: 'Width of the wing board', q: 'length', needs: 'wing', range: [0, 2.0], resolution: 0.02 },
    { value: 'wing-r', text: 'R-value of the wing board', q: 'r_value', needs: 'wing', range: [0.2, 6.0], resolution: 0.05 },
    { value: 'wall-board-r', text: 'R-value of the board against the wall', q: 'r_value', needs: 'wall_board', range: [0.2, 6.0], resolution: 0.05 },
    { value: 'footing-depth', text: 'Depth of the footing base', q: 'depth', needs: null, range: [0.3, 3.0], resolution: 0.02 },
  ];
  const edgeQuantity = (id) => EDGE_QUANTITIES.find((x) => x.value === id) || EDGE_QUANTITIES[0];

  function edgeDesignDraft() {
    const e = state.scenario.edge;
    if (!edge.design) {
      if (e && e.least) edge.design = clone(e.least);
      else {
        const q = e && e.wing ? EDGE_QUANTITIES[0] : EDGE_QUANTITIES[3];
        edge.design = { quantity: q.value, min: q.range[0], max: q.range[1], resolution: q.resolution };
      }
    }
    return edge.design;
  }

  function renderEdgeDesignFields() {
    const box = $('e-design-fields');
    clear(box);
    const d = edgeDesignDraft();
    const q = edgeQuantity(d.quantity);
    const e = state.scenario.edge;
    const redraw = () => { renderEdgeDesignFields(); edgeDesignStale(); };
    box.append(field({
      path: 'edge.least.quantity', label: 'Quantity to size', cls: 'wide',
      options: EDGE_QUANTITIES.map((x) => ({ value: x.value, text: x.text + (x.needs && e && !e[x.needs] ? ' (add that board first)' : '') })),
      get: () => d.quantity,
      set: (v) => { const n = edgeQuantity(v); d.quantity = n.value; d.min = n.range[0]; d.max = n.range[1]; d.resolution = n.resolution; badText.delete(d); },
      after: redraw,
    }));
    box.append(
      numField(d, 'min', 'edge.least.min', 'Least to try', q.q, { after: edgeDesignStale }),
      numField(d, 'max', 'edge.least.max', 'Most to try', q.q, { after: edgeDesignStale }),
      numField(d, 'resolution', 'edge.least.resolution', 'Found to within', q.q, { after: edgeDesignStale }),
    );
  }

  function edgeDesignStale() {
    const box = $('e-design');
    if (edge.designRun) { edge.designGen++; edge.designRun.free(); edge.designRun = null; $('e-design-go').disabled = false; }
    if (box.dataset.state === 'done' || box.dataset.state === 'running') {
      box.dataset.state = 'stale';
      $('e-design-status').textContent = 'Out of date: the scenario changed since this search. Run it again.';
      $('e-design-answer').classList.add('is-stale');
    }
  }

  function startEdgeDesign() {
    const d = searchDraftReady('e-design', edgeDesignDraft, (x) => [...bad(x).values()]);
    if (!d) return;
    // The search is part of the scenario from now on (saved with it).
    state.scenario.edge.least = clone(d);
    startSearch({ id: 'e-design', holder: edge, make: () => new W.EdgeDesignRun(edgeScenario()), describe: describePath, render: renderEdgeDesignReport });
  }

  function renderEdgeDesignReport() {
    const r = edge.designReport;
    const ans = $('e-design-answer');
    ans.classList.remove('is-stale');
    const tb = $('e-design-trials').querySelector('tbody');
    clear(tb);
    if (!r) { ans.textContent = ''; $('e-design-trials').hidden = true; return; }
    const q = edgeQuantity(r.quantity);
    const name = q.text.charAt(0).toLowerCase() + q.text.slice(1);
    let text;
    if (r.outcome === 'found' || r.outcome === 'run-limit') {
      const v = r.frost_below_base_m;
      const at = v > 0 || Math.abs(v) < 0.0005 ? 'frost just reaches the base' : 'frost stays ' + fmtU('depth', -v) + ' above the base';
      text = 'The least ' + name + ' that keeps frost at or above the footing base is ' + fmtUpU(q.q, r.value) +
        ' (with it, ' + at + ')' + (r.outcome === 'found' ? ', found to within ' + fmtU(q.q, r.resolution) + '.' : '; the search ran out of tries before narrowing it to ' + fmtU(q.q, r.resolution) + ', so a little less may do.');
      if (r.slope != null && Number.isFinite(r.slope) && r.slope < 0) {
        const step = q.q === 'r_value' ? (state.units === 'us' ? fromDisplay('r_value', 1) : 0.1) : 0.05;
        text += ' Sensitivity: just short of the answer, each ' + fmtU(q.q, step) + ' more lifts the frost by about ' + fmtU('depth', -r.slope * step) + '.';
      }
      if (r.jump_m != null && r.jump_m > 0.02) {
        text += ' Across the answer the frost line jumps by ' + fmtU('depth', r.jump_m) + ' (the last frozen ground under the footing thaws at once), so the answer is sharp: allow a margin for a colder winter.';
      }
    } else if (r.outcome === 'smallest-suffices') {
      text = 'Even ' + fmtU(q.q, r.value) + ' (the least tried) keeps frost above the footing base.';
    } else if (r.outcome === 'not-reachable') {
      text = 'Even the most tried (' + fmtU(q.q, r.value) + ') lets frost get ' + belowBaseWords(r.frost_below_base_m) + '. Try a wider range, another board, or a deeper footing.';
    } else {
      text = 'Frost reached deeper with more of this quantity between two tries, so no least value can be named here; look at the table.';
    }
    ans.textContent = text;
    r.trials.forEach((t, i) => {
      const ok = !(t.frost_below_base_m > 0);
      tb.append(el('tr', {},
        el('td', { text: String(i + 1) }),
        el('td', { text: fmtU(q.q, t.value) }),
        el('td', { text: belowBaseWords(t.frost_below_base_m) }),
        el('td', { text: ok ? 'yes' : 'no', class: ok ? 'ok' : 'no' })));
    });
    $('e-design-trials').hidden = false;
  }

  // ---------- scenario in and out ----------
  // `from`: where an outside scenario came from ('file', 'link'), to name it in the notice
  // shown when it is of an older format version; bundled examples open without one.
  // ---------- ranges: how sure the answers are ----------
  // What an uncertain input can stand for: the quantity its ends are shown in and the
  // material kind a layer must have for it (null: no layer choice).
  const RANGED = [
    { value: 'snow-density', text: 'Snow density', q: 'density', kind: 'snow' },
    { value: 'water-content', text: 'Soil water content', q: 'water_content', kind: 'soil' },
    { value: 'soil-conductivity-factor', text: 'Soil conductivity factor', q: 'fraction', kind: 'soil' },
    { value: 'insulation-derating', text: 'Insulation derating', q: 'percent', kind: 'insulation' },
    { value: 'freezing-index', text: 'Freezing index', q: 'degree_days', kind: null },
  ];
  const rangedOf = (id) => RANGED.find((x) => x.value === id) || RANGED[0];
  const RANGE_RESULTS = [
    { value: 'r-value', text: 'R-value of the stack', has: (s) => s.layers && s.layers.length > 0 },
    { value: 'frost-depth', text: 'Deepest frost over the winter', has: (s) => !!s.winter },
    { value: 'frost-below-footing', text: 'Frost below the footing', has: (s) => !!s.edge },
    { value: 'shelter-interior', text: 'Shelter interior', has: (s) => !!s.shelter },
    { value: 'shelter-melt', text: 'Melt inside the shelter', has: (s) => !!s.shelter },
  ];
  const SPREADS = [
    { value: 'uniform', text: 'Even (uniform)' },
    { value: 'triangular', text: 'Peaked (triangular)' },
    { value: 'normal', text: 'Bell (normal, cut at the ends)' },
  ];
  const ranges = {
    gen: 0,
    workers: [],
    url: null,
    main: null, // the RangesStudy under way on the page
    study: null, // the RangesStudy that finished last (charts and CSV), or null
    report: null,
    ranWith: '', // the scenario (JSON) the finished study read
    pick: 0, // index of the charted result in the report
    pickId: null, // its id, kept across studies; null: the default
    past: null,
  };
  const workerCount = () => Math.max(1, Math.min(8, Number(navigator.hardwareConcurrency) || 2));

  function baseValueOf(what, layer) {
    try {
      const v = W.ranges_base_value(scenarioWithout('ranges'), what, layer == null ? -1 : layer);
      return typeof v === 'number' && isFinite(v) ? v : null;
    } catch (err) {
      console.error(err);
      return null;
    }
  }

  // A range around the scenario's own value (or a common one where it has none).
  function defaultRange(what, layer) {
    const b = baseValueOf(what, layer);
    const round = (v, step) => Math.round(v / step) * step;
    switch (what) {
      case 'snow-density': return b ? [round(Math.max(100, b * 0.75), 5), round(Math.min(550, b * 1.25), 5)] : [200, 350];
      case 'water-content': return b ? [round(b * 0.8, 0.5), round(b * 1.15, 0.5)] : [10, 25];
      case 'soil-conductivity-factor': return [0.8, 1.25];
      case 'insulation-derating': return b != null ? [Math.max(0, round(b - 10, 1)), Math.min(60, round(b + 15, 1))] : [0, 25];
      default: return b ? [round(b * 0.8, 10), round(b * 1.2, 10)] : [500, 1500];
    }
  }

  function defaultRangedInput(what) {
    const [low, high] = defaultRange(what, null);
    return { what, low, high, distribution: { kind: 'uniform' } };
  }

  function firstUsefulKind() {
    const s = state.scenario;
    for (const r of RANGED) if (baseValueOf(r.value, null) != null) return r.value;
    return s.winter || s.edge ? 'freezing-index' : 'snow-density';
  }

  function defaultRanges() {
    return { runs: 200, seed: 1 + Math.floor(Math.random() * 999999), inputs: [defaultRangedInput(firstUsefulKind())] };
  }

  function rangesOwners() {
    const r = state.scenario.ranges;
    if (!r) return [];
    const out = [[r, 'ranges.']];
    r.inputs.forEach((inp, i) => {
      out.push([inp, 'ranges.inputs[' + i + '].']);
      if (inp.distribution) out.push([inp.distribution, 'ranges.inputs[' + i + '].distribution.']);
    });
    return out;
  }

  function layerChoices(kind) {
    const out = [{ value: '', text: kind === null ? 'Every winter' : 'Everywhere' }];
    if (kind === null) return out;
    state.scenario.layers.forEach((L, i) => {
      if (L.material && L.material.kind === kind) out.push({ value: String(i), text: 'Layer ' + (i + 1) + (L.name ? ': ' + L.name : '') });
    });
    return out;
  }

  function renderRanges(focusPath) {
    const r = state.scenario.ranges;
    $('ranges-off').hidden = !!r;
    $('ranges-on').hidden = !r;
    const body = $('r-inputs').querySelector('tbody');
    clear(body);
    clear($('r-fields'));
    clear($('r-which'));
    if (!r) return;
    const rerender = (path) => () => { renderRanges(path); schedule(); };
    r.inputs.forEach((inp, i) => {
      const base = 'ranges.inputs[' + i + '].';
      const def = rangedOf(inp.what);
      const d = inp.distribution || (inp.distribution = { kind: 'uniform' });
      const tr = el('tr');
      const cell = (node) => tr.append(el('td', {}, node));
      cell(field({
        path: base + 'what', label: 'Uncertain input ' + (i + 1), options: RANGED, owner: inp, key: 'what',
        get: () => inp.what,
        set: (v) => {
          inp.what = v;
          delete inp.layer;
          [inp.low, inp.high] = defaultRange(v, null);
          bad(inp).clear();
          if (d.kind !== 'uniform') inp.distribution = { kind: 'uniform' };
        },
        after: rerender(base + 'what'),
      }));
      cell(field({
        path: base + 'layer', label: 'Where input ' + (i + 1) + ' applies', options: layerChoices(def.kind), owner: inp, key: 'layer',
        get: () => (inp.layer == null ? '' : String(inp.layer)),
        set: (v) => { if (v === '') delete inp.layer; else inp.layer = Number(v); },
        after: rerender(base + 'layer'),
      }));
      cell(numField(inp, 'low', base + 'low', 'Low end of input ' + (i + 1), def.q));
      cell(numField(inp, 'high', base + 'high', 'High end of input ' + (i + 1), def.q));
      cell(field({
        path: base + 'distribution.kind', label: 'Spread of input ' + (i + 1), options: SPREADS, owner: inp, key: 'distribution.kind',
        get: () => d.kind,
        set: (v) => {
          const mid = (Number(inp.low) + Number(inp.high)) / 2;
          if (v === 'triangular') inp.distribution = { kind: v, mode: mid };
          else if (v === 'normal') inp.distribution = { kind: v, mean: mid, sd: (Number(inp.high) - Number(inp.low)) / 4 };
          else inp.distribution = { kind: 'uniform' };
        },
        after: rerender(base + 'distribution.kind'),
      }));
      if (d.kind === 'triangular') cell(numField(d, 'mode', base + 'distribution.mode', 'Most likely value of input ' + (i + 1), def.q));
      else if (d.kind === 'normal') cell(numField(d, 'mean', base + 'distribution.mean', 'Mean of input ' + (i + 1), def.q));
      else tr.append(el('td', { class: 'muted', text: '–' }));
      if (d.kind === 'normal') {
        // A spread is a difference: shown without the unit's offset.
        const dq = def.q === 'temperature' ? 'temperature_difference' : def.q;
        cell(numField(d, 'sd', base + 'distribution.sd', 'Standard deviation of input ' + (i + 1), dq));
      } else tr.append(el('td', { class: 'muted', text: '–' }));
      tr.append(el('td', {}, el('button', {
        type: 'button', class: 'btn subtle icon', 'aria-label': 'Remove uncertain input ' + (i + 1), title: 'Remove this input',
        disabled: r.inputs.length <= 1, text: '✕',
        onclick: () => { r.inputs.splice(i, 1); rerender('ranges.inputs[0].what')(); },
      })));
      body.append(tr);
    });
    $('r-add-input').disabled = r.inputs.length >= 32;
    const f = $('r-fields');
    f.append(numField(r, 'runs', 'ranges.runs', 'Runs', 'count', { hint: '2 to 10 000' }));
    f.append(numField(r, 'seed', 'ranges.seed', 'Seed', 'count', { hint: 'the same seed draws the same values' }));
    // Which results: all the scenario has, unless some are unticked.
    const avail = RANGE_RESULTS.filter((x) => x.has(state.scenario));
    const chosen = Array.isArray(r.results) && r.results.length ? r.results : avail.map((x) => x.value);
    const which = $('r-which');
    which.append(el('span', { class: 'field-label', text: 'Results to give as ranges' }));
    for (const x of avail) {
      const id = 'r-result-' + x.value;
      const box = el('input', { type: 'checkbox', id, 'data-field': 'ranges.results.' + x.value, checked: chosen.includes(x.value) });
      box.addEventListener('change', () => {
        const now = avail.filter((y) => (y.value === x.value ? box.checked : chosen.includes(y.value))).map((y) => y.value);
        if (now.length === 0) { box.checked = true; return; }
        if (now.length === avail.length) delete r.results; else r.results = now;
        renderRanges('ranges.results.' + x.value);
        schedule();
      });
      which.append(el('label', { class: 'check', for: id }, box, ' ' + x.text));
    }
    which.append(el('span', { class: 'field-msg', 'data-msg-for': 'ranges.results' }));
    if (focusPath) {
      const t = document.querySelector('[data-field="' + CSS.escape(focusPath) + '"]');
      if (t) t.focus();
    }
  }

  // The study's inputs that are not numbers yet, as {label}.
  function rangesTyped() {
    const out = [];
    for (const [owner] of rangesOwners()) {
      const m = badText.get(owner);
      if (m) for (const v of m.values()) out.push(v);
    }
    return out;
  }

  function rangesStale() {
    const stale = !!ranges.report && JSON.stringify(state.scenario) !== ranges.ranWith;
    $('r-stale').hidden = !stale;
    $('ranges-results').classList.toggle('is-stale', stale);
  }

  function stopWorkers() {
    for (const w of ranges.workers) w.terminate();
    ranges.workers = [];
    if (ranges.url) { URL.revokeObjectURL(ranges.url); ranges.url = null; }
  }

  // Stop the study under way (a newer one, the Stop button, another scenario).
  function stopStudy(words) {
    ranges.gen++;
    stopWorkers();
    if (ranges.main) {
      const done = ranges.main.recorded();
      const all = ranges.main.task_count();
      ranges.main.free();
      ranges.main = null;
      if (words) {
        $('r-status').textContent = 'Stopped after ' + done + ' of ' + all + ' trials.';
        $('ranges-results').dataset.state = 'stopped';
      }
    }
    $('r-go').disabled = false;
    $('r-stop').disabled = true;
  }

  function dropRangesResult() {
    stopStudy(false);
    if (ranges.study) { ranges.study.free(); ranges.study = null; }
    ranges.report = null;
    ranges.ranWith = '';
    $('ranges-results').dataset.state = 'idle';
    $('r-status').textContent = 'Not run yet.';
    $('r-progress').value = 0;
    renderRangesReport();
  }

  // A worker: the page's wasm glue, then this. It makes its own study from the scenario
  // and runs the tasks it is sent, one at a time.
  function rangesWorkerMain() {
    let study = null;
    self.onmessage = (ev) => {
      const m = ev.data;
      if (m.type === 'init') {
        wasm_bindgen({ module_or_path: m.module }).then(() => {
          study = new wasm_bindgen.RangesStudy(m.scenario);
          self.postMessage({ type: 'ready' });
        }, (err) => self.postMessage({ type: 'failed', message: String(err && err.message || err) }));
      } else if (m.type === 'task' && study) {
        let outcome;
        try { outcome = study.run_task(m.k); } catch (err) { self.postMessage({ type: 'failed', message: String(err && err.message || err) }); return; }
        self.postMessage({ type: 'done', k: m.k, outcome });
      }
    };
  }

  function startWorkers(scen, main, gen, onDone, onFail) {
    const glue = $('hibernal-glue');
    if (typeof Worker !== 'function' || !glue || !state.module) return false;
    try {
      const src = glue.textContent + '\n;(' + rangesWorkerMain.toString() + ')();\n';
      ranges.url = URL.createObjectURL(new Blob([src], { type: 'text/javascript' }));
      const n = Math.min(workerCount(), main.task_count());
      let next = 0;
      const feed = (w) => {
        if (gen !== ranges.gen) return;
        if (next < main.task_count()) w.postMessage({ type: 'task', k: next++ });
      };
      for (let i = 0; i < n; i++) {
        const w = new Worker(ranges.url);
        w.onmessage = (ev) => {
          if (gen !== ranges.gen) return;
          const m = ev.data;
          // Two tasks in hand, so a worker never waits on the page between tasks.
          if (m.type === 'ready') {
            feed(w);
            feed(w);
          } else if (m.type === 'done') {
            if (!main.record(m.k, m.outcome)) { onFail('an outcome came back that the study could not take'); return; }
            feed(w);
            onDone();
          } else if (m.type === 'failed') onFail(m.message);
        };
        w.onerror = (ev) => { if (gen === ranges.gen) { ev.preventDefault(); onFail(ev.message || 'a worker stopped'); } };
        w.postMessage({ type: 'init', module: state.module, scenario: scen });
        ranges.workers.push(w);
      }
      return true;
    } catch (err) {
      console.error(err);
      stopWorkers();
      return false;
    }
  }

  function startStudy() {
    if ($('results').dataset.pending === 'true') run();
    stopStudy(false);
    const list = $('r-errors');
    clear(list); list.hidden = true;
    for (const m of document.querySelectorAll('#ranges .field-msg')) clear(m);
    for (const f of document.querySelectorAll('#ranges .has-error')) f.classList.remove('has-error');
    const typed = rangesTyped();
    if (typed.length) {
      for (const b of typed) list.append(el('li', { text: b.label + ': enter a number' }));
      list.hidden = false;
      $('r-status').textContent = 'Fix the marked inputs.';
      return;
    }
    const scen = clone(state.scenario);
    let main;
    try {
      main = new W.RangesStudy(scen);
    } catch (err) {
      console.error(err);
      generalError('The study failed unexpectedly: ' + String(err && err.message || err));
      return;
    }
    const errs = main.errors();
    if (errs && errs.length) {
      main.free();
      for (const e of errs) {
        if (!placeMessage(e.field, e.message, 'error', e)) list.append(el('li', { text: describePath(e.field) + ': ' + e.message }));
      }
      list.hidden = !list.firstChild;
      $('r-status').textContent = 'Fix the marked inputs.';
      $('ranges-results').dataset.state = 'refused';
      return;
    }
    const gen = ranges.gen;
    ranges.main = main;
    const all = main.task_count();
    const box = $('ranges-results');
    box.dataset.state = 'running';
    $('r-go').disabled = true;
    $('r-stop').disabled = false;
    const t0 = performance.now();
    const progress = (where) => {
      const k = main.recorded();
      $('r-progress').value = k / all;
      const s = (performance.now() - t0) / 1000;
      const left = k > 0 ? s * (all - k) / k : NaN;
      $('r-status').textContent = k + ' of ' + all + ' trials ' + where + (isFinite(left) && k < all ? ', about ' + Math.ceil(left) + ' s left' : '') + '…';
    };
    const finishStudy = () => {
      const ms = performance.now() - t0;
      stopWorkers();
      ranges.main = null;
      if (ranges.study) ranges.study.free();
      ranges.study = main;
      const rep = main.report();
      ranges.report = rep;
      ranges.ranWith = JSON.stringify(scen);
      $('r-go').disabled = false;
      $('r-stop').disabled = true;
      box.dataset.runs = String(Number(box.dataset.runs || 0) + 1);
      box.dataset.ms = String(Math.round(ms));
      box.dataset.state = 'done';
      $('r-status').textContent = 'Done: ' + rep.runs + ' runs and ' + (all - rep.runs) + ' more trials (the base case, each input at its ends, each snow regression) in ' + msWords(ms) + (box.dataset.workers !== '0' ? ' on ' + box.dataset.workers + ' workers' : ' on this page') + '.';
      renderRangesReport();
      rangesStale();
    };
    const fail = (message) => {
      stopStudy(false);
      list.append(el('li', { text: 'The study stopped: ' + message }));
      list.hidden = false;
      $('r-status').textContent = 'The study stopped.';
      box.dataset.state = 'failed';
    };
    const where = 'on ' + workerCount() + ' workers';
    const onDone = () => {
      if (main.recorded() === all && main.report() !== null) finishStudy();
      else progress(where);
    };
    if (startWorkers(scen, main, gen, onDone, fail)) {
      box.dataset.workers = String(ranges.workers.length);
      progress(where);
      return;
    }
    // No workers here: run the tasks on the page, a slice at a time.
    box.dataset.workers = '0';
    const slice = () => {
      if (gen !== ranges.gen) return;
      const st = main.advance(SLICE_MS);
      if (!st.ok) { fail((st.errors || []).map((e) => e.message).join('; ') || 'unknown reason'); return; }
      if (st.finished) { finishStudy(); return; }
      progress('on this page');
      setTimeout(slice, 0);
    };
    slice();
  }

  function rangesHeadCell(text) { return el('th', { scope: 'col', text }); }

  function renderRangesReport() {
    const rep = ranges.report;
    const t = $('r-summary');
    const head = t.querySelector('thead');
    const body = t.querySelector('tbody');
    clear(head); clear(body);
    const pick = $('r-pick');
    clear(pick);
    $('r-summary-csv').disabled = !rep;
    $('r-trials-csv').disabled = !rep;
    t.hidden = !rep;
    $('r-pick-wrap').hidden = !rep;
    $('r-failed').textContent = '';
    clear($('r-limits'));
    $('r-limits').hidden = true;
    if (!rep) {
      for (const id of ['r-spread-chart', 'r-sensitivity-chart']) { const c = $(id); const g = c.getContext('2d'); if (g) g.clearRect(0, 0, c.width, c.height); }
      return;
    }
    head.append(el('tr', {}, rangesHeadCell('Result'), rangesHeadCell('Base case'), rangesHeadCell('P10'), rangesHeadCell('P50'),
      rangesHeadCell('P90'), rangesHeadCell('Snow regressions, base case'), rangesHeadCell('Runs'), rangesHeadCell('Moved most by')));
    const notes = [];
    const limits = $('r-limits');
    rep.results.forEach((res, i) => {
      const q = res.quantity;
      const v = (x) => (x == null ? '–' : fmtU(q, x));
      const sp = res.spread;
      const band = sp && sp.min != null ? v(sp.min) + ' to ' + v(sp.max) : 'no snow';
      // The input with the largest swing, if any moved the answer at all.
      const top = res.sensitivity.find((s) => s.swing != null && s.swing > 0);
      body.append(el('tr', { 'data-result': res.id },
        el('th', { scope: 'row', text: res.name }),
        el('td', { 'data-col': 'base', text: v(res.base) }),
        el('td', { 'data-col': 'p10', text: v(res.p10) }),
        el('td', { 'data-col': 'p50', text: v(res.p50) }),
        el('td', { 'data-col': 'p90', text: v(res.p90) }),
        el('td', { 'data-col': 'band', text: band }),
        el('td', { 'data-col': 'runs', text: res.runs_ok + (res.runs_failed ? ' (' + res.runs_failed + ' failed)' : '') }),
        el('td', { 'data-col': 'top', text: top ? top.name : 'none of the inputs' })));
      pick.append(el('option', { value: String(i), text: res.name }));
      const past = res.past_limit;
      if (past && past.of > 0) {
        const pct = Math.round(100 * past.runs / past.of);
        limits.append(el('li', { 'data-result': res.id, text: res.name + ': ' + past.meaning + ' in ' + past.runs + ' of ' + past.of + ' runs (' + pct + ' %)'
          + (past.base_past == null ? '.' : past.base_past ? ', the base case among them.' : '; not in the base case.') }));
      }
      if (res.runs_failed) {
        const first = res.failures[0];
        notes.push(res.name + ': ' + res.runs_failed + ' of ' + rep.runs + ' runs gave no value' + (first ? ' (first, ' + first.field + ': ' + first.message + ')' : '') + '; the percentiles are of the others.');
      }
    });
    if (rep.results.some((x) => x.id === 'frost-below-footing')) notes.push('Frost below the footing: a negative value is how far above the footing\'s base the frost stays.');
    notes.push('Seed ' + rep.seed + ', ' + rep.runs + ' runs: the same seed and inputs give the same numbers.');
    $('r-failed').textContent = notes.join(' ');
    $('r-limits').hidden = !$('r-limits').firstChild;
    // The result chosen before, if this study has it; else the first that is not the
    // steady R-value (a winter, an edge or a shelter is what a range study is usually for).
    let at = rep.results.findIndex((x) => x.id === ranges.pickId);
    if (at < 0) at = Math.max(0, rep.results.findIndex((x) => x.id !== 'r-value'));
    ranges.pick = at;
    pick.value = String(ranges.pick);
    drawRanges();
  }

  function drawRanges() {
    if (!ranges.study || !ranges.report) return;
    jobChart('r-spread-chart', ranges.study, (c, dpr) => ranges.study.draw_spread(c, ranges.pick, state.units, dpr));
    jobChart('r-sensitivity-chart', ranges.study, (c, dpr) => ranges.study.draw_sensitivity(c, ranges.pick, state.units, dpr));
  }

  function setUpRanges() {
    $('ranges-add').addEventListener('click', () => {
      state.scenario.ranges = ranges.past || defaultRanges();
      state.scenario.version = CAT.format_version;
      renderRanges('ranges.inputs[0].what');
      schedule();
    });
    $('ranges-remove').addEventListener('click', () => {
      ranges.past = state.scenario.ranges;
      delete state.scenario.ranges;
      dropRangesResult();
      renderRanges();
      schedule();
      $('ranges-add').focus();
    });
    $('r-add-input').addEventListener('click', () => {
      const r = state.scenario.ranges;
      const used = new Set(r.inputs.map((x) => x.what + '/' + (x.layer == null ? '' : x.layer)));
      const next = RANGED.find((x) => !used.has(x.value + '/') && baseValueOf(x.value, null) != null) || RANGED.find((x) => !used.has(x.value + '/')) || RANGED[0];
      r.inputs.push(defaultRangedInput(next.value));
      renderRanges('ranges.inputs[' + (r.inputs.length - 1) + '].what');
      schedule();
    });
    $('r-go').addEventListener('click', startStudy);
    $('r-stop').addEventListener('click', () => stopStudy(true));
    $('r-pick').addEventListener('change', (ev) => {
      ranges.pick = Number(ev.target.value) || 0;
      const res = ranges.report && ranges.report.results[ranges.pick];
      ranges.pickId = res ? res.id : null;
      drawRanges();
    });
    $('r-summary-csv').addEventListener('click', () => { if (ranges.study) download(ranges.study.summary_csv(state.units), fileStem('ranges') + '-summary.csv'); });
    $('r-trials-csv').addEventListener('click', () => { if (ranges.study) download(ranges.study.trials_csv(state.units), fileStem('ranges') + '-runs.csv'); });
  }

  function adopt(scenario, from) {
    state.scenario = scenario;
    const note = $('format-note');
    note.hidden = true;
    if (from && Number.isInteger(scenario.version) && scenario.version < CAT.format_version) {
      note.textContent = 'This ' + from + ' holds format version ' + scenario.version + '; this page reads it unchanged and writes version ' +
        CAT.format_version + ' when you save or share it (older versions of the page may not open that).';
      note.hidden = false;
      scenario.version = CAT.format_version;
    }
    if (typeof state.scenario.title !== 'string') state.scenario.title = '';
    if (typeof state.scenario.notes !== 'string') state.scenario.notes = '';
    state.preset.top = guessPreset(scenario.top);
    state.preset.bottom = guessPreset(scenario.bottom);
    state.lastGood = null;
    cancelWinter();
    if (winter.job) { winter.job.free(); winter.job = null; }
    winter.report = null;
    winter.day = null;
    winter.past = {};
    winter.summary = null;
    winter.design = null;
    winter.designReport = null;
    designStale();
    $('w-design').dataset.state = 'idle';
    $('w-design-status').textContent = '';
    renderDesignReport();
    $('w-csv').disabled = true;
    $('w-profiles-csv').disabled = true;
    dropShelterResult();
    shelter.past = {};
    dropEdgeResult();
    edge.past = {};
    edge.design = null;
    edge.designReport = null;
    edgeDesignStale();
    $('e-design').dataset.state = 'idle';
    $('e-design-status').textContent = '';
    renderEdgeDesignReport();
    dropRangesResult();
    ranges.past = null;
    ranges.pickId = null;
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
    download(JSON.stringify(state.scenario, null, 2) + '\n', fileStem('scenario') + '.hibernal.json', 'application/json');
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
      adopt(s, 'file');
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
      // Compiled once: the page and the study's workers instantiate the same module.
      state.module = await WebAssembly.compile(decodeBase64(data.textContent.trim()));
      await wasm_bindgen({ module_or_path: state.module });
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
    // The gallery: every example as a card with what it shows.
    const gl = $('gallery-list');
    for (const ex of EXAMPLES) {
      const b = el('button', { type: 'button', class: 'gallery-card', 'data-example': ex.id },
        el('strong', { text: ex.title }), el('span', { text: ex.summary }));
      b.addEventListener('click', () => { loadExample(ex.id); $('gallery').open = false; });
      gl.append(el('li', {}, b));
    }
    $('gallery').hidden = !EXAMPLES.length;
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
        if (winter.report) { renderWinterReport(); drawWinter(); }
        if (shelter.report) { renderShelterReport(); drawShelter(); }
        if (edge.report) { renderEdgeReport(); drawEdge(); }
        if (edge.designReport) renderEdgeDesignReport();
        if (ranges.report) renderRangesReport();
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
    $('profile-csv').addEventListener('click', () => {
      // The last scenario that computed (what the chart shows).
      const scen = state.lastGood ? state.lastGood.scenario : null;
      if (scen) download(W.profile_csv(scen, state.units), fileStem('scenario') + '-profile.csv');
    });
    $('open-file').addEventListener('change', openFile);
    setUpWinter();
    setUpShelter();
    setUpEdge();
    setUpRanges();
    setUpChartSaving();
    setUpTableSaving();
    setUpPrinting();
    setUpHistory();

    let resizeTimer = 0;
    window.addEventListener('resize', () => {
      clearTimeout(resizeTimer);
      resizeTimer = setTimeout(() => { drawChart(); drawWinter(); drawShelter(); drawEdge(); drawRanges(); }, 120);
    });

    renderSources();
    $('load-status').hidden = true;
    $('app').hidden = false;
    $('start-fresh').addEventListener('click', () => {
      $('restore-note').hidden = true;
      if (EXAMPLES.length) loadExample(EXAMPLES[0].id);
    });
    $('share-make').addEventListener('click', makeShareLink);
    scenarioFromLink().then((linked) => {
      if (linked) {
        adopt(linked, 'link');
        $('example-pick').value = '';
        $('restore-text').textContent = 'Opened the scenario this link carries.';
        $('restore-note').hidden = false;
      } else {
        // A broken link's note is kept, followed by what opened instead.
        const linkNote = $('restore-note').hidden ? '' : $('restore-text').textContent;
        const restored = restoreAutosave();
        if (!restored && EXAMPLES.length) loadExample(EXAMPLES[0].id);
        if (linkNote) {
          $('restore-text').textContent = linkNote + ' ' + (restored ? $('restore-text').textContent : 'The first example is open instead.');
          $('restore-note').hidden = false;
        }
      }
      document.documentElement.dataset.ready = 'true';
    }).catch((err) => {
      console.error(err);
      $('load-status').hidden = false;
      $('load-status').textContent = 'The page could not be set up: ' + String(err && err.message || err);
    });
  }

  function loadExample(id) {
    const ex = EXAMPLES.find((e) => e.id === id);
    $('restore-note').hidden = true;
    $('example-pick').value = id;
    $('example-summary').textContent = ex ? ex.summary : '';
    adopt(W.example(id));
    // A shelter example is about the shelter: bring its section into view.
    if (state.scenario && state.scenario.shelter && typeof $('shelter').scrollIntoView === 'function') $('shelter').scrollIntoView({ block: 'start' });
    // So is an edge example.
    else if (state.scenario && state.scenario.edge && typeof $('edge').scrollIntoView === 'function') $('edge').scrollIntoView({ block: 'start' });
  }

  if (document.readyState === 'loading') document.addEventListener('DOMContentLoaded', start);
  else start();
})();
