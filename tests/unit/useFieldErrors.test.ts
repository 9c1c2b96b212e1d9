import { describe, expect, it } from 'vitest';
import { materialInputSchema } from '../../shared/schemas/materials';
import { receiveLotInputSchema } from '../../shared/schemas/lots';
import { ApiError } from '../../src/api/http';
import { fieldFor, pathToField, sortIssues, useFieldErrors } from '../../src/composables/useFieldErrors';

const MATERIAL_FIELDS = [
  'code',
  'name',
  'kind',
  'unit',
  'storageClass',
  'thawedLifeHours',
  'cure',
  'cure.refTempC',
  'cure.handlingMinutes',
  'cure.fullCureMinutes',
  'hazards.statements',
  'hazards.pictograms',
  'gtin',
];

describe('field names', () => {
  it('joins a zod path with dots, as the API names fields in 400 details', () => {
    expect(pathToField(['cure', 'refTempC'])).toBe('cure.refTempC');
    expect(pathToField(['hazards', 'statements', 2])).toBe('hazards.statements.2');
    expect(pathToField([])).toBe('');
  });

  it('maps a field to the longest known field it lies inside', () => {
    expect(fieldFor('hazards.statements.2', MATERIAL_FIELDS)).toBe('hazards.statements');
    expect(fieldFor('cure.refTempC', MATERIAL_FIELDS)).toBe('cure.refTempC');
    expect(fieldFor('cure.factorPer10C', MATERIAL_FIELDS)).toBe('cure');
    expect(fieldFor('query.status', MATERIAL_FIELDS)).toBeNull();
    expect(fieldFor('anything', undefined)).toBe('anything');
  });

  it('keeps the first message per field and collects the rest for the form', () => {
    const sorted = sortIssues(
      [
        { field: 'code', message: 'is required' },
        { field: 'code', message: 'is too long' },
        { field: 'elsewhere', message: 'is odd' },
        { field: '', message: 'says nothing to change' },
      ],
      MATERIAL_FIELDS,
    );
    expect(sorted.fields).toEqual({ code: 'is required' });
    expect(sorted.general).toEqual(['elsewhere is odd', 'says nothing to change']);
  });
});

describe('useFieldErrors with the shared schemas', () => {
  it("puts the material schema's cross-field rules at the fields they name", () => {
    const form = useFieldErrors(MATERIAL_FIELDS);
    const data = form.validate(materialInputSchema, {
      code: 'ADH-X',
      name: 'Test adhesive',
      kind: 'adhesive',
      unit: 'g',
      storageClass: 'frozen',
      cure: { refTempC: 23, handlingMinutes: 200, fullCureMinutes: 100 },
      hazards: { pictograms: [], statements: ['H317', 'nonsense'] },
    });
    expect(data).toBeNull();
    // Frozen material needs a thawed life (shared/schemas/materials.ts checkMaterialRules).
    expect(form.errors.thawedLifeHours).toMatch(/required for frozen/);
    expect(form.errors['cure.handlingMinutes']).toMatch(/must not be longer than fullCureMinutes/);
    expect(form.errors['hazards.statements']).toMatch(/hazard statement code/);
    expect(form.fieldProps('thawedLifeHours').error).toBe(true);
    expect(form.fieldProps('name').error).toBe(false);
  });

  it('returns the parsed data and clears old errors when the input is valid', () => {
    const form = useFieldErrors(MATERIAL_FIELDS);
    form.show([{ field: 'code', message: 'is taken' }]);
    // GTIN 09501101530003 of the demo adhesive: check digit 3 by the GS1 mod-10 rule (gs1.org).
    const data = form.validate(materialInputSchema, {
      code: 'ADH-Y',
      name: 'Test adhesive',
      kind: 'adhesive',
      unit: 'g',
      gtin: '9501101530003',
    });
    expect(data?.gtin).toBe('09501101530003');
    expect(form.errors).toEqual({});
    expect(form.hasErrors.value).toBe(false);
  });

  it('shows a wrong GTIN check digit at the gtin field', () => {
    const form = useFieldErrors(MATERIAL_FIELDS);
    // GS1 General Specifications: 09501101530003 is valid, so ending in 4 is a wrong check digit.
    form.validate(materialInputSchema, { code: 'A', name: 'B', kind: 'other', unit: 'pcs', gtin: '09501101530004' });
    expect(form.errors.gtin).toBe('has a wrong check digit');
  });

  it("maps a server 400's details onto the named fields", () => {
    const form = useFieldErrors(['supplierLot', 'expiresOn']);
    const shown = form.fromApiError(
      new ApiError(400, 'VALIDATION_FAILED', 'Check the body: expiresOn must not be before manufacturedOn', [
        { field: 'expiresOn', message: 'must not be before manufacturedOn' },
      ]),
    );
    expect(shown).toBe(true);
    expect(form.errors.expiresOn).toBe('must not be before manufacturedOn');
    expect(form.formError.value).toBe('');
  });

  it("shows a refusal without fields (409, network) as the form's message", () => {
    const form = useFieldErrors(['supplierLot']);
    form.fromApiError(new ApiError(409, 'DUPLICATE_LOT', 'Lot L-9 of this material was received on 2026-03-01.'));
    // The catalogue's plain title, then the server's message; never the code.
    expect(form.formError.value).toBe('Supplier lot already received. Lot L-9 of this material was received on 2026-03-01.');
    expect(form.fromApiError(new Error('boom'))).toBe(false);
  });

  it('names a 400 field the form does not have in the form message', () => {
    const form = useFieldErrors(['supplierLot']);
    form.fromApiError(
      new ApiError(400, 'VALIDATION_FAILED', 'Check the body: gtin has a wrong check digit', [
        { field: 'gtin', message: 'has a wrong check digit' },
      ]),
    );
    expect(form.errors).toEqual({});
    expect(form.formError.value).toMatch(/gtin has a wrong check digit/);
  });

  it('receive-lot schema: quantity and containers are named when missing', () => {
    const form = useFieldErrors(['materialId', 'supplierId', 'supplierLot', 'containers', 'quantityPerContainer']);
    form.validate(receiveLotInputSchema, { supplierLot: '  ' });
    expect(form.errors.materialId).toBe('is required');
    expect(form.errors.supplierLot).toBe('is required');
    expect(form.errors.containers).toBe('is required');
    form.clear('containers');
    expect(form.errors.containers).toBeUndefined();
    expect(form.errors.materialId).toBe('is required');
  });

  it('names the field in each message when labels are given', () => {
    const form = useFieldErrors(['supplierLot', 'containers'], { supplierLot: 'Supplier lot', containers: 'Containers' });
    form.validate(receiveLotInputSchema, { supplierLot: '', containers: 0 });
    expect(form.errors.supplierLot).toBe('Supplier lot is required');
    // receiveLotInputSchema: at least one container per receipt.
    expect(form.errors.containers).toBe('Containers must be at least 1');
  });
});
