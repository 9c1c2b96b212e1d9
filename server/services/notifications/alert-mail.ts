/**
 * E-mails about alerts, queued in the transaction that raises (or resolves) the alert, one per
 * recipient, each under a once-only key (alert + recipient): with several servers running the
 * watch, an alert is raised once and its e-mails are queued once.
 */
import { and, eq, sql } from 'drizzle-orm';
import type { Tx } from '../../db/client';
import { notificationSettings, outgoingEmails, users } from '../../db/schema';
import type { AlertSeverity, Role } from '../../../shared/constants';
import { defaultMode, effectiveModes, isAlertKind, kindsFor, type NotificationMode } from '../../../shared/notifications';
import { queueEmail } from '../mail/outbox';
import { renderAlertMail, renderAlertResolvedMail } from '../mail/templates/alert';
import { mailContext } from './context';
import { describeSubject } from './subject';

export interface RaisedAlert {
  id: string;
  kind: string;
  severity: AlertSeverity;
  subjectType: string;
  subjectId: string;
  message: string;
  audience: Role[];
  data: Record<string, unknown> | null;
  raisedAt: Date;
}

interface Candidate {
  id: string;
  email: string;
  name: string;
  roles: Role[];
  modes: Partial<Record<string, NotificationMode>> | null;
  whenResolved: boolean | null;
}

/** Active users who may see the alert (its audience, or administrators), with their choices. */
async function candidates(tx: Tx, audience: Role[]): Promise<Candidate[]> {
  const audienceArray = `{${audience.join(',')}}`;
  return tx
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      roles: users.roles,
      modes: notificationSettings.modes,
      whenResolved: notificationSettings.whenResolved,
    })
    .from(users)
    .leftJoin(notificationSettings, eq(notificationSettings.userId, users.id))
    .where(and(eq(users.active, true), sql`(${users.roles} && ${audienceArray}::role[] OR 'admin' = ANY(${users.roles}))`))
    .orderBy(users.email);
}

/** How this user wants to hear of alerts of `kind` (an unknown kind: critical ones at once, to its audience). */
export function modeFor(user: Pick<Candidate, 'roles' | 'modes'>, kind: string, severity: AlertSeverity): NotificationMode {
  if (!isAlertKind(kind)) return severity === 'critical' ? 'immediate' : 'none';
  if (!kindsFor(user.roles).includes(kind)) return 'none';
  return effectiveModes(user.roles, user.modes ?? {})[kind] ?? defaultMode(kind, user.roles);
}

/** Queues one e-mail per subscriber ("at once") of a new alert. Returns how many were queued. */
export async function queueAlertMails(tx: Tx, alert: RaisedAlert): Promise<number> {
  const people = (await candidates(tx, alert.audience)).filter((u) => modeFor(u, alert.kind, alert.severity) === 'immediate');
  if (!people.length) return 0;
  const subject = await describeSubject(tx, alert);
  const ctx = await mailContext();
  let queued = 0;
  for (const person of people) {
    const mail = renderAlertMail(ctx, {
      kind: alert.kind,
      severity: alert.severity,
      subjectWords: subject.words,
      message: alert.message,
      raisedAt: alert.raisedAt,
      itemPath: subject.path,
      itemLabel: subject.label,
      recipientName: person.name,
    });
    const id = await queueEmail(tx, {
      kind: 'alert',
      to: [person.email],
      subject: mail.subject,
      text: mail.text,
      html: mail.html,
      dedupeKey: `alert:${alert.id}:${person.id}`,
      recipientUserId: person.id,
      alertId: alert.id,
    });
    if (id) queued += 1;
  }
  return queued;
}

/**
 * When an alert is resolved: an e-mail only to those who were e-mailed about it and asked to
 * hear of its resolution (notification setting "when resolved"). Nobody else is e-mailed.
 */
export async function queueAlertResolvedMails(
  tx: Tx,
  alert: Pick<RaisedAlert, 'id' | 'kind' | 'subjectType' | 'subjectId' | 'data'>,
  resolution: string,
  resolvedAt: Date,
  resolvedBy: string | null,
): Promise<number> {
  const people = await tx
    .selectDistinct({ id: users.id, email: users.email, name: users.name })
    .from(outgoingEmails)
    .innerJoin(users, eq(users.id, outgoingEmails.recipientUserId))
    .innerJoin(notificationSettings, eq(notificationSettings.userId, users.id))
    .where(
      and(
        eq(outgoingEmails.alertId, alert.id),
        eq(outgoingEmails.kind, 'alert'),
        eq(notificationSettings.whenResolved, true),
        eq(users.active, true),
      ),
    );
  if (!people.length) return 0;
  const subject = await describeSubject(tx, alert);
  const ctx = await mailContext();
  let queued = 0;
  for (const person of people) {
    const mail = renderAlertResolvedMail(ctx, {
      kind: alert.kind,
      subjectWords: subject.words,
      resolution,
      resolvedAt,
      resolvedBy,
      recipientName: person.name,
    });
    const id = await queueEmail(tx, {
      kind: 'alert_resolved',
      to: [person.email],
      subject: mail.subject,
      text: mail.text,
      html: mail.html,
      dedupeKey: `alert-resolved:${alert.id}:${person.id}`,
      recipientUserId: person.id,
      alertId: alert.id,
    });
    if (id) queued += 1;
  }
  return queued;
}
