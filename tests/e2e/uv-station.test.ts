import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { blockExternalRequests, closeBrowser, newPage, signInAs } from '../helpers/browser';
import { containerOf, json, signedIn } from '../helpers/demo-stock';

/**
 * A UV step at the station on the 1024×768 tablet, against the demo plant: model HB12X's dust cap
 * is bonded with the UV-curing acrylic ADH-UV-30 (3,000 mJ/cm² needed) under lamp ST-UV-1, whose
 * latest radiometer reading is 97 mW/cm² (9 days old, so its check is due). Dose = irradiance ×
 * time (1 mW/cm² for 1 s = 1 mJ/cm²): 20 s gives 1,940 mJ/cm², refused; 35 s gives 3,395, enough.
 * Then the batch page at 1440×900 shows the cure methods and the dose reached, and the cure board
 * shows the oven cure and the UV cure with their own figures.
 */
const baseUrl = inject('baseUrl');
let page: Page;
let external: string[];

const feedback = () => page.locator('[data-test="feedback"]');
async function expectFeedback(kind: string, title: RegExp) {
  await expect
    .poll(async () => `${await feedback().getAttribute('data-kind')} ${await page.locator('[data-test="feedback-title"]').innerText()}`, {
      timeout: 15_000,
    })
    .toMatch(new RegExp(`^${kind} ${title.source}`));
}
async function wedgeScan(code: string) {
  await page.locator('[data-test="station-scan"] input').focus();
  await page.keyboard.type(code, { delay: 5 });
  await page.keyboard.press('Enter');
}

interface Traveler {
  batch: { id: string; code: string; modelCode: string };
  steps: { name: string; state: string; cure: { method: string } | null; run: { uv: { doseMJcm2: number } | null } | null }[];
}

beforeAll(async () => {
  page = await newPage(baseUrl, undefined, { viewport: { width: 1024, height: 768 } });
  external = await blockExternalRequests(page);
  await signInAs(page, 'assembler@tacklog.test');
});
afterEach(() => expect(external).toEqual([]));
afterAll(async () => {
  await page.context().close();
  await closeBrowser();
});

describe('UV step at the station', () => {
  let batch: Traveler['batch'];

  it('the demo has the lamp due for its radiometer check', async () => {
    const quality = await signedIn(baseUrl, 'quality@tacklog.test');
    try {
      await json(quality, '/api/compliance/run', { data: {} });
      const alerts = await json<{ items: { kind: string; message: string }[] }>(
        quality,
        '/api/alerts?state=live&kind=lamp_check_due&limit=200',
      );
      const due = alerts.items.filter((a) => a.kind === 'lamp_check_due');
      expect(due.map((a) => a.message).join(' ')).toContain('ST-UV-1');
    } finally {
      await quality.dispose();
    }
  });

  it('scans, takes the exposure time, shows the dose, refuses a short dose in words, then finishes', async () => {
    const request = page.request;
    const list = await json<{ items: { id: string; code: string }[] }>(request, '/api/batches?q=HB12X&limit=20');
    let found: Traveler | null = null;
    for (const b of list.items) {
      const t = await json<Traveler>(request, `/api/batches/${b.id}`);
      const cap = t.steps.find((s) => s.name === 'Dust cap (UV)');
      if (cap?.state === 'pending' && t.steps.filter((s) => s.state === 'pending').length === 2) found = t;
    }
    expect(found, 'a demo HB12X batch whose next step is the UV dust cap').toBeTruthy();
    batch = found!.batch;
    const acrylic = await containerOf(baseUrl, request, 'ADH-UV-30', 5);
    const caps = await containerOf(baseUrl, request, 'DCP-40', 20);

    await page.goto('/station');
    await page.locator('[data-test="station-page"]').waitFor();
    await wedgeScan('ST-UV-1');
    await expectFeedback('info', /Station ST-UV-1/);
    // The oven / UV lamp caution (eyes, skin, hot parts; the plant's rules and the maker's instructions).
    const caution = await page.locator('[data-test="cure-station-caution"]').innerText();
    expect(caution).toMatch(/UV eye and skin protection/);
    expect(caution).toMatch(/plant's safety rules and the equipment maker's instructions/);

    await wedgeScan(batch.code);
    await expectFeedback('info', /Batch /);
    expect(await page.locator('[data-test="step-here"]').innerText()).toContain('Dust cap (UV)');
    expect(await page.locator('[data-test="batch-panel"]').innerText()).toContain('HB12X rev 1');
    await wedgeScan(acrylic);
    await expectFeedback('accept', /Accepted: UV-curing acrylic/);
    await wedgeScan(caps);
    await expectFeedback('accept', /Accepted: Dust cap/);

    const panel = page.locator('[data-test="uv-dose-panel"]');
    await panel.waitFor();
    expect(await panel.innerText()).toContain('dose needed 3,000 mJ/cm²');
    await expect.poll(() => page.locator('[data-test="uv-lamp"]').innerText()).toContain('97 mW/cm²');
    expect(await page.locator('[data-test="uv-lamp"]').innerText()).toContain('At least 31 s'); // ⌈3000 / 97⌉

    await page.locator('[data-test="start-step"]').click();
    await expectFeedback('accept', /Started: Dust cap \(UV\)/);
    // Finish waits for an exposure time.
    await page.locator('[data-test="finish-why-not"]').waitFor();
    expect(await page.locator('[data-test="finish-step"]').isDisabled()).toBe(true);

    // 20 s × 97 mW/cm² = 1,940 mJ/cm²: shown short, and the server refuses it in words.
    await page.locator('input[data-test="uv-exposure"]').fill('20');
    await expect
      .poll(() => page.locator('[data-test="uv-dose-value"]').innerText())
      .toBe('Dose 1,940 of 3,000 mJ/cm² — too low: the finish will be refused');
    await page.screenshot({ path: '/tmp/uv-station-short.png' });
    await page.locator('[data-test="finish-step"]').click();
    await expectFeedback('refuse', /Refused: UV dose too low/);
    const refusal = await page.locator('[data-test="feedback-message"]').innerText();
    expect(refusal).toContain('The UV dose reached is 1,940 mJ/cm² (97 mW/cm² × 20 s); the adhesive needs 3,000 mJ/cm²');
    expect(refusal).toContain('at least 31 s');
    expect(await feedback().innerText()).not.toContain('UV_DOSE_LOW');

    // 35 s × 97 = 3,395 mJ/cm²: enough; the finish goes through. The step is running again after the refusal.
    await page.locator('input[data-test="uv-exposure"]').fill('35');
    await page.locator('[data-test="finish-step"]:not([disabled])').waitFor();
    await expect.poll(() => page.locator('[data-test="uv-dose-value"]').innerText()).toBe('Dose 3,395 of 3,000 mJ/cm² — enough');
    await page.screenshot({ path: '/tmp/uv-station-1024x768.png' });
    // Nothing on the tablet runs off to the side.
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(1024);
    await page.locator('[data-test="finish-step"]').click();
    await expectFeedback('accept', /Finished: Dust cap \(UV\)/);

    const after = await json<Traveler>(request, `/api/batches/${batch.id}`);
    const cap = after.steps.find((s) => s.name === 'Dust cap (UV)')!;
    expect(cap.run?.uv?.doseMJcm2).toBe(3395);
  });

  it('the batch page (1440×900) shows each step’s cure method and the UV dose reached against the dose needed', async () => {
    await page.setViewportSize({ width: 1440, height: 900 });
    await page.goto(`/batches/${batch.id}`);
    await page.locator('[data-test="traveler-code"]').waitFor();
    expect(await page.locator('[data-test="traveler-revision"]').innerText()).toBe('HB12X rev 1');
    const methods = await page.locator('[data-test="traveler-cure-method"]').allInnerTexts();
    expect(methods.some((m) => m.includes('Oven (heat) cure') && m.includes('15 min at 150 °C'))).toBe(true);
    expect(methods.some((m) => m.includes('UV-light cure (by dose)') && m.includes('needs 3,000 mJ/cm²'))).toBe(true);
    expect(await page.locator('[data-test="traveler-uv-dose"]').innerText()).toContain('UV dose 3,395 of 3,000 mJ/cm²');
    await page.screenshot({ path: '/tmp/uv-batch-1440x900.png', fullPage: true });
  });

  it('the cure board shows the oven cure with the oven’s own temperature and a UV cure with its dose', async () => {
    await page.goto('/cure');
    await page.locator('[data-test="cure-board"]').waitFor();
    await expect.poll(() => page.locator('[data-test="cure-basis-own"]').count(), { timeout: 15_000 }).toBeGreaterThan(0);
    // The oven's latest temperature arrives after the board itself.
    await expect
      .poll(async () => (await page.locator('[data-test="cure-basis-own"]').allInnerTexts()).join(' '), { timeout: 15_000 })
      .toMatch(/Oven ST-OVN-1's own readings.*latest 1\d\d °C/);
    expect((await page.locator('[data-test="cure-basis-uv"]').allInnerTexts()).join(' ')).toMatch(/of 3,000 mJ\/cm² \(97 mW\/cm² ×/);
    await page.screenshot({ path: '/tmp/cure-board-1440x900.png', fullPage: true });
  });
});
