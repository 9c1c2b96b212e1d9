import { eq, sql } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { rowFromJson, rowJson } from '../../server/db/row-json';
import { containers, lots, materials } from '../../server/db/schema';
import { createLot, createTwoPart } from '../helpers/fixtures';

// The load's one-statement context carries its container, lot and material as JSON: they must
// come back exactly as drizzle's own select gives them (Dates, exact numeric text, jsonb, nulls).
describe('rows as JSON inside a statement', () => {
  it("container, lot and material equal drizzle's select of the same rows", async () => {
    const { resin } = await createTwoPart({ potLifeMinutes: 45 });
    const lot = await createLot({
      materialId: resin.id,
      quantity: 123.456,
      remaining: 0.5,
      manufacturedOn: '2026-01-31',
      expiresOn: '2027-01-31',
      containerStatus: 'open',
      openedAt: new Date('2026-11-30T07:08:09.123Z'),
    });
    const [expected] = await db
      .select({ container: containers, lot: lots, material: materials })
      .from(containers)
      .innerJoin(lots, eq(lots.id, containers.lotId))
      .innerJoin(materials, eq(materials.id, lots.materialId))
      .where(eq(containers.lotId, lot.id));
    const { rows } = await db.execute<{ c: Record<string, unknown>; l: Record<string, unknown>; m: Record<string, unknown> }>(sql`
      SELECT ${rowJson(containers, 'c')} AS c, ${rowJson(lots, 'l')} AS l, ${rowJson(materials, 'm')} AS m
      FROM containers c JOIN lots l ON l.id = c.lot_id JOIN materials m ON m.id = l.material_id
      WHERE c.lot_id = ${lot.id}`);
    expect(rowFromJson(containers, rows[0].c)).toEqual(expected.container);
    expect(rowFromJson(lots, rows[0].l)).toEqual(expected.lot);
    expect(rowFromJson(materials, rows[0].m)).toEqual(expected.material);
    // The values that differ most easily: exact numeric digits, a microsecond-less Date, a date string.
    expect(expected.container.remaining).toBe('0.500');
    expect(rowFromJson(containers, rows[0].c)!.openedAt).toEqual(new Date('2026-11-30T07:08:09.123Z'));
    expect(rowFromJson(lots, rows[0].l)!.expiresOn).toBe('2027-01-31');
    expect(rowFromJson(containers, null)).toBeNull();
  });
});
