import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import type { Role } from '../../shared/constants';
import { NAV_ITEMS } from '../../src/navigation';
import { can } from '../../shared/permissions';
import { roleWord } from '../../shared/words';
import { actionsOf } from '../../src/router/meta';
import { freshPagePerTest } from '../helpers/browser';

const baseUrl = inject('baseUrl');
const password = process.env.TACKLOG_DEMO_PASSWORD || 'tacklog-demo';

const ACCOUNTS: { email: string; role: Role }[] = [
  { email: 'admin@tacklog.test', role: 'admin' },
  { email: 'receiving@tacklog.test', role: 'receiving' },
  { email: 'assembler@tacklog.test', role: 'assembler' },
  { email: 'quality@tacklog.test', role: 'quality' },
  { email: 'purchasing@tacklog.test', role: 'purchasing' },
];

let page: Page;
freshPagePerTest(baseUrl, (p) => {
  page = p;
});

async function signIn(email: string, secret: string) {
  await page.locator('[data-test="signin-email"]').fill(email);
  await page.locator('[data-test="signin-password"]').fill(secret);
  await page.locator('[data-test="signin-submit"]').click();
}

/** Route names the running client has registered (areas appear as other work adds routes). */
function registeredRoutes(names: string[]): Promise<string[]> {
  return page.evaluate((candidates) => {
    type AppHost = { __vue_app__?: { config: { globalProperties: { $router: { hasRoute(n: string): boolean } } } } };
    const app = (document.querySelector('#q-app') as unknown as AppHost).__vue_app__;
    if (!app) throw new Error('the Vue app is not mounted on #q-app');
    return candidates.filter((name) => app.config.globalProperties.$router.hasRoute(name));
  }, names);
}

async function navItemsShown(): Promise<string[]> {
  const hooks = await page
    .locator('[data-test="nav"] [data-test^="nav-"]')
    .evaluateAll((els) => els.map((el) => el.getAttribute('data-test') ?? ''));
  return hooks.map((hook) => hook.replace(/^nav-/, '')).sort();
}

describe('sign-in', () => {
  for (const account of ACCOUNTS) {
    it(`${account.role}: signs in through the form, sees its own menu, signs out`, async () => {
      await page.goto('/');
      await expect.poll(() => new URL(page.url()).pathname).toBe('/sign-in');

      await signIn(account.email, password);
      await page.locator('[data-test="home-page"]').waitFor();
      expect(new URL(page.url()).pathname).toBe('/');

      // Header: who is signed in and with which role.
      await expect.poll(() => page.locator('[data-test="user-name"]').innerText()).toContain(`(${account.role})`);
      expect(await page.locator('[data-test="user-roles"]').innerText()).toContain(roleWord(account.role));
      // The home page's figures for this role (tests/e2e/home.test.ts checks them against the API).
      await page.locator(account.role === 'purchasing' ? '[data-test="purchasing-today"]' : `[data-test="home-${account.role}"]`).waitFor();

      // The drawer shows exactly the items this role may use whose routes exist; other roles' items never.
      const mayUse = (item: (typeof NAV_ITEMS)[number]) =>
        !item.permission || actionsOf(item.permission).some((a) => can([account.role], a));
      const allowed = NAV_ITEMS.filter(mayUse).map((i) => i.to);
      const forbidden = NAV_ITEMS.filter((item) => !mayUse(item)).map((i) => i.to);
      const expected = (await registeredRoutes(allowed)).sort();
      expect(expected).toContain('home');
      const shown = await navItemsShown();
      expect(shown).toEqual(expected);
      for (const name of forbidden) expect(shown).not.toContain(name);

      // The general safety caution shows once after signing in, for people who handle adhesives.
      const handlesAdhesives = can([account.role], 'containers.handle');
      expect(await page.locator('[data-test="safety-note"]').count()).toBe(handlesAdhesives ? 1 : 0);

      await page.locator('[data-test="signout"]').click();
      await page.locator('[data-test="signin-submit"]').waitFor();
      expect(new URL(page.url()).pathname).toBe('/sign-in');

      // The session cookie is gone: the app sends us back to sign in.
      await page.goto('/');
      await expect.poll(() => new URL(page.url()).pathname).toBe('/sign-in');
    });
  }

  it('a wrong password shows an error and stays on the sign-in page', async () => {
    await page.goto('/sign-in');
    await signIn('quality@tacklog.test', `${password}-wrong`);
    const error = page.locator('[data-test="signin-error"]');
    await error.waitFor();
    expect(await error.innerText()).toMatch(/e-mail or password is not right/i);
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    expect(await page.locator('[data-test="home-page"]').count()).toBe(0);
  });

  it('names the field in error before asking the server', async () => {
    await page.goto('/sign-in');
    await signIn('not-an-address', '');
    await expect
      .poll(() => page.locator('.q-field--error').allInnerTexts())
      .toEqual([expect.stringContaining('E-mail must be an e-mail address'), expect.stringContaining('Password is required')]);
  });

  it('a deep link survives signing in', async () => {
    await page.goto('/no-such-page?x=1');
    await expect.poll(() => new URL(page.url()).pathname).toBe('/sign-in');
    expect(new URL(page.url()).searchParams.get('redirect')).toBe('/no-such-page?x=1');
    await signIn('admin@tacklog.test', password);
    await page.locator('[data-test="notfound-page"]').waitFor();
    expect(new URL(page.url()).pathname + new URL(page.url()).search).toBe('/no-such-page?x=1');
  });
});
