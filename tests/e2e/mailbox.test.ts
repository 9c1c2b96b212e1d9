/**
 * The Mailbox: an alert e-mail sent by the app's mail worker to the local catcher (the e2e
 * server runs without TACKLOG_SMTP_URL) is read on the Mailbox page, as plain text and as HTML
 * in a sandboxed frame; and a person changes their notification settings under their name.
 */
import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { DEMO_PASSWORD, freshPagePerTest, keepScreenshot, signInAs } from '../helpers/browser';

const baseUrl = inject('baseUrl');

let page: Page;
freshPagePerTest(baseUrl, (p) => {
  page = p;
});

async function tokenFor(email: string): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password: DEMO_PASSWORD }),
  });
  expect(res.status).toBe(200);
  return ((await res.json()) as { token: string }).token;
}

interface MailBody {
  items: { id: string; subject: string; status: string; captured: number; to: string[] }[];
}

/** Runs the watch (the demo plant has a mix past its pot life) and waits for quality's alert e-mail to be caught. */
async function caughtAlertMail(): Promise<MailBody['items'][number]> {
  const admin = await tokenFor('admin@tacklog.test');
  const run = await fetch(`${baseUrl}/api/compliance/run`, { method: 'POST', headers: { authorization: `Bearer ${admin}` } });
  expect(run.status).toBe(200);
  const quality = await tokenFor('quality@tacklog.test');
  let found: MailBody['items'][number] | undefined;
  await expect
    .poll(
      async () => {
        const res = await fetch(`${baseUrl}/api/mail?kind=alert&status=sent&limit=200`, {
          headers: { authorization: `Bearer ${quality}` },
        });
        const body = (await res.json()) as MailBody;
        found = body.items.find((m) => m.subject.includes('Pot life passed') && m.captured === 1);
        return Boolean(found);
      },
      { timeout: 30_000 },
    )
    .toBe(true);
  return found!;
}

describe('mailbox', () => {
  it('quality reads a captured alert e-mail as plain text and as HTML', async () => {
    const mail = await caughtAlertMail();
    expect(mail.to).toEqual(['quality@tacklog.test']);

    await signInAs(page, 'quality@tacklog.test');
    await page.locator('[data-test="user-menu"]').click();
    await page.locator('[data-test="menu-mailbox"]').click();
    await page.locator('[data-test="mailbox-page"]').waitFor();
    expect(await page.locator('[data-test="mail-transport"]').innerText()).toMatch(
      /local mail catcher on 127\.0\.0\.1:\d+: nothing leaves this machine/,
    );

    await page.locator(`[data-test="mail-item-${mail.id}"]`).click();
    const view = page.locator('[data-test="mail-message"]');
    await view.waitFor();
    expect(await view.locator('[data-test="mail-subject"]').innerText()).toBe(mail.subject);
    expect(await view.locator('[data-test="mail-status"]').innerText()).toContain('Sent');
    expect(await view.locator('[data-test="mail-smtp-answer"]').innerText()).toMatch(/^250 /);
    const text = await view.locator('[data-test="mail-text"]').innerText();
    expect(text).toContain('What happened:');
    expect(text).toContain('passed its pot life');
    expect(text).toContain('What to do:');
    expect(text).toContain('safety data sheet (SDS)');
    await keepScreenshot(page, 'mailbox-text');

    await view.locator('[data-test="mail-view-html"]').click();
    const frame = view.locator('[data-test="mail-html"]');
    await frame.waitFor();
    // Sandboxed: no scripts, no same-origin access.
    const sandbox = await frame.getAttribute('sandbox');
    expect(sandbox).not.toContain('allow-scripts');
    expect(sandbox).not.toContain('allow-same-origin');
    const body = page.frameLocator('[data-test="mail-html"]').locator('body');
    await expect.poll(() => body.innerText()).toContain('What happened');
    expect(await body.innerText()).toContain('Halvard Bay Driver Works');
    await keepScreenshot(page, 'mailbox-html');

    // On a phone the list and the message take turns.
    await page.setViewportSize({ width: 390, height: 844 });
    await page.locator('text=All messages').click();
    await page.locator(`[data-test="mail-item-${mail.id}"]`).waitFor();
    await keepScreenshot(page, 'mailbox-phone');
  });

  it('a purchaser changes a notification setting under their name, and the change holds', async () => {
    await signInAs(page, 'purchasing@tacklog.test');
    await page.locator('[data-test="user-menu"]').click();
    await page.locator('[data-test="menu-notifications"]').click();
    await page.locator('[data-test="notifications-page"]').waitFor();
    const row = page.locator('[data-test="kind-expiring_soon"]');
    await row.waitFor();
    // Not critical: in the digest by default.
    expect(await row.locator('[data-test="mode-expiring_soon-digest"]').getAttribute('aria-pressed')).toBe('true');
    await row.locator('[data-test="mode-expiring_soon-immediate"]').click();
    await page.locator('[data-test="notifications-save"]').click();
    await page.locator('.q-notification', { hasText: 'saved' }).waitFor();
    await keepScreenshot(page, 'notification-settings');
    await page.reload();
    await page.locator('[data-test="kind-expiring_soon"]').waitFor();
    expect(await page.locator('[data-test="mode-expiring_soon-immediate"]').getAttribute('aria-pressed')).toBe('true');
    // A kind that does not concern purchasing is not offered.
    expect(await page.locator('[data-test="kind-pot_life_exceeded"]').count()).toBe(0);
    await page.setViewportSize({ width: 390, height: 844 });
    await page.reload();
    await page.locator('[data-test="kind-expiring_soon"]').waitFor();
    await keepScreenshot(page, 'notification-settings-phone');
    await page.setViewportSize({ width: 1024, height: 768 });
    await keepScreenshot(page, 'notification-settings-tablet');
  });
});
