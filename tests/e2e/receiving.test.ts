import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { isValidContainerCode } from '../../shared/schemas/containers';
import { freshPagePerTest, keepScreenshot, signInAs } from '../helpers/browser';

const baseUrl = inject('baseUrl');

let page: Page;
freshPagePerTest(baseUrl, (p) => {
  page = p;
});

const shot = (name: string) => keepScreenshot(page, name);

const signIn = (email: string) => signInAs(page, email);

/** Opens a Quasar select and clicks the option with this text. */
async function choose(selectTestId: string, optionText: string) {
  await page.locator(`[data-test="${selectTestId}"]`).click();
  await page.locator('.q-menu .q-item', { hasText: optionText }).first().click();
}

describe('receiving a lot', () => {
  it('scans a GS1 barcode, receives 3 containers, previews their labels and finds one by scanning its code', async () => {
    const supplierLot = `E2E-${Math.random().toString(36).slice(2, 8).toUpperCase()}`;
    await signIn('receiving@tacklog.test');

    // The receiving form, reached through the menu.
    await page.locator('[data-test="nav-receiving.new"]').click();
    await page.locator('[data-test="receive-page"]').waitFor();

    // A supplier's GS1 element string in the human-readable form: (01) GTIN of the demo's
    // ADH-AN-220, (17) expiry 27-12-31, (10) lot. GS1 General Specifications: AI 17 is YYMMDD,
    // and by the §7.12 century rule 27 is 2027.
    const scan = page.locator('[data-test="scan-input"]');
    await scan.click();
    await page.keyboard.type(`(01)09501101530003(17)271231(10)${supplierLot}`);
    await page.keyboard.press('Enter');
    await page.locator('[data-test="gs1-read"]').waitFor();
    await expect.poll(() => page.locator('[data-test="receive-supplier-lot"]').inputValue()).toBe(supplierLot);
    expect(await page.locator('[data-test="receive-expires"]').inputValue()).toBe('2027-12-31');
    expect(await page.locator('[data-test="receive-gtin"]').inputValue()).toBe('09501101530003');
    // The GTIN chose the material, whose hazards and the safety note are shown.
    expect(await page.locator('[data-test="receive-form"]').innerText()).toContain('ADH-AN-220 — Anaerobic structural acrylic');
    await page.locator('[data-test="receive-material-facts"] [data-test="hazards"]').waitFor();
    expect(await page.locator('[data-test="receive-material-facts"] [data-test="ghs-GHS07"]').count()).toBe(1);
    expect(await page.locator('[data-test="receive-material-facts"] [data-test="hazard-statements"]').innerText()).toContain(
      'May cause an allergic skin reaction.', // H317, UN GHS Annex 3
    );
    expect(await page.locator('[data-test="safety-note"]').count()).toBeGreaterThan(0);

    // A wrong check digit is refused with the server's message at the scan field
    // (09501101530004: the GS1 mod-10 check digit of 0950110153000 is 3).
    await scan.click();
    await page.keyboard.type('(01)09501101530004(10)X');
    await page.keyboard.press('Enter');
    await expect.poll(() => page.locator('[data-test="scan-field"]').innerText()).toMatch(/check digit/i);

    await choose('receive-supplier', 'Corvane Bonding Supplies');
    await page.locator('[data-test="receive-containers"]').fill('3');
    await page.locator('[data-test="receive-quantity"]').fill('250');
    await page.locator('[data-test="receive-location"]').fill('Adhesive cabinet A2');
    await shot('e-receive-form');
    await page.locator('[data-test="receive-submit"]').click();

    // The new lot with its three containers.
    const result = page.locator('[data-test="receipt-result"]');
    await result.waitFor();
    expect(await result.innerText()).toContain(supplierLot);
    const codes = await page.locator('[data-test="receipt-container"] [data-test="container-code"]').allInnerTexts();
    expect(codes).toHaveLength(3);
    for (const code of codes) expect(isValidContainerCode(code)).toBe(true);
    // ADH-AN-220 needs incoming inspection: the lot waits on hold (text, not colour alone).
    expect(await result.locator('[data-test="status-lot"]').innerText()).toContain('On hold');
    await shot('e-receipt');

    // Labels: the server-rendered sheet in the preview frame, one label with a QR code per container.
    await page.locator('[data-test="receipt-print"]').click();
    await page.locator('[data-test="labels-page"]').waitFor();
    await expect.poll(() => page.locator('[data-test="labels-count"]').innerText(), { timeout: 20_000 }).toContain('3 labels');
    const frame = page.frameLocator('[data-test="label-frame"]');
    expect(await frame.locator('.label:not(.empty)').count()).toBe(3);
    expect(await frame.locator('.label:not(.empty) .qr svg').count()).toBe(3);
    const printed = await frame.locator('.label .code').allInnerTexts();
    expect([...printed].sort()).toEqual([...codes].sort());
    await shot('e-labels');

    // Scan page: type the first container's code like a keyboard wedge, then Enter.
    await page.locator('[data-test="nav-scan.lookup"]').click();
    await page.locator('[data-test="scan-page"]').waitFor();
    await page.locator('[data-test="scan-input"]').click();
    await page.keyboard.type(codes[0]);
    await page.keyboard.press('Enter');
    const card = page.locator('[data-test="scan-container"]');
    await card.waitFor();
    expect(await card.locator('[data-test="scan-container-code"]').innerText()).toBe(codes[0]);
    expect(await card.innerText()).toContain(supplierLot);
    expect(await card.innerText()).toContain('ADH-AN-220');
    expect(await card.locator('[data-test="scan-blocked"]').innerText()).toContain('on hold');
    await shot('e-scan');

    // An unknown but well-formed code says "not found".
    await page.locator('[data-test="scan-input"]').click();
    await page.keyboard.type('UNKNOWN-CODE-0000');
    await page.keyboard.press('Enter');
    await page.locator('[data-test="scan-not-found"]').waitFor();

    // The link from the scan result leads to the lot page with its containers and its status
    // changes (the full history with names is for quality and administrators).
    await page.locator('[data-test="scan-input"]').click();
    await page.keyboard.type(codes[0]);
    await page.keyboard.press('Enter');
    await page.locator('[data-test="scan-open-lot"]').click();
    await page.locator('[data-test="lot-detail-page"] [data-test="lot-containers"]').waitFor();
    expect(await page.locator('[data-test="lot-title"]').innerText()).toContain(supplierLot);
    await expect.poll(() => page.locator('[data-test="status-change"]').count()).toBeGreaterThan(0);
    expect(await page.locator('[data-test="status-change"]').first().innerText()).toMatch(/Received as[\s\S]*(On hold|Released)/);
    expect(await page.locator('[data-test="lot-history"]').count()).toBe(0);
    await shot('e-lot');

    // The same supplier lot again is a possible mistake: the server refuses it (409 DUPLICATE_LOT)
    // and the page asks before receiving it a second time.
    await page.locator('[data-test="nav-receiving.new"]').click();
    await page.locator('[data-test="receipt-again"]').click(); // the page still shows the last receipt
    await page.locator('[data-test="scan-input"]').click();
    await page.keyboard.type(`(01)09501101530003(17)271231(10)${supplierLot}`);
    await page.keyboard.press('Enter');
    await expect.poll(() => page.locator('[data-test="receive-supplier-lot"]').inputValue()).toBe(supplierLot);
    await choose('receive-supplier', 'Corvane Bonding Supplies');
    await page.locator('[data-test="receive-quantity"]').fill('250');
    await page.locator('[data-test="receive-submit"]').click();
    const dialog = page.locator('.q-dialog', { hasText: 'received before' });
    await dialog.waitFor();
    expect(await dialog.innerText()).toContain(supplierLot);
    await shot('e-duplicate');
    await dialog.locator('button', { hasText: 'Receive it again' }).click();
    await page.locator('[data-test="receipt-result"]').waitFor();
    expect(await page.locator('[data-test="receipt-container"]').count()).toBe(1);
  });
});
