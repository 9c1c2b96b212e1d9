import { inject, type DeepReadonly, type InjectionKey } from 'vue';
import type { GhsPictogram, MaterialKind, StorageClass } from '@shared/constants';
import { ADHESIVE_LIKE_KINDS, type Material, type MaterialInput } from '@shared/schemas/materials';

/**
 * The material form's state, shared by its sections (basics, times, mix and cure, hazards,
 * stock) through provide/inject. The draft holds what the fields show; `draftToInput` turns it
 * into the body the shared `materialInputSchema` checks (the same schema the route uses).
 */
export interface MaterialDraft {
  code: string;
  name: string;
  kind: MaterialKind | null;
  unit: string;
  storageClass: StorageClass;
  shelfLifeDays: number | null;
  openLifeHours: number | null;
  thawedLifeHours: number | null;
  outOfStorageAllowanceHours: number | null;
  potLifeMinutes: number | null;
  partnerMaterialId: string | null;
  mixRatio: number | null;
  hasCure: boolean;
  cure: {
    refTempC: number | null;
    handlingMinutes: number | null;
    fullCureMinutes: number | null;
    /** How the cure speeds up with temperature: a factor per +10 °C, or Arrhenius. */
    model: 'factor' | 'arrhenius';
    factorPer10C: number | null;
    activationEnergyKJ: number | null;
    /** ambient (room air), heat (oven schedule) or uv (dose): shared/cure-methods.ts */
    method: 'ambient' | 'heat' | 'uv';
    minTempC: number | null;
    schedule: { tempC: number | null; minutes: number | null }[];
    uvDoseMJcm2: number | null;
    rhMinPct: number | null;
    rhMaxPct: number | null;
  };
  requiresInspection: boolean;
  signalWord: 'Danger' | 'Warning' | null;
  pictograms: GhsPictogram[];
  statements: string[];
  gtin: string;
  reorderPoint: number | null;
  orderQuantity: number | null;
  leadTimeDays: number | null;
}

/** Every field the form shows, as the API names them (for mapping errors onto fields). */
export const MATERIAL_FIELDS = [
  'code',
  'name',
  'kind',
  'unit',
  'storageClass',
  'shelfLifeDays',
  'openLifeHours',
  'thawedLifeHours',
  'outOfStorageAllowanceHours',
  'potLifeMinutes',
  'partnerMaterialId',
  'mixRatio',
  'cure',
  'cure.refTempC',
  'cure.handlingMinutes',
  'cure.fullCureMinutes',
  'cure.factorPer10C',
  'cure.activationEnergyKJ',
  'cure.method',
  'cure.minTempC',
  'cure.schedule',
  'cure.uvDoseMJcm2',
  'cure.rhMinPct',
  'cure.rhMaxPct',
  'requiresInspection',
  'hazards.signalWord',
  'hazards.pictograms',
  'hazards.statements',
  'gtin',
  'reorderPoint',
  'orderQuantity',
  'leadTimeDays',
] as const;

/** What each field is called on screen, so error messages name it. */
export const MATERIAL_FIELD_LABELS: Readonly<Record<string, string>> = {
  code: 'Code',
  name: 'Name',
  kind: 'Kind',
  unit: 'Unit',
  storageClass: 'Storage class',
  shelfLifeDays: 'Shelf life',
  openLifeHours: 'After-opening life',
  thawedLifeHours: 'Life after thawing',
  outOfStorageAllowanceHours: 'Out-of-storage allowance',
  potLifeMinutes: 'Pot life',
  partnerMaterialId: 'Mix partner',
  mixRatio: 'Mix ratio',
  cure: 'Cure profile',
  'cure.refTempC': 'Reference temperature',
  'cure.handlingMinutes': 'Handling time',
  'cure.fullCureMinutes': 'Full-cure time',
  'cure.factorPer10C': 'Rate factor',
  'cure.activationEnergyKJ': 'Activation energy',
  'cure.method': 'Cure method',
  'cure.minTempC': 'Minimum cure temperature',
  'cure.schedule': 'Oven schedule',
  'cure.uvDoseMJcm2': 'UV dose',
  'cure.rhMinPct': 'Lowest humidity',
  'cure.rhMaxPct': 'Highest humidity',
  requiresInspection: 'Inspection',
  'hazards.signalWord': 'Signal word',
  'hazards.pictograms': 'Pictograms',
  'hazards.statements': 'Hazard statements',
  gtin: 'GTIN',
  reorderPoint: 'Reorder point',
  orderQuantity: 'Order quantity',
  leadTimeDays: 'Lead time',
};

export function emptyDraft(): MaterialDraft {
  return {
    code: '',
    name: '',
    kind: null,
    unit: '',
    storageClass: 'ambient',
    shelfLifeDays: null,
    openLifeHours: null,
    thawedLifeHours: null,
    outOfStorageAllowanceHours: null,
    potLifeMinutes: null,
    partnerMaterialId: null,
    mixRatio: null,
    hasCure: false,
    cure: {
      refTempC: 23,
      handlingMinutes: null,
      fullCureMinutes: null,
      model: 'factor',
      factorPer10C: 2,
      activationEnergyKJ: null,
      method: 'ambient',
      minTempC: null,
      schedule: [],
      uvDoseMJcm2: null,
      rhMinPct: null,
      rhMaxPct: null,
    },
    requiresInspection: true,
    signalWord: null,
    pictograms: [],
    statements: [],
    gtin: '',
    reorderPoint: null,
    orderQuantity: null,
    leadTimeDays: null,
  };
}

export function draftFromMaterial(m: DeepReadonly<Material>): MaterialDraft {
  return {
    code: m.code,
    name: m.name,
    kind: m.kind,
    unit: m.unit,
    storageClass: m.storageClass,
    shelfLifeDays: m.shelfLifeDays,
    openLifeHours: m.openLifeHours,
    thawedLifeHours: m.thawedLifeHours,
    outOfStorageAllowanceHours: m.outOfStorageAllowanceHours,
    potLifeMinutes: m.potLifeMinutes,
    partnerMaterialId: m.partnerMaterialId,
    mixRatio: m.mixRatio,
    hasCure: m.cure !== null,
    cure: {
      refTempC: m.cure?.refTempC ?? 23,
      handlingMinutes: m.cure?.handlingMinutes ?? null,
      fullCureMinutes: m.cure?.fullCureMinutes ?? null,
      model: m.cure?.activationEnergyKJ !== undefined ? 'arrhenius' : 'factor',
      factorPer10C: m.cure?.factorPer10C ?? (m.cure?.activationEnergyKJ !== undefined ? null : 2),
      activationEnergyKJ: m.cure?.activationEnergyKJ ?? null,
      method: m.cure?.method ?? 'ambient',
      minTempC: m.cure?.minTempC ?? null,
      schedule: (m.cure?.schedule ?? []).map((p) => ({ tempC: p.tempC, minutes: p.minutes })),
      uvDoseMJcm2: m.cure?.uvDoseMJcm2 ?? null,
      rhMinPct: m.cure?.rhMinPct ?? null,
      rhMaxPct: m.cure?.rhMaxPct ?? null,
    },
    requiresInspection: m.requiresInspection,
    signalWord: m.hazards.signalWord ?? null,
    pictograms: [...m.hazards.pictograms] as GhsPictogram[],
    statements: [...m.hazards.statements],
    gtin: m.gtin ?? '',
    reorderPoint: m.reorderPoint,
    orderQuantity: m.orderQuantity,
    leadTimeDays: m.leadTimeDays,
  };
}

/** A number field's value: '' (cleared) and null are "not given". */
export function num(value: unknown): number | null {
  if (value === '' || value === null || value === undefined) return null;
  const n = typeof value === 'number' ? value : Number(value);
  return Number.isNaN(n) ? null : n;
}

/** Inside the cure profile a missing number is "required", so it is left out rather than null. */
const required = (value: unknown): number | undefined => num(value) ?? undefined;

/**
 * The request body for the draft. Fields that do not apply to the kind or storage class are
 * sent empty (null), so a form that hid them cannot send stale values.
 */
export function draftToInput(d: MaterialDraft): MaterialInput {
  const adhesiveLike = d.kind !== null && ADHESIVE_LIKE_KINDS.includes(d.kind);
  const cure =
    adhesiveLike && d.hasCure
      ? {
          refTempC: required(d.cure.refTempC) as number,
          handlingMinutes: required(d.cure.handlingMinutes) as number,
          fullCureMinutes: required(d.cure.fullCureMinutes) as number,
          ...(d.cure.model === 'factor'
            ? { factorPer10C: required(d.cure.factorPer10C) }
            : { activationEnergyKJ: required(d.cure.activationEnergyKJ) as number }),
          method: d.cure.method,
          ...(d.cure.method === 'ambient' && num(d.cure.minTempC) !== null ? { minTempC: num(d.cure.minTempC) as number } : {}),
          ...(d.cure.method === 'heat'
            ? { schedule: d.cure.schedule.map((p) => ({ tempC: required(p.tempC) as number, minutes: required(p.minutes) as number })) }
            : {}),
          ...(d.cure.method === 'uv' ? { uvDoseMJcm2: required(d.cure.uvDoseMJcm2) as number } : {}),
          ...(num(d.cure.rhMinPct) !== null ? { rhMinPct: num(d.cure.rhMinPct) as number } : {}),
          ...(num(d.cure.rhMaxPct) !== null ? { rhMaxPct: num(d.cure.rhMaxPct) as number } : {}),
        }
      : null;
  return {
    code: d.code,
    name: d.name,
    kind: (d.kind ?? undefined) as MaterialKind,
    unit: d.unit,
    storageClass: d.storageClass,
    shelfLifeDays: num(d.shelfLifeDays),
    openLifeHours: num(d.openLifeHours),
    thawedLifeHours: d.storageClass === 'frozen' ? num(d.thawedLifeHours) : null,
    outOfStorageAllowanceHours: d.storageClass === 'refrigerated' ? num(d.outOfStorageAllowanceHours) : null,
    potLifeMinutes: adhesiveLike ? num(d.potLifeMinutes) : null,
    partnerMaterialId: adhesiveLike ? d.partnerMaterialId : null,
    mixRatio: adhesiveLike ? num(d.mixRatio) : null,
    cure,
    requiresInspection: d.requiresInspection,
    hazards: { signalWord: d.signalWord ?? undefined, pictograms: d.pictograms, statements: d.statements },
    gtin: d.gtin.trim() === '' ? null : d.gtin.trim(),
    reorderPoint: num(d.reorderPoint),
    orderQuantity: num(d.orderQuantity),
    leadTimeDays: num(d.leadTimeDays),
  };
}

export interface MaterialFormContext {
  draft: MaterialDraft;
  /** Error shown at each field (dotted names, see MATERIAL_FIELDS). */
  errors: Record<string, string>;
  /** Forget a field's error once the person changes it. */
  clear: (field: string) => void;
  /** `v-bind` for a Quasar field: its error state and message. */
  fieldProps: (field: string) => { error: boolean; errorMessage: string | undefined };
  /** The other materials (for the mix partner). */
  others: readonly DeepReadonly<Material>[];
}

export const MATERIAL_FORM: InjectionKey<MaterialFormContext> = Symbol('material-form');

export function useMaterialForm(): MaterialFormContext {
  const context = inject(MATERIAL_FORM);
  if (!context) throw new Error('material form sections must be used inside MaterialForm');
  return context;
}
