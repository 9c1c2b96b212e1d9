import { afterAll, describe, expect, inject, it } from 'vitest';
import { request as playwrightRequest, type APIRequestContext, type Page } from 'playwright-core';
import { blockExternalRequests, closeBrowser, DEMO_PASSWORD, keepScreenshot, newPage, signInAs } from '../helpers/browser';

/**
 * One cure, three screens, one plant time. The server runs with TACKLOG_PLANT_ZONE=Europe/Berlin
 * (tests/e2e/global-setup.ts) while this machine runs in UTC and the browsers here are set to
 * America/New_York: a page that formatted a time in the browser's or the machine's zone would
 * show another hour. The demo plant has a woofer batch curing after its dust cap, with
 * "Magnetize and test" waiting for that cure.
 */
const baseUrl = inject('baseUrl');
const PLANT_ZONE = 'Europe/Berlin';
const BROWSER_ZONE = 'America/New_York';

interface CureItem {
  batchId: string;
  batchCode: string;
  stepName: string;
  cureCompleteAt: string;
  ready: boolean;
  waitForCure: boolean;
  serial: string | null;
  nextStep: { id: string; seq: number; name: string } | null;
}

/**
 * Independent reference for the expected wall clock: ECMA-402 Intl.DateTimeFormat with the IANA
 * zone (Node's ICU), not Tacklog's formatter.
 */
function wallClock(iso: string, zone: string): { date: string; time: string } {
  const parts = new Intl.DateTimeFormat('en-GB', {
    timeZone: zone,
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
    hour: '2-digit',
    minute: '2-digit',
    hourCycle: 'h23',
  }).formatToParts(new Date(iso));
  const p = (type: string) => parts.find((x) => x.type === type)!.value;
  return { date: `${p('year')}-${p('month')}-${p('day')}`, time: `${p('hour')}:${p('minute')}` };
}

async function json<T>(request: APIRequestContext, path: string, data?: unknown): Promise<T> {
  const response = data === undefined ? await request.get(path) : await request.post(path, { data });
  if (!response.ok()) throw new Error(`${path}: HTTP ${response.status()} ${await response.text()}`);
  return (await response.json()) as T;
}

async function signedIn(email: string): Promise<APIRequestContext> {
  const ctx = await playwrightRequest.newContext({ baseURL: baseUrl });
  await json(ctx, '/api/auth/login', { email, password: DEMO_PASSWORD });
  return ctx;
}

async function wedgeScan(page: Page, code: string) {
  await page.keyboard.type(code, { delay: 5 });
  await page.keyboard.press('Enter');
}

const pages: Page[] = [];
async function openPage(email: string, viewport: { width: number; height: number }): Promise<{ page: Page; external: string[] }> {
  const page = await newPage(baseUrl, undefined, { timezoneId: BROWSER_ZONE, viewport });
  pages.push(page);
  const external = await blockExternalRequests(page);
  await signInAs(page, email);
  return { page, external };
}

afterAll(async () => {
  for (const p of pages) await p.context().close();
  await closeBrowser();
});

describe('plant time', () => {
  it('the station, the cure board and the alerts page show the same plant time for one cure', async () => {
    const config = await json<{ plantZone: string }>(await playwrightRequest.newContext({ baseURL: baseUrl }), '/api/config');
    expect(config.plantZone).toBe(PLANT_ZONE);

    const quality = await signedIn('quality@tacklog.test');
    const assembler = await signedIn('assembler@tacklog.test');
    const board = await json<{ items: CureItem[] }>(quality, '/api/cure/board');
    // The demo cures two batches overnight; this test starts one early (a short cure), so it takes
    // the one that cures last and leaves the other to the station layout test.
    const cure = board.items
      .filter((i) => i.waitForCure && !i.ready && i.nextStep && i.serial === null)
      .sort((a, b) => Date.parse(b.cureCompleteAt) - Date.parse(a.cureCompleteAt))[0];
    expect(cure, 'a demo batch curing with its next step waiting').toBeTruthy();
    const { batchId, batchCode, nextStep } = cure!;
    const traveler = await json<{ steps: { id: string; stationKind: string }[] }>(assembler, `/api/batches/${batchId}`);
    const kind = traveler.steps.find((s) => s.id === nextStep!.id)!.stationKind;
    const stations = await json<{ id: string; code: string; kind: string }[] | { items: { id: string; code: string; kind: string }[] }>(
      assembler,
      '/api/stations',
    );
    const station = (Array.isArray(stations) ? stations : stations.items).find((s) => s.kind === kind)!;
    expect(station, `a station of kind ${kind}`).toBeTruthy();

    const plant = wallClock(cure!.cureCompleteAt, PLANT_ZONE);
    const browser = wallClock(cure!.cureCompleteAt, BROWSER_ZONE);
    const utc = wallClock(cure!.cureCompleteAt, 'UTC');
    expect(browser.time).not.toBe(plant.time);
    expect(utc.time).not.toBe(plant.time);

    // 1. The station (tablet): starting the waiting step is refused; the gate names the full-cure time.
    const { page: station1, external: ext1 } = await openPage('assembler@tacklog.test', { width: 1024, height: 768 });
    await station1.goto('/station');
    await station1.locator('[data-test="station-page"]').waitFor();
    await expect.poll(() => station1.evaluate(() => document.activeElement?.closest('[data-test="station-scan"]') !== null)).toBe(true);
    await wedgeScan(station1, station.code);
    await expect.poll(() => station1.locator('[data-test="station-code"]').innerText()).toContain(station.code);
    await wedgeScan(station1, batchCode);
    await expect.poll(() => station1.locator('[data-test="batch-code"]').innerText()).toBe(batchCode);
    // The gate shows as soon as the batch is scanned (Start is disabled and says why).
    await station1.locator('[data-test="cure-block"]').waitFor();
    const stationTime = await station1.locator('[data-test="cure-complete-at"]').innerText();
    const refusal = await station1.locator('[data-test="start-why-not"]').innerText();
    await keepScreenshot(station1, 'plant-time-station');

    // 2. The cure board (office).
    const { page: office, external: ext2 } = await openPage('quality@tacklog.test', { width: 1440, height: 900 });
    await office.goto('/cure');
    const item = office.locator(`[data-test="cure-item"][data-batch="${batchCode}"]`).first();
    await item.waitFor();
    const boardTime = await item.locator('[data-test="cure-complete"]').innerText();
    await keepScreenshot(office, 'plant-time-cure-board');

    // 3. Quality signs an early start, the assembler starts the step, the watch raises a short-cure alert.
    await json(quality, '/api/deviations', {
      batchId,
      stepId: nextStep!.id,
      kind: 'early_start',
      reason: 'Browser test: early start to check the plant-time wording.',
    });
    await json(assembler, `/api/batches/${batchId}/steps/${nextStep!.id}/start`, { stationId: station.id });
    await json(quality, '/api/compliance/run', {});
    await office.goto('/alerts?kind=short_cure');
    const card = office.locator('[data-test="alert-short_cure"]', { hasText: `Batch ${batchCode}:` }).first();
    await card.waitFor();
    const alertText = await card.locator('[data-test="alert-message"]').innerText();
    await keepScreenshot(office, 'plant-time-alerts');

    // The same plant time everywhere: the time (day named when not today) and, on the alert, the date too.
    expect(stationTime).toMatch(new RegExp(`(^|\\s)${plant.time}$`));
    expect(boardTime).toMatch(new RegExp(`(^|\\s)${plant.time}$`));
    expect(stationTime).toBe(boardTime);
    expect(refusal).toContain(`ready ${stationTime}, in `);
    expect(alertText).toContain(`full cure at ${plant.date} ${plant.time}`);
    for (const text of [stationTime, boardTime, refusal, alertText]) {
      expect(text).not.toMatch(/UTC|AM|PM|\d{1,2}\/\d{1,2}\/\d{4}/);
    }

    // Everything is bundled: nothing left 127.0.0.1.
    expect([...ext1, ...ext2]).toEqual([]);
    await quality.dispose();
    await assembler.dispose();
  });

  it('greets by the plant hour', async () => {
    const greetingAt = () => {
      const hour = Number(wallClock(new Date().toISOString(), PLANT_ZONE).time.slice(0, 2));
      return hour >= 5 && hour < 12
        ? 'Good morning'
        : hour >= 12 && hour < 18
          ? 'Good afternoon'
          : hour >= 18 && hour < 23
            ? 'Good evening'
            : 'Hello';
    };
    const before = greetingAt();
    const { page } = await openPage('quality@tacklog.test', { width: 1440, height: 900 });
    const shown = (await page.locator('[data-test="home-greeting"]').innerText()).split(',')[0];
    // Read between two clock readings, so a change of the hour in between cannot fail the test.
    expect([before, greetingAt()]).toContain(shown);
  });
});
