/**
 * The frame of every Tacklog e-mail, as plain text and as HTML. HTML uses inline styles only,
 * no images and nothing fetched from elsewhere, so it reads the same in any mail program and
 * in the Mailbox page's sandboxed view. Pure: everything it shows is passed in.
 */
import { formatDateTime } from '../../../../shared/plant-time';

export interface MailContext {
  plantName: string;
  /** The plant's time zone (IANA name); every time in a message is shown in it. */
  zone: string;
  /** Where Tacklog is opened, for links (no trailing slash). */
  baseUrl: string;
  now: Date;
}

export interface RenderedMail {
  subject: string;
  text: string;
  html: string;
}

const ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

export function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (c) => ESCAPES[c]);
}

/** An absolute link into Tacklog. */
export function link(ctx: MailContext, path: string): string {
  return `${ctx.baseUrl}${path.startsWith('/') ? path : `/${path}`}`;
}

export const COLORS = {
  accent: '#1f6f78',
  text: '#1d2327',
  muted: '#5c6770',
  critical: '#b3261e',
  warning: '#8a5a00',
  info: '#1f5f99',
  rule: '#d9dee2',
  panel: '#f4f6f7',
};

export function paragraph(html: string): string {
  return `<p style="margin:0 0 12px 0;line-height:1.5">${html}</p>`;
}

export function button(href: string, label: string): string {
  return `<p style="margin:16px 0"><a href="${escapeHtml(href)}" style="display:inline-block;padding:10px 16px;background:${COLORS.accent};color:#ffffff;text-decoration:none;border-radius:4px;font-weight:600">${escapeHtml(label)}</a></p>`;
}

export function heading(text: string): string {
  return `<h2 style="font-size:17px;margin:20px 0 8px 0;color:${COLORS.text}">${escapeHtml(text)}</h2>`;
}

/** Footer lines: where the times are from, why this came, and where to change it. */
function footerLines(ctx: MailContext, reason: string): string[] {
  return [
    `Times are plant time (${ctx.zone}). Written ${formatDateTime(ctx.now, ctx.zone)}.`,
    reason,
    `Change what you receive: ${link(ctx, '/me/notifications')}`,
  ];
}

export function wrapText(ctx: MailContext, body: string, reason: string): string {
  return [`Tacklog · ${ctx.plantName}`, '', body.trimEnd(), '', '-- ', ...footerLines(ctx, reason), ''].join('\n');
}

export function wrapHtml(ctx: MailContext, title: string, bodyHtml: string, reason: string): string {
  const footer = footerLines(ctx, reason)
    .map((l) => escapeHtml(l).replace(/(https?:\/\/[^\s<]+)/g, (u) => `<a href="${u}" style="color:${COLORS.accent}">${u}</a>`))
    .join('<br>');
  return `<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width"><title>${escapeHtml(title)}</title></head>
<body style="margin:0;padding:0;background:${COLORS.panel};font-family:'Noto Sans',Arial,sans-serif;font-size:15px;color:${COLORS.text}">
<div style="max-width:640px;margin:0 auto;padding:16px">
<div style="padding:12px 16px;border-left:6px solid ${COLORS.accent};background:#ffffff;font-weight:700">Tacklog · ${escapeHtml(ctx.plantName)}</div>
<div style="padding:16px;background:#ffffff;border-top:1px solid ${COLORS.rule}">
${bodyHtml}
</div>
<div style="padding:12px 16px;font-size:12px;color:${COLORS.muted}">${footer}</div>
</div>
</body></html>
`;
}
