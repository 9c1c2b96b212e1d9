import { chromium, type Browser, type Page } from 'playwright-core';
import { afterAll, afterEach, beforeEach, expect } from 'vitest';

/** Debian's chromium; browser tests never download a browser. */
export const CHROMIUM_PATH = '/usr/bin/chromium';

const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--no-first-run',
  '--disable-sync',
  '--disable-quic',
];

/** Starts headless chromium. Close it in afterAll. */
export function launchBrowser(): Promise<Browser> {
  return chromium.launch({ executablePath: CHROMIUM_PATH, headless: true, args: CHROMIUM_ARGS });
}

let shared: Promise<Browser> | null = null;

/** One browser per test file, started on first use; `closeBrowser()` ends it. */
function sharedBrowser(): Promise<Browser> {
  if (!shared) shared = launchBrowser();
  return shared;
}

export async function closeBrowser(): Promise<void> {
  if (!shared) return;
  const browser = await shared;
  shared = null;
  await browser.close();
}

export interface PageOptions {
  /** The browser's own time zone (IANA), e.g. to show that pages use the plant's zone, not this one. */
  timezoneId?: string;
  viewport?: { width: number; height: number };
}

/**
 * A page in a fresh context (own cookies) whose relative URLs resolve against `baseUrl`,
 * sized like a plant desktop screen unless told otherwise.
 */
export async function newPage(baseUrl: string, browser?: Browser, options: PageOptions = {}): Promise<Page> {
  const b = browser ?? (await sharedBrowser());
  const context = await b.newContext({
    baseURL: baseUrl,
    viewport: options.viewport ?? { width: 1366, height: 860 },
    locale: 'en-GB',
    ...(options.timezoneId ? { timezoneId: options.timezoneId } : {}),
  });
  return context.newPage();
}

const LOCAL_HOSTS = new Set(['127.0.0.1', 'localhost', '[::1]']);

/** Whether a URL stays on this machine (data: and blob: URLs never leave it). */
export function isLocalUrl(url: string): boolean {
  const parsed = new URL(url);
  if (parsed.protocol === 'data:' || parsed.protocol === 'blob:' || parsed.protocol === 'about:') return true;
  return LOCAL_HOSTS.has(parsed.hostname);
}

/**
 * Aborts every request from the page to a host other than 127.0.0.1/localhost and records its
 * URL in the returned list, so a test can assert that nothing left the machine.
 */
export async function blockExternalRequests(page: Page): Promise<string[]> {
  const external: string[] = [];
  await page.context().route('**/*', async (route) => {
    const url = route.request().url();
    if (isLocalUrl(url)) {
      await route.continue();
    } else {
      external.push(url);
      await route.abort('blockedbyclient');
    }
  });
  // Requests that bypass routing (e.g. websockets) are still recorded.
  page.on('websocket', (ws) => {
    if (!isLocalUrl(ws.url())) external.push(ws.url());
  });
  return external;
}

/** Password of the demo accounts (api.md). */
export const DEMO_PASSWORD = process.env.TACKLOG_DEMO_PASSWORD || 'tacklog-demo';

/** Signs in through the sign-in form and waits for the home page. */
export async function signInAs(page: Page, email: string, password: string = DEMO_PASSWORD): Promise<void> {
  await page.goto('/sign-in');
  await page.locator('[data-test="signin-email"]').fill(email);
  await page.locator('[data-test="signin-password"]').fill(password);
  await page.locator('[data-test="signin-submit"]').click();
  await page.locator('[data-test="home-page"]').waitFor();
}

/**
 * A fresh page for every test of the file, with outside requests blocked and the check after
 * each test that none was made; the browser closes after the file. `use` receives each page.
 */
export function freshPagePerTest(baseUrl: string, use: (page: Page) => void): void {
  let page: Page;
  let external: string[];
  beforeEach(async () => {
    page = await newPage(baseUrl);
    external = await blockExternalRequests(page);
    use(page);
  });
  afterEach(async () => {
    // Fonts, icons, scripts and label previews are all served by Tacklog itself.
    expect(external).toEqual([]);
    await page.context().close();
  });
  afterAll(async () => {
    await closeBrowser();
  });
}

/** Keeps a full-page screenshot when TACKLOG_E2E_SCREENSHOTS names a folder. */
export async function keepScreenshot(page: Page, name: string): Promise<void> {
  const folder = process.env.TACKLOG_E2E_SCREENSHOTS;
  if (folder) await page.screenshot({ path: `${folder}/${name}.png`, fullPage: true });
}
