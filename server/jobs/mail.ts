import cron from 'node-cron';
import { config } from '../config';
import { startMailCatcher, type MailCatcher } from '../services/mail/catcher';
import { catcherTransport, setMailTransport, smtpTransport, type MailTransport } from '../services/mail/transport';
import { drainOutbox, onMailQueued } from '../services/mail/worker';
import { queueDigests } from '../services/notifications/digest';
import { logger } from '../logger';

/** The digest time "HH:MM" as a daily cron expression ("30 6 * * *"); throws on a bad value. */
export function digestCron(time: string): string {
  const m = /^([01]?\d|2[0-3]):([0-5]\d)$/.exec(time);
  if (!m) throw new Error(`TACKLOG_DIGEST_TIME "${time}" must be a 24-hour time like 06:30, or "off"`);
  return `${Number(m[2])} ${Number(m[1])} * * *`;
}

/**
 * The mail transport of this process: the plant's SMTP server (TACKLOG_SMTP_URL), or else a
 * local catcher started here on 127.0.0.1 (nothing leaves the machine).
 */
export async function startMailTransport(): Promise<{ transport: MailTransport; catcher: MailCatcher | null }> {
  if (config.mail.smtpUrl) {
    const transport = smtpTransport(config.mail.smtpUrl);
    setMailTransport(transport);
    return { transport, catcher: null };
  }
  const catcher = await startMailCatcher({ port: config.mail.catcherPort });
  const transport = catcherTransport(catcher.port);
  setMailTransport(transport);
  return { transport, catcher };
}

/**
 * The outbox worker loop: a round every `pollMs` and at once when this process queues mail.
 * Several processes may run it; rows are claimed with SKIP LOCKED, so none is sent twice.
 */
export function startOutboxWorker(pollMs = 5000): () => void {
  let running: Promise<void> | null = null;
  let again = false;
  let stopped = false;
  const round = () => {
    if (stopped) return;
    if (running) {
      again = true;
      return;
    }
    running = drainOutbox()
      .then(
        (r) => {
          if (r.sent || r.failed || r.retried || r.recovered) {
            logger.info(
              { job: 'mail', ...r },
              `sent ${r.sent}, retry later ${r.retried}, failed ${r.failed}, found delivered ${r.recovered}`,
            );
          }
        },
        (err: unknown) => logger.error({ job: 'mail', err }, 'outbox round failed'),
      )
      .finally(() => {
        running = null;
        if (again) {
          again = false;
          round();
        }
      });
  };
  const timer = setInterval(round, pollMs);
  const unsubscribe = onMailQueued(round);
  round();
  return () => {
    stopped = true;
    clearInterval(timer);
    unsubscribe();
  };
}

/**
 * The daily digest at config.mail.digestTime, plant time (node-cron in TACKLOG_PLANT_ZONE).
 * Every process schedules it; the once-only key per user and plant date lets only one digest
 * a day through. At start, a digest whose time has passed today is queued too (a server that
 * was down at 06:30 still sends it; one that already sent it sends nothing).
 */
export function scheduleDigest(time = config.mail.digestTime, after: Promise<unknown> = Promise.resolve()): () => void {
  if (time === 'off') return () => undefined;
  const expression = digestCron(time);
  const run = (why: string) =>
    queueDigests().then(
      (r) => r.queued && logger.info({ job: 'digest' }, `${why}: queued ${r.queued} digest(s) for ${r.plantDate}`),
      (err: unknown) => logger.error({ job: 'digest', err }, 'digest failed'),
    );
  const task = cron.schedule(expression, () => void run('daily digest'), { timezone: config.plantZone });
  const [hh, mm] = time.split(':').map(Number);
  const plantNow = new Date().toLocaleString('en-GB', { timeZone: config.plantZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' });
  const [nh, nm] = plantNow.split(':').map(Number);
  if (nh * 60 + nm >= hh * 60 + mm) void after.finally(() => run("catching up on today's digest"));
  return () => void task.stop();
}
