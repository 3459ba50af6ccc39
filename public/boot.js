// Starts Kneepoint. Trunk names the hashed bindings and wasm files in this
// script tag's data attributes (Trunk.toml pattern_script), so the page
// needs no inline script and its Content-Security-Policy can stay strict.
const tag = document.querySelector('script[data-kneepoint-js]');
const { default: init } = await import(tag.dataset.kneepointJs);
await init({ module_or_path: tag.dataset.kneepointWasm });
