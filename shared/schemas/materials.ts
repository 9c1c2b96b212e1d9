import { z } from 'zod';
import { GHS_PICTOGRAMS, MATERIAL_KINDS, STORAGE_CLASSES, type MaterialKind } from '../constants';
import { isValidGtin } from '../gs1';
import { CURE_METHODS } from '../cure-methods';
import { fitsColumn, idSchema, instantSchema, MIX_RATIO_COLUMN, QUANTITY_COLUMN } from './common';
import { attachmentSchema } from './attachments';

/**
 * Material catalogue: the shapes the API sends and accepts (api.md `Material`, plus
 * thawedLifeHours, outOfStorageAllowanceHours, mixRatio, gtin, sdsAttachmentId and active).
 *
 * The same input schema validates the admin form in the client and the request on the server.
 * Cross-field rules are refinements with a `path`, so every 400 names the field:
 *  - only adhesives, hardeners and activators have a mix partner, a pot life or a cure profile;
 *  - a pot life needs a mix partner and a cure profile (pot life is given at cure.refTempC);
 *  - cure.handlingMinutes ≤ cure.fullCureMinutes; cure.factorPer10C > 1; give either
 *    factorPer10C or activationEnergyKJ, not both;
 *  - frozen material needs thawedLifeHours; thawedLifeHours only for frozen material;
 *    outOfStorageAllowanceHours only for refrigerated material.
 * Rules that need the database (the partner exists, is a different material, the pair is one
 * adhesive and one hardener/activator, pairs are mutual) are checked by the service.
 */

/** zod error option: "is required" when the field is missing, else `message`. */
export const orRequired = (message: string) => ({
  error: (issue: { input?: unknown }) => (issue.input === undefined ? 'is required' : message),
});

/** A required id (UUID) that says "is required" when missing. */
export const requiredIdSchema = z.string(orRequired('must be an id (UUID)')).pipe(idSchema);

export const materialKindSchema = z.enum(MATERIAL_KINDS, orRequired('must be one of: ' + MATERIAL_KINDS.join(', ')));
export const storageClassSchema = z.enum(STORAGE_CLASSES, orRequired('must be one of: ' + STORAGE_CLASSES.join(', ')));
export const ghsPictogramSchema = z.enum(GHS_PICTOGRAMS, { error: 'must be a GHS pictogram code GHS01 … GHS09' });
export const signalWordSchema = z.enum(['Danger', 'Warning'], { error: 'must be Danger or Warning' });

/** `:id` route parameter. */
export const materialParamsSchema = z.object({ id: idSchema });

/** Kinds that take part in mixing and curing. */
export const ADHESIVE_LIKE_KINDS: readonly MaterialKind[] = ['adhesive', 'hardener', 'activator'];
/** Kinds that may be the "second part" of a two-part pair. */
export const CURING_AGENT_KINDS: readonly MaterialKind[] = ['hardener', 'activator'];

/**
 * A UN GHS hazard statement code (H200–H499) or an EU supplemental code (EUH…), with the
 * letter suffixes used for reproductive toxicity (H360FD) and combinations (H301+H311).
 */
export const HAZARD_STATEMENT_RE = /^(?:EUH\d{3}|H[2-4]\d{2}[A-Za-z]{0,2})(?:\+(?:EUH\d{3}|H[2-4]\d{2}[A-Za-z]{0,2}))*$/;

const statementSchema = z
  .string()
  .trim()
  // Prefixes are upper case; suffix letters keep their case (H360Fd: F and d mean different things).
  .transform((s) =>
    s
      .split('+')
      .map((part) => part.trim().replace(/^(euh|h)/i, (p) => p.toUpperCase()))
      .join('+'),
  )
  .pipe(z.string().regex(HAZARD_STATEMENT_RE, 'must be a hazard statement code like H317 or EUH202'));

function unique<T>(list: T[]): boolean {
  return new Set(list).size === list.length;
}

export const hazardsSchema = z.object({
  signalWord: signalWordSchema.nullish().transform((v) => v ?? undefined),
  pictograms: z.array(ghsPictogramSchema).max(9).default([]).refine(unique, 'lists a pictogram twice'),
  statements: z.array(statementSchema).max(40).default([]).refine(unique, 'lists a statement twice'),
});
export type Hazards = z.infer<typeof hazardsSchema>;

const positiveInt = (what: string) =>
  z
    .number(orRequired(`must be a whole number of ${what}`))
    .int(`must be a whole number of ${what}`)
    .positive('must be more than 0');

const schedulePointSchema = z.object({
  tempC: z.number(orRequired('must be a temperature in °C')).min(20, 'must be at least 20 °C').max(300, 'must be at most 300 °C'),
  minutes: z.number(orRequired('must be a number of minutes')).positive('must be more than 0').max(525600, 'must be at most a year'),
});

export const cureProfileSchema = z
  .object({
    /** How it cures: in the room's air, in an oven by a schedule, or under a UV lamp by dose (shared/cure-methods.ts). */
    method: z.enum(CURE_METHODS, { error: 'must be one of: ' + CURE_METHODS.join(', ') }).default('ambient'),
    refTempC: z.number(orRequired('must be a temperature in °C')).min(-40, 'must be at least -40 °C').max(200, 'must be at most 200 °C'),
    handlingMinutes: z
      .number(orRequired('must be a number of minutes'))
      .positive('must be more than 0')
      .max(525600, 'must be at most a year'),
    fullCureMinutes: z
      .number(orRequired('must be a number of minutes'))
      .positive('must be more than 0')
      .max(525600, 'must be at most a year'),
    /** Rate factor per +10 °C (default 2: the rate roughly doubles every 10 °C, common practice). */
    factorPer10C: z
      .number(orRequired('must be a number'))
      .gt(1, 'must be more than 1 (the reaction speeds up when warmer)')
      .max(10, 'must be at most 10')
      .optional(),
    /** Arrhenius activation energy, kJ/mol; used instead of factorPer10C when given. */
    activationEnergyKJ: z
      .number(orRequired('must be a number of kJ/mol'))
      .positive('must be more than 0')
      .max(500, 'must be at most 500 kJ/mol')
      .optional(),
    /** ambient: no cure progress below this temperature (data sheets: "do not cure below 10 °C"). */
    minTempC: z
      .number(orRequired('must be a temperature in °C'))
      .min(-40, 'must be at least -40 °C')
      .max(100, 'must be at most 100 °C')
      .optional(),
    /** heat: the data sheet's cure schedule, (oven temperature, minutes) points. */
    schedule: z
      .array(schedulePointSchema, { error: 'must be a list of {tempC, minutes} points' })
      .max(12, 'has at most 12 points')
      .optional(),
    /** uv: the dose the adhesive needs, mJ/cm². */
    uvDoseMJcm2: z
      .number(orRequired('must be a dose in mJ/cm²'))
      .positive('must be more than 0')
      .max(1e6, 'must be at most 1,000,000 mJ/cm²')
      .optional(),
    /** Relative-humidity window from the data sheet (moisture-curing adhesives), %. */
    rhMinPct: z.number(orRequired('must be a percentage')).min(0, 'must be at least 0 %').max(100, 'must be at most 100 %').optional(),
    rhMaxPct: z.number(orRequired('must be a percentage')).min(0, 'must be at least 0 %').max(100, 'must be at most 100 %').optional(),
  })
  .superRefine((c, ctx) => {
    if (c.handlingMinutes > c.fullCureMinutes) {
      ctx.addIssue({ code: 'custom', path: ['handlingMinutes'], message: 'must not be longer than fullCureMinutes' });
    }
    if (c.factorPer10C !== undefined && c.activationEnergyKJ !== undefined) {
      ctx.addIssue({ code: 'custom', path: ['activationEnergyKJ'], message: 'give either factorPer10C or activationEnergyKJ, not both' });
    }
    if (c.method === 'heat') {
      if (!c.schedule || c.schedule.length === 0) {
        ctx.addIssue({
          code: 'custom',
          path: ['schedule'],
          message: 'a heat cure needs at least one schedule point (temperature, minutes)',
        });
      } else {
        const temps = c.schedule.map((p) => p.tempC);
        temps.forEach((t, i) => {
          if (temps.indexOf(t) !== i) ctx.addIssue({ code: 'custom', path: ['schedule', i, 'tempC'], message: `lists ${t} °C twice` });
        });
      }
    } else if (c.schedule !== undefined && c.schedule.length > 0) {
      ctx.addIssue({ code: 'custom', path: ['schedule'], message: 'only a heat cure has a schedule' });
    }
    if (c.method === 'uv' && c.uvDoseMJcm2 === undefined) {
      ctx.addIssue({ code: 'custom', path: ['uvDoseMJcm2'], message: 'a UV cure needs its dose in mJ/cm²' });
    }
    if (c.method !== 'uv' && c.uvDoseMJcm2 !== undefined) {
      ctx.addIssue({ code: 'custom', path: ['uvDoseMJcm2'], message: 'only a UV cure has a dose' });
    }
    if (c.method !== 'ambient' && c.minTempC !== undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['minTempC'],
        message: 'only a room-temperature (ambient) cure has a minimum cure temperature',
      });
    }
    if (c.rhMinPct !== undefined && c.rhMaxPct !== undefined && c.rhMinPct >= c.rhMaxPct) {
      ctx.addIssue({ code: 'custom', path: ['rhMaxPct'], message: 'must be above rhMinPct' });
    }
  });
export type CureProfile = z.infer<typeof cureProfileSchema>;

/** GTIN-8/12/13/14 with a correct check digit (GS1 General Specifications), stored as 14 digits. */
export const gtinSchema = z
  .string()
  .trim()
  .regex(/^\d{8}$|^\d{12,14}$/, 'must be a GTIN of 8, 12, 13 or 14 digits')
  .refine(isValidGtin, 'has a wrong check digit')
  .transform((g) => g.padStart(14, '0'));

const quantity = (msg: string) =>
  fitsColumn(z.number(orRequired(msg)).min(0, 'must not be negative').max(1e9, 'is too large'), QUANTITY_COLUMN);

/** Every editable field of a material; nullable fields accept null (cleared) or absence. */
export const materialFieldsSchema = z.object({
  code: z
    .string(orRequired('must be text'))
    .trim()
    .min(1, 'is required')
    .max(40, 'must be at most 40 characters')
    .regex(/^[A-Za-z0-9][A-Za-z0-9._\-/]*$/, 'may contain letters, digits and . _ - / only'),
  name: z.string(orRequired('must be text')).trim().min(1, 'is required').max(200, 'must be at most 200 characters'),
  kind: materialKindSchema,
  unit: z.string(orRequired('must be text')).trim().min(1, 'is required').max(16, 'must be at most 16 characters'),
  storageClass: storageClassSchema.default('ambient'),
  shelfLifeDays: positiveInt('days').max(36500, 'must be at most 100 years').nullish(),
  openLifeHours: positiveInt('hours').max(876000, 'is too long').nullish(),
  thawedLifeHours: positiveInt('hours').max(8760, 'must be at most a year').nullish(),
  outOfStorageAllowanceHours: positiveInt('hours').max(8760, 'must be at most a year').nullish(),
  potLifeMinutes: positiveInt('minutes').max(525600, 'must be at most a year').nullish(),
  partnerMaterialId: idSchema.nullish(),
  /** Parts by weight of this component per 1 part of the partner. */
  mixRatio: fitsColumn(
    z.number(orRequired('must be a number')).positive('must be more than 0').max(1000, 'must be at most 1000'),
    MIX_RATIO_COLUMN,
  ).nullish(),
  cure: cureProfileSchema.nullish(),
  requiresInspection: z.boolean(orRequired('must be true or false')).default(true),
  hazards: hazardsSchema.default({ signalWord: undefined, pictograms: [], statements: [] }),
  gtin: gtinSchema.nullish(),
  reorderPoint: quantity('must be a quantity').nullish(),
  orderQuantity: quantity('must be a quantity')
    .refine((n) => n > 0, 'must be more than 0')
    .nullish(),
  leadTimeDays: z
    .number(orRequired('must be a whole number of days'))
    .int('must be a whole number of days')
    .min(0, 'must not be negative')
    .max(3650, 'must be at most 10 years')
    .nullish(),
});

type MaterialFields = z.infer<typeof materialFieldsSchema>;

/** The cross-field rules, shared by create and by the service when it checks a merged edit. */
export function checkMaterialRules(m: MaterialFields, ctx: z.RefinementCtx): void {
  const issue = (path: string, message: string) => ctx.addIssue({ code: 'custom', path: [path], message });
  const adhesiveLike = ADHESIVE_LIKE_KINDS.includes(m.kind);
  if (!adhesiveLike) {
    if (m.partnerMaterialId) issue('partnerMaterialId', 'only adhesives, hardeners and activators have a mix partner');
    if (m.potLifeMinutes) issue('potLifeMinutes', 'only adhesives, hardeners and activators have a pot life');
    if (m.cure) issue('cure', 'only adhesives, hardeners and activators have a cure profile');
  }
  if (m.potLifeMinutes && !m.partnerMaterialId)
    issue('partnerMaterialId', 'is required when a pot life is given (pot life is for two-part mixes)');
  if (m.potLifeMinutes && !m.cure)
    issue('cure', 'is required when a pot life is given (pot life is given at the cure reference temperature)');
  if (m.mixRatio && !m.partnerMaterialId) issue('mixRatio', 'needs a mix partner');
  if (m.storageClass === 'frozen' && !m.thawedLifeHours)
    issue('thawedLifeHours', 'is required for frozen material (usable time after the thaw)');
  if (m.storageClass !== 'frozen' && m.thawedLifeHours) issue('thawedLifeHours', 'applies to frozen material only');
  if (m.storageClass !== 'refrigerated' && m.outOfStorageAllowanceHours)
    issue('outOfStorageAllowanceHours', 'applies to refrigerated material only');
}

/** POST /api/materials body. */
export const materialInputSchema = materialFieldsSchema.superRefine(checkMaterialRules);
export type MaterialInput = z.input<typeof materialInputSchema>;
export type MaterialValues = z.output<typeof materialInputSchema>;

/**
 * PATCH /api/materials/:id body: any subset of the fields (null clears an optional one), and
 * `active` to reinstate a retired material. The service checks the cross-field rules on the
 * merged result.
 */
export const materialPatchSchema = z
  .object({
    code: materialFieldsSchema.shape.code,
    name: materialFieldsSchema.shape.name,
    kind: materialKindSchema,
    unit: materialFieldsSchema.shape.unit,
    storageClass: storageClassSchema,
    shelfLifeDays: materialFieldsSchema.shape.shelfLifeDays,
    openLifeHours: materialFieldsSchema.shape.openLifeHours,
    thawedLifeHours: materialFieldsSchema.shape.thawedLifeHours,
    outOfStorageAllowanceHours: materialFieldsSchema.shape.outOfStorageAllowanceHours,
    potLifeMinutes: materialFieldsSchema.shape.potLifeMinutes,
    partnerMaterialId: materialFieldsSchema.shape.partnerMaterialId,
    mixRatio: materialFieldsSchema.shape.mixRatio,
    cure: materialFieldsSchema.shape.cure,
    requiresInspection: z.boolean(orRequired('must be true or false')),
    hazards: hazardsSchema,
    gtin: materialFieldsSchema.shape.gtin,
    reorderPoint: materialFieldsSchema.shape.reorderPoint,
    orderQuantity: materialFieldsSchema.shape.orderQuantity,
    leadTimeDays: materialFieldsSchema.shape.leadTimeDays,
    active: z.boolean(orRequired('must be true or false')),
  })
  .partial()
  .refine((p) => Object.keys(p).length > 0, { message: 'says nothing to change' });
export type MaterialPatch = z.input<typeof materialPatchSchema>;

/** GET /api/materials query. */
export const materialListQuerySchema = z.object({
  active: z
    .enum(['true', 'false'], { error: 'must be true or false' })
    .transform((v) => v === 'true')
    .optional(),
  kind: materialKindSchema.optional(),
});
export type MaterialListQuery = z.output<typeof materialListQuerySchema>;

export const materialSchema = z.object({
  id: idSchema,
  code: z.string(),
  name: z.string(),
  kind: materialKindSchema,
  unit: z.string(),
  storageClass: storageClassSchema,
  shelfLifeDays: z.number().nullable(),
  openLifeHours: z.number().nullable(),
  thawedLifeHours: z.number().nullable(),
  outOfStorageAllowanceHours: z.number().nullable(),
  potLifeMinutes: z.number().nullable(),
  partnerMaterialId: idSchema.nullable(),
  mixRatio: z.number().nullable(),
  cure: z
    .object({
      refTempC: z.number(),
      handlingMinutes: z.number(),
      fullCureMinutes: z.number(),
      factorPer10C: z.number().optional(),
      activationEnergyKJ: z.number().optional(),
      method: z.enum(CURE_METHODS).optional(),
      minTempC: z.number().optional(),
      schedule: z.array(z.object({ tempC: z.number(), minutes: z.number() })).optional(),
      uvDoseMJcm2: z.number().optional(),
      rhMinPct: z.number().optional(),
      rhMaxPct: z.number().optional(),
    })
    .nullable(),
  requiresInspection: z.boolean(),
  hazards: z.object({
    signalWord: signalWordSchema.optional(),
    pictograms: z.array(z.string()),
    statements: z.array(z.string()),
  }),
  gtin: z.string().nullable(),
  sdsAttachmentId: idSchema.nullable(),
  reorderPoint: z.number().nullable(),
  orderQuantity: z.number().nullable(),
  leadTimeDays: z.number().nullable(),
  active: z.boolean(),
  createdAt: instantSchema,
  updatedAt: instantSchema,
});
export type Material = z.infer<typeof materialSchema>;

export const materialListSchema = z.object({ items: z.array(materialSchema) });
export const materialResultSchema = materialSchema;

/** POST /api/materials/:id/sds (admin) → 201: the stored safety data sheet and the material now naming it. */
export const sdsUploadResultSchema = z.object({ attachment: attachmentSchema, material: materialSchema });
export type SdsUploadResult = z.infer<typeof sdsUploadResultSchema>;
