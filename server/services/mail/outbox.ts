import crypto from 'node:crypto';
import type { DbOrTx } from '../../db/client';
import { outgoingEmails } from '../../db/schema';
import type { EmailKind } from '../../../shared/constants';
import { senderDomain } from './transport';

export interface EmailToQueue {
  kind: EmailKind;
  to: string[];
  subject: string;
  text: string;
  html?: string | null;
  /** Once-only key: a second message with the same key is not queued. */
  dedupeKey?: string | null;
  recipientUserId?: string | null;
  alertId?: string | null;
}

/** A fresh RFC 5322 Message-ID in the sender's domain. */
export function newMessageId(): string {
  return `<${crypto.randomUUID()}@${senderDomain()}>`;
}

/**
 * Puts an e-mail in the outbox, in the caller's transaction (so it is queued exactly when the
 * change it reports commits). Returns its id, or null when its once-only key was already used.
 */
export async function queueEmail(tx: DbOrTx, email: EmailToQueue): Promise<string | null> {
  const [row] = await tx
    .insert(outgoingEmails)
    .values({
      kind: email.kind,
      to: email.to,
      subject: email.subject,
      body: email.text,
      html: email.html ?? null,
      messageId: newMessageId(),
      dedupeKey: email.dedupeKey ?? null,
      recipientUserId: email.recipientUserId ?? null,
      alertId: email.alertId ?? null,
    })
    .onConflictDoNothing()
    .returning({ id: outgoingEmails.id });
  return row?.id ?? null;
}
