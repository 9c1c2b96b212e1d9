/**
 * A table's row as one JSON value inside a hand-written statement, and back to the object
 * drizzle's own select would give. Lets a hot path fetch several tables' rows in the statement it
 * already runs (one round trip) with the same types as `db.select()`: numerics as exact text,
 * timestamps as Date — each column's own mapFromDriverValue does it; jsonb arrives parsed.
 */
import { getTableColumns, sql, type Column, type SQL } from 'drizzle-orm';
import type { PgTable } from 'drizzle-orm/pg-core';

const columnsOf = new WeakMap<PgTable, [string, Column][]>();
function columns(table: PgTable): [string, Column][] {
  let cols = columnsOf.get(table);
  if (!cols) {
    cols = Object.entries(getTableColumns(table));
    columnsOf.set(table, cols);
  }
  return cols;
}

/** json_build_object of every column of `table` as `alias` in the statement, keyed by property. */
export function rowJson(table: PgTable, alias: string): SQL {
  const cols = columns(table);
  if (cols.length > 50) throw new Error(`rowJson: ${alias} has more than 50 columns (json_build_object takes 100 arguments)`);
  const parts = cols.map(([prop, col]) => {
    if (!/^[A-Za-z_][A-Za-z0-9_]*$/.test(prop)) throw new Error(`rowJson: unexpected property name ${prop}`);
    const ref = sql`${sql.identifier(alias)}.${sql.identifier(col.name)}`;
    // Numeric as text: a JSON number would lose the column's exact digits.
    return sql`${sql.raw(`'${prop}'`)}, ${col.columnType === 'PgNumeric' ? sql`${ref}::text` : ref}`;
  });
  return sql`json_build_object(${sql.join(parts, sql`, `)})`;
}

/** The row object for `json` (from rowJson), as drizzle's select maps it; null stays null. */
export function rowFromJson<T extends PgTable>(table: T, json: Record<string, unknown> | null): T['$inferSelect'] | null {
  if (json === null) return null;
  const row: Record<string, unknown> = {};
  for (const [prop, col] of columns(table)) {
    const value = json[prop];
    row[prop] =
      value === null || value === undefined
        ? null
        : col.columnType === 'PgJsonb' || col.columnType === 'PgJson'
          ? value // already parsed with the row
          : col.mapFromDriverValue(value);
  }
  return row as T['$inferSelect'];
}
