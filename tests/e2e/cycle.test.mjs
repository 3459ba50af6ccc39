// Behavioural browser tests of the duty-cycle view (make e2e): a segment's
// force moves the timeline and the motor card; a stall or a bad value is
// marked beside its field while the last cycle stays; the whole profile
// travels in a copied link. Every test also checks that nothing went to
// another site and that the console stayed free of errors.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { openBrowser, settledHash, BASE } from './lib.mjs';

const TO_FORCE = 'cycle.segments[1].force.to_n';

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

/** Opens the duty-cycle view (of the demo press unless `hash` says else). */
async function openCycle(page, hash = '#v=1&view=cycle') {
  await page.goto(BASE + hash);
  await page.waitForSelector('[data-testid="timeline-motion"] .curve-position', { timeout: 15000 });
  await page.waitForSelector('[data-testid="timeline-power"] .curve-power');
  await page.waitForSelector('[data-testid="motor-figures"]');
}

const cin = (page, path) => page.locator(`[data-testid="cin-${path}"]`);
const motor = (page, attr) =>
  page.locator('[data-testid="motor-figures"]').getAttribute(attr).then(Number);
const curve = (page, chart, cls) =>
  page.locator(`[data-testid="${chart}"] .${cls}`).getAttribute('d');

test('a pressing force moves the timeline and the motor card', async () => {
  await withApp(undefined, async (b, page) => {
    await openCycle(page);
    // The demo press: pressing rises from 20 to 100 kN (design data).
    assert.equal(await cin(page, TO_FORCE).inputValue(), '100');
    const rms0 = await motor(page, 'data-rms-w');
    const pressure0 = await curve(page, 'timeline-motion', 'curve-pressure');
    const power0 = await curve(page, 'timeline-power', 'curve-power');
    const time0 = Number(await page.locator('[data-testid="seg-result-1"]').getAttribute('data-time-s'));
    const rmsText0 = await page.locator('[data-testid="motor-rms"]').textContent();

    await cin(page, TO_FORCE).fill('120');
    await page.waitForFunction(
      (r) => Number(document.querySelector('[data-testid="motor-figures"]').getAttribute('data-rms-w')) !== r,
      rms0,
    );
    const rms1 = await motor(page, 'data-rms-w');
    assert.ok(rms1 > rms0, `more force, more RMS power: ${rms0} -> ${rms1} W`);
    assert.notEqual(await curve(page, 'timeline-motion', 'curve-pressure'), pressure0);
    assert.notEqual(await curve(page, 'timeline-power', 'curve-power'), power0);
    const time1 = Number(await page.locator('[data-testid="seg-result-1"]').getAttribute('data-time-s'));
    assert.ok(time1 >= time0, `pressing is no faster against more force: ${time0} -> ${time1} s`);
    assert.notEqual(await page.locator('[data-testid="motor-rms"]').textContent(), rmsText0);
    assert.match(await page.locator('[data-testid="motor-rms"]').textContent(), /\d+ % of rating/);

    // A force the relief cannot reach: the stall is named beside the
    // segment, and the last cycle that ran stays on screen.
    await cin(page, TO_FORCE).fill('500');
    const stall = page.locator('[data-testid="stall-1"]');
    await page.waitForFunction(() => /Force not reachable/.test(document.querySelector('[data-testid="stall-1"]').textContent));
    assert.match(await stall.textContent(), /kN/);
    await page.locator('[data-testid="cycle-stale"]').waitFor();
    assert.equal(await motor(page, 'data-rms-w'), rms1, 'the last cycle stays');

    // A negative force is refused by the engine, beside that field.
    await cin(page, TO_FORCE).fill('-5');
    const msg = page.locator(`[data-testid="cmsg-${TO_FORCE}"]`);
    await page.waitForFunction((id) => document.querySelector(`[data-testid="${id}"]`).textContent.length > 0, `cmsg-${TO_FORCE}`);
    assert.match(await msg.textContent(), /zero or more/);
    assert.equal(await cin(page, TO_FORCE).getAttribute('aria-invalid'), 'true');
    assert.equal(await cin(page, TO_FORCE).inputValue(), '-5', 'what was typed stays');

    await cin(page, TO_FORCE).fill('100');
    await page.locator('[data-testid="cycle-stale"]').waitFor({ state: 'detached' });
    assert.equal(await motor(page, 'data-rms-w'), rms0, 'back to the start, bit for bit');
  });
});

/** Every cycle input on the page: its path and its text. */
async function cycleInputs(page) {
  return page
    .locator('[data-testid^="cin-cycle."]')
    .evaluateAll((els) => els.map((e) => [e.dataset.testid, e.value]));
}

test('the profile survives the link round trip', async () => {
  let link;
  let before;
  await withApp(undefined, async (b, page) => {
    await openCycle(page);
    await cin(page, TO_FORCE).fill('110');
    await cin(page, 'cycle.segments[5].time_s').fill('7.5');
    // A table-shaped force and one more segment at the end.
    await page.selectOption('[data-testid="shape-1"]', 'table');
    await page.locator('[data-testid="point-1-2"]').waitFor();
    await cin(page, 'cycle.segments[1].force.points[1].force_n').fill('42');
    await page.selectOption('[data-testid="add-kind"]', 'idle');
    await page.click('[data-testid="add-segment"]');
    await page.locator('[data-testid="segment-6"]').waitFor();
    await cin(page, 'cycle.segments[6].time_s').fill('1.25');
    await page.click('[data-testid="units-us"]');
    await settledHash(page);
    await page.click('[data-testid="copy-link"]');
    link = await page.locator('#share-link').inputValue();
    before = await cycleInputs(page);
    assert.ok(before.length >= 14, `${before.length} cycle inputs`);
  });
  assert.match(link, /#v=1&u=us&.*view=cycle&d=/);
  await withApp({ width: 390, height: 844 }, async (b, page) => {
    await openCycle(page, link.slice(link.indexOf('#')));
    assert.equal(await page.locator('[data-testid^="segment-"]').count(), 7);
    assert.equal(await page.locator('[data-testid="segment-6"]').getAttribute('data-kind'), 'idle');
    assert.deepEqual(await cycleInputs(page), before);
    await page.click('[data-testid="units-metric"]');
    assert.equal(await cin(page, 'cycle.segments[1].force.points[1].force_n').inputValue(), '42');
    assert.equal(await cin(page, 'cycle.segments[5].time_s').inputValue(), '7.5');
  });
});

test('the cycle view fits tablet and phone screens without sideways scrolling', async () => {
  for (const viewport of [
    { width: 1024, height: 768 },
    { width: 768, height: 1024 },
    { width: 390, height: 844 },
  ]) {
    await withApp(viewport, async (b, page) => {
      await openCycle(page);
      const [scroll, inner] = await page.evaluate(() => [document.documentElement.scrollWidth, window.innerWidth]);
      assert.ok(scroll <= inner, `${viewport.width}x${viewport.height}: ${scroll} > ${inner}`);
      // Every control a finger uses is at least 44 px tall, and labelled.
      const small = await page.evaluate(() =>
        [...document.querySelectorAll('.cycle button, .cycle select, .cycle input')]
          .filter((e) => e.offsetParent !== null)
          .filter((e) => e.getBoundingClientRect().height < 43.5)
          .map((e) => e.outerHTML.slice(0, 80)),
      );
      assert.deepEqual(small, []);
      const unlabelled = await page.evaluate(() =>
        [...document.querySelectorAll('.cycle select, .cycle input')]
          .filter((e) => !(e.labels && e.labels.length) && !e.getAttribute('aria-label') && !e.getAttribute('aria-labelledby'))
          .map((e) => e.outerHTML.slice(0, 80)),
      );
      assert.deepEqual(unlabelled, []);
    });
  }
});
