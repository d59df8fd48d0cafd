#!/usr/bin/env bash
# Hibernal build and test entry point.
#   ./build.sh          build dist/hibernal.html (one self-contained file) and print its path
#   ./build.sh serve    build, then serve dist/ on http://localhost:8000
#   ./build.sh test     every quality gate: fmt, clippy, native tests, wasm tests in headless
#                       Chromium, end-to-end tests of the built page
#   ./build.sh bench    the reference-year benchmark, native and as wasm in headless Chromium
# Idempotent: it installs on a fresh machine whatever it needs, and skips what is there.
set -euo pipefail
cd "$(dirname "$0")"
ROOT=$(pwd)
# Cargo's output directory (CARGO_TARGET_DIR if set, as cargo itself honours it).
TARGET_DIR=${CARGO_TARGET_DIR:-target}

log() { printf '\033[1m[build]\033[0m %s\n' "$*" >&2; }
# The wasm-bindgen version Cargo.lock pins; the CLI must match it exactly.
wasm_bindgen_version() {
  awk '/^name = "wasm-bindgen"$/ { getline; gsub(/version = |"/, ""); print; exit }' Cargo.lock
}

APT_UPDATED=0
apt_install() {
  if ! command -v apt-get >/dev/null; then
    log "apt-get not available; please install: $*"
    return 1
  fi
  local sudo=""
  [ "$(id -u)" -eq 0 ] || sudo="sudo"
  if [ "$APT_UPDATED" -eq 0 ]; then
    $sudo apt-get update -qq >&2
    APT_UPDATED=1
  fi
  DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq "$@" >&2
}

ensure_rust() {
  if ! rustup target list --installed | grep -qx wasm32-unknown-unknown; then
    log "adding the wasm32-unknown-unknown target"
    rustup target add wasm32-unknown-unknown >&2
  fi
  [ -f Cargo.lock ] || cargo generate-lockfile
  local want have
  want=$(wasm_bindgen_version)
  have=$(wasm-bindgen --version 2>/dev/null | awk '{print $2}' || true)
  if [ "$have" != "$want" ]; then
    log "installing wasm-bindgen-cli $want (about 4 minutes)"
    # --locked fails: a locked dependency of the CLI is missing from the registry.
    cargo install wasm-bindgen-cli --version "$want" --force >&2
  fi
}

ensure_lint_tools() {
  cargo fmt --version >/dev/null 2>&1 || rustup component add rustfmt >&2
  cargo clippy --version >/dev/null 2>&1 || rustup component add clippy >&2
}

ensure_browser() {
  if ! command -v chromium >/dev/null || ! command -v chromedriver >/dev/null; then
    log "installing Chromium and ChromeDriver"
    apt_install chromium chromium-driver
  fi
}

ensure_node_deps() {
  if [ ! -d e2e/node_modules ] || [ e2e/package-lock.json -nt e2e/node_modules/.package-lock.json ]; then
    log "installing end-to-end test dependencies (npm ci)"
    (cd e2e && npm ci --no-audit --no-fund >&2)
  fi
}

build_page() {
  ensure_rust
  log "compiling the core to wasm"
  cargo build --release --target wasm32-unknown-unknown --lib >&2
  rm -rf "$TARGET_DIR/web"
  wasm-bindgen --target no-modules --no-typescript --remove-name-section --remove-producers-section \
    --out-dir "$TARGET_DIR/web" \
    "$TARGET_DIR/wasm32-unknown-unknown/release/hibernal.wasm" >&2
  # A wasm-opt on the PATH shrinks the module if it is binaryen 116 or later; before that it
  # mis-encodes the reference types and externref table that this wasm-bindgen emits
  # (Chromium then refuses the module), so older ones are skipped. None is installed:
  # Debian's is older, and binaryen 132 from npm at -O3 made the reference year no faster
  # in Chromium (2026-12-03) while adding half a minute to every build. The features are
  # the ones this Rust target and wasm-bindgen emit (all of them makes imports Chromium
  # refuses).
  local wo_version
  wo_version=$(wasm-opt --version 2>/dev/null | awk '{print $3}' || true)
  if [ -n "$wo_version" ] && [ "$wo_version" -ge 116 ] 2>/dev/null; then
    if wasm-opt -Oz --enable-reference-types --enable-bulk-memory --enable-sign-ext \
      --enable-mutable-globals --enable-nontrapping-float-to-int --enable-multivalue \
      "$TARGET_DIR/web/hibernal_bg.wasm" -o "$TARGET_DIR/web/hibernal_bg.opt.wasm"; then
      mv "$TARGET_DIR/web/hibernal_bg.opt.wasm" "$TARGET_DIR/web/hibernal_bg.wasm"
    else
      log "wasm-opt could not optimise this module; using it as built"
    fi
  elif [ -n "$wo_version" ]; then
    log "wasm-opt $wo_version is older than 116 and breaks this module; skipping it"
  fi
  HIBERNAL_GLUE="$TARGET_DIR/web/hibernal.js" HIBERNAL_WASM="$TARGET_DIR/web/hibernal_bg.wasm" \
    node tools/inline.mjs >&2
  echo "$ROOT/dist/hibernal.html"
}

run_tests() {
  ensure_rust
  ensure_lint_tools
  ensure_browser
  log "cargo fmt --check"
  cargo fmt --all -- --check
  log "clippy (native and wasm32), warnings are errors"
  cargo clippy --all-targets -- -D warnings
  cargo clippy --target wasm32-unknown-unknown --lib --test web -- -D warnings
  log "native tests"
  cargo test
  log "wasm tests in headless Chromium"
  CHROMEDRIVER=$(command -v chromedriver) cargo test --target wasm32-unknown-unknown --test web
  log "building the page"
  build_page >/dev/null
  ensure_node_deps
  log "end-to-end tests of dist/hibernal.html"
  node --test e2e/
}

case "${1:-build}" in
  build) build_page ;;
  serve)
    build_page
    log "serving dist/ on http://localhost:8000 (Ctrl-C to stop)"
    python3 -m http.server 8000 --bind 127.0.0.1 --directory dist
    ;;
  test) run_tests ;;
  bench)
    ensure_browser
    cargo bench --bench reference_year
    build_page >/dev/null
    ensure_node_deps
    node e2e/bench.mjs
    ;;
  *)
    echo "usage: ./build.sh [build|serve|test|bench]" >&2
    exit 2
    ;;
esac
