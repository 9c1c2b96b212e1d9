import { and, asc, eq, ne, sql } from 'drizzle-orm';
import { db, type DbOrTx, type Tx } from '../../db/client';
import { suppliers } from '../../db/schema';
import { conflict, notFound } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import type { Supplier, SupplierPatch, SupplierValues } from '../../../shared/schemas/suppliers';

export type SupplierRow = typeof suppliers.$inferSelect;

export function toSupplier(row: SupplierRow): Supplier {
  return {
    id: row.id,
    code: row.code,
    name: row.name,
    contactName: row.contactName,
    email: row.email,
    phone: row.phone,
    address: row.address,
    notes: row.notes,
    active: row.active,
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

export async function findSupplier(tx: DbOrTx, id: string, lock = false): Promise<SupplierRow> {
  const q = tx.select().from(suppliers).where(eq(suppliers.id, id));
  const [row] = lock ? await q.for('update') : await q;
  if (!row) throw notFound('The supplier');
  return row;
}

export async function listSuppliers(query: { active?: boolean }): Promise<{ items: Supplier[] }> {
  const where = query.active === undefined ? undefined : eq(suppliers.active, query.active);
  const rows = await db.select().from(suppliers).where(where).orderBy(asc(suppliers.name));
  return { items: rows.map(toSupplier) };
}

export async function getSupplier(id: string): Promise<Supplier> {
  return toSupplier(await findSupplier(db, id));
}

async function checkUnique(tx: Tx, name: string | undefined, code: string | undefined, exceptId: string | null): Promise<void> {
  const notSelf = exceptId ? ne(suppliers.id, exceptId) : undefined;
  if (name !== undefined) {
    const [same] = await tx
      .select({ id: suppliers.id })
      .from(suppliers)
      .where(and(eq(sql`lower(${suppliers.name})`, name.toLowerCase()), notSelf))
      .limit(1);
    if (same)
      throw conflict('DUPLICATE_NAME', `A supplier named "${name}" already exists.`, [{ field: 'name', message: 'is already used' }]);
  }
  if (code !== undefined) {
    const [same] = await tx
      .select({ id: suppliers.id })
      .from(suppliers)
      .where(and(eq(suppliers.code, code), notSelf))
      .limit(1);
    if (same)
      throw conflict('DUPLICATE_CODE', `A supplier with the code "${code}" already exists; choose another code.`, [
        { field: 'code', message: 'is already used' },
      ]);
  }
}

/** "Corvane Bonding Supplies" → SUP-CORVANEBOND, with -2, -3 … when taken. */
async function deriveCode(tx: Tx, name: string): Promise<string> {
  const stem = `SUP-${
    name
      .toUpperCase()
      .replace(/[^A-Z0-9]/g, '')
      .slice(0, 12) || 'X'
  }`;
  const taken = new Set(
    (
      await tx
        .select({ code: suppliers.code })
        .from(suppliers)
        .where(sql`${suppliers.code} LIKE ${`${stem}%`}`)
    ).map((r) => r.code),
  );
  if (!taken.has(stem)) return stem;
  for (let i = 2; ; i++) if (!taken.has(`${stem}-${i}`)) return `${stem}-${i}`;
}

export async function createSupplier(actor: Actor, input: SupplierValues): Promise<Supplier> {
  requirePermission(actor, 'suppliers.edit');
  return db.transaction(async (tx) => {
    await checkUnique(tx, input.name, input.code, null);
    const code = input.code ?? (await deriveCode(tx, input.name));
    const [row] = await tx
      .insert(suppliers)
      .values({
        name: input.name,
        code,
        contactName: input.contactName ?? null,
        email: input.email ?? null,
        phone: input.phone ?? null,
        address: input.address ?? null,
        notes: input.notes ?? null,
      })
      .onConflictDoNothing()
      .returning();
    if (!row) throw conflict('DUPLICATE_SUPPLIER', 'A supplier with this name or code was added a moment ago; reload and check.');
    const supplier = toSupplier(row);
    await recordAudit(tx, { actorId: actor.id, action: 'supplier.create', entityType: 'supplier', entityId: row.id, after: supplier });
    return supplier;
  });
}

export async function updateSupplier(actor: Actor, id: string, patch: SupplierPatch & { active?: boolean }): Promise<Supplier> {
  requirePermission(actor, 'suppliers.edit');
  return db.transaction(async (tx) => {
    const row = await findSupplier(tx, id, true);
    const changes = Object.fromEntries(Object.entries(patch).filter(([, v]) => v !== undefined)) as Partial<SupplierRow>;
    await checkUnique(tx, changes.name, changes.code, id);
    const [updated] = await tx
      .update(suppliers)
      .set({ ...changes, updatedAt: new Date() })
      .where(eq(suppliers.id, id))
      .returning();
    const before = toSupplier(row);
    const after = toSupplier(updated);
    await recordAudit(tx, { actorId: actor.id, action: 'supplier.update', entityType: 'supplier', entityId: id, before, after });
    return after;
  });
}

/** Retired suppliers stay in the records but new lots cannot be received from them. */
export async function retireSupplier(actor: Actor, id: string): Promise<Supplier> {
  requirePermission(actor, 'suppliers.edit');
  return db.transaction(async (tx) => {
    const row = await findSupplier(tx, id, true);
    if (!row.active) return toSupplier(row);
    const [updated] = await tx.update(suppliers).set({ active: false, updatedAt: new Date() }).where(eq(suppliers.id, id)).returning();
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'supplier.retire',
      entityType: 'supplier',
      entityId: id,
      before: { active: true },
      after: { active: false },
    });
    return toSupplier(updated);
  });
}
