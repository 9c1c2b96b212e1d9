/** The e-mail about one new alert, and the one saying it was resolved. Pure. */
import { formatDateTime } from '../../../../shared/plant-time';
import { ALERT_KIND_INFO, alertKindWords, isAlertKind } from '../../../../shared/notifications';
import { button, COLORS, escapeHtml, heading, link, paragraph, wrapHtml, wrapText, type MailContext, type RenderedMail } from './layout';

export interface AlertMailData {
  kind: string;
  severity: 'info' | 'warning' | 'critical';
  /** The subject in words: "mix MX-0412 at GLUE-2", "lot AC-2231 of Anaerobic retainer". */
  subjectWords: string;
  message: string;
  raisedAt: Date;
  /** Path of the item's page in Tacklog, when it has one. */
  itemPath: string | null;
  itemLabel: string;
  recipientName: string;
}

const SEVERITY_WORDS = { critical: 'Critical', warning: 'Warning', info: 'Notice' } as const;
const SEVERITY_COLORS = { critical: COLORS.critical, warning: COLORS.warning, info: COLORS.info } as const;

export const SDS_CAUTION =
  "Safety: this material may be a hazardous chemical (skin and eye irritant or sensitiser, fumes). Wear the protective equipment its safety data sheet (SDS) names, and handle and discard it as the SDS, local regulations and the plant's own safety rules say. Tacklog records; it does not replace a qualified person's judgement.";

export function needsSdsCaution(kind: string): boolean {
  return isAlertKind(kind) && ALERT_KIND_INFO[kind].handling;
}

function todo(kind: string): string {
  return isAlertKind(kind) ? ALERT_KIND_INFO[kind].todo : 'Open the alert in Tacklog and decide what to do.';
}

export function renderAlertMail(ctx: MailContext, a: AlertMailData): RenderedMail {
  const severity = SEVERITY_WORDS[a.severity];
  const kind = alertKindWords(a.kind);
  const subject = `[Tacklog] ${severity}: ${kind} – ${a.subjectWords}`;
  const raised = formatDateTime(a.raisedAt, ctx.zone);
  const itemUrl = a.itemPath ? link(ctx, a.itemPath) : null;
  const alertsUrl = link(ctx, '/alerts');
  const caution = needsSdsCaution(a.kind);
  const reason = 'You receive this because your notification settings say "at once" for this kind of alert.';

  const text = [
    `Hello ${a.recipientName},`,
    '',
    `${severity}: ${kind} – ${a.subjectWords}`,
    '',
    'What happened:',
    a.message,
    '',
    'What to do:',
    todo(a.kind),
    '',
    `Raised: ${raised} (plant time, ${ctx.zone})`,
    ...(itemUrl ? [`${a.itemLabel}: ${itemUrl}`] : []),
    `Acknowledge or resolve it: ${alertsUrl}`,
    ...(caution ? ['', SDS_CAUTION] : []),
  ].join('\n');

  const html = [
    paragraph(`Hello ${escapeHtml(a.recipientName)},`),
    `<p style="margin:0 0 12px 0;font-size:17px;font-weight:700"><span style="color:${SEVERITY_COLORS[a.severity]}">${severity}</span>: ${escapeHtml(kind)} – ${escapeHtml(a.subjectWords)}</p>`,
    heading('What happened'),
    paragraph(escapeHtml(a.message)),
    heading('What to do'),
    paragraph(escapeHtml(todo(a.kind))),
    paragraph(`Raised ${escapeHtml(raised)} (plant time, ${escapeHtml(ctx.zone)}).`),
    ...(caution
      ? [
          `<div style="margin:12px 0;padding:10px 12px;border-left:4px solid ${COLORS.warning};background:#fff8e6">${escapeHtml(SDS_CAUTION)}</div>`,
        ]
      : []),
    itemUrl ? button(itemUrl, a.itemLabel) : '',
    paragraph(`<a href="${escapeHtml(alertsUrl)}" style="color:${COLORS.accent}">Acknowledge or resolve it on the Alerts page</a>`),
  ].join('\n');

  return { subject, text: wrapText(ctx, text, reason), html: wrapHtml(ctx, subject, html, reason) };
}

export interface ResolvedMailData {
  kind: string;
  subjectWords: string;
  resolution: string;
  resolvedAt: Date;
  resolvedBy: string | null;
  recipientName: string;
}

export function renderAlertResolvedMail(ctx: MailContext, r: ResolvedMailData): RenderedMail {
  const kind = alertKindWords(r.kind);
  const subject = `[Tacklog] Resolved: ${kind} – ${r.subjectWords}`;
  const when = formatDateTime(r.resolvedAt, ctx.zone);
  const by = r.resolvedBy ? `by ${r.resolvedBy}` : 'by the compliance watch (the condition no longer holds)';
  const reason = 'You receive this because you asked to hear when an alert you were e-mailed about is resolved.';
  const alertsUrl = link(ctx, '/alerts?state=resolved');
  const text = [
    `Hello ${r.recipientName},`,
    '',
    `Resolved ${when} ${by}: ${kind} – ${r.subjectWords}.`,
    '',
    'What was done:',
    r.resolution,
    '',
    `Resolved alerts: ${alertsUrl}`,
  ].join('\n');
  const html = [
    paragraph(`Hello ${escapeHtml(r.recipientName)},`),
    paragraph(`<strong>Resolved</strong> ${escapeHtml(when)} ${escapeHtml(by)}: ${escapeHtml(kind)} – ${escapeHtml(r.subjectWords)}.`),
    heading('What was done'),
    paragraph(escapeHtml(r.resolution)),
    button(alertsUrl, 'Resolved alerts'),
  ].join('\n');
  return { subject, text: wrapText(ctx, text, reason), html: wrapHtml(ctx, subject, html, reason) };
}
