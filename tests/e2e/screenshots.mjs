// Screenshots of the built site at the three tablet and phone sizes the
// app is designed for (make screenshots). Usage: node screenshots.mjs DIR
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { openBrowser, openApp, BASE } from './lib.mjs';

const out = process.argv[2] || 'docs/screenshots';
mkdirSync(out, { recursive: true });
const sizes = [
  ['tablet-landscape-1024x768', { width: 1024, height: 768 }],
  ['tablet-portrait-768x1024', { width: 768, height: 1024 }],
  ['phone-390x844', { width: 390, height: 844 }],
];
for (const [name, viewport] of sizes) {
  const b = await openBrowser(viewport);
  const page = await b.page();
  await openApp(page);
  // A reading under the pointer, as a person checking a value would see it.
  const box = await page.locator('[data-testid="staircase-svg"]').boundingBox();
  await page.mouse.move(box.x + box.width * 0.45, box.y + box.height * 0.5);
  await page.screenshot({ path: join(out, `${name}.png`) });
  await page.screenshot({ path: join(out, `${name}-full.png`), fullPage: true });
  // The other two views, as opened from a link.
  for (const [view, ready] of [
    ['cycle', '[data-testid="timeline"] svg'],
    ['field', '[data-testid="field-verdict"]'],
  ]) {
    await page.goto(`${BASE}#v=1&u=metric&view=${view}`);
    await page.waitForSelector(ready, { timeout: 15000 });
    await page.waitForTimeout(300);
    await page.screenshot({ path: join(out, `${name}-${view}.png`) });
    await page.screenshot({ path: join(out, `${name}-${view}-full.png`), fullPage: true });
  }
  if (b.watch.errors.length || b.watch.offsite.length) {
    console.error(`screenshots: ${name}:`, b.watch);
    process.exitCode = 1;
  }
  await b.close();
  console.log(`screenshots: ${join(out, name)}.png`);
}
