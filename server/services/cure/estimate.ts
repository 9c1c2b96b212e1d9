import { eq } from 'drizzle-orm';
import { db } from '../../db/client';
import { materials } from '../../db/schema';
import { AppError, fieldError } from '../../errors';
import { methodCureTimes, uvExposureSeconds, type MethodCureProfile } from '../../../shared/cure-methods';
import type { CureEstimate, CureEstimateInput } from '../../../shared/schemas/cure';

/**
 * POST /api/cure/estimate: the same computation as the gate and the cure board
 * (shared/cure-methods.ts): handling and full-cure times of a heat or ambient cure at a
 * temperature or over readings; the exposure a UV cure needs at a lamp's irradiance.
 */
export async function estimateCure(input: CureEstimateInput): Promise<CureEstimate> {
  const [m] = await db.select({ name: materials.name, cure: materials.cure }).from(materials).where(eq(materials.id, input.materialId));
  if (!m)
    throw new AppError('NOT_FOUND', 'The material was not found.', 404, [
      { field: 'materialId', message: 'is not a material in the catalogue' },
    ]);
  if (!m.cure) throw fieldError('materialId', `names ${m.name}, which has no cure profile in the catalogue`);
  const profile: MethodCureProfile = m.cure;
  const cureMethod = profile.method ?? 'ambient';
  if (cureMethod === 'uv') {
    if (input.irradianceMWcm2 === undefined) throw fieldError('irradianceMWcm2', `is required: ${m.name} cures under UV light, by dose`);
    const dose = profile.uvDoseMJcm2;
    if (dose === undefined || dose === null) throw fieldError('materialId', `names ${m.name}, which has no UV dose in the catalogue`);
    return {
      cureMethod,
      exposureSeconds: uvExposureSeconds(dose, input.irradianceMWcm2),
      doseMJcm2: dose,
      irradianceMWcm2: input.irradianceMWcm2,
    };
  }
  if (input.irradianceMWcm2 !== undefined)
    throw fieldError('irradianceMWcm2', `is for UV-curing adhesives; ${m.name} cures by time and temperature`);
  const startAt = input.startAt as string;
  const t = methodCureTimes(profile, startAt, input.readings ?? (input.tempC as number));
  const start = Date.parse(startAt);
  const minutes = (at: string | null) => (at === null ? null : (Date.parse(at) - start) / 60_000);
  const handlingMinutes = minutes(t.handlingAt);
  const fullCureMinutes = minutes(t.fullCureAt);
  return {
    cureMethod,
    handlingAt: t.handlingAt,
    fullCureAt: t.fullCureAt,
    factor: fullCureMinutes !== null && fullCureMinutes > 0 ? profile.fullCureMinutes / fullCureMinutes : fullCureMinutes === null ? 0 : 1,
    refTempC: profile.refTempC,
    handlingMinutes,
    fullCureMinutes,
    minutesBelowMin: t.minutesBelowMin,
    method: profile.activationEnergyKJ !== undefined && profile.activationEnergyKJ !== null ? 'arrhenius' : 'factor_per_10c',
  };
}
