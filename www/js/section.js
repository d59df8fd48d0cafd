// The section interface. Each optional section of a scenario the page edits (the winter,
// the shelter, the building edge, the ranges study) is a module exporting one object of
// this shape, made with section(); main.js keeps them in one list, in page order, and
// loops over it to recompute, to adopt another scenario, to show other units, to redraw,
// and to add or remove a section.
//
//   key           the scenario's property (state.scenario[key]); also the prefix of the
//                 ids of its Add and Remove buttons (#<key>-add, #<key>-remove)
//   firstField    the path of the input focused when the section is added
//   byHand        true: its results come only from a run started by hand (the ranges
//                 study), so its typed text does not block the recompute, and adding or
//                 removing it waits for the debounced recompute (which saves the scenario)
//   needsStack    true: its run starts from a good steady compute of the stack (the
//                 winter); false: it runs beside it (it does not read the stack's result)
//   inView        true: an example holding this section is about it (opening one brings
//                 the section into view)
//   fresh()       a new section of the page's own defaults, for Add
//   setUp()       wires its controls, once, at start
//   render()      builds its inputs from state.scenario[key] (Add alone when absent)
//   owners()      [owner, path prefix] pairs of its inputs, where text typed that is not a
//                 number yet is looked up
//   edited()      the scenario may have changed (each recompute starts with it): what was
//                 computed from an earlier scenario by hand (a search, a study) is marked
//                 out of date
//   run(blocked)  its part of the recompute; `blocked`: the inputs cannot be computed
//                 (its results are marked out of date)
//   showUnits()   shows its results again in the units now chosen
//   draw()        draws its charts again (the window changed size)
//   drop()        the section was removed: its run stops and its results go
//   adopt()       another scenario opened: its results, searches and the sub-sections
//                 kept for switching back all go
//   layersMoved(map)  the stack's layers were added, removed or reordered (map[old index]
//                 is the layer's new index, -1 if removed): the references it holds to
//                 layers follow them, and its lists of layers show the stack as it is now
const FLAGS = ['byHand', 'needsStack', 'inView'];
const HOOKS = ['fresh', 'setUp', 'render', 'owners', 'edited', 'run', 'showUnits', 'draw', 'drop', 'adopt', 'layersMoved'];

// Checks a section's shape (so a section missing a part fails at start, by name).
export function section(s) {
  const missing = HOOKS.filter((k) => typeof s[k] !== 'function')
    .concat(FLAGS.filter((k) => typeof s[k] !== 'boolean'))
    .concat(['key', 'firstField'].filter((k) => typeof s[k] !== 'string'));
  const extra = Object.keys(s).filter((k) => !HOOKS.includes(k) && !FLAGS.includes(k) && k !== 'key' && k !== 'firstField');
  if (missing.length || extra.length) {
    throw new Error('section ' + (s.key || '?') + (missing.length ? ' lacks ' + missing.join(', ') : '') + (extra.length ? ' has unknown ' + extra.join(', ') : ''));
  }
  return Object.freeze(s);
}
