// Benchmark of the reference year and of the building edge's design winter (2D, the
// heated-workshop example on the default grid) as wasm in headless Chromium, through the
// built page opened from file://. Prints the median of several runs. Run: node e2e/bench.mjs
// (./build.sh bench runs it after the native benchmark).
import { launch, openPage } from './helpers.mjs';

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
} finally {
  await browser.close();
}
