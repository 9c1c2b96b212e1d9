/**
 * Lot-level effective expiry as an SQL expression, for sorting and filtering lists in the
 * database. It mirrors shared/expiry.ts `lotExpiry` exactly (a test compares the two):
 *  - supplier expiry date: usable through that day in the plant zone → start of the next day;
 *  - shelf life from the manufacture date: start of (manufacturedOn + shelfLifeDays) in the zone;
 *  - shelf life without a manufacture date: receivedAt + shelfLifeDays calendar days, counted
 *    on the plant's wall clock;
 *  - the earliest that applies (LEAST ignores NULLs); NULL when none applies.
 * Use in a query that joins `lots` and `materials`.
 */
import { sql, type SQL } from 'drizzle-orm';
import { lots, materials } from '../../db/schema';

export function lotExpirySql(zone: string): SQL<Date | null> {
  return sql<Date | null>`LEAST(
    CASE WHEN ${lots.expiresOn} IS NOT NULL
      THEN ((${lots.expiresOn} + 1)::timestamp AT TIME ZONE ${zone}::text) END,
    CASE WHEN ${materials.shelfLifeDays} IS NOT NULL THEN
      CASE WHEN ${lots.manufacturedOn} IS NOT NULL
        THEN ((${lots.manufacturedOn} + ${materials.shelfLifeDays})::timestamp AT TIME ZONE ${zone}::text)
        ELSE (((${lots.receivedAt} AT TIME ZONE ${zone}::text) + make_interval(days => ${materials.shelfLifeDays})) AT TIME ZONE ${zone}::text)
      END
    END)`;
}
