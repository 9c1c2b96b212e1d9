/**
 * A second server process for mail tests, run with `node --import tsx` against DATABASE_URL:
 *   MAIL_CHILD=digest  queue the digests of MAIL_NOW (ISO) and send what is due
 *   MAIL_CHILD=drain   send the rows MAIL_ONLY (comma-separated ids)
 * It sends through the SMTP server at MAIL_SMTP_PORT on 127.0.0.1 (the test's catcher).
 * Prints one JSON line with the result, then exits.
 */
import { catcherTransport } from '../../server/services/mail/transport';
import { drainOutbox } from '../../server/services/mail/worker';
import { queueDigests } from '../../server/services/notifications/digest';
import { closeDb } from '../../server/db/client';

async function main() {
  const transport = catcherTransport(Number(process.env.MAIL_SMTP_PORT));
  const mode = process.env.MAIL_CHILD;
  const leaseMs = Number(process.env.MAIL_LEASE_MS ?? 60_000);
  let result: unknown;
  if (mode === 'digest') {
    const now = new Date(process.env.MAIL_NOW ?? Date.now());
    const run = await queueDigests(now);
    const sent = await drainOutbox({ transport, only: run.ids, leaseMs });
    result = { queued: run.queued, ...sent };
  } else if (mode === 'drain') {
    result = await drainOutbox({ transport, only: (process.env.MAIL_ONLY ?? '').split(','), leaseMs });
  } else {
    throw new Error(`unknown MAIL_CHILD "${mode}"`);
  }
  console.log(JSON.stringify(result));
  transport.close();
  await closeDb();
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
