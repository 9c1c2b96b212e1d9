import { describe, expect, it } from 'vitest';
import { draftToInput, emptyDraft } from '../../src/components/catalogue/materialForm';
import { materialInputSchema } from '../../shared/schemas/materials';

const adhesive = () => ({ ...emptyDraft(), code: 'MB-1', name: 'Magnet-bond epoxy', kind: 'adhesive' as const, unit: 'g', hasCure: true });

describe('material form: cure method fields', () => {
  it('a heat cure sends its schedule (and no minimum temperature); the server schema accepts it', () => {
    const d = adhesive();
    d.cure = {
      ...d.cure,
      handlingMinutes: 30,
      fullCureMinutes: 30,
      method: 'heat',
      minTempC: 10,
      schedule: [
        { tempC: 120, minutes: 30 },
        { tempC: 150, minutes: 15 },
      ],
    };
    const input = draftToInput(d);
    expect(input.cure).toMatchObject({
      method: 'heat',
      schedule: [
        { tempC: 120, minutes: 30 },
        { tempC: 150, minutes: 15 },
      ],
    });
    expect(input.cure).not.toHaveProperty('minTempC');
    expect(materialInputSchema.safeParse(input).success).toBe(true);
  });

  it('a UV cure without its dose is refused on the field cure.uvDoseMJcm2; an RH window goes with any method', () => {
    const d = adhesive();
    d.cure = { ...d.cure, handlingMinutes: 1, fullCureMinutes: 1, method: 'uv', rhMinPct: 40, rhMaxPct: 60 };
    const r = materialInputSchema.safeParse(draftToInput(d));
    expect(r.success).toBe(false);
    expect(r.error?.issues.map((i) => i.path.join('.'))).toEqual(['cure.uvDoseMJcm2']);
    d.cure.uvDoseMJcm2 = 3000;
    const ok = materialInputSchema.parse(draftToInput(d));
    expect(ok.cure).toMatchObject({ method: 'uv', uvDoseMJcm2: 3000, rhMinPct: 40, rhMaxPct: 60 });
  });
});
