import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { freshPagePerTest, keepScreenshot, signInAs } from '../helpers/browser';

const baseUrl = inject('baseUrl');

let page: Page;
freshPagePerTest(baseUrl, (p) => {
  page = p;
});

const shot = (name: string) => keepScreenshot(page, name);

const signIn = (email: string) => signInAs(page, email);

async function openAlerts() {
  await page.locator('[data-test="nav-alerts.list"]').click();
  await page.locator('[data-test="alerts-page"]').waitFor();
}

/** Lists only alerts of one kind (or every kind with null), and waits for the list to settle. */
async function filterKind(words: string | null) {
  const select = page.locator('[data-test="alert-kind-filter"]');
  if (words === null) {
    await select.locator('.q-field__focusable-action').click();
  } else {
    await select.click();
    await page.locator('.q-menu .q-item', { hasText: words }).first().click();
  }
  await page.waitForLoadState('networkidle');
}

const cards = (kind?: string) => page.locator(kind ? `[data-test="alert-${kind}"]` : '[data-test="alerts-list"] article');

describe('alerts page', () => {
  it('quality runs the watch, acknowledges one alert and resolves another with a reason', async () => {
    await signIn('quality@tacklog.test');
    await openAlerts();

    // The watch is run from the page and says what it did.
    await page.locator('[data-test="run-watch"]').click();
    await page.locator('[data-test="watch-result"]').waitFor();
    expect(await page.locator('[data-test="watch-result"]').innerText()).toMatch(/compliance watch ran: \d+ new alerts? raised/);

    // The demo plant leaves a loaded mix past its pot life: critical, counted in the header.
    await expect
      .poll(async () => Number(await page.locator('[data-test="alerts-critical-count"]').getAttribute('data-count')))
      .toBeGreaterThan(0);
    await filterKind('Pot life passed');
    await cards('pot_life_exceeded').first().waitFor();
    const potLife = cards('pot_life_exceeded').first();
    // Severity as a word beside its colour and icon (never colour alone).
    expect(await potLife.locator('[data-test="alert-severity"]').innerText()).toContain('Critical');
    // Discarding a mix means handling the chemical: the card defers to the SDS and the plant's rules.
    expect(await potLife.locator('[data-test="alert-caution"]').innerText()).toMatch(/safety data sheet.*safety rules/s);
    expect(await potLife.locator('[data-test="alert-raised"]').innerText()).toMatch(/^Raised .+ago|^Raised .*now/i);
    expect(await cards().count()).toBe(await cards('pot_life_exceeded').count());

    await filterKind('Quarantine advised');
    await cards('quarantine_advised').first().waitFor();
    expect(await cards('quarantine_advised').first().locator('[data-test="alert-kind"]').innerText()).toBe('Quarantine advised');
    // The demo's suspect resin lot (EPA2611-7741) reads in one go; its figures are in the detail line.
    const suspect = cards('quarantine_advised').filter({ hasText: 'EPA2611-7741' }).first();
    expect(await suspect.locator('[data-test="alert-message"]').innerText()).toMatch(
      /fails \d+\.\d % of drivers .* against a plant rate of \d+\.\d %; this /,
    );
    expect(await suspect.locator('[data-test="alert-message"]').innerText()).not.toMatch(/q = |p-chart/);
    expect(await suspect.locator('[data-test="alert-detail"]').innerText()).toMatch(/binomial test: p = .*q = .*p-chart upper limit/);
    // A lot's alert links to the lot page.
    await cards('quarantine_advised').first().locator('[data-test="alert-subject-link"]').click();
    await page.waitForURL(/\/lots\/[0-9a-f-]{36}$/);
    await page.goBack();
    await page.locator('[data-test="alerts-page"]').waitFor();
    await filterKind(null);
    // Wait until the unfiltered list is shown (more than the quarantine advice alone).
    await expect.poll(async () => (await cards().count()) > (await cards('quarantine_advised').count())).toBe(true);
    await shot('alerts-quality');

    // Acknowledge an open alert: it stays live, now acknowledged.
    const ackId = await cards()
      .filter({ has: page.locator('[data-test="alert-acknowledge"]') })
      .first()
      .getAttribute('data-alert-id');
    const acknowledged = page.locator(`[data-alert-id="${ackId}"]`);
    await acknowledged.locator('[data-test="alert-acknowledge"]').click();
    await expect.poll(() => acknowledged.getAttribute('data-state')).toBe('acknowledged');
    expect(await acknowledged.locator('[data-test="alert-state"]').innerText()).toContain('Acknowledged');
    // Who did it and when, in plant time.
    const name = ((await (await page.request.get('/api/auth/me')).json()) as { user: { name: string } }).user.name;
    const me = name.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
    expect(await acknowledged.locator('[data-test="alert-acknowledged"]').innerText()).toMatch(
      new RegExp(`^Acknowledged by ${me}, \\d{4}-\\d{2}-\\d{2} \\d{2}:\\d{2}$`),
    );

    // Resolve another: a too-short reason is refused at the field, a real one is recorded.
    const toResolve = page
      .locator(`[data-test="alerts-list"] article:not([data-alert-id="${ackId}"])`)
      .filter({ has: page.locator('[data-test="alert-resolve"]') });
    const resolvedId = await toResolve.first().getAttribute('data-alert-id');
    expect(resolvedId).not.toBe(ackId);
    const target = page.locator(`[data-alert-id="${resolvedId}"]`);
    await target.locator('[data-test="alert-resolve"]').click();
    const dialog = page.locator('[data-test="resolve-dialog"]');
    await dialog.waitFor();
    await dialog.locator('[data-test="resolve-text"]').fill('ok');
    await dialog.locator('[data-test="resolve-submit"]').click();
    await expect.poll(() => dialog.locator('.q-field__messages').innerText()).toContain('at least 5 characters');
    await shot('alerts-resolve-refused');
    const reason = `Checked on the line and cleared (browser test ${Date.now()}).`;
    await dialog.locator('[data-test="resolve-text"]').fill(reason);
    await dialog.locator('[data-test="resolve-submit"]').click();
    await dialog.waitFor({ state: 'detached' });
    // A resolved alert leaves the live list and shows under Resolved with what was done.
    await page.locator(`[data-alert-id="${resolvedId}"]`).waitFor({ state: 'detached' });
    await page.locator('[data-test="alert-state-resolved"]').click();
    const resolved = page.locator(`[data-alert-id="${resolvedId}"]`);
    await resolved.waitFor();
    expect(await resolved.getAttribute('data-state')).toBe('resolved');
    expect(await resolved.locator('[data-test="alert-resolution"]').innerText()).toContain(reason);
    expect(await resolved.locator('[data-test="alert-resolved-by"]').innerText()).toMatch(
      new RegExp(`^Resolved by ${me}, \\d{4}-\\d{2}-\\d{2} \\d{2}:\\d{2}:`),
    );
    await shot('alerts-resolved');
  });

  it('purchasing sees the reorder alert but no pot-life alert, and cannot run the watch', async () => {
    await signIn('purchasing@tacklog.test');
    await openAlerts();
    await page.waitForLoadState('networkidle');
    expect(await page.locator('[data-test="run-watch"]').count()).toBe(0);
    await filterKind('Below reorder point');
    await cards('below_reorder_point').first().waitFor();
    expect(await cards('below_reorder_point').first().locator('[data-test="alert-message"]').innerText()).toMatch(
      /below the reorder point/,
    );
    await shot('alerts-purchasing');
    // Pot life concerns the floor and quality, not purchasing.
    await filterKind('Pot life passed');
    await page.locator('[data-test="alerts-empty"]').waitFor();
    expect(await cards('pot_life_exceeded').count()).toBe(0);
  });
});
