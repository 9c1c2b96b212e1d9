/**
 * The local mail catcher: an SMTP server on 127.0.0.1 (the `smtp-server` package) that accepts
 * every message, parses it with `mailparser` and stores it in `captured_emails`, where the
 * Mailbox page reads it. Started in place of a real SMTP server when TACKLOG_SMTP_URL is not
 * set, so nothing leaves the machine in the demo, in development or in tests.
 */
import type { AddressInfo } from 'node:net';
import { SMTPServer, type SMTPServerAddress } from 'smtp-server';
import { simpleParser, type AddressObject } from 'mailparser';
import { db as defaultDb, type DbOrTx } from '../../db/client';
import { capturedEmails } from '../../db/schema';
import { logger } from '../../logger';

export interface CapturedMessage {
  id: string;
  messageId: string | null;
  envelopeTo: string[];
  subject: string;
}

/** Test hooks: refuse a recipient (throw an Error with `responseCode`), or hold a message. */
export interface CatcherHooks {
  /** Before a recipient is accepted. */
  rcpt?(address: string): Promise<void> | void;
  /** After a message is stored and before the server answers 250. */
  afterStore?(message: CapturedMessage): Promise<void> | void;
}

export interface MailCatcher {
  port: number;
  /** smtp://127.0.0.1:<port> */
  url: string;
  close(): Promise<void>;
}

const MAX_BYTES = 25 * 1024 * 1024;

function addresses(field: AddressObject | AddressObject[] | undefined): string[] {
  const list = Array.isArray(field) ? field : field ? [field] : [];
  return list.flatMap((a) => a.value.map((v) => v.address ?? '').filter(Boolean));
}

function smtpError(message: string, responseCode: number): Error & { responseCode: number } {
  return Object.assign(new Error(message), { responseCode });
}

export function startMailCatcher(options: { port?: number; db?: DbOrTx; hooks?: CatcherHooks } = {}): Promise<MailCatcher> {
  const store = options.db ?? defaultDb;
  const hooks = options.hooks ?? {};
  const server = new SMTPServer({
    banner: 'Tacklog local mail catcher (nothing leaves this machine)',
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    hideSTARTTLS: true,
    size: MAX_BYTES,
    logger: false,
    onRcptTo(address: SMTPServerAddress, _session, callback) {
      Promise.resolve()
        .then(() => hooks.rcpt?.(address.address))
        .then(
          () => callback(),
          (err: unknown) => callback(err instanceof Error ? err : new Error(String(err))),
        );
    },
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('error', (err) => callback(err));
      stream.on('end', () => {
        if ((stream as unknown as { sizeExceeded?: boolean }).sizeExceeded) {
          callback(smtpError('Message too large for the local catcher', 552));
          return;
        }
        const raw = Buffer.concat(chunks);
        void (async () => {
          const parsed = await simpleParser(raw);
          const envelopeTo = session.envelope.rcptTo.map((r) => r.address);
          const [row] = await store
            .insert(capturedEmails)
            .values({
              messageId: parsed.messageId ?? null,
              envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
              envelopeTo,
              from: parsed.from?.text ?? null,
              to: addresses(parsed.to),
              subject: parsed.subject ?? '',
              text: parsed.text ?? null,
              html: typeof parsed.html === 'string' ? parsed.html : null,
              sizeBytes: raw.length,
            })
            .returning({ id: capturedEmails.id });
          await hooks.afterStore?.({ id: row.id, messageId: parsed.messageId ?? null, envelopeTo, subject: parsed.subject ?? '' });
          return row.id;
        })().then(
          (id) => callback(null, `Captured as ${id}`),
          (err: unknown) => {
            logger.error({ err }, 'mail: the local catcher could not store a message');
            callback(smtpError('The local catcher could not store the message; try again later', 451));
          },
        );
      });
    },
  });
  server.on('error', (err) => logger.error({ err }, 'mail: local catcher error'));
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, '127.0.0.1', () => {
      const { port } = server.server.address() as AddressInfo;
      resolve({
        port,
        url: `smtp://127.0.0.1:${port}`,
        close: () => new Promise<void>((done) => server.close(() => done())),
      });
    });
  });
}
