import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { freshPagePerTest, keepScreenshot, signInAs } from '../helpers/browser';

const baseUrl = inject('baseUrl');

let page: Page;
// freshPagePerTest blocks and records every request that would leave 127.0.0.1 and fails the test if there was one.
freshPagePerTest(baseUrl, (p) => {
  page = p;
});

describe('quality overview page', () => {
  it('quality sees the p-chart, the Pareto chart and the lots table on the demo, all drawn locally', async () => {
    await signInAs(page, 'quality@tacklog.test');
    await page.locator('[data-test="nav-quality.overview"]').click();
    await page.locator('[data-test="quality-overview-page"]').waitFor();

    // Both charts are ECharts canvases inside their containers.
    await page.locator('[data-test="p-chart"] canvas').waitFor();
    await page.locator('[data-test="pareto-chart"] canvas').waitFor();
    expect(await page.locator('[data-test="p-chart"]').getAttribute('aria-label')).toMatch(
      /failure fraction of \d+ lots against the baseline; \d+ flagged/,
    );
    expect(await page.locator('[data-test="pareto-chart"]').getAttribute('aria-label')).toMatch(
      /^Failures by defect: \d+ failures in \d+ defects/,
    );

    // The lots table beside the p-chart has rows with rates, p-values and a judgement in words.
    const rows = page.locator('[data-test="pchart-lots"] tbody tr[data-test^="pchart-lot-"]');
    await rows.first().waitFor();
    expect(await rows.count()).toBeGreaterThan(0);
    const firstRow = await rows.first().innerText();
    expect(firstRow).toMatch(/\d+(\.\d+)? %/);
    expect(firstRow).toMatch(/Quarantine advised|As expected/);

    // The baseline in words, with where it comes from.
    expect(await page.locator('[data-test="baseline-rate-shown"]').innerText()).toMatch(/^\d+(\.\d+)? %$/);
    expect(await page.locator('[data-test="baseline-source"]').innerText()).toMatch(
      /(set by hand|computed from recent final tests|plant default)/,
    );
    await keepScreenshot(page, 'quality-overview');

    // A flagged lot ("quarantine advised") links to its forward trace: the drivers built with it.
    const flagged = page.locator('[data-test="pchart-lots"] tbody tr[data-flagged="true"]');
    if (await flagged.count()) {
      expect(await flagged.first().innerText()).toContain('Quarantine advised');
      await flagged.first().locator('[data-test^="containment-"]').click();
      await page.locator('[data-test="lot-trace-page"]').waitFor();
      expect(new URL(page.url()).pathname).toMatch(/^\/trace\/lots\/[0-9a-f-]{36}$/);
    }
  });

  it('the baseline override names the field that is wrong and changes nothing until it is right', async () => {
    await signInAs(page, 'quality@tacklog.test');
    await page.goto('/quality');
    await page.locator('[data-test="baseline-override"]').click();
    await page.locator('[data-test="baseline-dialog"]').waitFor();
    await page.locator('[data-test="baseline-rate"]').fill('abc');
    await page.locator('[data-test="baseline-reason"]').fill('short');
    await page.locator('[data-test="baseline-confirm"]').click();
    const dialog = await page.locator('[data-test="baseline-dialog"]').innerText();
    expect(dialog).toMatch(/Rate must be a number of percent/);
    await page.locator('[data-test="baseline-rate"]').fill('2.5');
    await page.locator('[data-test="baseline-confirm"]').click();
    await page.waitForFunction(() =>
      /Reason must say why/.test(document.querySelector('[data-test="baseline-dialog"]')?.textContent ?? ''),
    );
    await page.locator('[data-test="baseline-dialog"]').getByRole('button', { name: 'Cancel' }).click();
  });

  it('a receiving user is not allowed on the quality overview', async () => {
    await signInAs(page, 'receiving@tacklog.test');
    expect(await page.locator('[data-test="nav-quality.overview"]').count()).toBe(0);
    await page.goto('/quality');
    await page.locator('[data-test="not-allowed-page"]').waitFor();
  });
});
