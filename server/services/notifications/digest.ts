/**
 * The daily digest: built for every active user who sends at least one kind of alert to the
 * digest, and queued under a once-only key (user + plant date), so it goes once a day however
 * often it is triggered, by however many server processes, across restarts.
 */
import { and, eq, gte, like, ne } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { db } from '../../db/client';
import { alerts, notificationSettings, outgoingEmails, users } from '../../db/schema';
import { ALERT_KINDS, type Role } from '../../../shared/constants';
import { alertKindWords, type NotificationMode } from '../../../shared/notifications';
import { config } from '../../config';
import { queueEmail } from '../mail/outbox';
import { mailQueued } from '../mail/worker';
import { renderDigestMail, type DigestItem, type PurchasingFigures, type QualityFigures } from '../mail/templates/digest';
import { modeFor } from './alert-mail';
import { mailContext } from './context';
import { PURCHASING_DIGEST_KINDS, purchasingFigures, qualityFigures } from './figures';
import { describeSubject } from './subject';

export interface DigestRun {
  /** The plant date the digests are for. */
  plantDate: string;
  /** Digests queued by this run (0 when today's were already queued). */
  queued: number;
  ids: string[];
}

export function plantDateOf(now: Date, zone = config.plantZone): string {
  return DateTime.fromJSDate(now).setZone(zone).toISODate() as string;
}

export const digestKey = (userId: string, plantDate: string) => `digest:${userId}:${plantDate}`;

/** Queues today's digests (plant date) that are not queued yet. */
export async function queueDigests(now: Date = new Date()): Promise<DigestRun> {
  const zone = config.plantZone;
  const plantDate = plantDateOf(now, zone);
  const people = await db
    .select({ id: users.id, email: users.email, name: users.name, roles: users.roles, modes: notificationSettings.modes })
    .from(users)
    .leftJoin(notificationSettings, eq(notificationSettings.userId, users.id))
    .where(eq(users.active, true))
    .orderBy(users.email);
  const done = new Set(
    (
      await db
        .select({ key: outgoingEmails.dedupeKey })
        .from(outgoingEmails)
        .where(like(outgoingEmails.dedupeKey, `digest:%:${plantDate}`))
    ).map((r) => r.key),
  );

  const since = new Date(now.getTime() - 86_400_000);
  const recent = await db
    .select()
    .from(alerts)
    .where(and(gte(alerts.raisedAt, since), ne(alerts.state, 'resolved')))
    .orderBy(alerts.raisedAt);
  const recentItems = new Map<string, DigestItem>();
  let purchasing: PurchasingFigures | undefined;
  let quality: QualityFigures | undefined;
  const ctx = await mailContext(now);
  const run: DigestRun = { plantDate, queued: 0, ids: [] };

  for (const person of people) {
    if (done.has(digestKey(person.id, plantDate))) continue;
    const roles = person.roles as Role[];
    const buyer = roles.includes('purchasing');
    const mine = recent.filter(
      (a) =>
        (roles.includes('admin') || a.audience.some((r) => roles.includes(r))) &&
        modeFor({ roles, modes: person.modes }, a.kind, a.severity) === 'digest' &&
        !(buyer && PURCHASING_DIGEST_KINDS.has(a.kind)),
    );
    if (!hasDigestKind(roles, person.modes)) continue;
    const items: DigestItem[] = [];
    for (const a of mine) {
      if (!recentItems.has(a.id)) {
        const subject = await describeSubject(db, a);
        recentItems.set(a.id, {
          title: `${alertKindWords(a.kind)} – ${subject.words}`,
          detail: a.message,
          path: subject.path ?? '/alerts',
        });
      }
      items.push(recentItems.get(a.id) as DigestItem);
    }
    if (roles.includes('purchasing')) purchasing ??= await purchasingFigures(db, now, zone);
    if (roles.includes('quality')) quality ??= await qualityFigures(db, now, zone);
    const mail = renderDigestMail(ctx, {
      recipientName: person.name,
      plantDate,
      purchasing: roles.includes('purchasing') ? (purchasing ?? null) : null,
      quality: roles.includes('quality') ? (quality ?? null) : null,
      alerts: items,
    });
    const id = await queueEmail(db, {
      kind: 'digest',
      to: [person.email],
      subject: mail.subject,
      text: mail.text,
      html: mail.html,
      dedupeKey: digestKey(person.id, plantDate),
      recipientUserId: person.id,
    });
    if (id) {
      run.queued += 1;
      run.ids.push(id);
    }
  }
  if (run.queued) mailQueued();
  return run;
}

/** Whether the user sends at least one kind of alert to the digest. */
function hasDigestKind(roles: Role[], modes: Partial<Record<string, NotificationMode>> | null): boolean {
  return ALERT_KINDS.some((k) => modeFor({ roles, modes }, k, 'info') === 'digest');
}
