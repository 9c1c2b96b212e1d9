import { and, eq, gte, isNotNull, lte } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { readings } from '../../db/schema';
import type { CureProfile } from '../../../shared/cure';
import { humidityWindowCheck, type MethodCureProfile } from '../../../shared/cure-methods';

/** Readings this long before a finish are looked at, so the humidity in force at the finish is known. */
const LOOK_BEFORE_MS = 4 * 3_600_000;

export interface RunHumidity {
  rhMinPct: number | null;
  rhMaxPct: number | null;
  /** Stretches of the cure spent outside the window (empty: inside it throughout, or no reading). */
  outside: { from: string; to: string; rhPct: number }[];
}

/**
 * The humidity window check of one finished run (moisture-curing adhesives with a data-sheet RH
 * range): the area's relative humidity from the finish to full cure (or `now` while curing),
 * against each adhesive's window; the first window left is reported. Null when no adhesive of
 * the run has a window. A compliance check, not a rate: the cure time does not change.
 */
export async function humidityOfRun(
  tx: DbOrTx,
  run: { finishedAt: Date; cureCompleteAt: Date | null; area: string },
  profiles: CureProfile[],
  now: Date,
): Promise<RunHumidity | null> {
  const windows = (profiles as MethodCureProfile[]).filter((p) => typeof p.rhMinPct === 'number' || typeof p.rhMaxPct === 'number');
  if (windows.length === 0) return null;
  const to = run.cureCompleteAt && run.cureCompleteAt < now ? run.cureCompleteAt : now;
  const rows = await tx
    .select({ at: readings.at, rh: readings.rhPct })
    .from(readings)
    .where(
      and(
        eq(readings.area, run.area),
        isNotNull(readings.rhPct),
        lte(readings.at, to),
        gte(readings.at, new Date(run.finishedAt.getTime() - LOOK_BEFORE_MS)),
      ),
    )
    .orderBy(readings.at);
  const rh = rows.map((x) => ({ at: x.at.toISOString(), rhPct: Number(x.rh) }));
  for (const w of windows) {
    const check = humidityWindowCheck(w, run.finishedAt.toISOString(), to.toISOString(), rh);
    if (!check.ok) return { rhMinPct: w.rhMinPct ?? null, rhMaxPct: w.rhMaxPct ?? null, outside: check.outside };
  }
  return { rhMinPct: windows[0].rhMinPct ?? null, rhMaxPct: windows[0].rhMaxPct ?? null, outside: [] };
}
