/**
 * Each demo account's home page shows its role's live figures, the same numbers GET /api/home
 * gives that user, with links to where the figure is acted on; no role sees another's section.
 */
import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { homeFiguresSchema, type HomeFigures } from '../../shared/schemas/home';
import { freshPagePerTest, keepScreenshot, signInAs } from '../helpers/browser';

const baseUrl = inject('baseUrl');

let page: Page;
freshPagePerTest(baseUrl, (p) => {
  page = p;
});

const SECTIONS = ['receiving', 'assembler', 'quality', 'admin'] as const;

/** The figures the API gives the signed-in user of this page (same cookie). */
async function apiFigures(): Promise<HomeFigures> {
  const res = await page.request.get('/api/home');
  expect(res.status()).toBe(200);
  return homeFiguresSchema.parse(await res.json());
}

/** The value a tile shows (its data-value, as the page rendered it). */
async function tileValue(test: string): Promise<string> {
  const tile = page.locator(`[data-test="${test}"]`);
  await tile.waitFor();
  return (await tile.getAttribute('data-value')) ?? '';
}

async function statusText(test: string): Promise<string> {
  return page.locator(`[data-test="${test}"] [data-test="figure-status-text"]`).innerText();
}

/** Only this role's section is on the page. */
async function expectOnlySection(role: (typeof SECTIONS)[number] | 'purchasing') {
  for (const other of SECTIONS) expect(await page.locator(`[data-test="home-${other}"]`).count(), other).toBe(other === role ? 1 : 0);
  expect(await page.locator('[data-test="purchasing-today"]').count()).toBe(role === 'purchasing' ? 1 : 0);
}

describe('home page by role, with the demo plant', () => {
  it('receiving: lots received today and lots on hold, as the API counts them; the on-hold tile opens those lots', async () => {
    await signInAs(page, 'receiving@tacklog.test');
    await page.locator('[data-test="home-receiving"]').waitFor();
    const f = (await apiFigures()).receiving!;
    expect(await tileValue('home-received-today')).toBe(String(f.receivedToday.lots));
    expect(await tileValue('home-on-hold')).toBe(String(f.onHold.count));
    // The demo plant has lots on hold awaiting inspection.
    expect(f.onHold.count).toBeGreaterThan(0);
    expect(await statusText('home-on-hold')).toMatch(/^Oldest waiting \d/);
    await expectOnlySection('receiving');
    await keepScreenshot(page, 'home-receiving');

    await page.locator('[data-test="home-on-hold"]').click();
    await page.locator('[data-test="lots-page"]').waitFor();
    const url = new URL(page.url());
    expect(url.pathname).toBe('/lots');
    expect(url.searchParams.get('status')).toBe('on_hold');
  });

  it('assembler: my station, its batch and the cures ending soon, as the API gives them', async () => {
    await signInAs(page, 'assembler@tacklog.test');
    await page.locator('[data-test="home-assembler"]').waitFor();
    const f = (await apiFigures()).assembler!;
    // The demo assembler has run steps: the home page knows their station.
    expect(f.station).not.toBeNull();
    expect(await tileValue('home-station')).toBe(f.station!.code);
    expect(await tileValue('home-station-batch')).toBe(f.batch ? f.batch.code : 'None');
    expect(await tileValue('home-cures-soon')).toBe(String(f.curesEndingSoon.count));
    if (f.batch) expect(await statusText('home-station-batch')).toMatch(/running|Loaded|Finished/);
    await expectOnlySection('assembler');
    await keepScreenshot(page, 'home-assembler');

    await page.locator('[data-test="home-cures-soon"]').click();
    await page.locator('[data-test="cure-board"]').waitFor();
  });

  it('quality: live alerts by severity, awaiting inspection, failures today, quarantine advised; a severity opens the alerts filtered', async () => {
    await signInAs(page, 'quality@tacklog.test');
    await page.locator('[data-test="home-quality"]').waitFor();
    const f = (await apiFigures()).quality!;
    for (const a of f.alerts) expect(await tileValue(`home-alerts-${a.severity}`), a.severity).toBe(String(a.live));
    expect(await tileValue('home-awaiting-inspection')).toBe(String(f.onHold.count));
    expect(await tileValue('home-failures-today')).toBe(String(f.failuresToday.failed));
    expect(await tileValue('home-quarantine-advised')).toBe(String(f.quarantineAdvised));
    expect(f.onHold.count).toBeGreaterThan(0);
    await expectOnlySection('quality');
    await keepScreenshot(page, 'home-quality');

    const warning = f.alerts.find((a) => a.severity === 'warning')!;
    await page.locator('[data-test="home-alerts-warning"]').click();
    await page.locator('[data-test="alerts-page"]').waitFor();
    expect(new URL(page.url()).searchParams.get('severity')).toBe('warning');
    if (warning.live > 0) {
      await page.locator('[data-test="alerts-list"] [data-test="alert-severity"]').first().waitFor();
      const shown = await page.locator('[data-test="alerts-list"] [data-test="alert-severity"]').allInnerTexts();
      expect(shown.length).toBe(Math.min(warning.live, 25));
      for (const s of shown) expect(s).toMatch(/Warning/i);
    } else {
      await page.locator('[data-test="alerts-empty"]').waitFor();
    }
  });

  it('purchasing: the three figures of the stock page', async () => {
    await signInAs(page, 'purchasing@tacklog.test');
    const panel = page.locator('[data-test="purchasing-today"]');
    await panel.locator('[data-test="today-runouts"]').waitFor();
    const f = (await apiFigures()).purchasing!;
    expect(await panel.locator('[data-test="today-runouts"]').getAttribute('data-count')).toBe(String(f.runOuts.length));
    expect(await panel.locator('[data-test="today-waste"]').getAttribute('data-count')).toBe(String(f.wasteThisMonth.items.length));
    expect(await panel.locator('[data-test="today-expiring"]').getAttribute('data-count')).toBe(String(f.expiringLots.items.length));
    expect(f.runOuts.length).toBeGreaterThan(0);
    await expectOnlySection('purchasing');
    await keepScreenshot(page, 'home-purchasing');
  });

  it('admin: users, stations and the audit chain state, as the API gives them', async () => {
    await signInAs(page, 'admin@tacklog.test');
    await page.locator('[data-test="home-admin"]').waitFor();
    const f = (await apiFigures()).admin!;
    expect(await tileValue('home-users')).toBe(String(f.users.active));
    expect(await tileValue('home-stations')).toBe(String(f.stations.active));
    expect(f.stations.active).toBeGreaterThan(0);
    const check = f.auditChain.lastCheck;
    expect(await statusText('home-audit-chain')).toBe(
      !check ? 'Not verified yet' : check.ok ? 'Intact' : `Broken at entry ${check.firstBroken?.id}`,
    );
    await expectOnlySection('admin');
    await keepScreenshot(page, 'home-admin');

    // Verify on the audit page, then home again: the chain's state is that verification.
    await page.locator('[data-test="home-audit-chain"]').click();
    await page.locator('[data-test="audit-page"]').waitFor();
    const verify = page.waitForResponse((r) => r.url().endsWith('/api/audit/verify'));
    await page.locator('[data-test="audit-verify"]').click();
    const verified = (await (await verify).json()) as { ok: boolean; checked: number };
    await page.goto('/');
    await page.locator('[data-test="home-audit-chain"]').waitFor();
    await expect.poll(() => statusText('home-audit-chain')).toMatch(verified.ok ? /^Intact$/ : /^Broken/);
    if (verified.ok) expect(await tileValue('home-audit-chain')).toBe(`${verified.checked.toLocaleString('en-GB')} entries`);
  });
});
