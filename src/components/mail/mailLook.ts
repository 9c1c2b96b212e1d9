import type { EmailKind, EmailStatus } from '@shared/constants';

/** How a message's state and kind read on screen: a word, an icon and a colour (never colour alone). */
export const MAIL_STATUS_LOOK: Record<EmailStatus, { label: string; color: string; icon: string; hint: string }> = {
  queued: {
    label: 'Waiting to send',
    color: 'grey-7',
    icon: 'schedule',
    hint: 'In the outbox; the mail worker sends it shortly (or retries after a refusal).',
  },
  sending: { label: 'Sending', color: 'info', icon: 'outgoing_mail', hint: 'A mail worker is handing it to the mail server now.' },
  sent: { label: 'Sent', color: 'positive', icon: 'mark_email_read', hint: 'The mail server accepted it.' },
  failed: { label: 'Not delivered', color: 'negative', icon: 'error', hint: 'The mail server refused it, or every attempt failed.' },
};

export const MAIL_KIND_WORDS: Record<EmailKind, string> = {
  alert: 'Alert',
  alert_resolved: 'Alert resolved',
  digest: 'Daily digest',
  password_reset: 'Password reset link',
  other: 'Other',
};

/** A message shown as a stand-alone HTML page: scripts, remote images, fonts and frames all blocked. */
const GUARD =
  '<meta http-equiv="Content-Security-Policy" content="default-src \'none\'; style-src \'unsafe-inline\'; img-src data:; font-src data:">' +
  '<base target="_blank">';

/**
 * The HTML part prepared for an `<iframe sandbox srcdoc>`: a content security policy that lets
 * nothing load from anywhere, and links that open in a new tab instead of inside the frame.
 */
export function guardedHtml(html: string): string {
  if (/<head[^>]*>/i.test(html)) return html.replace(/<head[^>]*>/i, (head) => `${head}${GUARD}`);
  return `<!DOCTYPE html><html><head>${GUARD}</head><body>${html}</body></html>`;
}
