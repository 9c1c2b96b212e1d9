import { readFile } from 'node:fs/promises';
import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { parse } from 'csv-parse/sync';
import { freshPagePerTest, keepScreenshot, signInAs } from '../helpers/browser';

/**
 * Shop conditions: a temperature / humidity chart per place above the readings table, at the
 * plant's three screen sizes; and Export CSV on the list pages downloading what is filtered on
 * screen (the demo plant, TACKLOG_PLANT_ZONE Europe/Berlin).
 */
const baseUrl = inject('baseUrl');

let page: Page;
freshPagePerTest(baseUrl, (p) => {
  page = p;
});

async function downloadCsv(trigger: () => Promise<void>): Promise<{ name: string; header: string[]; rows: string[][]; raw: string }> {
  const [download] = await Promise.all([page.waitForEvent('download'), trigger()]);
  const raw = await readFile((await download.path())!, 'utf8');
  const [header, ...rows] = parse(raw, { record_delimiter: '\r\n' }) as string[][];
  return { name: download.suggestedFilename(), header, rows, raw };
}

/** No sideways scrolling: the page is no wider than the window. */
async function fitsWidth(): Promise<boolean> {
  return page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth + 1);
}

describe('shop conditions', () => {
  it('draws a temperature and humidity chart per area (and for the oven) above the table, at each plant screen size', async () => {
    await signInAs(page, 'quality@tacklog.test');
    await page.goto('/readings');
    await page.locator('[data-test="readings-page"]').waitFor();
    const cards = page.locator('[data-test="place-conditions"]');
    await cards.first().locator('[data-test="conditions-chart"] canvas').waitFor();
    const places = await cards.evaluateAll((els) => els.map((e) => e.getAttribute('data-place')));
    // The demo's shop areas each have a chart, and so does the oven with its own readings.
    for (const area of ['Line A', 'Test bay', 'Rework']) expect(places).toContain(area);
    expect(places.some((p) => /own readings/.test(p ?? ''))).toBe(true);
    for (const area of ['Line A', 'Test bay', 'Rework']) {
      const chart = page.locator(`[data-test="place-conditions"][data-place="${area}"] [data-test="conditions-chart"]`);
      await chart.locator('canvas').waitFor();
      // A reading every 30 minutes (every 2 hours in Rework) over the 7 days shown.
      expect(Number(await chart.getAttribute('data-points'))).toBeGreaterThan(area === 'Rework' ? 70 : 300);
      expect(await chart.getAttribute('aria-label')).toMatch(/temperature readings, [\d.]+ to [\d.]+ °C; \d+ humidity readings/);
    }
    // The charts come before the readings table.
    const chartsBox = await page.locator('[data-test="conditions-charts"]').boundingBox();
    const tableBox = await page.locator('[data-test="readings-table"]').boundingBox();
    expect(chartsBox!.y).toBeLessThan(tableBox!.y);
    expect(await page.locator('[data-test="readings-table"] tbody tr').count()).toBeGreaterThan(10);

    for (const [name, size] of [
      ['office', { width: 1440, height: 900 }],
      ['tablet', { width: 1024, height: 768 }],
      ['phone', { width: 390, height: 844 }],
    ] as const) {
      await page.setViewportSize(size);
      await page.waitForTimeout(300); // the charts follow their box (autoresize)
      const box = await page.locator('[data-test="place-conditions"][data-place="Line A"] canvas').boundingBox();
      expect(box!.width, name).toBeGreaterThan(250);
      expect(box!.height, name).toBeGreaterThan(150);
      expect(await fitsWidth(), `${name}: no sideways scrolling`).toBe(true);
      await keepScreenshot(page, `readings-${name}`);
    }
  });

  it('one place and a shorter period: the chart and the table follow, and Export CSV downloads that period of that place', async () => {
    await signInAs(page, 'quality@tacklog.test');
    await page.goto('/readings');
    await page.locator('[data-test="conditions-chart"] canvas').first().waitFor();
    await page.locator('[data-test="period-24"]').click();
    await page.locator('[data-test="readings-place"]').click();
    await page.locator('.q-menu .q-item', { hasText: /^Line A$/ }).click();
    const card = page.locator('[data-test="place-conditions"]');
    await expect.poll(() => card.count()).toBe(1);
    await expect.poll(() => card.getAttribute('data-place')).toBe('Line A');
    const tableRows = page.locator('[data-test="readings-table"] tbody tr');
    await expect.poll(async () => (await tableRows.allInnerTexts()).every((t) => t.includes('Line A'))).toBe(true);
    const shown = await tableRows.count();

    const csv = await downloadCsv(() => page.locator('[data-test="export-csv"]').click());
    expect(csv.name).toMatch(/^tacklog-readings-\d{4}-\d{2}-\d{2}\.csv$/);
    expect(csv.header[0]).toBe('Taken (plant time, Europe/Berlin)');
    expect(csv.raw.endsWith('\r\n')).toBe(true);
    expect(new Set(csv.rows.map((r) => r[1]))).toEqual(new Set(['Line A']));
    // Every reading of the last 24 hours of Line A (a reading each 30 minutes), as the table shows them.
    expect(csv.rows.length).toBe(shown);
    const firstTaken = (await tableRows.first().locator('td').first().innerText()).trim();
    expect(csv.rows[0][0]).toBe(firstTaken);
  });
});

describe('Export CSV on the list pages', () => {
  it('lots: downloads every lot the filters select, not only the page on screen, statuses in words', async () => {
    await signInAs(page, 'quality@tacklog.test');
    await page.goto('/lots?status=released&rows=10');
    await page.locator('[data-test="lots-table"] tbody tr').first().waitFor();
    const total = await page.evaluate(async () => {
      const res = await fetch('/api/lots?status=released&limit=1', { credentials: 'same-origin' });
      return ((await res.json()) as { total: number }).total;
    });
    expect(total).toBeGreaterThan(0);
    const csv = await downloadCsv(() => page.locator('[data-test="export-csv"]').click());
    expect(csv.name).toMatch(/^tacklog-lots-\d{4}-\d{2}-\d{2}\.csv$/);
    expect(csv.header).toContain('Received (plant time, Europe/Berlin)');
    expect(csv.rows).toHaveLength(total);
    const status = csv.header.indexOf('Status');
    expect(new Set(csv.rows.map((r) => r[status]))).toEqual(new Set(['Released']));
    // The button sits in the page's title row at the phone's width too.
    await page.setViewportSize({ width: 390, height: 844 });
    await page.locator('[data-test="export-csv"]').waitFor();
    expect(await fitsWidth()).toBe(true);
    await keepScreenshot(page, 'lots-export-phone');
  });

  it('alerts, batches and the audit trail each download their list', async () => {
    await signInAs(page, 'quality@tacklog.test');
    // The watch raises the demo's alerts (expiring lots, the lamp's radiometer check…).
    await page.evaluate(() =>
      fetch('/api/compliance/run', {
        method: 'POST',
        credentials: 'same-origin',
        headers: { 'Content-Type': 'application/json' },
        body: '{}',
      }),
    );
    for (const [path, api, list, column] of [
      ['/alerts?state=all', '/api/alerts', 'alerts', 'Kind'],
      ['/batches', '/api/batches', 'batches', 'Batch'],
      ['/audit', null, 'audit', 'Action'],
    ] as const) {
      await page.goto(path);
      const button = page.locator('[data-test="export-csv"]');
      await button.waitFor({ timeout: 15_000 }).catch((err: Error) => {
        throw new Error(`${path}: no Export CSV button (${err.message})`);
      });
      await keepScreenshot(page, `export-${list}`);
      const csv = await downloadCsv(() => button.click());
      expect(csv.name, path).toMatch(new RegExp(`^tacklog-${list}-\\d{4}-\\d{2}-\\d{2}\\.csv$`));
      expect(csv.header, path).toContain(column);
      expect(csv.rows.length, path).toBeGreaterThan(0);
      if (api) {
        const total = await page.evaluate(async (url) => ((await (await fetch(`${url}?limit=1`)).json()) as { total: number }).total, api);
        expect(csv.rows.length, path).toBe(total);
      }
    }
  });
});
