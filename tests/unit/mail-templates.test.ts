/**
 * Every e-mail template rendered with demo data: plain-text and HTML parts, the plant's name
 * and time zone, times in plant time, links back to Tacklog, nothing fetched from elsewhere,
 * and text from the data escaped in the HTML.
 */
import { describe, expect, it } from 'vitest';
import { renderAlertMail, renderAlertResolvedMail, SDS_CAUTION } from '../../server/services/mail/templates/alert';
import { renderDigestMail, type DigestData } from '../../server/services/mail/templates/digest';
import type { MailContext, RenderedMail } from '../../server/services/mail/templates/layout';

const ctx: MailContext = {
  plantName: 'Halvard Bay Driver Works',
  zone: 'Europe/Lisbon',
  baseUrl: 'http://127.0.0.1:3000',
  // 2026-07-14 05:30 UTC is 06:30 in Lisbon (summer time, UTC+1).
  now: new Date('2026-07-14T05:30:00Z'),
};

function expectWellFormed(mail: RenderedMail) {
  expect(mail.text).toContain('Halvard Bay Driver Works');
  expect(mail.text).toContain('plant time (Europe/Lisbon)');
  expect(mail.text).toContain('Written 2026-07-14 06:30');
  expect(mail.html).toMatch(/^<!DOCTYPE html>/);
  expect(mail.html).toContain('Halvard Bay Driver Works');
  // Nothing fetched from elsewhere: no images, scripts, style sheets or frames; links only to Tacklog.
  expect(mail.html).not.toMatch(/<img|<script|<link|<iframe|url\(|src=/i);
  const hrefs = [...mail.html.matchAll(/href="([^"]+)"/g)].map((m) => m[1]);
  expect(hrefs.length).toBeGreaterThan(0);
  for (const h of hrefs) expect(h.startsWith('http://127.0.0.1:3000/')).toBe(true);
  expect(mail.text).toContain('http://127.0.0.1:3000/me/notifications');
}

describe('alert e-mail', () => {
  const alert = {
    kind: 'pot_life_exceeded',
    severity: 'critical' as const,
    subjectWords: 'mix MX-260714-003 at GLUE-2',
    message: 'Mix MX-260714-003 at GLUE-2 passed its pot life at 2026-07-14 06:10 and is still loaded: unload and discard it.',
    raisedAt: new Date('2026-07-14T05:12:00Z'),
    itemPath: null,
    itemLabel: '',
    recipientName: 'Tomas Ferreira <QA>',
  };

  it('names severity, kind and subject in the subject line', () => {
    expect(renderAlertMail(ctx, alert).subject).toBe('[Tacklog] Critical: Pot life passed – mix MX-260714-003 at GLUE-2');
  });

  it('says what happened, what to do, when (plant time), links back and carries the SDS caution', () => {
    const mail = renderAlertMail(ctx, alert);
    expectWellFormed(mail);
    expect(mail.text).toContain('What happened:\nMix MX-260714-003');
    expect(mail.text).toMatch(/What to do:\nUnload the mix/);
    expect(mail.text).toContain('Raised: 2026-07-14 06:12 (plant time, Europe/Lisbon)');
    expect(mail.text).toContain('Acknowledge or resolve it: http://127.0.0.1:3000/alerts');
    expect(mail.text).toContain(SDS_CAUTION);
    expect(mail.html).toContain('safety data sheet (SDS)');
    // Names from the data are escaped in the HTML part.
    expect(mail.html).toContain('Tomas Ferreira &lt;QA&gt;');
    expect(mail.html).not.toContain('<QA>');
  });

  it('links to the item when it has a page, and leaves the SDS caution off alerts that handle no chemical', () => {
    const mail = renderAlertMail(ctx, {
      ...alert,
      kind: 'below_reorder_point',
      severity: 'warning',
      subjectWords: 'Lead wire (LW-TIN-07)',
      message: 'Lead wire (LW-TIN-07): 120 m on hand, below the reorder point of 500 m.',
      itemPath: '/lots?materialId=8f1c2d4e-0000-4000-8000-000000000001',
      itemLabel: 'Lots of this material',
    });
    expect(mail.subject).toBe('[Tacklog] Warning: Below reorder point – Lead wire (LW-TIN-07)');
    expect(mail.text).toContain('Lots of this material: http://127.0.0.1:3000/lots?materialId=8f1c2d4e-0000-4000-8000-000000000001');
    expect(mail.text).not.toContain('safety data sheet');
    expectWellFormed(mail);
  });
});

describe('alert resolved e-mail', () => {
  it('says who resolved it, when and what was done', () => {
    const mail = renderAlertResolvedMail(ctx, {
      kind: 'expired_in_stock',
      subjectWords: 'container TLC-7Q2 of Dust-cap adhesive, lot DC-4410',
      resolution: 'Container scrapped and logged.',
      resolvedAt: new Date('2026-07-14T07:45:00Z'),
      resolvedBy: 'Ana Brandt',
      recipientName: 'Jo',
    });
    expect(mail.subject).toBe('[Tacklog] Resolved: Expired material in stock – container TLC-7Q2 of Dust-cap adhesive, lot DC-4410');
    expect(mail.text).toContain('Resolved 2026-07-14 08:45 by Ana Brandt');
    expect(mail.text).toContain('Container scrapped and logged.');
    expectWellFormed(mail);
  });
});

describe('daily digest e-mail', () => {
  const data: DigestData = {
    recipientName: 'Jun Halloran',
    plantDate: '2026-07-14',
    purchasing: {
      source: "from today's alerts and lots",
      runOuts: [
        {
          title: 'Lead wire (LW-TIN-07)',
          detail: '120 m on hand, below the reorder point of 500 m. Lead time 21 days.',
          path: '/lots?materialId=x',
        },
      ],
      predictedWaste: [],
      expiringLots: [
        { title: 'Lot DC-4410 of Dust-cap adhesive', detail: '900 g in stock; expires 2026-07-20 00:00 (in 5 d 18 h).', path: '/lots/abc' },
      ],
      windowDays: 14,
    },
    quality: {
      openAlertsByKind: [{ kind: 'Pot life passed', open: 1, acknowledged: 0, critical: 1 }],
      lotsOnHold: [
        { title: 'Lot AC-2231 of Anaerobic retainer', detail: 'received 2026-07-12 09:15, waiting 1 d 20 h.', path: '/lots/def' },
      ],
      shortCures: [],
    },
    alerts: [],
  };

  it('has a purchasing and a quality part, with empty sections said in words', () => {
    const mail = renderDigestMail(ctx, data);
    expect(mail.subject).toBe('[Tacklog] Daily digest for 2026-07-14 – Halvard Bay Driver Works');
    expect(mail.text).toContain('PURCHASING');
    expect(mail.text).toContain('* Lead wire (LW-TIN-07): 120 m on hand');
    expect(mail.text).toContain('No stock is past its expiry or predicted to go to waste.');
    expect(mail.text).toContain('Lots expiring within 14 days');
    expect(mail.text).toContain('QUALITY');
    expect(mail.text).toContain('* Pot life passed: 1 open, 0 acknowledged; 1 critical');
    expect(mail.text).toContain('No step started before its cure was complete.');
    expect(mail.html).toContain('href="http://127.0.0.1:3000/lots/def"');
    expectWellFormed(mail);
  });

  it('says so when nothing needs attention', () => {
    const mail = renderDigestMail(ctx, { recipientName: 'Sam', plantDate: '2026-07-14', purchasing: null, quality: null, alerts: [] });
    expect(mail.text).toContain('Nothing needs your attention today.');
    expectWellFormed(mail);
  });
});
