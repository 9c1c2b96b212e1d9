import { and, arrayOverlaps, count, eq, ne, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { alerts } from '../../db/schema';
import { ALERT_SEVERITIES } from '../../../shared/constants';
import { can } from '../../../shared/permissions';
import type { HomeQuality } from '../../../shared/schemas/home';
import type { Actor } from '../auth/actor';
import { onHoldFigures } from './on-hold';

/**
 * The quality engineer's day: live alerts by severity (the ones the alerts page lists for this
 * person), lots awaiting inspection, final tests failed in this plant day, and lots the watch
 * advises to quarantine.
 */
export async function qualityFigures(tx: DbOrTx, actor: Actor, day: { start: Date; end: Date }): Promise<HomeQuality> {
  // The same audience rule as the alerts list: an administrator sees every alert, others their roles'.
  const audience = can(actor.roles, 'alerts.readAll') ? undefined : arrayOverlaps(alerts.audience, actor.roles);
  const live = and(ne(alerts.state, 'resolved'), audience);
  const bySeverity = await tx
    .select({
      severity: alerts.severity,
      live: count(),
      unacknowledged: sql<number>`count(*) FILTER (WHERE ${alerts.state} = 'open')::int`,
    })
    .from(alerts)
    .where(live)
    .groupBy(alerts.severity);
  const [advised] = await tx
    .select({ n: count() })
    .from(alerts)
    .where(and(live, eq(alerts.kind, 'quarantine_advised')));
  const [tests] = (
    await tx.execute<{ failed: number; tested: number }>(sql`
      SELECT count(*) FILTER (WHERE result = 'fail')::int AS failed, count(*)::int AS tested
      FROM test_results
      WHERE tested_at >= ${day.start} AND tested_at < ${day.end}`)
  ).rows;
  // Most severe first, every severity present (zero included) so the page always shows the three.
  const severities = [...ALERT_SEVERITIES].reverse();
  return {
    alerts: severities.map((severity) => {
      const row = bySeverity.find((r) => r.severity === severity);
      return { severity, live: row?.live ?? 0, unacknowledged: row?.unacknowledged ?? 0 };
    }),
    onHold: await onHoldFigures(tx),
    failuresToday: { failed: tests?.failed ?? 0, tested: tests?.tested ?? 0 },
    quarantineAdvised: advised?.n ?? 0,
  };
}
