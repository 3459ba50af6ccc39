#!/usr/bin/env bash
# Trunk build hook (Trunk.toml): builds the app's wasm and splits it at its
# split functions (src/split.rs), so the page downloads only what the circuit view
# needs and fetches the duty-cycle view, the machine-check view, the saved
# designs panel and the circuit diagram the first time they open.
#
#   cargo build (wasm32, relocations kept by .cargo/config.toml)
#   -> wasm-split-cli   main module + one module per split function + shared
#                       chunks + __wasm_split.js, their loader
#   -> wasm-bindgen     bindings for the main module (kneepoint.js),
#                       minified by esbuild with the loader (release only)
#   -> wasm-opt -Os     every module (release only; -Os packs the main
#                       module about 1 KB tighter gzipped than -Oz here)
#
# Writes into $TRUNK_STAGING_DIR (or the folder given as $1).
set -euo pipefail
cd "$(dirname "$0")/.."
export PATH="$HOME/.cargo/bin:$PWD/node_modules/.bin:$PATH"

out="${TRUNK_STAGING_DIR:-${1:-}}"
[ -n "$out" ] || { echo "build-wasm: no output folder (TRUNK_STAGING_DIR or \$1)" >&2; exit 1; }
profile="${TRUNK_PROFILE:-release}"

flags=(--offline --target wasm32-unknown-unknown --bin kneepoint-app)
dir=debug
if [ "$profile" = release ]; then
  flags+=(--release)
  dir=release
fi
cargo build "${flags[@]}"

target="${CARGO_TARGET_DIR:-target}"
work="$target/kneepoint-split"
rm -rf "$work"
mkdir -p "$work/pkg" "$out"
wasm-split-cli "$target/wasm32-unknown-unknown/$dir/kneepoint-app.wasm" "$work" \
  --out-name kneepoint >/dev/null
# --keep-lld-exports: the split modules import functions the main module
# exports for them.
wasm-bindgen --target web --keep-lld-exports --no-typescript \
  --out-name kneepoint --out-dir "$work/pkg" "$work/kneepoint.wasm"

mods=("$work/pkg/kneepoint_bg.wasm")
for f in "$work"/chunk_*.wasm "$work"/split_*.wasm; do
  [ -e "$f" ] && mods+=("$f")
done
if [ "$profile" = release ]; then
  for f in "${mods[@]}"; do
    # Its warnings about the split modules' name sections are noise; its
    # errors are shown.
    if ! wasm-opt -Os --strip-debug --strip-producers --strip-target-features \
      --enable-bulk-memory --enable-nontrapping-float-to-int \
      "$f" -o "$f.opt" 2>"$f.log"; then
      cat "$f.log" >&2
      exit 1
    fi
    mv "$f.opt" "$f"
  done
fi

# The loader starts each fetch before it waits for the chunks the module
# needs; a fetch that fails meanwhile would be reported as an unhandled
# rejection although the loader handles it (the split function returns
# Unloaded). Mark each fetch as handled.
n_fetch="$(grep -c 'const src = fetch(' "$work/__wasm_split.js" || true)"
sed -i 's|^\(\s*const src = fetch(.*);\)$|\1 src.catch(() => {});|' "$work/__wasm_split.js"
[ "$(grep -c 'src.catch(() => {});' "$work/__wasm_split.js" || true)" = "$n_fetch" ] \
  || { echo "build-wasm: the split loader changed shape; check __wasm_split.js" >&2; exit 1; }

# One build id in every file name, so a static server's cache never mixes
# files of two builds. The wasm import names stay as they are; only the
# addresses the scripts load are renamed.
loader="$work/__wasm_split.js"
bind="$work/pkg/kneepoint.js"
id="$(cat "${mods[@]}" "$loader" "$bind" | sha256sum | cut -c1-16)"
for f in "${mods[@]}"; do
  b="$(basename "$f" .wasm)"
  sed -i "s|\"\./$b\.wasm\"|\"./$b-$id.wasm\"|g" "$loader"
  cp "$f" "$out/$b-$id.wasm"
done
sed -i "s|from \"\./kneepoint\.js\"|from \"./kneepoint-$id.js\"|" "$loader"
sed -i "s|from \"\./__wasm_split\.js\"|from \"./__wasm_split-$id.js\"|g" "$bind"
if [ "$profile" = release ]; then
  # The bindings and the loader, minified (esbuild keeps their imports,
  # exports and the wasm import names, which are string keys).
  for f in "$loader" "$bind"; do
    esbuild --minify --format=esm --log-level=warning --allow-overwrite "$f" --outfile="$f"
  done
fi
cp "$loader" "$out/__wasm_split-$id.js"
cp "$bind" "$out/kneepoint-$id.js"
# The page names the bindings and the main module (index.html).
echo "$id" > "$out/.kneepoint-build-id"
echo "build-wasm: build $id, $((${#mods[@]} - 1)) split modules beside the main one"
