// Shared helpers for the browser tests: launch Debian Chromium through
// playwright-core (flags from docs: toolchain notes), open the app, and
// watch for console errors, page errors and off-site requests.
import { chromium } from 'playwright-core';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export const BASE = process.env.KNEEPOINT_URL || 'http://127.0.0.1:8080/';
export const CHROMIUM = process.env.CHROMIUM || '/usr/bin/chromium';

const FLAGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

/** A fresh browser profile (own user-data-dir) with one context. */
export async function openBrowser(viewport = { width: 1024, height: 768 }) {
  const dir = mkdtempSync(join(tmpdir(), 'kneepoint-chromium-'));
  const context = await chromium.launchPersistentContext(dir, {
    executablePath: CHROMIUM,
    headless: true,
    args: FLAGS,
    viewport,
    serviceWorkers: 'allow',
  });
  const watch = { errors: [], offsite: [] };
  const origin = new URL(BASE).origin;
  context.on('request', (r) => {
    const u = r.url();
    if (!u.startsWith(origin) && !u.startsWith('data:') && !u.startsWith('blob:')) {
      watch.offsite.push(u);
    }
  });
  const hook = (page) => {
    page.on('console', (m) => {
      if (m.type() === 'error') watch.errors.push(`console: ${m.text()}`);
    });
    page.on('pageerror', (e) => watch.errors.push(`page error: ${e.message}`));
  };
  context.on('page', hook);
  for (const p of context.pages()) hook(p);
  return {
    context,
    watch,
    async page() {
      return context.pages()[0] || context.newPage();
    },
    async close() {
      await context.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** Opens the app at `hash` (with or without '#') and waits for both charts. */
export async function openApp(page, hash = '') {
  const h = hash && !hash.startsWith('#') ? `#${hash}` : hash;
  await page.goto(BASE + h);
  await page.waitForSelector('[data-testid="staircase-svg"] .curve-flow', { timeout: 15000 });
  await page.waitForSelector('[data-testid="power-svg"] .curve-power');
}

/** Sets a range input as a person dragging it would: value, then 'input'. */
export async function slide(page, path, value) {
  await page.locator(`[data-testid="slider-${path}"]`).evaluate((el, v) => {
    el.value = String(v);
    el.dispatchEvent(new Event('input', { bubbles: true }));
  }, value);
}

/** Types into a numeric field, replacing what was there. */
export async function type(page, path, text) {
  const input = page.locator(`[data-testid="input-${path}"]`);
  await input.fill(text);
}

/** The pressure (Pa) of a knee read from the chart's own attributes. */
export async function kneePressure(page, kind) {
  const v = await page
    .locator(`[data-testid="staircase-svg"] [data-knee-kind="${kind}"]`)
    .getAttribute('data-pressure-pa');
  return Number(v);
}

/** Waits until the address holds the design (the link follows edits). */
export async function settledHash(page) {
  await page.waitForTimeout(400);
  return page.evaluate(() => location.hash);
}
