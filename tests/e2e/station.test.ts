import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import type { APIRequestContext, Page } from 'playwright-core';
import { blockExternalRequests, closeBrowser, newPage, signInAs } from '../helpers/browser';
import { containerOf as containerOfMaterial, json } from '../helpers/demo-stock';

/**
 * A full assembler session at the magnet-assembly station with keyboard-wedge input (typed
 * characters + Enter into whatever has the focus, as a handheld scanner does), against the
 * demo-seeded e2e database: ST-MAG-1, model HB12W whose first step uses MAG-FER-156, FRM-12S,
 * ADH-AN-220 and ACT-220.
 */
const baseUrl = inject('baseUrl');
const containerOf = (request: APIRequestContext, materialCode: string, atLeast = 10) =>
  containerOfMaterial(baseUrl, request, materialCode, atLeast);

let page: Page;
let external: string[];

/** What a keyboard-wedge scanner does: types into the focused element and presses Enter. */
async function wedgeScan(code: string) {
  await page.keyboard.type(code, { delay: 5 });
  await page.keyboard.press('Enter');
}

const feedback = () => page.locator('[data-test="feedback"]');

async function expectFeedback(kind: string, title: RegExp) {
  await expect
    .poll(async () => `${await feedback().getAttribute('data-kind')} ${await page.locator('[data-test="feedback-title"]').innerText()}`, {
      timeout: 15_000,
    })
    .toMatch(new RegExp(`^${kind} ${title.source}`));
}

async function scanFieldHasFocus(): Promise<boolean> {
  return page.evaluate(
    () => document.activeElement?.tagName === 'INPUT' && document.activeElement.closest('[data-test="station-scan"]') !== null,
  );
}

beforeAll(async () => {
  page = await newPage(baseUrl);
  external = await blockExternalRequests(page);
  await signInAs(page, 'assembler@tacklog.test');
});

afterEach(() => {
  // Everything is bundled (fonts, icons, the camera library): nothing may leave 127.0.0.1.
  expect(external).toEqual([]);
});

afterAll(async () => {
  await page.context().close();
  await closeBrowser();
});

describe('station screen', () => {
  it('runs a full session with a keyboard-wedge scanner: station, batch, loads (accept and refuse), start and finish', async () => {
    const request = page.request;
    const models = await json<{ items: { id: string; code: string }[] }>(request, '/api/models');
    const hb12w = models.items.find((m) => m.code === 'HB12W');
    expect(hb12w, 'demo model HB12W').toBeTruthy();
    const created = await json<{ batch: { id: string; code: string } }>(request, '/api/batches', {
      data: { modelId: hb12w!.id, quantity: 4 },
    });
    // The first step of HB12W uses all four; 4 units need at most 4.8 of each (recipe amounts).
    const adhesive = await containerOf(request, 'ADH-AN-220');
    const activator = await containerOf(request, 'ACT-220');
    const magnet = await containerOf(request, 'MAG-FER-156');
    const frame = await containerOf(request, 'FRM-12S');
    const cone = await containerOf(request, 'CON-12P', 1);
    for (const [name, code] of Object.entries({ adhesive, activator, magnet, frame, cone })) {
      expect(code, `a usable ${name} container in the demo stock`).toBeTruthy();
    }

    await page.goto('/station');
    await page.locator('[data-test="station-page"]').waitFor();
    await expect.poll(scanFieldHasFocus).toBe(true);

    // 1. The station, by its code.
    await wedgeScan('ST-MAG-1');
    await expectFeedback('info', /Station ST-MAG-1/);
    expect(await page.locator('[data-test="station-code"]').innerText()).toContain('ST-MAG-1');

    // 2. The build batch, by its traveler code.
    await wedgeScan(created.batch.code);
    await expectFeedback('info', /Batch /);
    expect(await page.locator('[data-test="batch-code"]').innerText()).toBe(created.batch.code);
    expect(await page.locator('[data-test="step-here"]').innerText()).toContain('Magnet assembly');

    // 3. The right material: accepted, shown big, listed with a live countdown and its hazards.
    await wedgeScan(adhesive);
    await expectFeedback('accept', /Accepted: Anaerobic structural acrylic/);
    expect(await page.locator('[data-test="feedback-word"]').innerText()).toBe('ACCEPTED');
    const loaded = page.locator(`[data-test="loaded-item"][data-code="${adhesive}"]`);
    await loaded.waitFor();
    const countdown = loaded.locator('[data-test="countdown"]');
    expect(await countdown.innerText()).toMatch(/ends in \d+ (d|h|min)/);
    expect(['ok', 'soon']).toContain(await countdown.getAttribute('data-tone'));
    await page.locator('[data-test="station-hazards"] [data-test="ghs-GHS07"]').waitFor();
    expect(await page.locator('[data-test="station-hazards"] [data-test="safety-note"]').innerText()).toMatch(
      /safety data sheet, local regulations/i,
    );
    await page.screenshot({ path: '/tmp/station-accept.png', fullPage: true });

    // 4. A wrong material: refused with the server's reason text and code; nothing more is loaded.
    await wedgeScan(cone);
    await expectFeedback('refuse', /Refused: wrong material/);
    expect(await page.locator('[data-test="feedback-word"]').innerText()).toBe('REFUSED');
    expect(await page.locator('[data-test="feedback-message"]').innerText()).toMatch(
      /Wrong material: container .* is Paper cone, 12 in, but step "Magnet assembly" uses/,
    );
    // The code is for scripts (data-code), never shown: people read the title and the reason.
    expect(await page.locator('[data-test="feedback"]').getAttribute('data-code')).toBe('WRONG_MATERIAL');
    expect(await page.locator('[data-test="feedback"]').innerText()).not.toContain('WRONG_MATERIAL');
    expect(await page.locator('[data-test="loaded-item"]').count()).toBe(1);
    await page.screenshot({ path: '/tmp/station-refuse.png', fullPage: true });

    // 5. Offline: the scan is queued on the device, then sent (once) when the network is back.
    await page.context().setOffline(true);
    await expect.poll(() => page.locator('[data-test="queue-text"]').innerText()).toBe('Offline — 0 queued');
    await wedgeScan(activator);
    await expectFeedback('queued', /Offline: queued/);
    expect(await page.locator('[data-test="queue-text"]').innerText()).toBe('Offline — 1 queued');
    expect(await page.evaluate(() => JSON.parse(localStorage.getItem('tacklog.station.queue') ?? '[]').length)).toBe(1);
    await page.screenshot({ path: '/tmp/station-offline.png', fullPage: true });
    await page.context().setOffline(false);
    await expectFeedback('accept', /Accepted: Activator for anaerobic acrylic/);
    await expect.poll(() => page.locator('[data-test="queue-text"]').innerText()).toBe('Online');
    await page.locator(`[data-test="loaded-item"][data-code="${activator}"]`).waitFor();

    // The rest of the step's materials.
    await wedgeScan(magnet);
    await expectFeedback('accept', /Accepted: Ferrite ring magnet/);
    await wedgeScan(frame);
    await expectFeedback('accept', /Accepted: Stamped steel frame/);
    await expect.poll(() => page.locator('[data-test="loaded-item"]').count()).toBe(4);

    // 6. Start and finish the step with the big buttons; the scan field gets the focus back.
    const start = page.locator('[data-test="start-step"]');
    expect((await start.boundingBox())!.height).toBeGreaterThanOrEqual(64);
    await start.click();
    await expectFeedback('accept', /Started: Magnet assembly/);
    await expect.poll(scanFieldHasFocus, { timeout: 5000 }).toBe(true);
    await page.locator('[data-test="finish-step"]:not([disabled])').waitFor();
    await page.locator('[data-test="finish-step"]').click();
    await expectFeedback('accept', /Finished: Magnet assembly/);
    await expect.poll(scanFieldHasFocus, { timeout: 5000 }).toBe(true);

    // The server agrees: the step ran at ST-MAG-1 with the containers loaded there.
    const traveler = await json<{
      steps: { name: string; state: string; run: { materials: { containerCode: string | null }[] } | null }[];
    }>(request, `/api/batches/${created.batch.id}`);
    const magnetStep = traveler.steps.find((s) => s.name === 'Magnet assembly')!;
    expect(['done', 'curing']).toContain(magnetStep.state);
    expect(magnetStep.run!.materials.map((m) => m.containerCode)).toContain(adhesive);
    expect(magnetStep.run!.materials.map((m) => m.containerCode)).not.toContain(cone);
    await page.screenshot({ path: '/tmp/station-finished.png', fullPage: true });
  });

  it('remembers the station on this device', async () => {
    await page.reload();
    await page.locator('[data-test="station-page"]').waitFor();
    expect(await page.locator('[data-test="station-code"]').innerText()).toContain('ST-MAG-1');
  });
});
