import { eq } from 'drizzle-orm';
import { db } from '../../../db/client';
import { materials } from '../../../db/schema';
import { AppError } from '../../../errors';
import { Gs1Error, looksLikeGs1, parseGs1, type Gs1Result } from '../../../../shared/gs1';
import type { ScanResolver } from '../types';

function parse(code: string): Gs1Result {
  try {
    return parseGs1(code);
  } catch (err) {
    if (err instanceof Gs1Error) {
      const field = err.field === 'input' ? 'code' : err.field;
      throw new AppError('VALIDATION_FAILED', `The GS1 code is not valid: ${err.message}.`, 400, [
        { field, message: err.message, ...(err.ai ? { ai: err.ai } : {}) },
      ]);
    }
    throw err;
  }
}

/** A supplier's GS1 element string or Digital Link: what it says, and the material with its GTIN. */
export const gs1Resolver: ScanResolver = {
  type: 'gs1',
  async resolve({ code, gs1Symbology }) {
    if (!gs1Symbology && !looksLikeGs1(code)) return null;
    const parsed = parse(code);
    const [material] = parsed.gtin
      ? await db
          .select({ id: materials.id, code: materials.code, name: materials.name })
          .from(materials)
          .where(eq(materials.gtin, parsed.gtin))
          .limit(1)
      : [];
    return {
      type: 'gs1',
      ...(parsed.gtin !== undefined ? { gtin: parsed.gtin } : {}),
      ...(parsed.lot !== undefined ? { lot: parsed.lot } : {}),
      ...(parsed.expiresOn !== undefined ? { expiresOn: parsed.expiresOn } : {}),
      ...(parsed.producedOn !== undefined ? { producedOn: parsed.producedOn } : {}),
      ...(parsed.serial !== undefined ? { serial: parsed.serial } : {}),
      ...(parsed.count !== undefined ? { count: parsed.count } : {}),
      ...(material ? { materialId: material.id, materialCode: material.code, materialName: material.name } : {}),
      elements: parsed.elements,
    };
  },
};
