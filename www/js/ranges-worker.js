// A Web Worker of the ranges study. Not a module of the page: ranges.js imports this file
// as text and runs it after the page's own wasm-bindgen glue (global `wasm_bindgen`), the
// two together in one blob: URL. It makes its own study from the scenario and runs the
// tasks it is sent, one at a time.
(function () {
  'use strict';
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
})();
