// Behavioural browser tests of the built site (make e2e). Each test opens
// a fresh Chromium profile, drives the page as a person would and checks
// what the page shows; every test also checks that nothing went to
// another site and that the console stayed free of errors.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync, writeFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openBrowser, openApp, slide, type, kneePressure, settledHash, BASE } from './lib.mjs';

const UNLOADING = 'unloading_valve.setting_pa';
const PSI = 6894.757293168361; // Pa, from 1 lbf and 1 in (NIST SP 811 B.8)

async function withApp(viewport, fn) {
  const b = await openBrowser(viewport);
  try {
    await fn(b, await b.page());
    assert.deepEqual(b.watch.offsite, [], 'no request leaves the page origin');
    assert.deepEqual(b.watch.errors, [], 'no console or page error');
  } finally {
    await b.close();
  }
}

const value = (page, path) => page.locator(`[data-testid="input-${path}"]`).inputValue();

test('moving the unloading slider moves the staircase knee', async () => {
  await withApp(undefined, async (b, page) => {
    await openApp(page);
    assert.equal(await kneePressure(page, 'unloader_starts'), 30e5);
    await slide(page, UNLOADING, 45);
    await page.waitForFunction(() =>
      document.querySelector('[data-knee-kind="unloader_starts"]')?.getAttribute('data-pressure-pa') === '4500000');
    assert.equal(await kneePressure(page, 'unloader_starts'), 45e5);
    // Unloader fully open moves with it: 45 bar + 5 % band.
    assert.ok(Math.abs((await kneePressure(page, 'unloader_open')) - 47.25e5) < 1);
    const label = await page.locator('[data-knee-kind="unloader_starts"] text').textContent();
    assert.match(label, /45\.0 bar/);
    assert.equal(await value(page, UNLOADING), '45');
  });
});

test('a typed value beyond the slider is accepted; an invalid one is marked and the last result stays', async () => {
  await withApp(undefined, async (b, page) => {
    await openApp(page);
    // The slider ends at 120 bar; 150 bar is still a valid setting below the relief.
    await type(page, UNLOADING, '150');
    await page.waitForFunction(() =>
      document.querySelector('[data-knee-kind="unloader_starts"]')?.getAttribute('data-pressure-pa') === '15000000');
    // A rod as large as the bore is invalid: message beside the field, charts kept.
    await type(page, 'cylinder.rod_m', '120');
    const msg = page.locator('[data-testid="msg-cylinder.rod_m"]');
    await msg.waitFor();
    assert.match(await msg.textContent(), /smaller than the bore/);
    assert.equal(await page.locator('[data-testid="stale"]').count(), 1);
    assert.equal(await kneePressure(page, 'unloader_starts'), 150e5, 'the last good chart stays');
    // Text that is not a number keeps what was typed and says so.
    await type(page, 'cylinder.bore_m', '10o');
    assert.equal(await value(page, 'cylinder.bore_m'), '10o');
    assert.match(await page.locator('[data-testid="msg-cylinder.bore_m"]').textContent(), /Enter a number in mm/);
    await type(page, 'cylinder.rod_m', '56');
    await type(page, 'cylinder.bore_m', '100');
    await page.locator('[data-testid="stale"]').waitFor({ state: 'detached' });
  });
});

test('the unit toggle shows 1000 psi as 68.95 bar and back', async () => {
  await withApp(undefined, async (b, page) => {
    await openApp(page);
    await page.click('[data-testid="units-us"]');
    await type(page, UNLOADING, '1000');
    await page.waitForFunction((p) =>
      Math.abs(Number(document.querySelector('[data-knee-kind="unloader_starts"]')?.getAttribute('data-pressure-pa')) - p) < 1e-6,
    1000 * PSI);
    assert.match(await page.locator('[data-knee-kind="unloader_starts"] text').textContent(), /1000 psi/);
    await page.click('[data-testid="units-metric"]');
    assert.equal(await value(page, UNLOADING), '68.95');
    assert.match(await page.locator('[data-testid="staircase-svg"]').textContent(), /System pressure \(bar\)/);
    await page.click('[data-testid="units-us"]');
    assert.equal(await value(page, UNLOADING), '1000');
    await page.click('[data-testid="units-metric"]');
    await page.click('[data-testid="units-us"]');
    assert.equal(await value(page, UNLOADING), '1000', 'toggling never changes the design');
  });
});

/** The design as the page would export it (the command-line file format). */
async function exported(page) {
  const [download] = await Promise.all([page.waitForEvent('download'), page.click('[data-testid="export"]')]);
  const dir = mkdtempSync(join(tmpdir(), 'kneepoint-file-'));
  const file = join(dir, 'design.json');
  await download.saveAs(file);
  return JSON.parse(readFileSync(file, 'utf8'));
}

const at = (obj, path) => path.split('.').reduce((o, k) => (o == null ? o : o[k]), obj);

test('a link restores every input exactly', async () => {
  let hash;
  let edited;
  let paths;
  await withApp(undefined, async (b, page) => {
    await openApp(page);
    const original = await exported(page);
    await page.click('[data-testid="units-us"]');
    await page.evaluate(() => document.querySelectorAll('details').forEach((d) => (d.open = true)));
    const inputs = await page.locator('[data-testid^="input-"]').all();
    assert.ok(inputs.length >= 30, `${inputs.length} inputs`);
    let i = 0;
    paths = [];
    for (const input of inputs) {
      paths.push((await input.getAttribute('data-testid')).slice('input-'.length));
      const t = await input.inputValue();
      // Nudge every value by a different factor so none stays put.
      const next = t.trim() === '' ? String(11 + i) : String(+(Number(t) * (1.013 + 0.001 * i)).toPrecision(6));
      await input.fill(next);
      i += 1;
    }
    hash = await settledHash(page);
    edited = await exported(page);
    for (const p of paths) {
      assert.notEqual(at(edited, p), at(original, p), `${p} was changed`);
    }
  });
  assert.match(hash, /^#v=1&u=us&base=[a-z-]+&view=circuit&d=[A-Za-z0-9_-]+$/);
  await withApp(undefined, async (b, page) => {
    await openApp(page, hash);
    assert.equal(await page.getAttribute('[data-testid="units-us"]', 'aria-pressed'), 'true');
    // Bit for bit: the design file written by the reopened page is the same.
    assert.deepEqual(await exported(page), edited);
    assert.equal(await settledHash(page), hash, 'the address is unchanged after opening');
  });
});

test('a link pasted into the open page loads its design and opens the view it names', async () => {
  await withApp(undefined, async (b, page) => {
    await openApp(page);
    await page.evaluate(() => {
      location.hash = '#v=1&u=us&base=baler&view=cycle';
    });
    await page.waitForSelector('[data-testid="timeline"] svg', { timeout: 10000 });
    assert.equal(await page.getAttribute('[data-testid="units-us"]', 'aria-pressed'), 'true');
  });
});

test('switching views and then turning the tablet leaves no error behind', async () => {
  // Regression: a closed view's resize handler used to read disposed signals.
  await withApp({ width: 1024, height: 768 }, async (b, page) => {
    await openApp(page);
    await page.evaluate(() => {
      location.hash = '#v=1&u=metric&view=cycle';
    });
    await page.waitForSelector('[data-testid="timeline"] svg', { timeout: 10000 });
    await page.evaluate(() => {
      location.hash = '#v=1&u=metric&view=field';
    });
    await page.waitForSelector('[data-testid="field-verdict"]', { timeout: 10000 });
    await page.setViewportSize({ width: 768, height: 1024 });
    await page.waitForTimeout(300);
    await page.evaluate(() => {
      location.hash = '#v=1&u=metric&view=circuit';
    });
    await page.waitForSelector('[data-testid="staircase-svg"] .curve-flow', { timeout: 10000 });
    await page.setViewportSize({ width: 1024, height: 768 });
    await page.waitForTimeout(300);
  });
});

test('a broken or tampered link shows a notice and the demo design, and runs nothing', async () => {
  const b64 = (s) => Buffer.from(s).toString('base64url');
  const links = [
    '#v=1&u=metric&base=workshop-press&d=%3Cscript%3E',
    '#v=7&d=AAAA',
    '#v=1&base=../../etc',
    `#v=1&d=${b64('{"cylinder":{"bore_m":"<img src=x onerror=alert(1)>"}}')}`,
    `#v=1&d=${b64('{"cylinder":{"bore_m":0.1,"extra":1}}')}`,
  ];
  for (const link of links) {
    await withApp(undefined, async (b, page) => {
      let dialogs = 0;
      page.on('dialog', (d) => {
        dialogs += 1;
        d.dismiss();
      });
      await openApp(page, link);
      const notice = page.locator('[data-testid="notice"]');
      await notice.waitFor();
      assert.match(await notice.textContent(), /could not be opened/);
      assert.equal(await value(page, UNLOADING), '30');
      assert.equal(await page.locator('img[src="x"]').count(), 0);
      assert.equal(dialogs, 0);
    });
  }
  // A readable design whose name holds markup shows it as text only.
  const hostile = `#v=1&d=${b64('{"name":"<img src=x onerror=alert(1)>"}')}`;
  await withApp(undefined, async (b, page) => {
    await openApp(page, hostile);
    assert.equal(await page.locator('[data-testid="notice"]').count(), 0);
    assert.equal(await page.locator('img[src="x"]').count(), 0);
    await page.click('[data-testid="saved-show"]');
    assert.equal(await page.locator('[data-testid="preset-name"]').inputValue(), '<img src=x onerror=alert(1)>');
  });
});

test('saved designs survive a reload, and a damaged entry does not stop the app', async () => {
  await withApp(undefined, async (b, page) => {
    await openApp(page);
    await slide(page, UNLOADING, 40);
    // The saved list loads when asked for.
    await page.click('[data-testid="saved-show"]');
    await page.fill('[data-testid="preset-name"]', 'Press A');
    await page.click('[data-testid="preset-save"]');
    await slide(page, UNLOADING, 50);
    await page.fill('[data-testid="preset-name"]', 'Press B');
    await page.click('[data-testid="preset-save"]');
    await page.evaluate(() => {
      localStorage.setItem('kneepoint.preset.Damaged', '{"format": 1, "drive": ');
    });
    await page.goto(BASE); // no link: a fresh open
    await page.waitForSelector('[data-testid="staircase-svg"] .curve-flow');
    await page.click('[data-testid="saved-show"]');
    await page.locator('[data-testid="saved-list"]').waitFor();
    const names = await page.locator('[data-testid="saved-row"]').evaluateAll((els) => els.map((e) => e.dataset.name));
    assert.deepEqual(names, ['Press A', 'Press B']);
    assert.equal(await page.locator('[data-testid="saved-broken"]').count(), 1);
    assert.match(await page.locator('[data-testid="notice"]').first().textContent(), /“Damaged” could not be read/);
    await page.locator('[data-testid="saved-row"][data-name="Press A"] [data-testid="saved-open"]').click();
    assert.equal(await value(page, UNLOADING), '40');
    await page.locator('[data-testid="saved-row"][data-name="Press B"] [data-testid="saved-open"]').click();
    assert.equal(await value(page, UNLOADING), '50');
    // Rename keeps the design under its new name only.
    const rowB = page.locator('[data-testid="saved-row"][data-name="Press B"]');
    await rowB.getByRole('button', { name: 'Rename' }).click();
    await rowB.getByLabel('New name').fill('Press C');
    await rowB.locator('form button[type="submit"]').click();
    await page.locator('[data-testid="saved-row"][data-name="Press C"]').waitFor();
    assert.equal(await page.locator('[data-testid="saved-row"][data-name="Press B"]').count(), 0);
    // Delete asks once more before it removes.
    const del = page.locator('[data-testid="saved-row"][data-name="Press A"] [data-testid="saved-delete"]');
    await del.click();
    assert.equal(await page.locator('[data-testid="saved-row"]').count(), 2);
    await del.click();
    assert.equal(await page.locator('[data-testid="saved-row"]').count(), 1);
  });
});

test('a design file exports and imports in the command-line format', async () => {
  await withApp(undefined, async (b, page) => {
    await openApp(page);
    await slide(page, UNLOADING, 42);
    const [download] = await Promise.all([page.waitForEvent('download'), page.click('[data-testid="export"]')]);
    const dir = mkdtempSync(join(tmpdir(), 'kneepoint-file-'));
    const file = join(dir, download.suggestedFilename());
    await download.saveAs(file);
    const design = JSON.parse(readFileSync(file, 'utf8'));
    assert.equal(design.format, 1);
    assert.equal(design.unloading_valve.setting_pa, 42e5);
    // Import it back into a page showing another demo design.
    await page.click('[data-testid="example-baler"]');
    assert.equal(await value(page, UNLOADING), '35');
    await page.setInputFiles('[data-testid="import"]', file);
    await page.waitForFunction(() => document.querySelector('[data-testid="input-unloading_valve.setting_pa"]').value === '42');
    // A malformed file changes nothing and says why.
    const bad = join(dir, 'bad.json');
    writeFileSync(bad, '{"format": 1, "oops": true}');
    await page.setInputFiles('[data-testid="import"]', bad);
    await page.locator('[data-testid="notice"]').filter({ hasText: 'bad.json' }).waitFor();
    assert.equal(await value(page, UNLOADING), '42');
  });
});

test('with the network off, a reload still draws the charts', async () => {
  await withApp(undefined, async (b, page) => {
    await openApp(page);
    await page.evaluate(async () => {
      await navigator.serviceWorker.ready;
      if (!navigator.serviceWorker.controller) {
        await new Promise((ok) => navigator.serviceWorker.addEventListener('controllerchange', ok));
      }
    });
    await b.context.setOffline(true);
    await page.reload();
    await page.waitForSelector('[data-testid="staircase-svg"] .curve-flow', { timeout: 15000 });
    await page.waitForSelector('[data-testid="power-svg"] .curve-power');
    assert.equal(await kneePressure(page, 'unloader_starts'), 30e5);
    await b.context.setOffline(false);
  });
});

test('axe-core finds no serious or critical violation', async () => {
  const axe = readFileSync(new URL('../../node_modules/axe-core/axe.min.js', import.meta.url), 'utf8');
  for (const viewport of [{ width: 1024, height: 768 }, { width: 390, height: 844 }]) {
    await withApp(viewport, async (b, page) => {
      await openApp(page);
      await page.click('[data-testid="safety-toggle"]');
      await page.evaluate(() => document.querySelectorAll('details').forEach((d) => (d.open = true)));
      // Evaluated through the driver, not as a page script: the page's CSP stays intact.
      await page.evaluate(axe);
      const result = await page.evaluate(async () => {
        const r = await window.axe.run(document, { resultTypes: ['violations'] });
        return r.violations.map((v) => ({ id: v.id, impact: v.impact, nodes: v.nodes.slice(0, 3).map((n) => n.target.join(' ')) }));
      });
      const bad = result.filter((v) => v.impact === 'serious' || v.impact === 'critical');
      assert.deepEqual(bad, [], JSON.stringify(bad, null, 1));
    });
  }
});

test('touch targets and no sideways scrolling on tablets and phones', async () => {
  for (const viewport of [{ width: 1024, height: 768 }, { width: 768, height: 1024 }, { width: 390, height: 844 }]) {
    await withApp(viewport, async (b, page) => {
      await openApp(page);
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
      assert.ok(overflow <= 0, `${viewport.width}px: ${overflow}px of sideways scroll`);
      const small = await page.evaluate(() =>
        [...document.querySelectorAll('button, input, summary, select, .button')]
          .filter((e) => e.offsetParent !== null && !e.classList.contains('visually-hidden-file'))
          .map((e) => ({ e, r: e.getBoundingClientRect() }))
          .filter(({ r }) => r.height < 44 || r.width < 44)
          .map(({ e, r }) => `${e.tagName} ${e.textContent.trim().slice(0, 20) || e.id} ${r.width.toFixed(0)}x${r.height.toFixed(0)}`));
      assert.deepEqual(small, [], `${viewport.width}px`);
    });
  }
});

test('the printed design sheet is one A4 page with inputs, results and both charts', async () => {
  await withApp(undefined, async (b, page) => {
    await openApp(page);
    await page.emulateMedia({ media: 'print' });
    for (const sel of ['.inputs-table', '[data-testid="results"]', '[data-testid="staircase-svg"]', '[data-testid="power-svg"]', '.print-safety']) {
      assert.ok(await page.locator(sel).isVisible(), `${sel} is on the sheet`);
    }
    assert.equal(await page.locator('.inputs .slider').first().isVisible(), false, 'no sliders on paper');
    const pdf = (await page.pdf({ format: 'A4' })).toString('latin1');
    const pages = (pdf.match(/\/Type\s*\/Page[^s]/g) || []).length;
    assert.equal(pages, 1);
  });
});

test('a first visit loads only the main module; the other views load on first use, and offline', async () => {
  await withApp(undefined, async (b, page) => {
    // Requests of the page itself (the service worker's own requests, to
    // store every file on install, are not the page's download).
    const fetched = [];
    b.context.on('request', (r) => {
      if (!r.serviceWorker()) fetched.push(new URL(r.url()).pathname);
    });
    const split = (view) => fetched.filter((p) => p.includes(`split_kneepoint_${view}_view`));
    await openApp(page);
    // A first visit draws the circuit view from the main module alone.
    await page.waitForTimeout(600); // past the address's quarter-second sync
    const parts = fetched.filter((p) => /\/(split|chunk)_/.test(p));
    assert.deepEqual(parts, [], 'no split module fetched by a first visit before any edit');
    // The first edit: the address follows it (the link codec loads then).
    await slide(page, UNLOADING, 35);
    await page.waitForFunction(() => location.hash.startsWith('#v=1'));
    assert.deepEqual(split('cycle'), [], 'duty-cycle module not fetched by the page');
    assert.deepEqual(split('field'), [], 'machine-check module not fetched by the page');
    await page.evaluate(async () => {
      await navigator.serviceWorker.ready;
      if (!navigator.serviceWorker.controller) {
        await new Promise((ok) => navigator.serviceWorker.addEventListener('controllerchange', ok));
      }
    });
    // The service worker stored them on the first visit: both open offline.
    await b.context.setOffline(true);
    await page.getByRole('button', { name: 'Duty cycle', exact: true }).click();
    await page.waitForSelector('[data-testid="timeline"] svg', { timeout: 15000 });
    assert.ok(split('cycle').length >= 1, 'duty-cycle module fetched when the view opened');
    await page.getByRole('button', { name: 'Machine check', exact: true }).click();
    await page.waitForSelector('[data-testid="field-verdict"]', { timeout: 15000 });
    assert.ok(split('field').length >= 1, 'machine-check module fetched when the view opened');
    await page.getByRole('button', { name: 'Circuit', exact: true }).click();
    await page.waitForSelector('[data-testid="staircase-svg"] .curve-flow');
    await b.context.setOffline(false);
  });
});

test('a view whose module cannot be fetched says so, keeps the page working, and opens on a retry', async () => {
  const b = await openBrowser();
  try {
    const page = await b.page();
    // As if the network dropped before the files were stored.
    const block = (route) => route.abort();
    await b.context.route('**/split_kneepoint_cycle_view*', block);
    await openApp(page);
    await page.getByRole('button', { name: 'Duty cycle', exact: true }).click();
    const msg = page.locator('[data-testid="unloaded"]');
    await msg.waitFor({ timeout: 15000 });
    assert.match(await msg.textContent(), /could not be loaded.*Reload the page with the network on/);
    // With the network back, "Try again" opens the view.
    await b.context.unroute('**/split_kneepoint_cycle_view*', block);
    await page.getByRole('button', { name: 'Try again' }).click();
    await page.waitForSelector('[data-testid="timeline"] svg', { timeout: 15000 });
    // And the rest of the page kept working throughout.
    await page.getByRole('button', { name: 'Circuit', exact: true }).click();
    await slide(page, UNLOADING, 45);
    await page.waitForFunction(
      () => document.querySelector('[data-knee-kind="unloader_starts"]')?.getAttribute('data-pressure-pa') === '4500000',
    );
    const pageErrors = b.watch.errors.filter((e) => e.startsWith('page error'));
    assert.deepEqual(pageErrors, [], 'no page error (no panic)');
  } finally {
    await b.close();
  }
});
