//! The layers of the code and the way their dependencies point, checked on the source text.
//!
//! - **The physics core** (`src/physics/`) mentions none of serde, schemars, plotters,
//!   wasm-bindgen, web-sys, js-sys or the csv crate, and none of the document, chart or web
//!   modules.
//! - **The document** (`src/document/`) mentions neither plotters nor the browser's crates,
//!   nor the charts or the web face.
//! - **The charts** (`src/charts/`) mention neither the browser's crates nor the web face.
//! - **No import circles**: no file reaches itself through the paths it uses (`use` trees and
//!   paths written out in the code, comments and strings left out), at the granularity of
//!   files. A module file (`mod.rs`) that re-exports its children counts as using them, so a
//!   child names a sibling by its own path (`super::solver::Solver`), never through the
//!   parent's re-export.
//!
//! The same checks run on planted sources in the tests at the end, which must fail them.

use std::collections::{BTreeMap, BTreeSet};
use std::path::{Path, PathBuf};

/// The layer a source file belongs to, from its path under `src/`.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Layer {
    Physics,
    Document,
    Charts,
    Web,
    Cli,
    Root,
}

fn layer_of(rel: &str) -> Layer {
    match rel.split('/').next().unwrap_or("").trim_end_matches(".rs") {
        "physics" => Layer::Physics,
        "document" => Layer::Document,
        "charts" => Layer::Charts,
        "web" => Layer::Web,
        "bin" => Layer::Cli,
        _ => Layer::Root,
    }
}

/// What a layer may not mention, as whole words or path prefixes.
fn forbidden(layer: Layer) -> &'static [&'static str] {
    const BROWSER: [&str; 5] = ["wasm_bindgen", "wasm-bindgen", "web_sys", "js_sys", "web::"];
    match layer {
        Layer::Physics => &[
            "serde",
            "schemars",
            "plotters",
            "csv::",
            "wasm_bindgen",
            "wasm-bindgen",
            "web_sys",
            "js_sys",
            "document::",
            "charts::",
            "web::",
        ],
        Layer::Document => &[
            "plotters",
            "charts::",
            "wasm_bindgen",
            "wasm-bindgen",
            "web_sys",
            "js_sys",
            "web::",
        ],
        Layer::Charts => &BROWSER,
        _ => &[],
    }
}

/// Every `.rs` file under `dir`, as (path relative to `src/`, text).
fn sources(src: &Path) -> Vec<(String, String)> {
    fn walk(dir: &Path, out: &mut Vec<PathBuf>) {
        let mut entries: Vec<_> = std::fs::read_dir(dir)
            .unwrap_or_else(|e| panic!("{}: {e}", dir.display()))
            .map(|e| e.expect("dir entry").path())
            .collect();
        entries.sort();
        for p in entries {
            if p.is_dir() {
                walk(&p, out);
            } else if p.extension().is_some_and(|x| x == "rs") {
                out.push(p);
            }
        }
    }
    let mut files = Vec::new();
    walk(src, &mut files);
    files
        .into_iter()
        .map(|p| {
            let rel = p
                .strip_prefix(src)
                .expect("under src")
                .to_string_lossy()
                .replace('\\', "/");
            let text = std::fs::read_to_string(&p).expect("source file");
            (rel, text)
        })
        .collect()
}

/// Does `text` mention `word`: as a path prefix when it ends in `::`, else as a whole word
/// (so `serde` matches `serde::Serialize` and `#[serde(...)]` but not `deserialise`).
fn mentions(text: &str, word: &str) -> bool {
    let is_ident = |c: char| c.is_alphanumeric() || c == '_';
    let mut from = 0;
    while let Some(i) = text[from..].find(word) {
        let at = from + i;
        let before = text[..at].chars().next_back();
        let after = text[at + word.len()..].chars().next();
        let starts = !before.is_some_and(is_ident);
        let ends = word.ends_with("::") || !after.is_some_and(is_ident);
        if starts && ends {
            return true;
        }
        from = at + word.len();
    }
    false
}

/// Lines of each file that mention what its layer may not.
fn layer_violations(files: &[(String, String)]) -> Vec<String> {
    let mut out = Vec::new();
    for (rel, text) in files {
        for word in forbidden(layer_of(rel)) {
            for (n, line) in text.lines().enumerate() {
                if mentions(line, word) {
                    out.push(format!(
                        "src/{rel}:{}: mentions {word:?}: {}",
                        n + 1,
                        line.trim()
                    ));
                }
            }
        }
    }
    out
}

/// The source with comments, string and character literals blanked (newlines kept).
fn code_only(text: &str) -> String {
    let b: Vec<char> = text.chars().collect();
    let mut out = String::with_capacity(text.len());
    let mut i = 0;
    while i < b.len() {
        let c = b[i];
        let next = b.get(i + 1).copied();
        if c == '/' && next == Some('/') {
            while i < b.len() && b[i] != '\n' {
                i += 1;
            }
        } else if c == '/' && next == Some('*') {
            let mut depth = 0;
            while i < b.len() {
                if b[i] == '/' && b.get(i + 1) == Some(&'*') {
                    depth += 1;
                    i += 2;
                } else if b[i] == '*' && b.get(i + 1) == Some(&'/') {
                    depth -= 1;
                    i += 2;
                    if depth == 0 {
                        break;
                    }
                } else {
                    if b[i] == '\n' {
                        out.push('\n');
                    }
                    i += 1;
                }
            }
        } else if c == 'r' && (next == Some('"') || next == Some('#')) && !ident_before(&b, i) {
            // Raw string r"…" or r#"…"#.
            let mut j = i + 1;
            let mut hashes = 0;
            while b.get(j) == Some(&'#') {
                hashes += 1;
                j += 1;
            }
            if b.get(j) != Some(&'"') {
                out.push(c);
                i += 1;
                continue;
            }
            j += 1;
            loop {
                if j >= b.len() {
                    break;
                }
                if b[j] == '"' && (0..hashes).all(|h| b.get(j + 1 + h) == Some(&'#')) {
                    j += 1 + hashes;
                    break;
                }
                if b[j] == '\n' {
                    out.push('\n');
                }
                j += 1;
            }
            out.push_str("\"\"");
            i = j;
        } else if c == '"' {
            let mut j = i + 1;
            while j < b.len() && b[j] != '"' {
                if b[j] == '\\' {
                    j += 1;
                }
                if b.get(j) == Some(&'\n') {
                    out.push('\n');
                }
                j += 1;
            }
            out.push_str("\"\"");
            i = j + 1;
        } else if c == '\'' {
            // A char literal ('a', '\n', '\u{..}'), or a lifetime ('a) left as it is.
            let close = if next == Some('\\') {
                (i + 2..b.len().min(i + 12)).find(|&j| b[j] == '\'')
            } else if b.get(i + 2) == Some(&'\'') {
                Some(i + 2)
            } else {
                None
            };
            match close {
                Some(j) => {
                    out.push_str("' '");
                    i = j + 1;
                }
                None => {
                    out.push(c);
                    i += 1;
                }
            }
        } else {
            out.push(c);
            i += 1;
        }
    }
    out
}

fn ident_before(b: &[char], i: usize) -> bool {
    i > 0 && (b[i - 1].is_alphanumeric() || b[i - 1] == '_')
}

/// The module path of a file (`physics/transient/mod.rs` → ["physics", "transient"]).
fn module_of(rel: &str) -> Vec<String> {
    let p = rel.trim_end_matches(".rs");
    let mut parts: Vec<String> = p.split('/').map(str::to_owned).collect();
    if parts.last().is_some_and(|l| l == "mod" || l == "lib") {
        parts.pop();
    }
    if rel.starts_with("bin/") {
        // A binary is a crate of its own: its `crate::` is itself.
        return vec![format!("<{rel}>")];
    }
    parts
}

/// Expand a `use` tree (`a::{b, c::{d, e}}`) into its leaf paths.
fn expand_tree(tree: &str, prefix: &str, out: &mut Vec<String>) {
    let tree = tree.trim();
    if let Some(open) = tree.find('{') {
        let head = tree[..open].trim().trim_end_matches("::");
        let inner = &tree[open + 1..tree.rfind('}').unwrap_or(tree.len())];
        let base = join(prefix, head);
        let mut depth = 0;
        let mut start = 0;
        for (k, ch) in inner.char_indices() {
            match ch {
                '{' => depth += 1,
                '}' => depth -= 1,
                ',' if depth == 0 => {
                    expand_tree(&inner[start..k], &base, out);
                    start = k + 1;
                }
                _ => {}
            }
        }
        expand_tree(&inner[start..], &base, out);
    } else if !tree.is_empty() {
        let leaf = tree.split(" as ").next().unwrap_or(tree).trim();
        out.push(join(prefix, leaf));
    }
}

fn join(a: &str, b: &str) -> String {
    match (a.is_empty(), b.is_empty()) {
        (true, _) => b.to_owned(),
        (_, true) => a.to_owned(),
        _ => format!("{a}::{b}"),
    }
}

/// The paths a file's code uses, each with the module it is written in (inline modules such
/// as `mod tests { … }` counted), as (module, path).
fn used_paths(rel: &str, text: &str) -> Vec<(Vec<String>, String)> {
    let code = code_only(text);
    let base = module_of(rel);
    let mut out = Vec::new();
    // Inline modules: a stack of (name, brace depth at which it opened).
    let mut inline: Vec<(String, i32)> = Vec::new();
    let mut depth = 0i32;
    let chars: Vec<char> = code.chars().collect();
    let mut i = 0;
    let word_at = |i: usize, w: &str| -> bool {
        let n = w.chars().count();
        chars.len() >= i + n
            && chars[i..i + n].iter().copied().eq(w.chars())
            && (i == 0 || !(chars[i - 1].is_alphanumeric() || chars[i - 1] == '_'))
            && !chars
                .get(i + n)
                .is_some_and(|c| c.is_alphanumeric() || *c == '_')
    };
    let module_here = |inline: &Vec<(String, i32)>| -> Vec<String> {
        let mut m = base.clone();
        m.extend(inline.iter().map(|(n, _)| n.clone()));
        m
    };
    while i < chars.len() {
        let c = chars[i];
        if c == '{' {
            depth += 1;
            i += 1;
            continue;
        }
        if c == '}' {
            depth -= 1;
            if inline.last().is_some_and(|(_, d)| *d == depth) {
                inline.pop();
            }
            i += 1;
            continue;
        }
        if word_at(i, "mod") {
            // `mod name {` opens an inline module; `mod name;` declares a file.
            let rest: String = chars[i + 3..chars.len().min(i + 80)].iter().collect();
            let rest = rest.trim_start();
            let name: String = rest
                .chars()
                .take_while(|c| c.is_alphanumeric() || *c == '_')
                .collect();
            let after = rest[name.len()..].trim_start();
            if !name.is_empty() && after.starts_with('{') {
                inline.push((name, depth));
            }
            i += 3;
            continue;
        }
        if word_at(i, "use") {
            let end = (i..chars.len())
                .find(|&j| chars[j] == ';')
                .unwrap_or(chars.len());
            let tree: String = chars[i + 3..end].iter().collect();
            let mut leaves = Vec::new();
            expand_tree(&tree.replace(char::is_whitespace, ""), "", &mut leaves);
            for l in leaves {
                out.push((module_here(&inline), l));
            }
            i = end;
            continue;
        }
        for root in ["crate", "super", "self"] {
            if word_at(i, root) && chars.get(i + root.len()) == Some(&':') {
                let mut j = i;
                while j < chars.len()
                    && (chars[j].is_alphanumeric() || chars[j] == '_' || chars[j] == ':')
                {
                    j += 1;
                }
                let path: String = chars[i..j].iter().collect();
                out.push((module_here(&inline), path.trim_end_matches(':').to_owned()));
                i = j;
                break;
            }
        }
        i += 1;
    }
    out
}

/// The file a path leads to: its longest prefix that names a module file. `None` for paths
/// outside the crate (std, other crates) and for a binary's own paths.
fn resolve(module: &[String], path: &str, files: &BTreeMap<Vec<String>, String>) -> Option<String> {
    let mut segs = path.split("::").filter(|s| !s.is_empty());
    let first = segs.next()?;
    let mut at: Vec<String> = match first {
        "crate" => Vec::new(),
        "self" => module.to_vec(),
        "super" => {
            let mut m = module.to_vec();
            m.pop()?;
            m
        }
        // A path relative to the current module (`use solver::Solver;` in a `mod.rs`).
        child if files.contains_key(&[module, &[child.to_owned()]].concat()) => {
            [module, &[child.to_owned()]].concat()
        }
        _ => return None,
    };
    let mut rest: Vec<&str> = segs.collect();
    while rest.first() == Some(&"super") {
        at.pop()?;
        rest.remove(0);
    }
    // The file holding `at` (an inline module lives in its file's file).
    let file_of = |m: &[String]| -> Option<String> {
        (0..=m.len())
            .rev()
            .find_map(|k| files.get(&m[..k]).cloned())
    };
    let mut best = file_of(&at);
    for s in rest {
        at.push(s.to_owned());
        match files.get(&at) {
            Some(f) => best = Some(f.clone()),
            None => break,
        }
    }
    best
}

/// The file-level dependency graph of the library's sources.
fn graph(files: &[(String, String)]) -> BTreeMap<String, BTreeSet<String>> {
    let by_module: BTreeMap<Vec<String>, String> = files
        .iter()
        .filter(|(rel, _)| !rel.starts_with("bin/"))
        .map(|(rel, _)| (module_of(rel), rel.clone()))
        .collect();
    let mut g: BTreeMap<String, BTreeSet<String>> = BTreeMap::new();
    for (rel, text) in files.iter().filter(|(rel, _)| !rel.starts_with("bin/")) {
        let edges = g.entry(rel.clone()).or_default();
        for (module, path) in used_paths(rel, text) {
            if let Some(target) = resolve(&module, &path, &by_module) {
                if &target != rel {
                    edges.insert(target);
                }
            }
        }
    }
    g
}

/// Every circle of files that import each other (strongly connected components of more
/// than one file), each as its files in order.
fn circles(g: &BTreeMap<String, BTreeSet<String>>) -> Vec<Vec<String>> {
    // Tarjan's algorithm, iterative enough for a few hundred files (recursion is fine).
    struct T<'a> {
        g: &'a BTreeMap<String, BTreeSet<String>>,
        index: BTreeMap<&'a str, usize>,
        low: BTreeMap<&'a str, usize>,
        stack: Vec<&'a str>,
        on: BTreeSet<&'a str>,
        next: usize,
        out: Vec<Vec<String>>,
    }
    fn visit<'a>(t: &mut T<'a>, v: &'a str) {
        t.index.insert(v, t.next);
        t.low.insert(v, t.next);
        t.next += 1;
        t.stack.push(v);
        t.on.insert(v);
        if let Some(ws) = t.g.get(v) {
            for w in ws {
                let w = w.as_str();
                if !t.index.contains_key(w) {
                    visit(t, w);
                    let lw = t.low[w];
                    let lv = t.low[v];
                    t.low.insert(v, lv.min(lw));
                } else if t.on.contains(w) {
                    let iw = t.index[w];
                    let lv = t.low[v];
                    t.low.insert(v, lv.min(iw));
                }
            }
        }
        if t.low[v] == t.index[v] {
            let mut comp = Vec::new();
            while let Some(w) = t.stack.pop() {
                t.on.remove(w);
                comp.push(w.to_owned());
                if w == v {
                    break;
                }
            }
            if comp.len() > 1 {
                comp.sort();
                t.out.push(comp);
            }
        }
    }
    let mut t = T {
        g,
        index: BTreeMap::new(),
        low: BTreeMap::new(),
        stack: Vec::new(),
        on: BTreeSet::new(),
        next: 0,
        out: Vec::new(),
    };
    for v in g.keys() {
        if !t.index.contains_key(v.as_str()) {
            visit(&mut t, v.as_str());
        }
    }
    t.out
}

/// Why a circle is one: for each file in it, the files of the circle it uses.
fn explain(g: &BTreeMap<String, BTreeSet<String>>, circle: &[String]) -> String {
    circle
        .iter()
        .map(|f| {
            let uses: Vec<&str> = g[f]
                .iter()
                .filter(|t| circle.contains(t))
                .map(String::as_str)
                .collect();
            format!("  src/{f} uses {}", uses.join(", "))
        })
        .collect::<Vec<_>>()
        .join("\n")
}

fn repo_sources() -> Vec<(String, String)> {
    sources(&Path::new(env!("CARGO_MANIFEST_DIR")).join("src"))
}

#[test]
fn each_layer_mentions_only_what_lies_below_it() {
    let files = repo_sources();
    assert!(
        files.iter().any(|(r, _)| r.starts_with("physics/"))
            && files.iter().any(|(r, _)| r.starts_with("document/"))
            && files.iter().any(|(r, _)| r.starts_with("charts/")),
        "the layers' folders are where this test looks"
    );
    let v = layer_violations(&files);
    assert!(v.is_empty(), "layering broken:\n{}", v.join("\n"));
}

#[test]
fn no_file_reaches_itself_through_its_imports() {
    let files = repo_sources();
    let g = graph(&files);
    let found = circles(&g);
    let text: Vec<String> = found.iter().map(|c| explain(&g, c)).collect();
    assert!(
        found.is_empty(),
        "{} import circle(s):\n{}",
        found.len(),
        text.join("\n\n")
    );
}

#[test]
fn the_graph_sees_the_imports_that_exist() {
    // A check of the checker on the real sources: known uses are found.
    let g = graph(&repo_sources());
    let uses = |a: &str, b: &str| g.get(a).is_some_and(|s| s.contains(b));
    assert!(uses("document/winter.rs", "physics/transient/run.rs"));
    assert!(uses("charts/winter.rs", "document/winter.rs"));
    assert!(uses("document/winter_least.rs", "document/winter.rs"));
}

/// The real sources with one file's text replaced (or a file added).
fn planted(rel: &str, text: &str) -> Vec<(String, String)> {
    let mut files = repo_sources();
    match files.iter_mut().find(|(r, _)| r == rel) {
        Some(f) => f.1 = text.to_owned(),
        None => files.push((rel.to_owned(), text.to_owned())),
    }
    files
}

#[test]
fn a_planted_forbidden_import_is_caught() {
    let stack =
        std::fs::read_to_string(Path::new(env!("CARGO_MANIFEST_DIR")).join("src/physics/stack.rs"))
            .expect("stack.rs");
    for bad in [
        "use serde::Serialize;",
        "#[derive(schemars::JsonSchema)] struct X;",
        "use crate::document::vocabulary::LayerDoc;",
        "fn f() { let _ = crate::charts::frame::INK; }",
        "use plotters::prelude::*;",
    ] {
        let files = planted("physics/stack.rs", &format!("{stack}\n{bad}\n"));
        let v = layer_violations(&files);
        assert!(
            v.iter().any(|l| l.starts_with("src/physics/stack.rs:")),
            "not caught in the core: {bad}"
        );
    }
    let files = planted(
        "document/steady.rs",
        "use crate::charts::profile::draw_profile;\n",
    );
    assert!(
        !layer_violations(&files).is_empty(),
        "a chart in the document"
    );
    let files = planted("charts/frame.rs", "use wasm_bindgen::prelude::*;\n");
    assert!(
        !layer_violations(&files).is_empty(),
        "the browser in a chart"
    );
    // Prose that merely contains the letters does not count.
    let files = planted("physics/stack.rs", "// deserialise, webbing, documents\n");
    assert!(layer_violations(&files).is_empty());
}

#[test]
fn a_planted_import_circle_is_caught() {
    // The column solver made to use its run: run already uses the solver.
    let solver = std::fs::read_to_string(
        Path::new(env!("CARGO_MANIFEST_DIR")).join("src/physics/transient/solver.rs"),
    )
    .expect("solver.rs");
    let files = planted(
        "physics/transient/solver.rs",
        &format!("{solver}\nuse super::run::Run;\n"),
    );
    let found = circles(&graph(&files));
    assert!(
        found
            .iter()
            .any(|c| c.contains(&"physics/transient/run.rs".to_owned())
                && c.contains(&"physics/transient/solver.rs".to_owned())),
        "circle not found: {found:?}"
    );
    // A child that reaches what the parent re-exports from it is a circle too.
    let files = planted(
        "physics/transient/solver.rs",
        &format!("{solver}\nfn f(_: super::Cell) {{}}\n"),
    );
    assert!(
        circles(&graph(&files))
            .iter()
            .any(|c| c.contains(&"physics/transient/mod.rs".to_owned())),
        "re-export circle not found"
    );
    // Paths inside comments and strings are not uses.
    let files = planted(
        "physics/transient/solver.rs",
        &format!("{solver}\n// use super::run::Run;\nconst S: &str = \"super::run::Run\";\n"),
    );
    assert!(circles(&graph(&files)).is_empty());
}

#[test]
fn inline_test_modules_resolve_super_to_their_file() {
    let text = "pub struct A;\n#[cfg(test)]\nmod tests {\n    use super::A;\n    fn f() { let _ = super::A; }\n}\n";
    let files = planted("physics/transient/solver.rs", text);
    let g = graph(&files);
    assert!(!g["physics/transient/solver.rs"].contains("physics/transient/mod.rs"));
}
