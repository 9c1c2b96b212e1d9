import type { DriverModel, RecipeStepInput } from '@shared/schemas/models';

/** A recipe step while it is being edited (list order is the step order). */
export interface StepDraft {
  key: string;
  name: string;
  stationKind: string;
  waitForCure: boolean;
  materials: { key: string; materialId: string | null; amountPerUnit: number | null }[];
}

let n = 0;
export const draftKey = () => `d${++n}`;

export function emptyStep(): StepDraft {
  return { key: draftKey(), name: '', stationKind: '', waitForCure: false, materials: [] };
}

export function draftsFromModel(model: DriverModel): StepDraft[] {
  return [...model.steps]
    .sort((a, b) => a.seq - b.seq)
    .map((s) => ({
      key: draftKey(),
      name: s.name,
      stationKind: s.stationKind,
      waitForCure: s.waitForCure,
      materials: s.materials.map((m) => ({ key: draftKey(), materialId: m.materialId, amountPerUnit: m.amountPerUnit })),
    }));
}

/** The steps as the API takes them: in list order (seq left to the server), blanks as undefined for the schema to name. */
export function stepsInput(drafts: readonly StepDraft[]): RecipeStepInput[] {
  return drafts.map((d) => ({
    name: d.name,
    stationKind: d.stationKind,
    waitForCure: d.waitForCure,
    materials: d.materials.map((m) => ({ materialId: m.materialId ?? '', amountPerUnit: m.amountPerUnit ?? Number.NaN })),
  }));
}

/** Moves the item at `from` by `by` places (−1 up, +1 down), keeping the list otherwise in order. */
export function moved<T>(list: readonly T[], from: number, by: number): T[] {
  const to = from + by;
  if (to < 0 || to >= list.length) return [...list];
  const out = [...list];
  const [item] = out.splice(from, 1);
  out.splice(to, 0, item);
  return out;
}
