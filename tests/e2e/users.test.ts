/**
 * Users and roles in the browser: an administrator creates a user on the Users page, reads the
 * temporary password once and the new person signs in with it (and must choose their own before
 * anything else opens); a person changes their password and ends another session on the
 * Account page.
 */
import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { DEMO_PASSWORD, freshPagePerTest, keepScreenshot, newPage, signInAs } from '../helpers/browser';

const baseUrl = inject('baseUrl');

let page: Page;
freshPagePerTest(baseUrl, (p) => {
  page = p;
});

const suffix = () => Math.random().toString(36).slice(2, 8);

async function apiCall(path: string, init: { method?: string; token?: string; body?: unknown } = {}) {
  const res = await fetch(`${baseUrl}${path}`, {
    method: init.method ?? 'GET',
    headers: { 'content-type': 'application/json', ...(init.token ? { authorization: `Bearer ${init.token}` } : {}) },
    body: init.body === undefined ? undefined : JSON.stringify(init.body),
  });
  return { status: res.status, body: (await res.json().catch(() => null)) as Record<string, unknown> | null };
}

async function tokenFor(email: string, password: string): Promise<string> {
  const res = await apiCall('/api/auth/login', { method: 'POST', body: { email, password } });
  expect(res.status).toBe(200);
  return res.body!.token as string;
}

/** Signs in on the sign-in page and waits until it is left (the first page depends on the account). */
async function signInOn(p: Page, email: string, password: string) {
  await p.goto('/sign-in');
  await p.locator('[data-test="signin-email"]').fill(email);
  await p.locator('[data-test="signin-password"]').fill(password);
  await p.locator('[data-test="signin-submit"]').click();
  await p.waitForFunction(() => !location.pathname.startsWith('/sign-in'));
}

describe('users page', () => {
  it('an administrator creates a user; the temporary password shown once signs them in, and they choose their own', async () => {
    const email = `e2e-new-${suffix()}@tacklog.test`;
    await signInAs(page, 'admin@tacklog.test');
    await page.goto('/users');
    await page.locator('[data-test="users-table"]').waitFor();
    await page.locator('[data-test="user-new"]').click();
    await page.locator('[data-test="user-email"]').fill(email);
    await page.locator('[data-test="user-name-input"]').fill('Odile Brandt');
    // Create refuses without a role, naming the field.
    await page.locator('[data-test="user-save"]').click();
    await expect.poll(() => page.locator('[data-test="user-dialog"]').textContent()).toContain('choose at least one role');
    await page.getByRole('checkbox', { name: 'Assembler' }).click();
    await page.locator('[data-test="user-save"]').click();

    const shown = page.locator('[data-test="temporary-password"]');
    await shown.waitFor();
    const temporary = (await shown.textContent())!.trim();
    expect(temporary).toMatch(/^[A-Za-z0-9]{4}(-[A-Za-z0-9]{4}){3,}$/);
    await expect.poll(() => page.locator('[data-test="copy-password"]').isVisible()).toBe(true);
    await keepScreenshot(page, 'users-temporary-password');
    await page.locator('[data-test="user-created-done"]').click();
    await page.locator('[data-test="user-dialog"]').waitFor({ state: 'detached' });
    const row = page.locator(`[data-test="user-row-${email}"]`);
    await expect.poll(() => row.textContent()).toContain('Temporary password');
    expect(await row.textContent()).toContain('Assembler');
    // The password is nowhere on the page once the dialog is closed.
    expect(await page.content()).not.toContain(temporary);

    // The new person, in their own browser context.
    const theirs = await newPage(baseUrl);
    try {
      await signInOn(theirs, email, temporary);
      await theirs.locator('[data-test="must-change-banner"]').waitFor();
      expect(new URL(theirs.url()).pathname).toBe('/me/account');
      // Other pages stay shut until the password is changed.
      await theirs.goto('/lots');
      await theirs.locator('[data-test="must-change-banner"]').waitFor();
      expect(new URL(theirs.url()).pathname).toBe('/me/account');

      await theirs.locator('[data-test="password-current"]').fill(temporary);
      await theirs.locator('[data-test="password-new"]').fill('password1234');
      await theirs.locator('[data-test="password-repeat"]').fill('password1234');
      await theirs.locator('[data-test="password-submit"]').click();
      // The first check loads the common-password dictionaries on the server: allow it a while.
      await expect
        .poll(() => theirs.locator('[data-test="password-form"]').textContent(), { timeout: 20_000 })
        .toContain('list of common passwords');

      const own = `walnut-ferry-glacier-${suffix()}`;
      await theirs.locator('[data-test="password-new"]').fill(own);
      await theirs.locator('[data-test="password-repeat"]').fill(own);
      await theirs.locator('[data-test="password-submit"]').click();
      await theirs.locator('[data-test="home-page"]').waitFor({ timeout: 20_000 });
      expect((await apiCall('/api/auth/login', { method: 'POST', body: { email, password: temporary } })).status).toBe(401);
      expect((await apiCall('/api/auth/login', { method: 'POST', body: { email, password: own } })).status).toBe(200);
    } finally {
      await theirs.context().close();
    }
  });

  it('deactivating a user asks first and signs them out at once', async () => {
    const admin = await tokenFor('admin@tacklog.test', DEMO_PASSWORD);
    const email = `e2e-off-${suffix()}@tacklog.test`;
    const password = `pewter-canyon-sorrel-${suffix()}`;
    expect(
      (await apiCall('/api/users', { method: 'POST', token: admin, body: { email, name: 'Kasimir Vale', roles: ['quality'], password } }))
        .status,
    ).toBe(201);
    const theirs = await tokenFor(email, password);

    await signInAs(page, 'admin@tacklog.test');
    await page.goto('/users');
    await page.locator(`[data-test="user-more-${email}"]`).click();
    await page.locator(`[data-test="user-deactivate-${email}"]`).click();
    await page.locator('.q-dialog').getByRole('button', { name: 'Deactivate' }).click();
    await expect.poll(() => apiCall('/api/auth/me', { token: theirs }).then((r) => r.status)).toBe(401);
    // The list reads again after the change; the row leaves it then (not necessarily before the poll above ends).
    await expect.poll(() => page.locator(`[data-test="user-row-${email}"]`).count()).toBe(0);
  });
});

describe('account page', () => {
  it('a person changes their password with the current one and ends another of their sessions', async () => {
    const admin = await tokenFor('admin@tacklog.test', DEMO_PASSWORD);
    const email = `e2e-acct-${suffix()}@tacklog.test`;
    const password = `harbor-thistle-quartz-${suffix()}`;
    const made = await apiCall('/api/users', {
      method: 'POST',
      token: admin,
      body: { email, name: 'Petra Lund', roles: ['receiving'], password },
    });
    expect(made.status).toBe(201);
    const elsewhere = await tokenFor(email, password);

    await signInAs(page, email, password);
    await page.locator('[data-test="user-menu"]').click();
    await page.locator('[data-test="menu-account"]').click();
    await page.locator('[data-test="account-page"]').waitFor();
    await expect.poll(() => page.locator('[data-test="session-other"]').count()).toBe(1);
    expect(await page.locator('[data-test="session-current"]').count()).toBe(1);

    // A wrong current password is refused at its field.
    await page.locator('[data-test="password-current"]').fill('not-my-password');
    await page.locator('[data-test="password-new"]').fill('saffron-lighthouse-kettle');
    await page.locator('[data-test="password-repeat"]').fill('saffron-lighthouse-kettle');
    await page.locator('[data-test="password-submit"]').click();
    await expect
      .poll(() => page.locator('[data-test="password-form"]').textContent(), { timeout: 20_000 })
      .toContain('Current password is not right');

    await page.locator('[data-test="password-current"]').fill(password);
    await page.locator('[data-test="password-submit"]').click();
    // The other session ended with the change; this one stays.
    await expect.poll(() => page.locator('[data-test="session-other"]').count(), { timeout: 20_000 }).toBe(0);
    expect((await apiCall('/api/auth/me', { token: elsewhere })).status).toBe(401);
    expect(await page.locator('[data-test="session-current"]').count()).toBe(1);
    await keepScreenshot(page, 'account-page');

    // A new session elsewhere, ended from here.
    const third = await tokenFor(email, 'saffron-lighthouse-kettle');
    await page.reload();
    await page.locator('[data-test="end-session-other"]').click();
    await page.locator('.q-dialog').getByRole('button', { name: 'End session' }).click();
    await expect.poll(() => apiCall('/api/auth/me', { token: third }).then((r) => r.status)).toBe(401);
    await expect.poll(() => page.locator('[data-test="session-other"]').count()).toBe(0);
  });
});

describe('reset-link page', () => {
  it('at phone size asks for the new password twice, names a repetition that differs, and says in words when the link is not valid', async () => {
    await page.setViewportSize({ width: 390, height: 844 });
    await page.goto(`/reset-password?token=${'x'.repeat(43)}`);
    await page.locator('[data-test="reset-form"]').waitFor();
    await page.locator('[data-test="reset-new"]').fill('copper lantern orchard 41');
    await page.locator('[data-test="reset-repeat"]').fill('copper lantern orchard 42');
    await page.locator('[data-test="reset-submit"]').click();
    await expect.poll(() => page.locator('[data-test="reset-form"]').textContent()).toContain('is not the same as the new password');

    await page.locator('[data-test="reset-repeat"]').fill('copper lantern orchard 41');
    await page.locator('[data-test="reset-submit"]').click();
    const error = page.locator('[data-test="reset-error"]');
    await error.waitFor();
    // The refusal's title and message in words, not its code (the banner's icon name aside).
    expect(await error.textContent()).toContain('Reset link not valid');
    expect(await error.textContent()).not.toContain('RESET_LINK_INVALID');
    expect(await page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth)).toBe(true);
    await keepScreenshot(page, 'reset-link-refused-390');
  });
});
