import { describe, expect, it } from 'vitest';
import { driverModelInputSchema } from '@shared/schemas/models';
import { emptyStep, moved, stepsInput } from '@/components/admin/recipe-draft';

describe('recipe editor drafts', () => {
  it('moves a step up or down and leaves the rest in order', () => {
    expect(moved(['a', 'b', 'c', 'd'], 2, -1)).toEqual(['a', 'c', 'b', 'd']);
    expect(moved(['a', 'b', 'c', 'd'], 0, 1)).toEqual(['b', 'a', 'c', 'd']);
    expect(moved(['a', 'b'], 0, -1)).toEqual(['a', 'b']);
    expect(moved(['a', 'b'], 1, 1)).toEqual(['a', 'b']);
  });

  it('sends steps in list order, and blanks reach the shared schema so it names the field', () => {
    const step = emptyStep();
    step.materials.push({ key: 'k', materialId: null, amountPerUnit: null });
    const result = driverModelInputSchema.safeParse({ code: 'HB15X', name: 'Test woofer', steps: stepsInput([step]) });
    expect(result.success).toBe(false);
    const fields = result.success ? [] : result.error.issues.map((i) => i.path.join('.'));
    expect(fields).toEqual(
      expect.arrayContaining([
        'steps.0.name',
        'steps.0.stationKind',
        'steps.0.materials.0.materialId',
        'steps.0.materials.0.amountPerUnit',
      ]),
    );
  });
});
