import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { freshPagePerTest, keepScreenshot, signInAs } from '../helpers/browser';

const baseUrl = inject('baseUrl');

let page: Page;
freshPagePerTest(baseUrl, (p) => {
  page = p;
});

describe('audit page', () => {
  it('quality reads the demo audit trail in words, filters it, loads more and verifies the chain as intact', async () => {
    await signInAs(page, 'quality@tacklog.test');
    await page.locator('[data-test="nav-audit.list"]').click();
    await page.locator('[data-test="audit-page"]').waitFor();
    const entries = page.locator('[data-test="audit-entry"]');
    await entries.first().waitFor();
    const first = await entries.count();
    expect(first).toBeGreaterThan(0);

    // Newest first: entry numbers fall down the list.
    const ids = await entries.evaluateAll((els) => els.map((el) => Number(el.getAttribute('data-id'))));
    expect([...ids].sort((a, b) => b - a)).toEqual(ids);
    // Who and when are words and plant time, never raw codes.
    const text = await page.locator('[data-test="audit-list"]').innerText();
    expect(text).toMatch(/\d{4}-\d{2}-\d{2} \d{2}:\d{2}/);
    expect(text).not.toMatch(/[a-z]+\.[a-z_]+ ·/); // no "lot.status ·" action codes
    expect(text).not.toMatch(/\d{4}-\d{2}-\d{2}T\d{2}:/); // no ISO instants
    await keepScreenshot(page, 'audit-list');

    // "Load more" continues after the last entry shown (the demo has more than one page).
    const more = page.locator('[data-test="audit-more"]');
    if (await more.count()) {
      await more.click();
      await page.waitForFunction((n) => document.querySelectorAll('[data-test="audit-entry"]').length > n, first);
      const all = await entries.evaluateAll((els) => els.map((el) => Number(el.getAttribute('data-id'))));
      expect(new Set(all).size).toBe(all.length);
      expect(Math.min(...ids)).toBeGreaterThan(all[ids.length]);
    }

    // Filtering by record type: only lot entries remain.
    await page.locator('[data-test="audit-entity"]').click();
    await page.locator('.q-menu .q-item', { hasText: /^Lot$/ }).click();
    await page.waitForFunction(() => {
      const rows = [...document.querySelectorAll('[data-test="audit-entry"]')];
      return rows.length > 0 && rows.every((r) => r.textContent?.includes('· Lot'));
    });

    // Verify: the demo chain is intact.
    await page.locator('[data-test="audit-verify"]').click();
    const result = page.locator('[data-test="audit-verify-result"]');
    await result.waitFor();
    expect(await result.innerText()).toMatch(/Intact, \d+ entries checked/);
    await keepScreenshot(page, 'audit-verified');
  });

  it('a receiving user is not allowed: no menu item, and the address shows the not-allowed page', async () => {
    await signInAs(page, 'receiving@tacklog.test');
    expect(await page.locator('[data-test="nav-audit.list"]').count()).toBe(0);
    await page.goto('/audit');
    await page.locator('[data-test="not-allowed-page"]').waitFor();
    expect(await page.locator('[data-test="not-allowed-path"]').innerText()).toBe('/audit');
  });
});
