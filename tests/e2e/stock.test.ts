import { readFile } from 'node:fs/promises';
import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { freshPagePerTest, keepScreenshot, signInAs } from '../helpers/browser';

const baseUrl = inject('baseUrl');

let page: Page;
freshPagePerTest(baseUrl, (p) => {
  page = p;
});

describe('stock page', () => {
  it('purchasing finds a material whose cover is cut short by expiry, opens the outlook chart and downloads the CSV', async () => {
    await signInAs(page, 'purchasing@tacklog.test');
    // The purchasing home page: today's three things, with links.
    const today = page.locator('[data-test="purchasing-today"]');
    await today.locator('[data-test="today-runouts"] .q-item').first().waitFor();
    expect(await today.locator('[data-test="today-runouts"]').innerText()).toMatch(/runs? out inside the lead time/);
    expect(await today.locator('[data-test="today-waste"] .q-item').count()).toBeGreaterThan(0);
    expect(await today.locator('[data-test="today-expiring"]').innerText()).toMatch(/expire within 14 days/);
    await keepScreenshot(page, 'stock-purchasing-home');

    await page.locator('[data-test="nav-stock.overview"]').click();
    await page.locator('[data-test="stock-page"]').waitFor();
    await page.locator('[data-test="stock-table"] tbody tr[data-cover]').first().waitFor();

    // A demo material whose days of cover (from the FEFO simulation) are shorter than on hand ÷ daily use.
    const rows = page.locator('[data-test="stock-table"] tbody tr[data-cover]');
    const count = await rows.count();
    let shortened: string | null = null;
    for (let i = 0; i < count; i++) {
      const row = rows.nth(i);
      const cover = Number(await row.getAttribute('data-cover'));
      const naive = Number(await row.getAttribute('data-cover-ignoring-expiry'));
      const waste = Number(await row.getAttribute('data-waste'));
      if ((await row.getAttribute('data-cover')) !== '' && cover > 0 && naive - cover > 0.5 && waste > 0) {
        shortened = (await row.getAttribute('data-test'))!.replace('stock-row-', '');
        break;
      }
    }
    expect(shortened).not.toBeNull();
    const row = page.locator(`[data-test="stock-row-${shortened}"]`);
    // The page says why: the cover without expiry beside it, and where daily use comes from.
    expect(await row.locator('[data-test="cover-note"]').innerText()).toMatch(/if nothing expired/);
    expect(await row.locator('[data-test="use-source"]').innerText()).toMatch(/from (use|the plan)/);
    // Advice is a word with its colour and icon, and a sentence.
    expect(await page.locator(`[data-test="stock-advice-${shortened}"]`).innerText()).toMatch(/(Order now|Order soon|Enough stock)/);
    await keepScreenshot(page, 'stock-table');

    // The CSV download: the same rows, units in the header.
    const [download] = await Promise.all([page.waitForEvent('download'), page.locator('[data-test="stock-csv"]').click()]);
    expect(download.suggestedFilename()).toMatch(/^stock-\d{4}-\d{2}-\d{2}\.csv$/);
    const csv = await readFile((await download.path())!, 'utf8');
    const lines = csv.split('\r\n');
    expect(lines[0]).toContain('Days of cover (days)');
    expect(lines[0]).toContain('Daily use (unit/day)');
    expect(lines.filter((l) => l.startsWith(`${shortened},`))).toHaveLength(1);
    expect(lines.length - 2).toBe(count); // header + rows + the empty string after the last CRLF

    // A row opens the material's containers in the order they will be used.
    await row.click();
    await page.locator('[data-test="stock-material-page"] [data-test="stock-containers"]').waitFor();
    expect(await page.locator('[data-test="fact-waste"]').innerText()).not.toMatch(/^0 /);
    const firstOrder = page.locator('[data-test^="use-order-"]').first();
    expect(await firstOrder.innerText()).toBe('1');
    await keepScreenshot(page, 'stock-material');

    // The outlook chart: the material with waste is shown, split into used and waste.
    await page.goBack();
    await page.locator('[data-test="open-outlook"]').click();
    // The chart, or whatever the page says instead (named in the failure).
    await page.locator('[data-test="outlook-chart"] canvas, [data-test="outlook-empty"], [role="alert"]').first().waitFor();
    const instead = page.locator('[data-test="outlook-empty"], [role="alert"]');
    expect(await instead.count(), await instead.allInnerTexts().then((t) => t.join(' | '))).toBe(0);
    await page.locator('[data-test="outlook-chart"] canvas').waitFor();
    const label = await page.locator('[data-test="outlook-chart"]').getAttribute('aria-label');
    expect(label).toMatch(/used before expiry, [\d.]+ \w+ predicted waste over 12 weeks/);
    expect(await page.locator('[data-test="outlook-totals"]').innerText()).toMatch(/predicted waste/);
    expect(await page.locator('[data-test="outlook-lots"] tbody tr').count()).toBeGreaterThan(0);
    await keepScreenshot(page, 'stock-outlook');
    const [outlookCsv] = await Promise.all([page.waitForEvent('download'), page.locator('[data-test="outlook-csv"]').click()]);
    expect(outlookCsv.suggestedFilename()).toMatch(/^expiry-outlook-\d{4}-\d{2}-\d{2}\.csv$/);
    expect((await readFile((await outlookCsv.path())!, 'utf8')).split('\r\n')[0]).toMatch(/^Week of \(date\),Expires/);
  });

  it('an assembler has no stock page: the menu hides it and the address says so, with a way back', async () => {
    await signInAs(page, 'assembler@tacklog.test');
    expect(await page.locator('[data-test="nav-stock.overview"]').count()).toBe(0);
    await page.goto('/stock');
    await page.locator('[data-test="not-allowed-page"]').waitFor();
    expect(await page.locator('[data-test="not-allowed-path"]').innerText()).toBe('/stock');
  });
});
