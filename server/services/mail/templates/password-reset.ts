/** The e-mail with a one-time password reset link an administrator sent. Pure. */
import { formatDateTime } from '../../../../shared/plant-time';
import { button, escapeHtml, paragraph, wrapHtml, wrapText, type MailContext, type RenderedMail } from './layout';

export interface PasswordResetMailData {
  recipientName: string;
  /** The administrator who asked for it. */
  sentBy: string;
  /** The whole link, token included. */
  url: string;
  expiresAt: Date;
}

export function renderPasswordResetMail(ctx: MailContext, d: PasswordResetMailData): RenderedMail {
  const subject = '[Tacklog] Set a new password';
  const until = formatDateTime(d.expiresAt, ctx.zone);
  const reason = `You receive this because ${d.sentBy} sent you a password reset link. If you did not expect it, tell them; your password stays as it is until the link is used.`;
  const text = [
    `Hello ${d.recipientName},`,
    '',
    `${d.sentBy} sent you a link to set a new Tacklog password:`,
    '',
    d.url,
    '',
    `The link works once, until ${until} (plant time, ${ctx.zone}). Setting a new password signs you out everywhere you are signed in.`,
  ].join('\n');
  const html = [
    paragraph(`Hello ${escapeHtml(d.recipientName)},`),
    paragraph(`${escapeHtml(d.sentBy)} sent you a link to set a new Tacklog password.`),
    button(d.url, 'Set a new password'),
    paragraph(
      `The link works once, until ${escapeHtml(until)} (plant time, ${escapeHtml(ctx.zone)}). Setting a new password signs you out everywhere you are signed in.`,
    ),
    paragraph(`If the button does not work, open this address: ${escapeHtml(d.url)}`),
  ].join('\n');
  return { subject, text: wrapText(ctx, text, reason), html: wrapHtml(ctx, subject, html, reason) };
}
