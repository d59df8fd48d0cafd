// Builds dist/hibernal.html: one self-contained page with the stylesheet, the
// wasm-bindgen glue, the page's script and the WebAssembly module (base64) inlined, so it
// works opened from file:// with no network at all.
//
// The page's script is written as ES modules under www/js/; this file bundles them into
// one classic script (see "bundling" below), so nothing is loaded as a module at run time.
//
// Usage (from the repository root): node tools/inline.mjs
// Optional environment overrides (for trying the page against other inputs):
//   HIBERNAL_GLUE   path of the wasm-bindgen glue   (default target/web/hibernal.js)
//   HIBERNAL_WASM   path of the wasm module          (default target/web/hibernal_bg.wasm)
//   HIBERNAL_OUT    path of the page to write        (default dist/hibernal.html)
//   HIBERNAL_ENTRY  the page's entry module          (default www/js/main.js)
import { readFileSync, writeFileSync, mkdirSync } from 'node:fs';
import { dirname, resolve, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import vm from 'node:vm';

// ---------- bundling ----------
// The modules use named imports and exports only:
//   import { a, b as c } from './x.js';
//   import { text } from './file.js?text';      (the file's text as a string)
//   export function f() {}   export async function g() {}   export class C {}
//   export const x = 1, y = 2;   export { a, b as c };
// Each module becomes a function run once, in an order where every module comes after the
// modules it imports (as browsers evaluate modules), returning a frozen object of its
// exports; its imports are consts taken from those objects. So each module keeps its own
// scope, and a name one module declares is unseen by the others.
//
// Refused, with a message naming the file: a default export or import, a namespace import
// (`import * as`), `export *`, re-exports (`export { a } from`), an import that names
// nothing (`import './x.js'`), dynamic `import()` and `import.meta`, a bare or absolute
// specifier, an import cycle (the message lists the cycle), an import of a name the other
// module does not export, `export let` and `export var` (an importer's const would not
// follow later assignments: export a const object and change its properties), a module that
// does not parse.

export class BundleError extends Error {
  get name() { return 'BundleError'; }
}

const REGEX_AFTER = new Set(['return', 'typeof', 'instanceof', 'in', 'of', 'new', 'delete', 'void',
  'throw', 'case', 'do', 'else', 'yield', 'await']);
const PUNCT = /^(?:>>>=|\.\.\.|===|!==|\*\*=|<<=|>>=|>>>|&&=|\|\|=|\?\?=|=>|==|!=|<=|>=|&&|\|\||\?\?|\?\.(?!\d)|\+\+|--|\+=|-=|\*=|\/=|%=|&=|\|=|\^=|\*\*|<<|>>|[\s\S])/;
const NAME = /^[A-Za-z_$\u0080-\uffff][\w$\u0080-\uffff]*/;
const NUMBER = /^(?:0[xXoObB][\da-fA-F_]+n?|(?:\d[\d_]*\.?[\d_]*|\.\d[\d_]*)(?:[eE][+-]?\d[\d_]*)?n?)/;

// The tokens of a script, comments left out. Each token: { type (name, punct, string,
// template, regex, number), value, start, end, line, depth (brackets open around it, a
// template's ${ counting as one), nl (a line break before it) }. Only as much of the
// language as finding the top-level imports and exports needs.
export function tokenize(src, file = 'input') {
  const tokens = [];
  const open = []; // '{', '(', '[' or '${' (a template's substitution)
  let i = 0;
  let line = 1; // the line scanning is on
  let lineAt = 1; // the line the token being read starts on
  let nl = true;
  const fail = (msg) => { throw new BundleError(`${file}:${line}: ${msg}`); };
  const last = () => tokens[tokens.length - 1];
  const regexMayStart = () => {
    const p = last();
    if (!p) return true;
    if (p.type === 'name') return REGEX_AFTER.has(p.value);
    if (p.type === 'punct') return !(p.value === ')' || p.value === ']' || p.value === '++' || p.value === '--');
    return false;
  };
  const push = (type, start, value) => {
    tokens.push({ type, value, start, end: i, line: lineAt, depth: open.length, nl });
    nl = false;
  };
  const countLines = (from, to) => {
    for (let k = from; k < to; k++) if (src.charCodeAt(k) === 10) line++;
  };
  // Scans a template from just after "`" or "}" up to its end or its next "${".
  const templatePart = () => {
    const start = i;
    for (;;) {
      if (i >= src.length) fail('a template literal does not end');
      const ch = src[i];
      if (ch === '\\') { i += 2; continue; }
      if (ch === '`') { i++; countLines(start, i); return false; }
      if (ch === '$' && src[i + 1] === '{') { i += 2; countLines(start, i); return true; }
      i++;
    }
  };
  while (i < src.length) {
    const ch = src[i];
    if (ch === '\n') { line++; nl = true; i++; continue; }
    if (/\s/.test(ch)) { i++; continue; }
    lineAt = line;
    const start = i;
    if (ch === '/' && src[i + 1] === '/') {
      while (i < src.length && src[i] !== '\n') i++;
      continue;
    }
    if (ch === '/' && src[i + 1] === '*') {
      const end = src.indexOf('*/', i + 2);
      if (end < 0) fail('a comment does not end');
      countLines(i, end);
      if (src.slice(i, end).includes('\n')) nl = true;
      i = end + 2;
      continue;
    }
    if (ch === '"' || ch === "'") {
      i++;
      while (i < src.length && src[i] !== ch) {
        if (src[i] === '\n') fail('a string does not end on its line');
        i += src[i] === '\\' ? 2 : 1;
      }
      if (i >= src.length) fail('a string does not end');
      i++;
      countLines(start, i); // line continuations
      push('string', start, src.slice(start, i));
      continue;
    }
    if (ch === '`') {
      i++;
      const subst = templatePart();
      push('template', start, src.slice(start, i));
      if (subst) open.push('${');
      continue;
    }
    if (ch === '}' && open[open.length - 1] === '${') {
      open.pop();
      i++;
      const subst = templatePart();
      push('template', start, src.slice(start, i));
      if (subst) open.push('${');
      continue;
    }
    if (ch === '/' && regexMayStart()) {
      i++;
      let inClass = false;
      while (i < src.length) {
        const c = src[i];
        if (c === '\n') fail('a regular expression does not end on its line');
        if (c === '\\') { i += 2; continue; }
        if (c === '[') inClass = true;
        else if (c === ']') inClass = false;
        else if (c === '/' && !inClass) break;
        i++;
      }
      i++;
      while (i < src.length && /[\w$]/.test(src[i])) i++;
      push('regex', start, src.slice(start, i));
      continue;
    }
    let m = NUMBER.exec(src.slice(i, i + 64));
    if (m && /[\d.]/.test(ch) && !(ch === '.' && !/\d/.test(src[i + 1] || ''))) {
      i += m[0].length;
      push('number', start, m[0]);
      continue;
    }
    m = NAME.exec(src.slice(i, i + 256));
    if (m || (ch === '#' && NAME.test(src.slice(i + 1, i + 257)))) {
      const word = m ? m[0] : '#' + NAME.exec(src.slice(i + 1, i + 257))[0];
      i += word.length;
      push('name', start, word);
      continue;
    }
    m = PUNCT.exec(src.slice(i, i + 4));
    const p = m[0];
    if (p === '}' || p === ')' || p === ']') {
      const want = { '}': '{', ')': '(', ']': '[' }[p];
      if (open[open.length - 1] !== want) fail(`"${p}" closes nothing`);
      open.pop();
      i += 1;
      push('punct', start, p);
      continue;
    }
    i += p.length;
    push('punct', start, p);
    if (p === '{' || p === '(' || p === '[') open.push(p);
  }
  if (open.length) fail(`"${open[open.length - 1]}" is not closed`);
  return tokens;
}

const isPunct = (t, v) => t && t.type === 'punct' && t.value === v;
const isName = (t, v) => t && t.type === 'name' && (v === undefined || t.value === v);
const RESERVED = new Set(['default', 'as', 'from']);
const stringValue = (t) => vm.runInNewContext(t.value); // a string literal's value

// What one module imports and exports, and the edits that turn it into a function body.
// `file` names it in messages.
export function analyse(src, file) {
  const toks = tokenize(src, file);
  const imports = []; // { names: [{ imported, local }], spec, line }
  const exports = new Map(); // exported name → local name
  const declared = new Map(); // top-level name → const, let, var, function or class
  const edits = []; // { start, end, text }
  const fail = (t, msg) => { throw new BundleError(`${file}:${t ? t.line : '?'}: ${msg}`); };
  const blank = (from, to) => edits.push({ start: from, end: to, text: src.slice(from, to).replace(/[^\n]/g, '') });
  const addExport = (name, local, t) => {
    if (exports.has(name)) fail(t, `exports "${name}" twice`);
    exports.set(name, local);
  };
  // Reads "{ a, b as c }" from token k (the "{"); returns [pairs, index after "}"].
  const nameList = (k, what) => {
    const pairs = [];
    k++;
    while (!isPunct(toks[k], '}')) {
      const a = toks[k];
      if (!isName(a)) fail(a, `expected a name in the ${what} list`);
      let b = a;
      if (isName(toks[k + 1], 'as')) {
        b = toks[k + 2];
        if (!isName(b)) fail(a, `expected a name after "as" in the ${what} list`);
        k += 2;
      }
      pairs.push([a.value, b.value, a]);
      k++;
      if (isPunct(toks[k], ',')) k++;
      else if (!isPunct(toks[k], '}')) fail(toks[k], `expected "," or "}" in the ${what} list`);
    }
    return [pairs, k + 1];
  };
  // Reads the declarators of a const, let or var at token k (the keyword); records each
  // name; returns [names, index after the statement].
  const declarators = (k) => {
    const kind = toks[k].value;
    const depth = toks[k].depth;
    const names = [];
    k++;
    for (;;) {
      const t = toks[k];
      if (isName(t)) { names.push(t.value); k++; }
      else if (isPunct(t, '{') || isPunct(t, '[')) {
        // A destructuring pattern: its names are those not followed by ":" (a key).
        k++;
        while (k < toks.length && toks[k].depth > depth) {
          const u = toks[k];
          if (isName(u) && !isPunct(toks[k + 1], ':') && !isPunct(toks[k - 1], '.')) names.push(u.value);
          k++;
        }
        k++;
      } else fail(t, `expected a name after "${kind}"`);
      // Skip the initializer up to the next declarator or the end of the statement.
      while (k < toks.length) {
        const u = toks[k];
        if (u.depth === depth && isPunct(u, ';')) { k++; return [names, k, kind]; }
        if (u.depth === depth && isPunct(u, ',')) break;
        if (u.depth === depth && u.nl && isName(u) && /^(?:import|export|function|class|const|let|var|async)$/.test(u.value)) return [names, k, kind];
        k++;
      }
      if (k >= toks.length) return [names, k, kind];
      k++; // the ","
    }
  };
  const record = (names, kind) => { for (const n of names) if (!declared.has(n)) declared.set(n, kind); };

  // Anywhere in the module, not only in its top-level statements.
  toks.forEach((t, k) => {
    if (!isName(t, 'import') || isPunct(toks[k - 1], '.') || isPunct(toks[k - 1], '?.')) return;
    if (isPunct(toks[k + 1], '(')) fail(t, 'dynamic import() is not bundled: import by name at the top');
    if (isPunct(toks[k + 1], '.')) fail(t, 'import.meta has no meaning in the bundled page');
  });

  for (let k = 0; k < toks.length; k++) {
    const t = toks[k];
    if (t.type !== 'name') continue;
    const prev = toks[k - 1];
    if (isPunct(prev, '.') || isPunct(prev, '?.')) continue; // a property named so
    const next = toks[k + 1];
    if (t.value === 'import') {
      if (isPunct(next, ':')) continue; // a key in an object literal
      if (t.depth !== 0) fail(t, 'an import inside a block');
      if (next && next.type === 'string') fail(t, `import ${next.value} names nothing it imports: import names from it, or drop it`);
      if (isPunct(next, '*')) fail(t, 'a namespace import (import * as) is refused: import the names used');
      if (!isPunct(next, '{')) fail(t, 'a default import is refused: import { name } from a named export');
      const [pairs, after] = nameList(k + 1, 'import');
      if (!isName(toks[after], 'from') || !toks[after + 1] || toks[after + 1].type !== 'string') fail(t, 'expected from \'./file.js\' after the import list');
      const specTok = toks[after + 1];
      let end = after + 2;
      if (isPunct(toks[end], ';')) end++;
      const names = pairs.map(([imported, local, at]) => {
        if (imported === 'default') fail(at, 'a default import is refused: import { name } from a named export');
        if (RESERVED.has(local)) fail(at, `"${local}" cannot name an import`);
        return { imported, local };
      });
      imports.push({ names, spec: stringValue(specTok), line: t.line });
      record(names.map((x) => x.local), 'import');
      blank(t.start, toks[end - 1].end);
      k = end - 1;
      continue;
    }
    if (t.value === 'export') {
      if (isPunct(next, ':')) continue;
      if (t.depth !== 0) fail(t, 'an export inside a block');
      if (isName(next, 'default')) fail(t, 'a default export is refused: export it by name');
      if (isPunct(next, '*')) fail(t, 'export * is refused: import the names, then export them');
      if (isPunct(next, '{')) {
        const [pairs, after] = nameList(k + 1, 'export');
        if (isName(toks[after], 'from')) fail(t, 'a re-export (export { } from) is refused: import the names, then export them');
        let end = after;
        if (isPunct(toks[end], ';')) end++;
        for (const [local, name, at] of pairs) {
          if (name === 'default') fail(at, 'a default export is refused: export it by name');
          addExport(name, local, at);
        }
        blank(t.start, toks[end - 1].end);
        k = end - 1;
        continue;
      }
      let d = k + 1;
      if (isName(toks[d], 'async') && isName(toks[d + 1], 'function')) d++;
      const decl = toks[d];
      if (isName(decl, 'function') || isName(decl, 'class')) {
        let n = d + 1;
        if (isPunct(toks[n], '*')) n++;
        if (!isName(toks[n])) fail(t, `expected the name of the exported ${decl.value}`);
        addExport(toks[n].value, toks[n].value, t);
        record([toks[n].value], decl.value);
      } else if (isName(decl, 'const')) {
        const [names, , kind] = declarators(d);
        for (const n of names) addExport(n, n, t);
        record(names, kind);
      } else if (isName(decl, 'let') || isName(decl, 'var')) {
        fail(t, `export ${decl.value} is refused: importers would keep the first value only; export a const (an object whose properties change, if it must change)`);
      } else fail(t, 'expected a function, class or const after export');
      edits.push({ start: t.start, end: next.start, text: '' });
      continue;
    }
    if (t.depth !== 0) continue;
    if ((t.value === 'function' || t.value === 'class') && (!prev || t.nl || isPunct(prev, ';') || isPunct(prev, '}') || isName(prev, 'async'))) {
      let n = k + 1;
      if (isPunct(toks[n], '*')) n++;
      if (isName(toks[n])) record([toks[n].value], t.value);
    } else if ((t.value === 'const' || t.value === 'let' || t.value === 'var') && (isName(next) || isPunct(next, '{') || isPunct(next, '['))) {
      const [names, after, kind] = declarators(k);
      record(names, kind);
      k = after - 1;
    }
  }
  for (const [name, local] of exports) {
    const kind = declared.get(local);
    if (!kind) throw new BundleError(`${file}: exports "${name}" but declares no "${local}" at its top level`);
    if (kind === 'let' || kind === 'var') {
      throw new BundleError(`${file}: exports "${name}", declared with ${kind}: importers would keep the first value only; declare it const`);
    }
  }
  return { imports, exports, declared, edits };
}

function applyEdits(src, edits) {
  let out = '';
  let at = 0;
  for (const e of edits.slice().sort((a, b) => a.start - b.start)) {
    out += src.slice(at, e.start) + e.text;
    at = e.end;
  }
  return out + src.slice(at);
}

const TEXT_QUERY = '?text';

// Bundles the module tree under `entry` into one classic script. Returns { code, modules }
// (modules: paths in the order they run). Throws a BundleError naming what it refuses.
// `root`: paths in messages are relative to it.
export function bundle(entryPath, { root = process.cwd() } = {}) {
  const entry = resolve(root, entryPath);
  const show = (path) => relative(root, path) || path;
  const nodes = new Map(); // key (path, or path + ?text) → node
  const order = [];
  const usedIds = new Set();
  const idFor = (key, prefix) => {
    const base = prefix + relative(dirname(entry), key.replace(TEXT_QUERY, '')).replace(/\.m?js$/, '').replace(/[^A-Za-z0-9]+/g, '_').replace(/^_+|_+$/g, '');
    let id = base;
    for (let n = 2; usedIds.has(id); n++) id = base + '_' + n;
    usedIds.add(id);
    return id;
  };
  const read = (path, from) => {
    try {
      return readFileSync(path, 'utf8');
    } catch (e) {
      throw new BundleError(`${from ? from + ': ' : ''}cannot read ${show(path)}: ${e.code === 'ENOENT' ? 'no such file' : e.message}`);
    }
  };
  const load = (key, from) => {
    if (key.endsWith(TEXT_QUERY)) {
      const path = key.slice(0, -TEXT_QUERY.length);
      return { key, path, text: read(path, from), id: idFor(key, 'text$'), exports: new Map([['text', 'text']]), imports: [] };
    }
    const src = read(key, from);
    const info = analyse(src, show(key));
    return { key, path: key, src, id: idFor(key, 'module$'), ...info };
  };
  const resolveSpec = (node, imp) => {
    const spec = imp.spec;
    const where = `${show(node.path)}:${imp.line}`;
    if (!(spec.startsWith('./') || spec.startsWith('../'))) {
      throw new BundleError(`${where}: "${spec}" is not a relative path ("./" or "../"): the page bundles its own files only`);
    }
    const q = spec.indexOf('?');
    if (q >= 0 && spec.slice(q) !== TEXT_QUERY) throw new BundleError(`${where}: "${spec}": the only query understood is ${TEXT_QUERY}`);
    const file = resolve(dirname(node.path), q >= 0 ? spec.slice(0, q) : spec);
    return q >= 0 ? file + TEXT_QUERY : file;
  };

  // Depth first from the entry; a module is placed once all it imports are.
  const visiting = [];
  const visit = (key, from) => {
    const seen = nodes.get(key);
    if (seen && seen.placed) return seen;
    if (seen) {
      const cycle = visiting.slice(visiting.indexOf(key)).concat(key).map((k) => show(k.replace(TEXT_QUERY, '')));
      throw new BundleError(`import cycle: ${cycle.join(' → ')}`);
    }
    const node = load(key, from);
    nodes.set(key, node);
    visiting.push(key);
    node.deps = node.imports.map((imp) => {
      const dep = visit(resolveSpec(node, imp), `${show(node.path)}:${imp.line}`);
      for (const { imported } of imp.names) {
        if (!dep.exports.has(imported)) {
          const has = [...dep.exports.keys()];
          throw new BundleError(`${show(node.path)}:${imp.line}: imports "${imported}" from ${imp.spec}, which does not export it` +
            (has.length ? ` (it exports ${has.join(', ')})` : ' (it exports nothing)'));
        }
      }
      return dep;
    });
    visiting.pop();
    node.placed = true;
    order.push(node);
    return node;
  };
  visit(entry, null);

  const parts = [];
  for (const node of order) {
    if (node.text != null) {
      parts.push(`// ${show(node.path)}, as text\nconst ${node.id} = Object.freeze({ text: ${JSON.stringify(node.text)} });\n`);
      continue;
    }
    const bindings = node.imports.map((imp, n) => {
      const names = imp.names.map(({ imported, local }) => (imported === local ? local : `${imported}: ${local}`));
      return `const { ${names.join(', ')} } = ${node.deps[n].id};`;
    });
    // The header shares the module's first line, so its line numbers stay its own.
    const head = `const ${node.id} = (function () { ${bindings.join(' ')} `;
    const body = applyEdits(node.src, node.edits);
    const outs = [...node.exports].map(([name, local]) => (name === local ? name : `${name}: ${local}`));
    const tail = `\nreturn Object.freeze({${outs.length ? ' ' + outs.join(', ') + ' ' : ''}});\n})();\n`;
    const text = head + body + tail;
    try {
      // Checked as the strict code it runs as (the bundle is strict throughout).
      new vm.Script("'use strict'; " + text, { filename: show(node.path) });
    } catch (e) {
      const at = String(e.stack || '').split('\n')[0];
      throw new BundleError(`${at || show(node.path)}: ${e.message}`);
    }
    parts.push(`// ${show(node.path)}\n${text}`);
  }
  const code = `// The page's script: ${order.length} modules from ${show(dirname(entry))}, bundled by tools/inline.mjs.\n` +
    `(function () {\n'use strict';\n${parts.join('')}})();\n`;
  try {
    new vm.Script(code, { filename: 'bundle' });
  } catch (e) {
    throw new BundleError(`the bundle does not parse: ${e.message}`);
  }
  return { code, modules: order.map((n) => show(n.path) + (n.text != null ? TEXT_QUERY : '')) };
}

// ---------- the page ----------
const CSP = "default-src 'none'; script-src 'unsafe-inline' 'wasm-unsafe-eval'; " +
  "style-src 'unsafe-inline'; img-src data: blob:; connect-src 'none'; " +
  // The ranges study's Web Workers run the inlined glue from a blob: URL.
  "worker-src blob:";

// Text placed inside <script> must not end the element early or open an
// HTML comment; both rewrites keep the JavaScript meaning unchanged
// ("<\/" and "<\!" read the same inside strings, regexes and comments).
export function safeScript(js) {
  return js.replace(/<\/(script)/gi, (_m, s) => '<\\/' + s).replace(/<!--/g, () => '<\\!--');
}
function safeStyle(css) {
  return css.replace(/<\/(style)/gi, (_m, s) => '<\\/' + s);
}

function buildPage() {
  const root = process.cwd();
  const p = (rel) => resolve(root, rel);
  const inputs = {
    html: p('www/index.html'),
    css: p('www/style.css'),
    entry: p(process.env.HIBERNAL_ENTRY || 'www/js/main.js'),
    glue: p(process.env.HIBERNAL_GLUE || 'target/web/hibernal.js'),
    wasm: p(process.env.HIBERNAL_WASM || 'target/web/hibernal_bg.wasm'),
  };
  const out = p(process.env.HIBERNAL_OUT || 'dist/hibernal.html');
  const stop = (msg) => {
    console.error(`inline.mjs: ${msg}`);
    process.exit(1);
  };

  function read(path, binary = false) {
    try {
      return binary ? readFileSync(path) : readFileSync(path, 'utf8');
    } catch (e) {
      return stop(`cannot read ${relative(root, path) || path}: ${e.message}`);
    }
  }

  let html = read(inputs.html);
  const css = read(inputs.css);
  let app;
  try {
    app = bundle(inputs.entry, { root }).code;
  } catch (e) {
    if (e instanceof BundleError) stop(e.message);
    throw e;
  }
  const glue = read(inputs.glue);
  const wasm = read(inputs.wasm, true);

  if (wasm.length < 8 || wasm.readUInt32LE(0) !== 0x6d736100) {
    stop(`${relative(root, inputs.wasm)} is not a WebAssembly module`);
  }

  // Each marker must appear exactly once in www/index.html.
  function replaceMarker(name, make) {
    const marker = `<!-- @inline:${name} -->`;
    const count = html.split(marker).length - 1;
    if (count !== 1) stop(`expected one "${marker}" in www/index.html, found ${count}`);
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
}

// Run as a program (not imported by the tests): build the page.
if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) buildPage();
