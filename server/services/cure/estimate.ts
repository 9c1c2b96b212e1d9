import { eq } from 'drizzle-orm';
import { db } from '../../db/client';
import { materials } from '../../db/schema';
import { AppError, fieldError } from '../../errors';
import { cureTimes } from '../../../shared/cure';
import type { CureEstimate, CureEstimateInput } from '../../../shared/schemas/cure';

/** POST /api/cure/estimate: handling and full-cure times of a material at a temperature or over readings. */
export async function estimateCure(input: CureEstimateInput): Promise<CureEstimate> {
  const [m] = await db.select({ name: materials.name, cure: materials.cure }).from(materials).where(eq(materials.id, input.materialId));
  if (!m) throw new AppError('NOT_FOUND', 'The material was not found.', 404, [{ field: 'materialId', message: 'is not a material in the catalogue' }]);
  if (!m.cure) throw fieldError('materialId', `names ${m.name}, which has no cure profile in the catalogue`);
  const profile = m.cure;
  const t = cureTimes(profile, input.startAt, input.readings ?? (input.tempC as number));
  const start = Date.parse(input.startAt);
  const handlingMinutes = (Date.parse(t.handlingAt) - start) / 60_000;
  const fullCureMinutes = (Date.parse(t.fullCureAt) - start) / 60_000;
  return {
    handlingAt: t.handlingAt,
    fullCureAt: t.fullCureAt,
    factor: fullCureMinutes > 0 ? profile.fullCureMinutes / fullCureMinutes : 1,
    refTempC: profile.refTempC,
    handlingMinutes,
    fullCureMinutes,
    method: profile.activationEnergyKJ !== undefined && profile.activationEnergyKJ !== null ? 'arrhenius' : 'factor_per_10c',
  };
}
