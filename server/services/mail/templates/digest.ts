/**
 * The daily digest: what purchasing and quality should know this morning, and the alerts the
 * reader chose to get in the digest rather than at once. Pure: the figures are passed in
 * (server/services/notifications/digest.ts gathers them).
 */
import { button, COLORS, escapeHtml, heading, link, paragraph, wrapHtml, wrapText, type MailContext, type RenderedMail } from './layout';

/** One line of a digest section, with an optional page to open. */
export interface DigestItem {
  title: string;
  detail: string;
  path?: string | null;
}

/**
 * Purchasing's figures. `source` says where they come from in words (today: the compliance
 * watch's alerts and the lots; later the stock figures of the purchasing work).
 */
export interface PurchasingFigures {
  source: string;
  /** Materials that will run out (or are below their reorder point) within their lead time. */
  runOuts: DigestItem[];
  /** Stock predicted to expire before it can be used (or already past its expiry). */
  predictedWaste: DigestItem[];
  /** Lots with stock expiring within the window. */
  expiringLots: DigestItem[];
  windowDays: number;
}

export interface QualityFigures {
  openAlertsByKind: { kind: string; open: number; acknowledged: number; critical: number }[];
  lotsOnHold: DigestItem[];
  shortCures: DigestItem[];
}

export interface DigestData {
  recipientName: string;
  /** The plant date the digest is for (YYYY-MM-DD). */
  plantDate: string;
  purchasing: PurchasingFigures | null;
  quality: QualityFigures | null;
  /** Alerts raised in the last day, of the kinds the reader chose for the digest. */
  alerts: DigestItem[];
}

function textSection(title: string, items: DigestItem[], ctx: MailContext, empty: string): string[] {
  const lines = [title, '-'.repeat(title.length)];
  if (!items.length) lines.push(empty);
  for (const i of items) lines.push(`* ${i.title}: ${i.detail}${i.path ? `\n  ${link(ctx, i.path)}` : ''}`);
  lines.push('');
  return lines;
}

function htmlSection(title: string, items: DigestItem[], ctx: MailContext, empty: string): string {
  if (!items.length) return heading(title) + paragraph(`<span style="color:${COLORS.muted}">${escapeHtml(empty)}</span>`);
  const rows = items
    .map((i) => {
      const name = i.path
        ? `<a href="${escapeHtml(link(ctx, i.path))}" style="color:${COLORS.accent};font-weight:600">${escapeHtml(i.title)}</a>`
        : `<strong>${escapeHtml(i.title)}</strong>`;
      return `<li style="margin:0 0 8px 0;line-height:1.45">${name}<br>${escapeHtml(i.detail)}</li>`;
    })
    .join('\n');
  return `${heading(title)}<ul style="margin:0;padding-left:20px">${rows}</ul>`;
}

function alertCountLines(q: QualityFigures): DigestItem[] {
  return q.openAlertsByKind.map((k) => ({
    title: k.kind,
    detail: `${k.open} open, ${k.acknowledged} acknowledged${k.critical ? `; ${k.critical} critical` : ''}`,
  }));
}

/** Whether the digest has anything to report. */
export function digestIsEmpty(d: DigestData): boolean {
  const p = d.purchasing;
  const q = d.quality;
  return (
    d.alerts.length === 0 &&
    (!p || p.runOuts.length + p.predictedWaste.length + p.expiringLots.length === 0) &&
    (!q || q.openAlertsByKind.length + q.lotsOnHold.length + q.shortCures.length === 0)
  );
}

export function renderDigestMail(ctx: MailContext, d: DigestData): RenderedMail {
  const subject = `[Tacklog] Daily digest for ${d.plantDate} – ${ctx.plantName}`;
  const reason = 'You receive this daily digest because your notification settings send at least one kind of alert to it.';
  const text: string[] = [`Hello ${d.recipientName},`, '', `This is the digest for ${d.plantDate}.`, ''];
  const html: string[] = [
    paragraph(`Hello ${escapeHtml(d.recipientName)},`),
    paragraph(`This is the digest for <strong>${escapeHtml(d.plantDate)}</strong>.`),
  ];
  if (digestIsEmpty(d)) {
    text.push('Nothing needs your attention today.', '');
    html.push(paragraph('Nothing needs your attention today.'));
  }
  if (d.purchasing) {
    const p = d.purchasing;
    text.push(`PURCHASING (${p.source})`, '');
    html.push(
      `<h1 style="font-size:19px;margin:24px 0 4px 0">Purchasing</h1>`,
      paragraph(`<span style="color:${COLORS.muted}">${escapeHtml(p.source)}</span>`),
    );
    const sections: [string, DigestItem[], string][] = [
      ['Run-outs inside lead time', p.runOuts, 'No material is below its reorder point.'],
      [
        'Waste: stock past its expiry or predicted to expire before use',
        p.predictedWaste,
        'No stock is past its expiry or predicted to go to waste.',
      ],
      [`Lots expiring within ${p.windowDays} days`, p.expiringLots, `No lot with stock expires within ${p.windowDays} days.`],
    ];
    for (const [title, items, empty] of sections) {
      text.push(...textSection(title, items, ctx, empty));
      html.push(htmlSection(title, items, ctx, empty));
    }
    html.push(button(link(ctx, '/lots?expiringWithinDays=' + p.windowDays), 'Lots expiring soon'));
  }
  if (d.quality) {
    const q = d.quality;
    text.push('QUALITY', '');
    html.push(`<h1 style="font-size:19px;margin:24px 0 4px 0">Quality</h1>`);
    const sections: [string, DigestItem[], string][] = [
      ['Open alerts by kind', alertCountLines(q), 'No open alerts.'],
      ['Lots on hold awaiting inspection', q.lotsOnHold, 'No lot is waiting for inspection.'],
      ['Short cures in the last day', q.shortCures, 'No step started before its cure was complete.'],
    ];
    for (const [title, items, empty] of sections) {
      text.push(...textSection(title, items, ctx, empty));
      html.push(htmlSection(title, items, ctx, empty));
    }
  }
  if (d.alerts.length) {
    text.push(...textSection('Alerts of the last day you chose for the digest', d.alerts, ctx, ''));
    html.push(htmlSection('Alerts of the last day you chose for the digest', d.alerts, ctx, ''));
  }
  text.push(`Alerts: ${link(ctx, '/alerts')}`);
  html.push(button(link(ctx, '/alerts'), 'Open the alerts'));
  return { subject, text: wrapText(ctx, text.join('\n'), reason), html: wrapHtml(ctx, subject, html.join('\n'), reason) };
}
