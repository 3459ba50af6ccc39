#!/usr/bin/env bash
# Installs every tool the build and the tests need, only when it is missing.
# One line per step; fails loudly with the reason.
# Usage: scripts/setup.sh [web] [browser]
#   web      crates, wasm target, wasm-bindgen-cli, wasm-split-cli, trunk,
#            wasm-opt (npm binaryen), esbuild (npm)
#   browser  Debian chromium + chromedriver, npm packages (playwright-core, axe-core)
set -euo pipefail
cd "$(dirname "$0")/.."

WASM_BINDGEN_VERSION=0.2.130
TRUNK_VERSION=0.21.14
# Splits the app's wasm at its split functions (scripts/build-wasm.sh);
# the same release as the wasm_split_helpers that leptos pins in Cargo.lock.
WASM_SPLIT_VERSION=0.2.3
export PATH="$HOME/.cargo/bin:$PWD/node_modules/.bin:$PATH"

step() { printf 'setup: %-34s %s\n' "$1" "$2"; }
fail() { echo "setup: FAILED: $*" >&2; exit 1; }

want_web=0; want_browser=0
for a in "$@"; do
  case "$a" in
    web) want_web=1 ;;
    browser) want_browser=1 ;;
    *) fail "unknown part '$a' (use: web, browser)" ;;
  esac
done

if [ "$want_web" = 1 ]; then
  # Every build after this one runs --offline.
  if cargo fetch --locked --offline >/dev/null 2>&1; then
    step "crates (Cargo.lock)" "present"
  else
    step "crates (Cargo.lock)" "fetching"
    cargo fetch --locked -q || fail "cargo fetch --locked"
  fi

  if rustup target list --installed | grep -qx wasm32-unknown-unknown; then
    step "wasm32 target" "present"
  else
    step "wasm32 target" "installing"
    rustup target add wasm32-unknown-unknown >/dev/null 2>&1 \
      || fail "rustup target add wasm32-unknown-unknown"
  fi

  if command -v wasm-bindgen >/dev/null \
     && wasm-bindgen --version | grep -q " $WASM_BINDGEN_VERSION\$"; then
    step "wasm-bindgen-cli $WASM_BINDGEN_VERSION" "present"
  else
    step "wasm-bindgen-cli $WASM_BINDGEN_VERSION" "installing (about 2 min)"
    # No --locked: the registry here lacks one version its lockfile pins.
    cargo install -q wasm-bindgen-cli --version "$WASM_BINDGEN_VERSION" --force \
      || fail "cargo install wasm-bindgen-cli $WASM_BINDGEN_VERSION"
  fi

  # wasm-split-cli has no --version; cargo's install list has it.
  if command -v wasm-split-cli >/dev/null \
     && cargo install --list | grep -qx "wasm_split_cli_support v$WASM_SPLIT_VERSION:"; then
    step "wasm-split-cli $WASM_SPLIT_VERSION" "present"
  else
    step "wasm-split-cli $WASM_SPLIT_VERSION" "installing (about 2 min)"
    cargo install -q --locked wasm_split_cli_support --version "$WASM_SPLIT_VERSION" \
      --features build-binary --force \
      || fail "cargo install --locked wasm_split_cli_support $WASM_SPLIT_VERSION"
  fi

  if command -v trunk >/dev/null \
     && trunk --version | grep -q " $TRUNK_VERSION\$"; then
    step "trunk $TRUNK_VERSION" "present"
  else
    step "trunk $TRUNK_VERSION" "installing (about 5 min)"
    # --locked: newer CSS crates break trunk's build otherwise.
    cargo install -q --locked trunk --version "$TRUNK_VERSION" --force \
      || fail "cargo install --locked trunk $TRUNK_VERSION"
  fi
fi

npm_ready() {
  [ -x node_modules/.bin/wasm-opt ] && [ -x node_modules/.bin/esbuild ] \
    && [ -d node_modules/playwright-core ] \
    && [ -d node_modules/axe-core ] \
    && [ "$(cat node_modules/.kneepoint-lock-sha 2>/dev/null)" = "$(sha256sum < package-lock.json)" ]
}
if [ "$want_web" = 1 ] || [ "$want_browser" = 1 ]; then
  if npm_ready; then
    step "npm packages" "present"
  else
    step "npm packages" "installing (npm ci)"
    npm ci --no-audit --no-fund --loglevel=error >/dev/null || fail "npm ci"
    sha256sum < package-lock.json > node_modules/.kneepoint-lock-sha
  fi
  # Debian's binaryen 108 corrupts the output; only the npm one is used.
  wasm-opt --version | grep -q "version 1[2-9][0-9]" \
    || fail "wasm-opt on PATH is not npm binaryen >= 120: $(command -v wasm-opt)"
fi

if [ "$want_browser" = 1 ]; then
  if [ -x /usr/bin/chromium ] && [ -x /usr/bin/chromedriver ]; then
    step "chromium + chromedriver" "present"
  else
    step "chromium + chromedriver" "installing (apt)"
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq >/dev/null || fail "apt-get update"
    apt-get install -y -qq chromium chromium-driver >/dev/null \
      || fail "apt-get install chromium chromium-driver"
  fi
fi
