import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { freshPagePerTest, keepScreenshot, signInAs } from '../helpers/browser';
import { containerOf, json } from '../helpers/demo-stock';

/**
 * The floor's screens at the sizes the plant uses: the assembler's station on a 1024×768
 * tablet, the receiving clerk's phone at 390×844, office screens 1024 and 1440 wide. Each page
 * must fit its width (no sideways scrolling: document scrollWidth <= innerWidth) and keep its
 * buttons inside the screen; the station keeps scan field, feedback, batch, Start/Finish and
 * what is loaded visible without scrolling.
 */
const baseUrl = inject('baseUrl');

let page: Page;
freshPagePerTest(baseUrl, (p) => {
  page = p;
});

const shot = (name: string) => keepScreenshot(page, name);

async function fitsWidth(): Promise<{ scrollWidth: number; innerWidth: number }> {
  return page.evaluate(() => ({ scrollWidth: document.documentElement.scrollWidth, innerWidth: window.innerWidth }));
}

async function expectNoSidewaysScroll(where: string) {
  const { scrollWidth, innerWidth } = await fitsWidth();
  expect(scrollWidth, `${where}: page width ${scrollWidth} px on a ${innerWidth} px screen`).toBeLessThanOrEqual(innerWidth);
}

/** Every visible button lies inside the screen's width (none cut off or pushed off the side). */
async function expectButtonsInside(where: string) {
  const outside = await page.evaluate(() =>
    [...document.querySelectorAll('button, a.q-btn, .q-btn')]
      .filter((el) => {
        const r = el.getBoundingClientRect();
        if (r.width === 0 || r.height === 0 || getComputedStyle(el).visibility === 'hidden') return false;
        // Buttons inside a closed drawer sit off-screen on purpose.
        if (el.closest('.q-drawer') && !el.closest('.q-drawer--on-top, .q-drawer--standard')) return false;
        return r.left < -1 || r.right > window.innerWidth + 1;
      })
      .map(
        (el) =>
          `${(el.textContent ?? '').trim().slice(0, 30) || el.getAttribute('aria-label')} (${Math.round(el.getBoundingClientRect().left)}–${Math.round(el.getBoundingClientRect().right)})`,
      ),
  );
  expect(outside, `${where}: buttons outside the screen`).toEqual([]);
}

/** The element lies wholly inside the viewport (no scrolling needed to see it). */
async function expectInViewport(selector: string, where: string) {
  const box = await page.locator(selector).first().boundingBox();
  expect(box, `${where}: ${selector} is shown`).not.toBeNull();
  const { width, height } = page.viewportSize()!;
  expect(box!.y, `${where}: ${selector} top`).toBeGreaterThanOrEqual(0);
  expect(box!.x, `${where}: ${selector} left`).toBeGreaterThanOrEqual(0);
  expect(box!.y + box!.height, `${where}: ${selector} bottom (screen ${height} px)`).toBeLessThanOrEqual(height);
  expect(box!.x + box!.width, `${where}: ${selector} right (screen ${width} px)`).toBeLessThanOrEqual(width);
}

/** Tables keep every column in view: no table scrolls sideways inside its frame. */
async function expectTablesFit(where: string) {
  const clipped = await page.evaluate(() =>
    [...document.querySelectorAll('.q-table__middle, .q-markup-table')]
      .filter((el) => el.scrollWidth > el.clientWidth + 1)
      .map((el) => `${el.closest('[data-test]')?.getAttribute('data-test') ?? 'table'}: ${el.scrollWidth} > ${el.clientWidth}`),
  );
  expect(clipped, `${where}: tables scrolling sideways`).toEqual([]);
}

/** Rows shown as stacked cards on a phone lie one below the other, never over each other. */
async function expectRowsApart(selector: string, where: string) {
  const boxes = await page
    .locator(selector)
    .evaluateAll((els) => els.map((el) => el.getBoundingClientRect()).map((r) => ({ top: r.top, bottom: r.bottom })));
  expect(boxes.length, `${where}: rows`).toBeGreaterThan(0);
  for (let i = 1; i < boxes.length; i++)
    expect(boxes[i].top, `${where}: row ${i + 1} starts below row ${i}`).toBeGreaterThanOrEqual(boxes[i - 1].bottom - 1);
}

async function wedgeScan(code: string) {
  await page.keyboard.type(code, { delay: 5 });
  await page.keyboard.press('Enter');
}

async function feedbackIs(kind: string, title: RegExp) {
  await expect
    .poll(
      async () =>
        `${await page.locator('[data-test="feedback"]').getAttribute('data-kind')} ${await page.locator('[data-test="feedback-title"]').innerText()}`,
      { timeout: 15_000 },
    )
    .toMatch(new RegExp(`^${kind} ${title.source}`));
}

interface TravelerLite {
  batch: { id: string; code: string };
  steps: { name: string; seq: number; stationKind: string; state: string; waitForCure: boolean; cureCompleteAt: string | null }[];
}

describe('station tablet, 1024×768', () => {
  it('scan a station, a batch and a container: scan field, feedback, batch, Start/Finish and what is loaded fit one screen', async () => {
    await page.setViewportSize({ width: 1024, height: 768 });
    await signInAs(page, 'assembler@tacklog.test');
    const models = await json<{ items: { id: string; code: string }[] }>(page.request, '/api/models');
    const hb12w = models.items.find((m) => m.code === 'HB12W')!;
    const created = await json<{ batch: { code: string } }>(page.request, '/api/batches', { data: { modelId: hb12w.id, quantity: 2 } });
    const adhesive = await containerOf(baseUrl, page.request, 'ADH-AN-220');

    await page.goto('/station');
    await page.locator('[data-test="station-page"]').waitFor();
    // Below 1280 px the menu is a drawer: closed, the page has the whole width.
    expect(await page.locator('[data-test="nav"]').isVisible()).toBe(false);
    await page.locator('[data-test="station-scan"] input').click();
    await wedgeScan('ST-MAG-1');
    await feedbackIs('info', /Station ST-MAG-1/);
    await wedgeScan(created.batch.code);
    await feedbackIs('info', /Batch /);
    await wedgeScan(adhesive);
    await feedbackIs('accept', /Accepted: Anaerobic structural acrylic/);
    await page.locator(`[data-test="loaded-item"][data-code="${adhesive}"]`).waitFor();
    await shot('layout-station-1024');

    await expectNoSidewaysScroll('station');
    await expectButtonsInside('station');
    for (const selector of [
      '[data-test="station-scan"]',
      '[data-test="feedback"]',
      '[data-test="batch-code"]',
      '[data-test="start-step"]',
      '[data-test="finish-step"]',
      `[data-test="loaded-item"][data-code="${adhesive}"]`,
    ]) {
      await expectInViewport(selector, 'station');
    }
    // The batch code stays on one line.
    const code = await page.locator('[data-test="batch-code"]').boundingBox();
    expect(code!.height).toBeLessThan(40);
    // The magnet step uses an anaerobic adhesive and its activator: nothing to mix here.
    expect(await page.locator('[data-test="open-mix"]').count()).toBe(0);
    // Start is possible (nothing cures before the first step), Finish says nothing until started.
    expect(await page.locator('[data-test="start-step"]').isEnabled()).toBe(true);
    expect(await page.locator('[data-test="start-why-not"]').count()).toBe(0);

    // A long name is one line; a tap shows all of it.
    const name = page.locator(`[data-test="loaded-item"][data-code="${adhesive}"] [data-test="truncated"]`).first();
    expect(await name.evaluate((el) => getComputedStyle(el).whiteSpace)).toBe('nowrap');
    await name.click();
    expect(await name.evaluate((el) => getComputedStyle(el).whiteSpace)).toBe('normal');

    // The menu opens as a drawer over the page.
    await page.locator('[data-test="drawer-toggle"]').click();
    await page.locator('[data-test="nav-station.work"]').waitFor({ state: 'visible' });
  });

  it('shows the cure gate as a live countdown with the day as soon as the batch is scanned, and Start says why it is disabled', async () => {
    await page.setViewportSize({ width: 1024, height: 768 });
    await signInAs(page, 'assembler@tacklog.test');
    // The demo's batch curing overnight: its dust-cap step finished, magnetize-and-test waits.
    const batches = await json<{ items: { id: string }[] }>(page.request, '/api/batches?status=in_process&limit=50');
    let curing: TravelerLite | null = null;
    for (const b of batches.items) {
      const t = await json<TravelerLite>(page.request, `/api/batches/${b.id}`);
      const test = t.steps.find((s) => s.stationKind === 'magnetize_test' && s.state === 'pending');
      const before = t.steps.find((s) => test && s.seq === test.seq - 1);
      // The demo cures two batches overnight; take the one that cures first (the plant-time test takes the other).
      const soonest = curing ? Date.parse(curing.steps.find((s) => s.state === 'curing')?.cureCompleteAt ?? '') : Number.POSITIVE_INFINITY;
      if (
        before?.waitForCure &&
        before.state === 'curing' &&
        before.cureCompleteAt &&
        Date.parse(before.cureCompleteAt) > Date.now() + 10 * 60_000 &&
        Date.parse(before.cureCompleteAt) < soonest
      )
        curing = t;
    }
    expect(curing, 'the demo has a batch curing before its final test').not.toBeNull();

    await page.goto('/station');
    await page.locator('[data-test="station-scan"] input').click();
    await wedgeScan('ST-MZT-1');
    await feedbackIs('info', /Station ST-MZT-1/);
    await wedgeScan(curing!.batch.code);
    await feedbackIs('info', /Batch /);

    const gate = page.locator('[data-test="cure-block"]');
    await gate.waitFor();
    // "Ready 16:56, in 11 h 42 min" today, or "Ready Thu 07:25, in 27 h 10 min" on another day (shared/plant-time formatWhen).
    expect(await page.locator('[data-test="cure-ready"]').innerText()).toMatch(
      /^(?:(?:Mon|Tue|Wed|Thu|Fri|Sat|Sun) )?\d{2}:\d{2}, in (?:\d+ h(?: \d+ min)?|\d+ min|\d+ d(?: \d+ h)?)$/,
    );
    expect(await page.locator('[data-test="start-step"]').isDisabled()).toBe(true);
    expect(await page.locator('[data-test="start-why-not"]').innerText()).toMatch(/Start waits for the cure: ready .+, in /);
    await expectInViewport('[data-test="cure-block"]', 'cure gate');
    await expectInViewport('[data-test="start-why-not"]', 'cure gate');
    await expectNoSidewaysScroll('cure gate');
    await shot('layout-station-cure-gate');
  });

  it('a loaded two-part mix shows both parts with their lots, and mixing is offered at a step that uses a two-part adhesive', async () => {
    await page.setViewportSize({ width: 1024, height: 768 });
    await signInAs(page, 'assembler@tacklog.test');
    const stations = await json<{ items: { id: string; code: string }[] }>(page.request, '/api/stations');
    const bench = stations.items.find((s) => s.code === 'ST-MOV-1')!;
    const loaded = await json<{
      items: { batchCode: string; mix: { code: string } | null; lot: { supplierLot: string }; partLot: { supplierLot: string } | null }[];
    }>(page.request, `/api/stations/${bench.id}/loaded`);
    const mixLoad = loaded.items.find((l) => l.mix);
    expect(mixLoad, 'the demo has a mix loaded at ST-MOV-1').toBeTruthy();

    await page.goto('/station');
    await page.locator('[data-test="station-scan"] input').click();
    await wedgeScan('ST-MOV-1');
    await feedbackIs('info', /Station ST-MOV-1/);
    await wedgeScan(mixLoad!.batchCode);
    await feedbackIs('info', /Batch /);
    const row = page.locator(`[data-test="loaded-item"][data-code="${mixLoad!.mix!.code}"]`);
    await row.waitFor();
    const parts = await row.locator('[data-test="mix-part"]').allInnerTexts();
    expect(parts).toHaveLength(2);
    expect(parts[0]).toContain(`lot ${mixLoad!.lot.supplierLot}`);
    expect(parts[1]).toContain(`lot ${mixLoad!.partLot!.supplierLot}`);
    await page.locator('[data-test="open-mix"]').waitFor();
    await expectNoSidewaysScroll('mix');
    await expectButtonsInside('mix');
    await shot('layout-station-mix');
  });

  it('the general safety caution shows once after signing in and again from the help button; hazards stay at the station', async () => {
    await page.setViewportSize({ width: 1024, height: 768 });
    await signInAs(page, 'assembler@tacklog.test');
    await page.locator('[data-test="safety-caution"]').waitFor();
    await page.goto('/station');
    await page.locator('[data-test="station-page"]').waitFor();
    expect(await page.locator('[data-test="safety-caution"]').count()).toBe(0);
    await page.goto('/');
    await page.locator('[data-test="home-page"]').waitFor();
    expect(await page.locator('[data-test="safety-caution"]').count()).toBe(0);
    await page.locator('[data-test="help-open"]').click();
    expect(await page.locator('[data-test="help-dialog"] [data-test="safety-note"]').innerText()).toMatch(
      /safety data sheet, local regulations/i,
    );
  });
});

describe('receiving phone, 390×844', () => {
  it('receiving after a GS1 scan, the receipt, its labels and the lot page fit the phone', async () => {
    await page.setViewportSize({ width: 390, height: 844 });
    await signInAs(page, 'receiving@tacklog.test');
    await page.goto('/receiving');
    await page.locator('[data-test="receive-page"]').waitFor();
    const supplierLot = `PHONE-${Math.random().toString(36).slice(2, 8).toUpperCase()}`;
    await page.locator('[data-test="scan-input"]').click();
    await page.keyboard.type(`(01)09501101530003(17)271231(10)${supplierLot}`);
    await page.keyboard.press('Enter');
    await page.locator('[data-test="gs1-read"]').waitFor();
    await page.locator('[data-test="receive-material-facts"]').waitFor();
    await shot('layout-phone-receiving');
    await expectNoSidewaysScroll('receiving after a scan');
    await expectButtonsInside('receiving after a scan');
    // Quantity and its unit are on the screen, not cut off.
    await page.locator('[data-test="receive-quantity"]').scrollIntoViewIfNeeded();
    const quantity = await page.locator('[data-test="receive-quantity"]').boundingBox();
    expect(quantity!.x + quantity!.width).toBeLessThanOrEqual(390);

    await page.locator('[data-test="receive-supplier"]').click();
    await page.locator('.q-menu .q-item', { hasText: 'Corvane Bonding Supplies' }).first().click();
    await page.locator('[data-test="receive-containers"]').fill('2');
    await page.locator('[data-test="receive-quantity"]').fill('250');
    await page.locator('[data-test="receive-submit"]').click();
    await page.locator('[data-test="receipt-result"]').waitFor();
    await shot('layout-phone-receipt');
    await expectRowsApart('[data-test="receipt-container"]', 'receipt');
    await expectNoSidewaysScroll('receipt');
    await expectButtonsInside('receipt');

    await page.locator('[data-test="receipt-print"]').click();
    await page.locator('[data-test="labels-page"]').waitFor();
    await expect.poll(() => page.locator('[data-test="labels-count"]').innerText(), { timeout: 20_000 }).toContain('2 labels');
    await expectNoSidewaysScroll('labels');
    await expectButtonsInside('labels');
    // The whole sheet is seen in the frame (scaled on screen), not clipped at its right edge.
    const frame = await page.locator('[data-test="label-frame"]').elementHandle();
    const sheet = await (await frame!.contentFrame())!.evaluate(() => {
      const zoom = Number(getComputedStyle(document.documentElement).zoom || 1);
      return { width: document.documentElement.scrollWidth * zoom, frameWidth: window.innerWidth };
    });
    expect(sheet.width).toBeLessThanOrEqual(sheet.frameWidth + 1);
    await page.locator('[data-test="label-scale"]').waitFor();
    await shot('layout-phone-labels');

    await page.goBack();
    await page.locator('[data-test="receipt-result"], [data-test="receive-page"]').first().waitFor();
    const lots = await json<{ items: { id: string; supplierLot: string }[] }>(page.request, `/api/lots?q=${supplierLot}`);
    await page.goto(`/lots/${lots.items[0].id}`);
    await page.locator('[data-test="lot-containers"]').waitFor();
    await shot('layout-phone-lot');
    await expectRowsApart('[data-test^="container-row-"]', 'lot detail');
    await expectNoSidewaysScroll('lot detail');
    await expectButtonsInside('lot detail');
    await expectTablesFit('lot detail');
  });

  it('the scan page and a scanned container fit the phone', async () => {
    await page.setViewportSize({ width: 390, height: 844 });
    await signInAs(page, 'receiving@tacklog.test');
    const code = await containerOf(baseUrl, page.request, 'ADH-DC-12', 1);
    await page.goto('/scan');
    await page.locator('[data-test="scan-input"]').click();
    await page.keyboard.type(code);
    await page.keyboard.press('Enter');
    await page.locator('[data-test="scan-container"]').waitFor();
    await shot('layout-phone-scan');
    await expectNoSidewaysScroll('scan');
    await expectButtonsInside('scan');
  });
});

describe('office screens, 1024 and 1440 wide', () => {
  for (const width of [1024, 1440]) {
    it(`the lots table and a driver trace show their key columns without sideways scrolling at ${width} px`, async () => {
      await page.setViewportSize({ width, height: width === 1024 ? 768 : 900 });
      await signInAs(page, 'quality@tacklog.test');
      await page.goto('/lots');
      await page.locator('[data-test="lots-table"] tbody tr').first().waitFor();
      await expectNoSidewaysScroll(`lots ${width}`);
      await expectTablesFit(`lots ${width}`);
      await expectButtonsInside(`lots ${width}`);
      const headers = await page.locator('[data-test="lots-table"] thead th').allInnerTexts();
      for (const key of ['Status', 'Expiry', 'On hand']) expect(headers.join('|')).toContain(key);
      // Filter labels are readable, not cut ("Mater…").
      const cut = await page
        .locator('[data-test="lot-filters"] .q-field__label')
        .evaluateAll((els) => els.filter((el) => el.scrollWidth > el.clientWidth + 1).map((el) => el.textContent));
      expect(cut).toEqual([]);
      await shot(`layout-lots-${width}`);

      // A failed driver built with the demo's suspect epoxy lot, found by tracing that lot forward.
      const suspect = await json<{ items: { id: string }[] }>(page.request, '/api/lots?q=EPA2611-7741');
      const forward = await json<{ drivers: { serial: string; status: string }[] }>(page.request, `/api/lots/${suspect.items[0].id}/trace`);
      const serial = forward.drivers.find((d) => d.status === 'failed')?.serial;
      expect(serial, 'a failed demo driver').toBeTruthy();
      await page.goto(`/trace/drivers/${serial}`);
      await page.locator('[data-test="trace-step"]').first().waitFor();
      await expectNoSidewaysScroll(`driver trace ${width}`);
      await expectTablesFit(`driver trace ${width}`);
      await expectButtonsInside(`driver trace ${width}`);
      await shot(`layout-trace-${width}`);
    });
  }

  it('purchasing opening a page it may not see gets "You don\'t have access to this page" and a way back', async () => {
    await signInAs(page, 'purchasing@tacklog.test');
    await page.locator('[data-test="nav-lots.list"]').click();
    await page.locator('[data-test="lots-table"] tbody tr').first().waitFor();
    // An in-app navigation (a link or a bookmark inside the app) to the materials catalogue.
    await page.evaluate(() => {
      const app = (
        document.querySelector('#q-app') as unknown as {
          __vue_app__: { config: { globalProperties: { $router: { push: (p: string) => Promise<unknown> } } } };
        }
      ).__vue_app__;
      return app.config.globalProperties.$router.push('/catalogue/materials');
    });
    const notAllowed = page.locator('[data-test="not-allowed-page"]');
    await notAllowed.waitFor();
    expect(await notAllowed.innerText()).toContain("You don't have access to this page");
    expect(await page.locator('[data-test="not-allowed-path"]').innerText()).toBe('/catalogue/materials');
    await page.locator('[data-test="not-allowed-back"]').click();
    await page.locator('[data-test="lots-page"]').waitFor();
    // Opened directly: still the page, with a way home.
    await page.goto('/catalogue/materials');
    await notAllowed.waitFor();
    await page.locator('[data-test="not-allowed-home"]').click();
    await page.locator('[data-test="home-page"]').waitFor();
  });
});
