/**
 * `npm run audit:verify`: walks the audit chain of the project's database (the local cluster in
 * .data/pg, or DATABASE_URL) and prints "intact, N entries" or the first broken link. Exits 1
 * when the chain is broken, so a scheduled job or a person's shell can tell.
 */
import { providePostgres } from './pg';
import { log, runMain } from './lib/proc';

runMain(async () => {
  const server = await providePostgres('persistent');
  process.env.DATABASE_URL ||= server.url('tacklog');
  // Imported after DATABASE_URL is known: the database client reads it when loaded.
  const { verifyAuditChain } = await import('../server/services/audit-chain');
  const { pool } = await import('../server/db/client');
  try {
    const result = await verifyAuditChain();
    if (result.ok) {
      log(`audit trail intact, ${result.checked} entries checked`);
      return 0;
    }
    const b = result.firstBroken!;
    log(`audit trail BROKEN at entry ${b.id} (${b.at}): ${b.problem}; ${result.checked} entries before it are intact`);
    return 1;
  } finally {
    await pool.end();
  }
});
