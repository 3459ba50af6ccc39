// In-browser benchmark (make bench-web): figures to record in
// docs/performance.md, never a pass/fail timing.
//  - 200 programmatic steps of the unloading slider, each sent at the start
//    of an animation frame: time from the input event to the DOM change
//    (the staircase knee moved), and whether the change was in place by
//    the next animation frame;
//  - cold load (fresh profile) to the first chart drawn;
//  - bytes of html, js, wasm and css, gzipped (level 9, what a server
//    sending gzip transfers): of the files the page fetched on a first
//    visit up to the first chart, after its first edit, when it opens a
//    link, after all three views; and of every file of the site.
import { readdirSync, readFileSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { join } from 'node:path';
import { openBrowser, openApp, BASE } from './lib.mjs';

const pct = (xs, p) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor((p / 100) * s.length))];
};

// Cold loads: each in a fresh profile, first chart time from navigation start.
/** Cold loads of `hash`: each in a fresh profile, first chart time from
 *  navigation start. */
async function coldLoads(hash, n) {
  const out = [];
  for (let i = 0; i < n; i++) {
    const br = await openBrowser({ width: 1024, height: 768 });
    const pg = await br.page();
    await pg.addInitScript(() => {
      new MutationObserver((_, obs) => {
        if (document.querySelector('[data-testid="staircase-svg"] .curve-flow')) {
          window.__firstChart = performance.now();
          obs.disconnect();
        }
      }).observe(document, { childList: true, subtree: true });
    });
    await openApp(pg, hash);
    out.push(await pg.evaluate(() => window.__firstChart));
    await br.close();
  }
  return out;
}
const loads = await coldLoads('', 5);
// A link to the baler with one input changed (the link codec loads first).
const linkLoads = await coldLoads(`#v=1&u=metric&base=baler&d=${Buffer.from('{"unloading_valve":{"setting_pa":3500000.0}}').toString('base64url')}`, 5);

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
// page already started; 33 batches of 50 evaluations per demo design, timed
// with performance.now() around each batch (Chromium coarsens the clock, so
// whole batches are timed). Compare with `cargo bench --bench cycle`.
const cycleWasm = await page.evaluate(async () => {
  const tag = document.querySelector('script[data-kneepoint-js]');
  const m = await import(tag.dataset.kneepointJs);
  const out = {};
  for (const name of ['workshop-press', 'baler', 'clamp']) {
    const per = [];
    // Warm-up: the first call loads the cycle's module, which starts on the
    // baseline compiler; half a second of runs lets it tier up, so the
    // batches time the optimised code (as native's criterion warm-up does).
    const w0 = performance.now();
    while (performance.now() - w0 < 500) await m.bench_cycle(name, 20);
    for (let i = 0; i < 33; i++) {
      const t0 = performance.now();
      const s = await m.bench_cycle(name, 50);
      per.push(((performance.now() - t0) / 50) * 1000);
      if (!(s > 0)) throw new Error(`bench_cycle(${name}) gave ${s}`);
    }
    per.sort((a, b) => a - b);
    out[name] = per[16];
  }
  return out;
});
await b.close();
console.log(`bench-web: ${BASE}`);
console.log(`slider step, input to DOM updated: p50 ${pct(dom, 50).toFixed(2)} ms, p95 ${pct(dom, 95).toFixed(2)} ms, max ${Math.max(...dom).toFixed(2)} ms (200 steps)`);
console.log(`slider step, DOM updated before the next animation frame: ${200 - missed} of 200`);
for (const [n, us] of Object.entries(cycleWasm)) console.log(`duty cycle in wasm, ${n}: median ${us.toFixed(1)} µs per evaluation (33 batches of 50)`);
console.log(`cold load to first chart: median ${pct(loads, 50).toFixed(0)} ms (5 fresh profiles: ${loads.map((x) => x.toFixed(0)).join(', ')} ms)`);
console.log(`cold load of a link to first chart: median ${pct(linkLoads, 50).toFixed(0)} ms (5 fresh profiles: ${linkLoads.map((x) => x.toFixed(0)).join(', ')} ms)`);

const dist = process.env.KNEEPOINT_DIST || 'dist';
const gzipped = new Map();
const gz = (f) => {
  if (!gzipped.has(f)) gzipped.set(f, gzipSync(readFileSync(join(dist, f)), { level: 9 }).length);
  return gzipped.get(f);
};
const kb = (n) => `${(n / 1000).toFixed(1)} kB (${(n / 1024).toFixed(1)} KiB)`;

/** A fresh profile; `steps(page)` drives it; the page's own requests of
 *  site files (not the service worker's, which stores every file in the
 *  background) are summed gzipped, by kind. */
async function fetchedBy(steps) {
  const br = await openBrowser({ width: 1024, height: 768 });
  const seen = new Set();
  br.context.on('request', (r) => {
    if (r.serviceWorker()) return;
    const f = decodeURIComponent(new URL(r.url()).pathname).replace(/^\//, '') || 'index.html';
    if (/\.(html|js|wasm|css)$/.test(f) && f !== 'sw.js') seen.add(f);
  });
  const p = await br.page();
  const extra = await steps(p);
  await br.close();
  const files = [...seen].sort();
  const by = {};
  for (const f of files) by[f.split('.').pop()] = (by[f.split('.').pop()] || 0) + gz(f);
  return { files, total: files.reduce((n, f) => n + gz(f), 0), by, extra };
}
const settle = (p) => p.waitForTimeout(800);
const edit = async (p) => {
  await p.locator('[data-testid="slider-unloading_valve.setting_pa"]').evaluate((el) => {
    el.value = '35';
    el.dispatchEvent(new Event('input', { bubbles: true }));
  });
  await p.waitForFunction(() => location.hash.startsWith('#v=1'));
  await settle(p);
};
const first = await fetchedBy(async (p) => {
  await openApp(p);
  await settle(p);
});
const edited = await fetchedBy(async (p) => {
  await openApp(p);
  await edit(p);
  return p.evaluate(() => location.hash);
});
const linked = await fetchedBy(async (p) => {
  await openApp(p, edited.extra);
  await settle(p);
});
const everything = await fetchedBy(async (p) => {
  await openApp(p);
  await edit(p);
  for (const [name, sel] of [['Duty cycle', '[data-testid="timeline"] svg'], ['Machine check', '[data-testid="field-verdict"]']]) {
    await p.getByRole('button', { name, exact: true }).click();
    await p.waitForSelector(sel);
  }
  await p.getByRole('button', { name: 'Circuit', exact: true }).click();
  await p.click('[data-testid="diagram-toggle"]');
  await p.click('[data-testid="saved-show"]');
  await p.waitForSelector('[data-testid="diagram-main-svg"]');
  await p.waitForSelector('[data-testid="preset-save"]');
  await settle(p);
});
const line = (what, r) =>
  console.log(`download, ${what}: ${kb(r.total)} gzipped in ${r.files.length} files (${Object.entries(r.by).map(([k, n]) => `${k} ${(n / 1024).toFixed(1)} KiB`).join(', ')})`);
line('first visit, to the first chart', first);
line('first visit, after the first edit (the address follows it)', edited);
line('opening a link, to the first chart', linked);
line('after all three views, the saved list and the diagram', everything);
const all = readdirSync(dist).filter((f) => /\.(html|js|wasm|css)$/.test(f) && f !== 'sw.js');
console.log(`download, every file of the site: ${kb(all.reduce((n, f) => n + gz(f), 0))} gzipped in ${all.length} files`);
console.log(`first-visit files: ${first.files.join(', ')}`);
