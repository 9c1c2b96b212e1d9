import { asc, eq } from 'drizzle-orm';
import { db } from '../../db/client';
import { defectCodes } from '../../db/schema';
import { conflict, notFound } from '../../errors';
import { requirePermission, type Actor } from '../auth/actor';
import { recordAudit } from '../audit';
import type { DefectCode, DefectCodeCreate, DefectCodeListQuery, DefectCodeUpdate } from '../../../shared/schemas/defects';

type Row = typeof defectCodes.$inferSelect;
const toDefectCode = (r: Row): DefectCode => ({ code: r.code, description: r.description, active: r.active });

/** The defect code list (any signed-in person: testers pick from it). */
export async function listDefectCodes(query: DefectCodeListQuery): Promise<{ items: DefectCode[] }> {
  const rows = await db
    .select()
    .from(defectCodes)
    .where(query.active === undefined ? undefined : eq(defectCodes.active, query.active))
    .orderBy(asc(defectCodes.code));
  return { items: rows.map(toDefectCode) };
}

export async function createDefectCode(actor: Actor, input: DefectCodeCreate): Promise<DefectCode> {
  requirePermission(actor, 'defects.edit');
  return db.transaction(async (tx) => {
    const inserted = await tx.insert(defectCodes).values(input).onConflictDoNothing().returning();
    const row = inserted[0];
    if (!row)
      throw conflict('DUPLICATE', `Defect code ${input.code} already exists; edit it instead.`, [
        { field: 'code', message: 'already exists' },
      ]);
    await recordAudit(tx, { actorId: actor.id, action: 'defect_code.create', entityType: 'defect_code', entityId: row.code, after: row });
    return toDefectCode(row);
  });
}

export async function updateDefectCode(actor: Actor, code: string, input: DefectCodeUpdate): Promise<DefectCode> {
  requirePermission(actor, 'defects.edit');
  return db.transaction(async (tx) => {
    const [before] = await tx.select().from(defectCodes).where(eq(defectCodes.code, code)).for('update');
    if (!before) throw notFound(`Defect code ${code}`);
    const [after] = await tx
      .update(defectCodes)
      .set({ description: input.description ?? before.description, active: input.active ?? before.active })
      .where(eq(defectCodes.code, code))
      .returning();
    await recordAudit(tx, { actorId: actor.id, action: 'defect_code.update', entityType: 'defect_code', entityId: code, before, after });
    return toDefectCode(after);
  });
}
