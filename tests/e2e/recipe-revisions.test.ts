import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import type { APIRequestContext, Page } from 'playwright-core';
import { blockExternalRequests, closeBrowser, newPage, signInAs } from '../helpers/browser';
import { json, signedIn } from '../helpers/demo-stock';

/**
 * Recipe revisions as the administrator uses them (office screen, 1440×900): a model of this
 * test's own (so the demo's models stay as other tests expect them) with a batch built on rev 1;
 * the model page copies it as rev 2, a step is edited and saved, rev 2 is made current after a
 * confirmation; a new batch is built with rev 2 and its batch page and driver trace say so, while
 * the rev 1 batch keeps rev 1.
 */
const baseUrl = inject('baseUrl');
let page: Page;
let external: string[];
let assembler: APIRequestContext;

beforeAll(async () => {
  page = await newPage(baseUrl, undefined, { viewport: { width: 1440, height: 900 } });
  external = await blockExternalRequests(page);
  await signInAs(page, 'admin@tacklog.test');
  assembler = await signedIn(baseUrl, 'assembler@tacklog.test');
});
afterEach(() => expect(external).toEqual([]));
afterAll(async () => {
  await assembler.dispose();
  await page.context().close();
  await closeBrowser();
});

interface Model {
  id: string;
  code: string;
  revision: number;
  steps: { name: string }[];
}

describe('recipe revisions', () => {
  it('copies a frozen revision, edits a step, makes it current; new batches and their traces name rev 2, old ones keep rev 1', async () => {
    const request = page.request;
    const materials = await json<{ items: { id: string; code: string }[] }>(request, '/api/materials');
    const glue = materials.items.find((m) => m.code === 'ADH-DC-12')!;
    const code = `RV${Date.now().toString(36).slice(-6).toUpperCase()}`;
    const rev1 = await json<Model>(request, '/api/models', {
      data: {
        code,
        name: 'Revision test woofer',
        steps: [
          { name: 'Dust cap', stationKind: 'dust_cap', materials: [{ materialId: glue.id, amountPerUnit: 1.5 }], waitForCure: false },
          { name: 'Magnetize and test', stationKind: 'magnetize_test' },
        ],
      },
    });
    const oldBatch = await json<{ batch: { id: string; code: string } }>(assembler, '/api/batches', {
      data: { modelId: rev1.id, quantity: 2 },
    });

    // The models page lists the code with its revision, frozen by the batch.
    await page.goto('/admin/models');
    const card = page.locator(`[data-test="model-card"][data-code="${code}"]`);
    await card.waitFor();
    await page.screenshot({ path: '/tmp/models-1440x900.png', fullPage: true });
    expect(await card.locator('[data-test="model-revisions"]').innerText()).toContain('rev 1 · Current · used by 1 batch');

    // The model page: rev 1 is current and frozen (read-only steps).
    await card.locator('.tl-model-link').click();
    await page.locator('[data-test="revisions"]').waitFor();
    expect(await page.locator('[data-test="model-title"]').innerText()).toBe(`Driver model ${code} rev 1`);
    await page.locator('[data-test="recipe-locked"]').waitFor();
    expect(await page.locator('[data-test="recipe-locked"]').innerText()).toContain('used by 1 batch');
    expect(await page.locator('input[data-test="step-name"]').first().isDisabled()).toBe(true);

    // Copy as a new revision: the draft opens, editable.
    await page.locator('[data-test="copy-revision"]').click();
    await expect.poll(() => page.locator('[data-test="model-title"]').innerText()).toBe(`Driver model ${code} rev 2`);
    expect(await page.locator('[data-test="recipe-locked"]').count()).toBe(0);
    expect(await page.locator('[data-test="revision-row"][data-revision="2"]').getAttribute('data-standing')).toBe('draft');
    expect(await page.locator('[data-test="revision-row"][data-revision="1"] [data-test="revision-use"]').innerText()).toContain(
      'used by 1 batch',
    );
    const stepName = page.locator('input[data-test="step-name"]').first();
    await stepName.fill('Dust cap, centred with jig');
    await page.locator('[data-test="model-save"]').click();
    await expect
      .poll(async () => {
        const all = await json<{ items: Model[] }>(request, `/api/models?includeRevisions=true&code=${code}`);
        return all.items.find((m) => m.revision === 2)?.steps[0]?.name;
      })
      .toBe('Dust cap, centred with jig');

    // Make current, with a confirmation that says old batches keep rev 1.
    await page.locator('[data-test="revision-row"][data-revision="2"] [data-test="make-current"]').click();
    const dialog = page.locator('.q-dialog');
    await dialog.waitFor();
    expect(await dialog.innerText()).toContain(`Batches already built with ${code} rev 1 keep it.`);
    await page.screenshot({ path: '/tmp/revision-confirm-1440x900.png' });
    await dialog.getByRole('button', { name: `Make ${code} rev 2 current` }).click();
    await expect
      .poll(() => page.locator('[data-test="revision-row"][data-revision="2"]').getAttribute('data-standing'), { timeout: 10_000 })
      .toBe('current');
    expect(await page.locator('[data-test="revision-row"][data-revision="1"]').getAttribute('data-standing')).toBe('frozen');
    await page.screenshot({ path: '/tmp/revisions-1440x900.png', fullPage: true });

    // A new batch is built with rev 2; the old one keeps rev 1.
    const current = await json<{ items: Model[] }>(request, `/api/models?code=${code}`);
    expect(current.items.map((m) => m.revision)).toEqual([2]);
    const newBatch = await json<{ batch: { id: string; code: string }; drivers: { serial: string }[] }>(assembler, '/api/batches', {
      data: { modelId: current.items[0].id, quantity: 1 },
    });
    await page.goto(`/batches/${newBatch.batch.id}`);
    await expect.poll(() => page.locator('[data-test="traveler-revision"]').innerText()).toBe(`${code} rev 2`);
    expect(await page.locator('[data-test="traveler-step"]').first().innerText()).toContain('Dust cap, centred with jig');
    await page.goto(`/batches/${oldBatch.batch.id}`);
    await expect.poll(() => page.locator('[data-test="traveler-revision"]').innerText()).toBe(`${code} rev 1`);
    expect(await page.locator('[data-test="traveler-step"]').first().innerText()).toContain('Dust cap');
    expect(await page.locator('[data-test="traveler-step"]').first().innerText()).not.toContain('centred');

    // The driver's trace names the revision its batch was built with.
    await page.goto(`/trace/drivers/${encodeURIComponent(newBatch.drivers[0].serial)}`);
    await expect.poll(() => page.locator('[data-test="trace-revision"]').first().innerText()).toBe(`${code} rev 2`);
  });
});
