// tools/inline.mjs: inlined text that looks like markup or like replacement
// patterns must arrive unchanged in meaning. No browser needed.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import vm from 'node:vm';
import { REPO } from './helpers.mjs';

test('inline.mjs escapes script ends and keeps $ patterns literal', () => {
  const dir = mkdtempSync(join(tmpdir(), 'hibernal-inline-'));
  try {
    const payload = '</script><!-- $& $1 $$ ' + "$'" + ' $` x';
    const glue = 'var wasm_bindgen = { s: ' + JSON.stringify(payload) + ' };\n';
    writeFileSync(join(dir, 'glue.js'), glue);
    writeFileSync(join(dir, 'm.wasm'), Buffer.from([0, 0x61, 0x73, 0x6d, 1, 0, 0, 0, 9, 9]));
    const out = join(dir, 'page.html');
    const log = execFileSync(process.execPath, ['tools/inline.mjs'], {
      cwd: REPO, env: { ...process.env, HIBERNAL_GLUE: join(dir, 'glue.js'), HIBERNAL_WASM: join(dir, 'm.wasm'), HIBERNAL_OUT: out },
    }).toString();
    assert.match(log, /page\.html/);
    const html = readFileSync(out, 'utf8');
    assert.match(html, /<meta http-equiv="Content-Security-Policy" content="default-src 'none';/);
    assert.equal(html.includes('@inline:'), false, 'every marker replaced');
    // Only the page's own closing tags remain.
    const scripts = [...html.matchAll(/<script([^>]*)>([\s\S]*?)<\/script>/g)];
    assert.equal(scripts.length, 3);
    const [data, glueTag, app] = scripts;
    assert.match(data[1], /type="application\/octet-stream" id="hibernal-wasm"/);
    assert.deepEqual([...Buffer.from(data[2], 'base64')], [0, 0x61, 0x73, 0x6d, 1, 0, 0, 0, 9, 9]);
    // The glue, run as JavaScript, still holds the original string.
    const ctx = {};
    vm.runInNewContext(glueTag[2] + '\nthis.s = wasm_bindgen.s;', ctx);
    assert.equal(ctx.s, payload);
    assert.ok(app[2].includes('wasm_bindgen'), 'app script inlined');
    assert.equal(/<!--/.test(glueTag[2] + app[2]), false);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});

test('inline.mjs refuses a file that is not WebAssembly', () => {
  const dir = mkdtempSync(join(tmpdir(), 'hibernal-inline-'));
  try {
    writeFileSync(join(dir, 'glue.js'), 'var wasm_bindgen;');
    writeFileSync(join(dir, 'm.wasm'), 'not wasm');
    assert.throws(() => execFileSync(process.execPath, ['tools/inline.mjs'], {
      cwd: REPO, stdio: 'pipe',
      env: { ...process.env, HIBERNAL_GLUE: join(dir, 'glue.js'), HIBERNAL_WASM: join(dir, 'm.wasm'), HIBERNAL_OUT: join(dir, 'o.html') },
    }));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});
