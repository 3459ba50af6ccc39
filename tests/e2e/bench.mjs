// In-browser benchmark (make bench-web): figures to record in
// docs/performance.md, never a pass/fail timing.
//  - 200 programmatic steps of the unloading slider, each sent at the start
//    of an animation frame: time from the input event to the DOM change
//    (the staircase knee moved), and whether the change was in place by
//    the next animation frame;
//  - cold load (fresh profile) to the first chart drawn;
//  - bytes of html, js, wasm and css, raw and gzipped.
import { readdirSync, readFileSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { join } from 'node:path';
import { openBrowser, openApp, BASE } from './lib.mjs';

const pct = (xs, p) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor((p / 100) * s.length))];
};

// Cold loads: each in a fresh profile, first chart time from navigation start.
const loads = [];
for (let i = 0; i < 5; i++) {
  const b = await openBrowser({ width: 1024, height: 768 });
  const page = await b.page();
  await page.addInitScript(() => {
    new MutationObserver((_, obs) => {
      if (document.querySelector('[data-testid="staircase-svg"] .curve-flow')) {
        window.__firstChart = performance.now();
        obs.disconnect();
      }
    }).observe(document, { childList: true, subtree: true });
  });
  await openApp(page);
  loads.push(await page.evaluate(() => window.__firstChart));
  await b.close();
}

const b = await openBrowser({ width: 1024, height: 768 });
const page = await b.page();
await openApp(page);
const steps = await page.evaluate(async () => {
  const slider = document.querySelector('[data-testid="slider-unloading_valve.setting_pa"]');
  const frame = () => new Promise((ok) => requestAnimationFrame(ok));
  const out = [];
  for (let i = 0; i < 200; i++) {
    await frame();
    const knee = document.querySelector('[data-knee-kind="unloader_starts"]');
    const before = knee.getAttribute('data-pressure-pa');
    let changed = null;
    const obs = new MutationObserver(() => {
      const k = document.querySelector('[data-knee-kind="unloader_starts"]');
      if (changed === null && k && k.getAttribute('data-pressure-pa') !== before) changed = performance.now();
    });
    obs.observe(document.querySelector('[data-testid="staircase"]'), { attributes: true, subtree: true, childList: true });
    const t0 = performance.now();
    slider.value = String(20 + (i % 2 === 0 ? i / 4 : 60 - i / 4));
    slider.dispatchEvent(new Event('input', { bubbles: true }));
    const next = await frame();
    // Give a late change a few more frames to show up, for the record.
    for (let k = 0; changed === null && k < 10; k++) await frame();
    obs.disconnect();
    out.push({ dom: changed - t0, inFrame: changed !== null && changed <= next });
  }
  return out;
});

const dom = steps.map((s) => s.dom);
const missed = steps.filter((s) => !s.inFrame).length;
// Duty cycle in wasm: the app's bench_cycle export, called on the module the
// page already started; 11 batches of 50 evaluations per demo design, timed
// with performance.now() around each batch (Chromium coarsens the clock, so
// whole batches are timed). Compare with `cargo bench --bench cycle`.
const cycleWasm = await page.evaluate(async () => {
  const tag = document.querySelector('script[data-kneepoint-js]');
  const m = await import(tag.dataset.kneepointJs);
  const out = {};
  for (const name of ['workshop-press', 'baler', 'clamp']) {
    const per = [];
    await m.bench_cycle(name, 20); // warm-up (the first call loads the cycle's module)
    for (let i = 0; i < 11; i++) {
      const t0 = performance.now();
      const s = await m.bench_cycle(name, 50);
      per.push(((performance.now() - t0) / 50) * 1000);
      if (!(s > 0)) throw new Error(`bench_cycle(${name}) gave ${s}`);
    }
    per.sort((a, b) => a - b);
    out[name] = per[5];
  }
  return out;
});
await b.close();
console.log(`bench-web: ${BASE}`);
console.log(`slider step, input to DOM updated: p50 ${pct(dom, 50).toFixed(2)} ms, p95 ${pct(dom, 95).toFixed(2)} ms, max ${Math.max(...dom).toFixed(2)} ms (200 steps)`);
console.log(`slider step, DOM updated before the next animation frame: ${200 - missed} of 200`);
for (const [n, us] of Object.entries(cycleWasm)) console.log(`duty cycle in wasm, ${n}: median ${us.toFixed(1)} µs per evaluation (11 batches of 50)`);
console.log(`cold load to first chart: median ${pct(loads, 50).toFixed(0)} ms (5 fresh profiles: ${loads.map((x) => x.toFixed(0)).join(', ')} ms)`);

const dist = process.env.KNEEPOINT_DIST || 'dist';
const files = readdirSync(dist).filter((f) => /\.(html|js|wasm|css)$/.test(f) && f !== 'sw.js');
let raw = 0;
let gz = 0;
for (const kind of ['html', 'js', 'wasm', 'css']) {
  const fs = files.filter((f) => f.endsWith(`.${kind}`));
  const r = fs.reduce((n, f) => n + readFileSync(join(dist, f)).length, 0);
  const g = fs.reduce((n, f) => n + gzipSync(readFileSync(join(dist, f)), { level: 9 }).length, 0);
  raw += r;
  gz += g;
  console.log(`size ${kind.padEnd(4)}: ${(r / 1024).toFixed(1)} KiB raw, ${(g / 1024).toFixed(1)} KiB gzipped (${fs.join(', ')})`);
}
console.log(`size total: ${(raw / 1024).toFixed(1)} KiB raw, ${(gz / 1024).toFixed(1)} KiB gzipped`);
