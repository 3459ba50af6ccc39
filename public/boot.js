// Starts Kneepoint. The script tag names the bindings and the main wasm
// module in its data attributes (index.html; both written by
// scripts/build-wasm.sh), so the page needs no inline script and its
// Content-Security-Policy can stay strict. The split modules are fetched
// later by __wasm_split.js, relative to its own address.
const tag = document.querySelector('script[data-kneepoint-js]');
const { default: init } = await import(tag.dataset.kneepointJs);
await init({ module_or_path: tag.dataset.kneepointWasm });
