// Builds dist/hibernal.html: one self-contained page with the stylesheet, the
// wasm-bindgen glue, the application script and the WebAssembly module (base64)
// inlined, so it works opened from file:// with no network at all.
//
// Usage (from the repository root): node tools/inline.mjs
// Optional environment overrides (for trying the page against other inputs):
//   HIBERNAL_GLUE  path of the wasm-bindgen glue   (default target/web/hibernal.js)
//   HIBERNAL_WASM  path of the wasm module          (default target/web/hibernal_bg.wasm)
//   HIBERNAL_OUT   path of the page to write        (default dist/hibernal.html)
import { readFileSync, writeFileSync, mkdirSync } from 'node:fs';
import { dirname, resolve, relative } from 'node:path';

const root = process.cwd();
const p = (rel) => resolve(root, rel);
const inputs = {
  html: p('www/index.html'),
  css: p('www/style.css'),
  app: p('www/app.js'),
  glue: p(process.env.HIBERNAL_GLUE || 'target/web/hibernal.js'),
  wasm: p(process.env.HIBERNAL_WASM || 'target/web/hibernal_bg.wasm'),
};
const out = p(process.env.HIBERNAL_OUT || 'dist/hibernal.html');

const CSP = "default-src 'none'; script-src 'unsafe-inline' 'wasm-unsafe-eval'; " +
  "style-src 'unsafe-inline'; img-src data: blob:; connect-src 'none'; " +
  // The ranges study's Web Workers run the inlined glue from a blob: URL.
  "worker-src blob:";

function read(path, binary = false) {
  try {
    return binary ? readFileSync(path) : readFileSync(path, 'utf8');
  } catch (e) {
    console.error(`inline.mjs: cannot read ${relative(root, path) || path}: ${e.message}`);
    process.exit(1);
  }
}

// Text placed inside <script> must not end the element early or open an
// HTML comment; both rewrites keep the JavaScript meaning unchanged
// ("<\/" and "<\!" read the same inside strings, regexes and comments).
function safeScript(js) {
  return js.replace(/<\/(script)/gi, (_m, s) => '<\\/' + s).replace(/<!--/g, () => '<\\!--');
}
function safeStyle(css) {
  return css.replace(/<\/(style)/gi, (_m, s) => '<\\/' + s);
}

let html = read(inputs.html);
const css = read(inputs.css);
const app = read(inputs.app);
const glue = read(inputs.glue);
const wasm = read(inputs.wasm, true);

if (wasm.length < 8 || wasm.readUInt32LE(0) !== 0x6d736100) {
  console.error(`inline.mjs: ${relative(root, inputs.wasm)} is not a WebAssembly module`);
  process.exit(1);
}

// Each marker must appear exactly once in www/index.html.
function replaceMarker(name, make) {
  const marker = `<!-- @inline:${name} -->`;
  const count = html.split(marker).length - 1;
  if (count !== 1) {
    console.error(`inline.mjs: expected one "${marker}" in www/index.html, found ${count}`);
    process.exit(1);
  }
  // A function replacer, so "$&", "$1" ... in the inlined text stay literal.
  html = html.replace(marker, () => make());
}

replaceMarker('csp', () => `<meta http-equiv="Content-Security-Policy" content="${CSP}">`);
replaceMarker('style', () => `<style>\n${safeStyle(css)}\n</style>`);
replaceMarker('scripts', () => [
  // Base64 has no "<", so a data block needs no escaping.
  `<script type="application/octet-stream" id="hibernal-wasm">${wasm.toString('base64')}</script>`,
  // The id lets the page hand the same glue to its Web Workers.
  `<script id="hibernal-glue">\n${safeScript(glue)}\n</script>`,
  `<script>\n${safeScript(app)}\n</script>`,
].join('\n'));

mkdirSync(dirname(out), { recursive: true });
writeFileSync(out, html);
const kib = (Buffer.byteLength(html) / 1024).toFixed(0);
const shownOut = relative(root, out).startsWith('..') ? out : relative(root, out);
console.log(`${shownOut} (${kib} KiB)`);
