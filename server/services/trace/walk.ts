/**
 * The one genealogy walk, container → (mix part) → step run, as the `material_uses` view
 * (migration genealogy_material_uses; declared in server/db/schema/production.ts). The driver
 * trace, the lot trace and the lot statistics all read it through the fragments below, and its
 * rows have one shape.
 */
import { sql, type SQL } from 'drizzle-orm';
import { materialUses } from '../../db/schema';

/** A row of the walk as the SQL driver returns it (snake_case columns). */
export interface MaterialUseRow {
  use_id: string;
  step_run_id: string;
  loaded_at: Date;
  quantity_used: string;
  container_id: string;
  mix_id: string | null;
  mix_code: string | null;
  mixed_at: Date | null;
  part: 'resin' | 'hardener' | null;
  part_ord: number;
}

/** Its columns, qualified by `alias` (in the order of MaterialUseRow). */
export const useColumns = (alias: string): SQL =>
  sql.raw(
    ['use_id', 'step_run_id', 'loaded_at', 'quantity_used', 'container_id', 'mix_id', 'mix_code', 'mixed_at', 'part', 'part_ord']
      .map((c) => `${alias}.${c}`)
      .join(', '),
  );

/** The view itself, for a FROM or JOIN. */
export const walk = sql`${materialUses}`;

/**
 * The uses of one step run, `stepRunId` being a column of the row joined from
 * (`LEFT JOIN LATERAL ${usesOfRun(sql`sr.id`)} mu ON true`). OFFSET 0 keeps the subquery from being
 * pulled up into the outer join: pulled up, the planner joined the whole view by hash (126,000
 * uses read for a driver's 9 on the 3-year benchmark history, 74 ms); kept apart it runs per step
 * run with the id pushed into each branch of the view, an index lookup each (1.3 ms, same rows).
 */
export const usesOfRun = (stepRunId: SQL): SQL => sql`(SELECT * FROM ${materialUses} mu0 WHERE mu0.step_run_id = ${stepRunId} OFFSET 0)`;

/**
 * Uses of the containers of the lots `lotFilter` picks (a condition on `c`, the container):
 * the walk's columns plus the container's lot and code. Each branch of the view stays an index
 * lookup (containers by lot, then uses by container or by mix part).
 */
export const lotUses = (lotFilter: SQL): SQL => sql`
  SELECT c.lot_id, c.code AS container_code, ${useColumns('mu')}
  FROM containers c JOIN ${walk} mu ON mu.container_id = c.id
  WHERE ${lotFilter}`;

/** A lot use's row: the walk's plus the lot and the container's code. */
export interface LotUseRow extends MaterialUseRow {
  lot_id: string;
  container_code: string;
}
