// The calculator core: the wasm-bindgen glue (global `wasm_bindgen`, from the page's
// <script id="hibernal-glue">) started on the WebAssembly module inlined in
// <script id="hibernal-wasm">. startCore() fills `core` in once; the other modules read
// the API, the catalogue (with the defaults a new section starts from), the examples and
// the edited scenario from it.
import { $ } from './dom.js';

export const core = {
  W: null, // the wasm API
  CAT: null, // its catalogue: units, materials, presets, cautions, versions
  EXAMPLES: [],
  // The scenario the page edits, in the core (an EditedScenario): set after each edit, it
  // serves the stack's report, the profile chart and CSV, and every section's job.
  doc: null,
  module: null, // the compiled WebAssembly.Module, handed to the ranges study's workers
};

// A copy (to edit) of a default the core gives a new section or part:
// core.CAT.defaults[group][kind], or core.CAT.defaults[group] without a kind; undefined
// when it has none.
export function coreDefault(group, kind) {
  const d = core.CAT.defaults[group];
  const v = kind === undefined ? d : d && d[kind];
  return v === undefined ? undefined : JSON.parse(JSON.stringify(v));
}

function decodeBase64(b64) {
  const bin = atob(b64);
  const out = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
  return out;
}

// Throws with a reason the page can show when the core is missing or does not start.
export async function startCore() {
  if (typeof wasm_bindgen !== 'function') throw new Error('the calculator core is missing from this page');
  const data = $('hibernal-wasm');
  if (!data) throw new Error('the calculator module is missing from this page');
  // Compiled once: the page and the study's workers instantiate the same module.
  core.module = await WebAssembly.compile(decodeBase64(data.textContent.trim()));
  await wasm_bindgen({ module_or_path: core.module });
  core.W = wasm_bindgen;
  core.CAT = core.W.catalogue();
  core.EXAMPLES = core.W.examples();
  core.doc = new core.W.EditedScenario();
}
