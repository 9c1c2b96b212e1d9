import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { freshPagePerTest, keepScreenshot, signInAs } from '../helpers/browser';

const baseUrl = inject('baseUrl');

let page: Page;
freshPagePerTest(baseUrl, (p) => {
  page = p;
});

describe('station code label', () => {
  it('an administrator prints a station code label from the stations page: QR, code and name in the preview', async () => {
    await signInAs(page, 'admin@tacklog.test');
    await page.locator('[data-test="nav-catalogue.stations"]').click();
    await page.locator('[data-test="stations-table"] tbody tr').first().waitFor();
    const button = page.locator('[data-test^="label-"]').first();
    const code = (await button.getAttribute('data-test'))!.replace(/^label-/, '');
    await button.click();
    await page.locator('[data-test="station-label-dialog"]').waitFor();
    const frame = page.frameLocator('[data-test="label-frame"]');
    await frame.locator('.label .qr svg').first().waitFor();
    expect(await frame.locator('.label .code').first().innerText()).toBe(code);
    expect(await frame.locator('.label .title').first().innerText()).not.toBe('');
    await page.locator('[data-test="station-label-print"]:not([disabled])').waitFor();
    await keepScreenshot(page, 'station-label');
  });
});
