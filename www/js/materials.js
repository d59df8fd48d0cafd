// Materials as the page edits them: the fields of each material kind (the layer list, the
// building edge's slab, wall, boards and soil bands), and a new material of each kind (the
// core's default).
import { core, coreDefault } from './core.js';
import { field, fmt, fmtU } from './fields.js';

function nominalBoard(id) {
  const b = core.CAT.boards.find((x) => x.id === id);
  return b ? b.conductivity_w_m_k : null;
}

// ---------- a new material of each kind ----------
export function defaultMaterial(kind) {
  return coreDefault('materials', kind) || { kind };
}

// Fields shown for each material kind (key is the property of `material`).
function materialFields(m) {
  const CAT = core.CAT;
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

// The fields of the material held at `owner.material` (paths under `prefix`). A choice
// that changes which fields apply (texture, model, board) calls rerender(its path)().
export function materialFieldsOf(owner, prefix, rerender) {
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
