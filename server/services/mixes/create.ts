import { asc, count, inArray, like, sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { db, type Tx } from '../../db/client';
import { containers, mixes } from '../../db/schema';
import { conflict } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import { findStation } from '../stations';
import { checkContainerUsable, containerByCode, containersByIds, type ContainerContext } from '../loading';
import { temperatureAt } from '../cure/readings';
import { adjustedMinutes, potLifeEndsAt } from '../../../shared/cure';
import type { MixInput, MixResult } from '../../../shared/schemas/mixes';
import { toMix } from './read';
import { config } from '../../config';

function checkPartners(resin: ContainerContext, hardener: ContainerContext): void {
  const r = resin.material;
  const h = hardener.material;
  if (r.id === h.id || (r.partnerMaterialId !== h.id && h.partnerMaterialId !== r.id)) {
    throw conflict(
      'NOT_MIX_PARTNERS',
      `${r.name} and ${h.name} are not the two parts of one adhesive. Scan the ${r.name} resin's own hardener${r.partnerMaterialId ? '' : ' (the catalogue names no partner for it)'}.`,
      { resinMaterialId: r.id, hardenerMaterialId: h.id },
    );
  }
}

function checkQuantity(c: ContainerContext, qty: number, field: string): void {
  if (Math.round(Number(c.container.remaining) * 1000) < Math.round(qty * 1000)) {
    throw conflict(
      'INSUFFICIENT_STOCK',
      `Container ${c.container.code} holds ${Number(c.container.remaining)} ${c.material.unit} of ${c.material.name}, less than the ${qty} ${c.material.unit} asked for. Use less or another container.`,
      { field, materialId: c.material.id, available: Number(c.container.remaining), needed: qty },
    );
  }
}

/** Takes the quantity out of a part, opening it if sealed. Conditional, so stock never goes negative. */
async function drawPart(tx: Tx, actor: Actor, c: ContainerContext, qty: number, now: Date, mixCode: string): Promise<void> {
  const q = qty.toFixed(3);
  const [row] = await tx
    .update(containers)
    .set({
      remaining: sql`${containers.remaining} - ${q}::numeric`,
      status: sql`CASE WHEN ${containers.remaining} - ${q}::numeric = 0 THEN 'empty'::container_status ELSE 'open'::container_status END`,
      openedAt: c.container.openedAt ?? now,
      updatedAt: now,
    })
    .where(sql`${containers.id} = ${c.container.id} AND ${containers.remaining} >= ${q}::numeric`)
    .returning();
  if (!row)
    throw conflict('INSUFFICIENT_STOCK', `Container ${c.container.code} no longer holds ${q} ${c.material.unit}; use another container.`);
  await recordAudit(tx, {
    actorId: actor.id,
    action: 'container.consume',
    entityType: 'container',
    entityId: row.id,
    before: { remaining: c.container.remaining, status: c.container.status, openedAt: c.container.openedAt?.toISOString() ?? null },
    after: { remaining: row.remaining, status: row.status, openedAt: row.openedAt?.toISOString() ?? null },
    reason: `mixed into ${mixCode}`,
  });
}

/**
 * POST /api/stations/:id/mixes — mixes two partner containers. Pot life starts now, adjusted to
 * the area's temperature (the latest recent reading, else the reference temperature).
 */
export async function createMix(actor: Actor, stationId: string, input: MixInput, now: Date = new Date()): Promise<MixResult> {
  requirePermission(actor, 'mixes.create');
  return db.transaction(async (tx) => {
    const station = await findStation(tx, stationId);
    if (!station.active) throw conflict('STATION_RETIRED', `Station ${station.code} is retired; mix at an active station.`);
    const resin0 = await containerByCode(tx, input.resinCode, 'resinCode');
    const hardener0 = await containerByCode(tx, input.hardenerCode, 'hardenerCode');
    if (resin0.container.id === hardener0.container.id) {
      throw conflict('NOT_MIX_PARTNERS', 'The resin and the hardener are the same container; scan the other part.');
    }
    // Lock both parts in id order (concurrent mixes and finishes lock containers the same way).
    await tx
      .select({ id: containers.id })
      .from(containers)
      .where(inArray(containers.id, [resin0.container.id, hardener0.container.id]))
      .orderBy(asc(containers.id))
      .for('update');
    const parts = await containersByIds(tx, [resin0.container.id, hardener0.container.id]);
    const resin = parts.get(resin0.container.id)!;
    const hardener = parts.get(hardener0.container.id)!;

    checkPartners(resin, hardener);
    checkContainerUsable(resin.container, resin.lot, resin.material, now);
    checkContainerUsable(hardener.container, hardener.lot, hardener.material, now);
    checkQuantity(resin, input.resinQuantity, 'resinQuantity');
    checkQuantity(hardener, input.hardenerQuantity, 'hardenerQuantity');

    const refPotLife = resin.material.potLifeMinutes ?? hardener.material.potLifeMinutes;
    if (!refPotLife) {
      throw conflict(
        'POT_LIFE_UNKNOWN',
        `The catalogue gives no pot life for ${resin.material.name}; an administrator must set it before it can be mixed here.`,
      );
    }
    const profile = resin.material.cure ?? hardener.material.cure;
    const temp = profile ? await temperatureAt(tx, station.area, now, profile.refTempC) : null;
    const endsAt =
      profile && temp
        ? potLifeEndsAt(refPotLife, profile, now.toISOString(), temp.tempC)
        : new Date(now.getTime() + refPotLife * 60_000).toISOString();
    const minutes = profile && temp ? adjustedMinutes(refPotLife, profile, temp.tempC) : refPotLife;

    // MX-<yyMMdd of the plant day>-<seq of the day>, one writer per day at a time.
    const prefix = `MX-${DateTime.fromJSDate(now).setZone(config.plantZone).toFormat('yyMMdd')}-`;
    await tx.execute(sql`SELECT pg_advisory_xact_lock(hashtext(${`mix-code:${prefix}`}))`);
    const [{ n }] = await tx
      .select({ n: count() })
      .from(mixes)
      .where(like(mixes.code, `${prefix}%`));
    const code = `${prefix}${String(n + 1).padStart(3, '0')}`;

    await drawPart(tx, actor, resin, input.resinQuantity, now, code);
    await drawPart(tx, actor, hardener, input.hardenerQuantity, now, code);
    const total = (Math.round(input.resinQuantity * 1000) + Math.round(input.hardenerQuantity * 1000)) / 1000;
    const [row] = await tx
      .insert(mixes)
      .values({
        code,
        stationId: station.id,
        resinContainerId: resin.container.id,
        hardenerContainerId: hardener.container.id,
        resinQuantity: input.resinQuantity.toFixed(3),
        hardenerQuantity: input.hardenerQuantity.toFixed(3),
        remaining: total.toFixed(3),
        mixedAt: now,
        potLifeEndsAt: new Date(endsAt),
        tempC: temp ? temp.tempC.toFixed(2) : null,
        mixedBy: actor.id,
      })
      .returning();
    const mix = toMix(row, resin, hardener);
    await recordAudit(tx, { actorId: actor.id, action: 'mix.create', entityType: 'mix', entityId: row.id, after: mix });
    return {
      mix,
      // Without a cure profile the pot life is not temperature-adjusted, so no temperature is reported.
      temperature: temp
        ? {
            tempC: temp.tempC,
            source: temp.source,
            readingAt: temp.readingAt,
            area: station.area,
            potLifeMinutes: Math.round(minutes * 10) / 10,
            referencePotLifeMinutes: refPotLife,
          }
        : undefined,
    };
  });
}
