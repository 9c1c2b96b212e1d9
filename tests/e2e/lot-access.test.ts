/**
 * Who reads what on a lot page (issue 8, item 16): quality and administrators read the full
 * history with names and old and new values; receiving, assemblers and purchasing see the lot's
 * status changes only (status, when, reason). Controls follow the user's permissions: only
 * quality is offered the status decisions, and receiving is not offered "Mark empty".
 */
import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { freshPagePerTest, keepScreenshot, signInAs } from '../helpers/browser';

const baseUrl = inject('baseUrl');

let page: Page;
freshPagePerTest(baseUrl, (p) => {
  page = p;
});

/** The id of a demo lot with this status, asked of the API with the page's own session. */
async function lotWithStatus(status: string): Promise<string> {
  const id = await page.evaluate(async (s) => {
    const res = await fetch(`/api/lots?status=${s}&limit=1`, { credentials: 'same-origin' });
    const body = (await res.json()) as { items: { id: string }[] };
    return body.items[0]?.id ?? null;
  }, status);
  if (!id) throw new Error(`the demo plant has no ${status} lot`);
  return id;
}

async function openLot(id: string) {
  await page.goto(`/lots/${id}`);
  await page.locator('[data-test="lot-detail-page"] [data-test="lot-containers"]').waitFor();
}

describe('lot page by role', () => {
  it('quality reads the full history with names and is offered the status decisions', async () => {
    await page.setViewportSize({ width: 1440, height: 900 });
    await signInAs(page, 'quality@tacklog.test');
    await openLot(await lotWithStatus('quarantined'));
    await expect.poll(() => page.locator('[data-test="history-entry"]').count()).toBeGreaterThan(0);
    expect(await page.locator('[data-test="lot-status-changes"]').count()).toBe(0);
    expect(await page.locator('[data-test="lot-action-released"]').count()).toBe(1);
    await keepScreenshot(page, 'lot-access-quality-office');
  });

  it('purchasing sees the status changes with their reason, no names, and no decisions or container actions', async () => {
    await page.setViewportSize({ width: 1440, height: 900 });
    await signInAs(page, 'purchasing@tacklog.test');
    await openLot(await lotWithStatus('quarantined'));
    await expect.poll(() => page.locator('[data-test="status-change"]').count()).toBeGreaterThan(1);
    const text = await page.locator('[data-test="lot-status-changes"]').innerText();
    expect(text).toContain('Quarantined');
    expect(text).toContain('Reason:');
    expect(text).not.toMatch(/on_hold|quarantined\b/); // words, not internal values
    expect(await page.locator('[data-test="lot-history"]').count()).toBe(0);
    expect(await page.locator('[data-test^="lot-action-"]').count()).toBe(0);
    await keepScreenshot(page, 'lot-access-purchasing-office');
  });

  it('receiving on a phone: status changes, and a released lot\'s containers offer no "Mark empty"', async () => {
    await page.setViewportSize({ width: 390, height: 844 });
    await signInAs(page, 'receiving@tacklog.test');
    await openLot(await lotWithStatus('released'));
    await expect.poll(() => page.locator('[data-test="status-change"]').count()).toBeGreaterThan(0);
    expect(await page.locator('[data-test="lot-history"]').count()).toBe(0);
    // A sealed container of the lot: receiving may move it, but never marks it empty.
    const sealedRow = page.locator('[data-test="lot-containers"] tr[data-test^="container-row-"]', { hasText: 'Sealed' }).first();
    await sealedRow.locator('[data-test^="container-actions-"]').click();
    await page.locator('.q-menu [data-test="container-action-location"]').waitFor();
    expect(await page.locator('.q-menu [data-test="container-action-empty"]').count()).toBe(0);
    await keepScreenshot(page, 'lot-access-receiving-phone');
  });
});
