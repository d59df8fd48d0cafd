// Benchmark of the reference year, of the building edge's design winter (2D, the
// heated-workshop example on the default grid) and of a ranges study of 200 runs of the
// reference year's column and climate (the invented silt-yard example) over the page's Web
// Workers, as wasm in headless Chromium, through the built page opened from file://. Prints
// the median of several runs. Run: node e2e/bench.mjs (./build.sh bench runs it after the
// native benchmark).
import { launch, openPage, andRecompute } from './helpers.mjs';

const runs = Number(process.env.HIBERNAL_BENCH_RUNS || 7);
const browser = await launch();
try {
  const { page } = await openPage(browser);
  const results = [];
  for (let i = 0; i < runs; i++) {
    const r = await page.evaluate(() => wasm_bindgen.benchmark_reference_year());
    if (typeof r === 'string') throw new Error(r);
    results.push(r);
  }
  const ms = results.map((r) => r.ms).sort((a, b) => a - b);
  const median = ms[Math.floor(ms.length / 2)];
  const r = results[0];
  console.log(`reference year (wasm, headless Chromium): ${r.cells} cells, ${r.steps} steps, ${r.iterations_per_step.toFixed(2)} iterations/step`);
  console.log(`  time: median ${median.toFixed(1)} ms (min ${ms[0].toFixed(1)}, max ${ms[ms.length - 1].toFixed(1)}) over ${ms.length} runs`);
  console.log(`  cell-updates per second: ${(r.cells * r.iterations / (median / 1000)).toExponential(3)} (cells × iterations / time)`);
  console.log(`  deepest frost ${r.max_frost_depth_m.toFixed(3)} m`);

  const edgeRuns = Number(process.env.HIBERNAL_BENCH_EDGE_RUNS || 3);
  const edge = [];
  for (let i = 0; i < edgeRuns; i++) {
    const e = await page.evaluate(() => wasm_bindgen.benchmark_edge_winter());
    if (typeof e === 'string') throw new Error(e);
    edge.push(e);
  }
  const ems = edge.map((e) => e.ms).sort((a, b) => a - b);
  const emedian = ems[Math.floor(ems.length / 2)];
  const e = edge[0];
  console.log(`edge design winter 2D (wasm, headless Chromium): ${e.nx} x ${e.nz} = ${e.cells} cells, ${e.steps} steps, ${e.iterations_per_step.toFixed(2)} passes/step, with the 1D column`);
  console.log(`  time: median ${(emedian / 1000).toFixed(2)} s (min ${(ems[0] / 1000).toFixed(2)}, max ${(ems[ems.length - 1] / 1000).toFixed(2)}) over ${ems.length} runs (target: under 2 s)`);
  console.log(`  frost below the footing base ${e.max_frost_below_base_m.toFixed(3)} m; far field ${e.far_frost_depth_m.toFixed(3)} m`);

  // The ranges study as a user runs it: from the click on Run to the drawn report.
  const studyRuns = Number(process.env.HIBERNAL_BENCH_STUDY_RUNS || 3);
  await andRecompute(page, () => page.selectOption('#example-pick', 'silt-yard-how-sure'));
  const studies = [];
  for (let i = 0; i < studyRuns; i++) {
    const before = await page.evaluate(() => Number(document.querySelector('#ranges-results').dataset.runs || 0));
    const t0 = Date.now();
    await page.click('#r-go');
    await page.waitForFunction((b) => Number(document.querySelector('#ranges-results').dataset.runs || 0) > b
      || ['failed', 'refused'].includes(document.querySelector('#ranges-results').dataset.state), before, { timeout: 600000 });
    const d = await page.evaluate(() => Object.assign({}, document.querySelector('#ranges-results').dataset));
    if (d.state !== 'done') throw new Error(`the study ended ${d.state}: ${await page.locator('#r-errors').textContent()}`);
    studies.push({ wall: Date.now() - t0, ms: Number(d.ms), workers: Number(d.workers) });
  }
  const sms = studies.map((x) => x.wall).sort((a, b) => a - b);
  const smedian = sms[Math.floor(sms.length / 2)];
  const cores = await page.evaluate(() => navigator.hardwareConcurrency);
  const p = await page.evaluate(() => [...document.querySelectorAll('#r-summary tr[data-result="frost-depth"] td')].map((t) => t.textContent));
  console.log(`ranges study (silt-yard example: 200 runs of the reference year's column and climate + 18 more trials, ${studies[0].workers} workers, ${cores} cores reported):`);
  console.log(`  time from the click to the report: median ${(smedian / 1000).toFixed(2)} s (min ${(sms[0] / 1000).toFixed(2)}, max ${(sms[sms.length - 1] / 1000).toFixed(2)}) over ${sms.length} studies (target: under 5 s)`);
  console.log(`  deepest frost: base ${p[0]}, P10 ${p[1]}, P50 ${p[2]}, P90 ${p[3]}`);
} finally {
  await browser.close();
}
