import cron from 'node-cron';
import { sweep } from '../services/compliance';
import { isDatabaseUnavailable, noteDatabaseDown } from '../db/availability';
import { logger } from '../logger';

/**
 * Schedules the compliance watch (node-cron). Every server process schedules it; the sweep's
 * PostgreSQL advisory lock makes exactly one of them do the work each time.
 * Returns a stop function; `schedule` 'off' disables the watch.
 */
export function scheduleComplianceWatch(schedule: string): () => void {
  if (schedule === 'off') return () => undefined;
  if (!cron.validate(schedule)) throw new Error(`TACKLOG_WATCH_CRON "${schedule}" is not a valid cron expression`);
  const task = cron.schedule(schedule, async () => {
    try {
      const result = await sweep();
      if (result.ran && (result.raised || result.resolved)) {
        logger.info({ job: 'watch', ...result }, `compliance watch raised ${result.raised}, resolved ${result.resolved}`);
      }
    } catch (err) {
      // The database away is logged once per outage (db/availability.ts); the next run tries again.
      if (isDatabaseUnavailable(err)) noteDatabaseDown(err);
      else logger.error({ job: 'watch', err }, 'compliance sweep failed');
    }
  });
  return () => void task.stop();
}
