// tools/inline.mjs as a bundler: the page's modules become one classic script, each module
// in a scope of its own, in an order where each comes after what it imports; what it
// cannot bundle faithfully it refuses, naming the file. No browser needed: small module
// trees in a temporary folder, run in a fresh VM context.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, mkdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import vm from 'node:vm';
import { REPO } from './helpers.mjs';
import { bundle, tokenize, BundleError } from '../tools/inline.mjs';

// Writes `files` ({ 'a.js': text, ... }) to a fresh folder; body(dir) gets its path.
function withTree(files, body) {
  const dir = mkdtempSync(join(tmpdir(), 'hibernal-bundle-'));
  try {
    for (const [name, text] of Object.entries(files)) {
      mkdirSync(dirname(join(dir, name)), { recursive: true });
      writeFileSync(join(dir, name), text);
    }
    return body(dir);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

// Bundles from main.js and runs the script; returns the context's `out`.
function runTree(files) {
  return withTree(files, (dir) => {
    const { code, modules } = bundle(join(dir, 'main.js'), { root: dir });
    const ctx = { out: [] };
    vm.runInNewContext(code, ctx);
    return { out: ctx.out, modules, code };
  });
}

// The message bundling `files` from main.js is refused with.
function refusal(files) {
  return withTree(files, (dir) => {
    try {
      bundle(join(dir, 'main.js'), { root: dir });
    } catch (e) {
      assert.ok(e instanceof BundleError, String(e));
      return e.message;
    }
    assert.fail('the bundle was not refused');
  });
}

test('modules run in the order of their imports, each once', () => {
  const { out, modules } = runTree({
    'main.js': "import { b } from './b.js';\nimport { a } from './lib/a.js';\nout.push('main ' + a + b);\n",
    'b.js': "import { a } from './lib/a.js';\nimport { c } from './c.js';\nout.push('b');\nexport const b = a + c;\n",
    'c.js': "out.push('c');\nexport const c = 'c';\n",
    'lib/a.js': "out.push('a');\nexport const a = 'a';\n",
  });
  // Depth first in the order of the import statements, as browsers evaluate modules.
  assert.deepEqual(out, ['a', 'c', 'b', 'main aac']);
  assert.deepEqual(modules, ['lib/a.js', 'c.js', 'b.js', 'main.js']);
});

test('an import cycle is refused, naming the modules around it', () => {
  const msg = refusal({
    'main.js': "import { a } from './a.js';\nexport const m = a;\n",
    'a.js': "import { b } from './b.js';\nexport const a = b;\n",
    'b.js': "import { c } from './sub/c.js';\nexport const b = c;\n",
    'sub/c.js': "import { a } from '../a.js';\nexport const c = () => a;\n",
  });
  assert.match(msg, /import cycle: a\.js → b\.js → sub\/c\.js → a\.js/);
});

test('an import of a name the other module does not export is refused', () => {
  const msg = refusal({
    'main.js': "import { here, missing } from './a.js';\nout.push(here, missing);\n",
    'a.js': "export const here = 1;\nconst missing = 2;\n",
  });
  assert.match(msg, /main\.js:1: imports "missing" from \.\/a\.js, which does not export it \(it exports here\)/);
});

test('default exports, default, namespace and bare imports and the like are refused', () => {
  const cases = [
    ["export default function f() {}\n", /main\.js:1: a default export is refused/],
    ["const f = 1;\nexport { f as default };\n", /main\.js:2: a default export is refused/],
    ["import a from './a.js';\n", /main\.js:1: a default import is refused/],
    ["import { default as a } from './a.js';\n", /main\.js:1: a default import is refused/],
    ["import * as a from './a.js';\n", /main\.js:1: a namespace import \(import \* as\) is refused/],
    ["import './a.js';\n", /main\.js:1: import '\.\/a\.js' names nothing/],
    ["export * from './a.js';\n", /main\.js:1: export \* is refused/],
    ["export { x } from './a.js';\n", /main\.js:1: a re-export \(export \{ \} from\) is refused/],
    ["import { x } from 'a';\n", /main\.js:1: "a" is not a relative path/],
    ["import { x } from '/abs/a.js';\n", /main\.js:1: "\/abs\/a\.js" is not a relative path/],
    ["\nconst m = () => import('./a.js');\n", /main\.js:2: dynamic import\(\) is not bundled/],
    ["out.push(import.meta.url);\n", /main\.js:1: import\.meta/],
    ["export let n = 1;\n", /main\.js:1: export let is refused/],
    ["var n = 1;\nexport { n };\n", /main\.js: exports "n", declared with var/],
    ["export { nothing };\n", /main\.js: exports "nothing" but declares no "nothing"/],
    ["export const x = 1;\nexport function x() {}\n", /main\.js:2: exports "x" twice/],
    ["import { x } from './a.js?raw';\n", /the only query understood is \?text/],
    ["import { x } from './none.js';\n", /main\.js:1: cannot read none\.js: no such file/],
    ["const a = 1;\nconst b = ;\n", /main\.js:2/],
  ];
  for (const [main, want] of cases) {
    const msg = refusal({ 'main.js': main, 'a.js': 'export const a = 1, x = 2;\n' });
    assert.match(msg, want, `for ${JSON.stringify(main)}: ${msg}`);
  }
});

test('a name declared in one module is not seen by another, and the same name in two does not clash', () => {
  const { out } = runTree({
    'main.js': "import { seen } from './a.js';\nimport { other } from './b.js';\nconst secret = 'main';\nout.push(seen(), other(), secret, typeof helper);\n",
    'a.js': "const secret = 41;\nfunction helper() { return secret + 1; }\nexport const seen = () => helper();\n",
    'b.js': "export const other = () => typeof secret + ' ' + typeof helper;\n",
  });
  assert.deepEqual(out, [42, 'undefined undefined', 'main', 'undefined']);
});

test('renamed imports and exports, several names per statement, shared state through a const object', () => {
  const { out } = runTree({
    'main.js': "import { twice as double, state, bump, ONE, TWO } from './a.js';\nbump();\nbump();\nout.push(double(ONE + TWO), state.n);\n",
    'a.js': "function twiceOf(x) { return 2 * x; }\nexport const state = { n: 0 }, ONE = 1;\nexport const TWO = 2;\nexport function bump() { state.n++; }\nexport { twiceOf as twice };\n",
  });
  assert.deepEqual(out, [6, 2]);
});

test('an import from "file?text" gives the file\'s text', () => {
  const text = "self.onmessage = () => `${1}`; // </script> <!-- \\ \"quoted\" 'single'\n";
  const { out } = runTree({
    'main.js': "import { text } from './worker.js?text';\nout.push(text);\n",
    'worker.js': text,
  });
  assert.deepEqual(out, [text]);
});

test('words in strings, templates, regular expressions and comments are not statements', () => {
  const { out } = runTree({
    'main.js': [
      "// import { nothing } from './nowhere.js';",
      "/* export default 1; */",
      "const s = \"import { x } from 'y'\";",
      "const t = `export ${ { v: 'import' }.v } ${`export * from ${'x'}`}`;",
      "const r = /export \\/ import [/'\"]/;",
      "const o = { import: 1, export: 2 };",
      "const d = 10 / 2 / 5;",
      "out.push(s.length, t, r.test(\"export / import '\"), o.import + o.export, d);",
      "export const done = true;",
    ].join('\n') + '\n',
  });
  assert.deepEqual(out, [21, 'export import export * from x', true, 3, 1]);
  const toks = tokenize('a = b / c; re = /x\\/y[/]/g; tpl = `a${ {b: `c${d}`}.b }e`;');
  assert.deepEqual(toks.filter((t) => t.type === 'regex').map((t) => t.value), ['/x\\/y[/]/g']);
  assert.equal(toks.filter((t) => t.type === 'template').length, 4);
});

test('the page\'s own modules bundle, with the worker as text', () => {
  const { code, modules } = bundle(join(REPO, 'www/js/main.js'), { root: REPO });
  assert.equal(modules[modules.length - 1], 'www/js/main.js');
  assert.ok(modules.includes('www/js/ranges-worker.js?text'));
  assert.ok(modules.indexOf('www/js/dom.js') < modules.indexOf('www/js/fields.js'));
  assert.ok(code.includes('wasm_bindgen'));
  assert.equal(/\bimport\s*[{*(]|\bexport\s+(?:const|function|default|\{)/.test(code.replace(/"(?:[^"\\]|\\.)*"/g, '""')), false, 'no module syntax is left');
});

test('inline.mjs refuses a module tree it cannot bundle, and says why', () => {
  withTree({
    'main.js': "import { a } from './a.js';\n",
    'a.js': "import { m } from './main.js';\nexport const a = 1;\n",
    'glue.js': 'var wasm_bindgen;',
    'm.wasm': Buffer.from([0, 0x61, 0x73, 0x6d, 1, 0, 0, 0]).toString('latin1'),
  }, (dir) => {
    let err = null;
    try {
      execFileSync(process.execPath, ['tools/inline.mjs'], {
        cwd: REPO, stdio: 'pipe',
        env: { ...process.env, HIBERNAL_ENTRY: join(dir, 'main.js'), HIBERNAL_GLUE: join(dir, 'glue.js'), HIBERNAL_WASM: join(dir, 'm.wasm'), HIBERNAL_OUT: join(dir, 'o.html') },
      });
    } catch (e) {
      err = e;
    }
    assert.ok(err, 'the build failed');
    assert.equal(err.status, 1);
    assert.match(err.stderr.toString(), /^inline\.mjs: import cycle: .*main\.js → .*a\.js → .*main\.js/);
  });
});
