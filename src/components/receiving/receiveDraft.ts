import type { ReceiveLotInput } from '@shared/schemas/lots';
import { fromPlantInput } from '@shared/plant-time';

/** What the receiving form's fields hold (strings as the inputs give them). */
export interface ReceiveDraft {
  materialId: string | null;
  supplierId: string | null;
  supplierLot: string;
  containers: number | string | null;
  quantityPerContainer: number | string | null;
  manufacturedOn: string;
  expiresOn: string;
  /** datetime-local value (plant time); empty = now. */
  receivedAt: string;
  gtin: string;
  location: string;
  notes: string;
}

export const RECEIVE_FIELDS = [
  'materialId',
  'supplierId',
  'supplierLot',
  'containers',
  'quantityPerContainer',
  'manufacturedOn',
  'expiresOn',
  'receivedAt',
  'gtin',
  'location',
  'notes',
] as const;

/** What each field is called on screen, so error messages name it. */
export const RECEIVE_FIELD_LABELS: Readonly<Record<string, string>> = {
  materialId: 'Material',
  supplierId: 'Supplier',
  supplierLot: 'Supplier lot',
  containers: 'Containers',
  quantityPerContainer: 'Quantity',
  manufacturedOn: 'Manufacture date',
  expiresOn: 'Expiry date',
  receivedAt: 'Received at',
  gtin: 'GTIN',
  location: 'Location',
  notes: 'Notes',
};

export function emptyReceiveDraft(): ReceiveDraft {
  return {
    materialId: null,
    supplierId: null,
    supplierLot: '',
    containers: 1,
    quantityPerContainer: null,
    manufacturedOn: '',
    expiresOn: '',
    receivedAt: '',
    gtin: '',
    location: '',
    notes: '',
  };
}

function numberOrUndefined(v: number | string | null): number | undefined {
  if (v === null || v === '') return undefined;
  const n = Number(v);
  return Number.isNaN(n) ? undefined : n;
}

/**
 * A datetime-local value ("2026-03-04T07:30", plant time, not the browser's) as an ISO instant;
 * '' → undefined; anything unreadable is sent as it is so the server names the field.
 */
export function localToIso(value: string, zone: string): string | undefined {
  if (!value) return undefined;
  return fromPlantInput(value, zone) ?? value;
}

/** The POST /api/lots body for the draft (checked with receiveLotInputSchema before sending). */
export function draftToReceiveInput(d: ReceiveDraft, zone: string, confirmDuplicate = false): ReceiveLotInput {
  return {
    materialId: d.materialId ?? undefined,
    supplierId: d.supplierId ?? undefined,
    supplierLot: d.supplierLot,
    containers: numberOrUndefined(d.containers),
    quantityPerContainer: numberOrUndefined(d.quantityPerContainer),
    manufacturedOn: d.manufacturedOn || null,
    expiresOn: d.expiresOn || null,
    receivedAt: localToIso(d.receivedAt, zone) ?? null,
    gtin: d.gtin.trim() || null,
    location: d.location,
    notes: d.notes,
    confirmDuplicate,
  } as ReceiveLotInput;
}
