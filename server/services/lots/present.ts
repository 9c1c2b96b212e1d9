/**
 * Turning lot and container rows into API shapes, with their effective expiry from
 * shared/expiry.ts (the same computation the station screen and the compliance watch use).
 */
import type { attachments, containers, lots, materials } from '../../db/schema';
import { containerExpiry, lotExpiry, type ExpiryMaterial, type ExpiryResult } from '../../../shared/expiry';
import type { Container } from '../../../shared/schemas/containers';
import type { Lot } from '../../../shared/schemas/lots';
import type { Attachment } from '../../../shared/schemas/attachments';
import { config } from '../../config';

export type LotRow = typeof lots.$inferSelect;
export type ContainerRow = typeof containers.$inferSelect;
export type MaterialRow = typeof materials.$inferSelect;
export type AttachmentRow = typeof attachments.$inferSelect;

/** The plant's time zone: supplier expiry dates are usable through that whole day there. */
export const PLANT_ZONE = config.plantZone;

export function expiryMaterialOf(
  m: Pick<
    MaterialRow,
    'shelfLifeDays' | 'openLifeHours' | 'thawedLifeHours' | 'outOfStorageAllowanceHours' | 'potLifeMinutes' | 'storageClass'
  >,
): ExpiryMaterial {
  return {
    shelfLifeDays: m.shelfLifeDays,
    openLifeHours: m.openLifeHours,
    thawedLifeHours: m.thawedLifeHours,
    outOfStorageAllowanceHours: m.outOfStorageAllowanceHours,
    potLifeMinutes: m.potLifeMinutes,
    storageClass: m.storageClass,
  };
}

export function expiryLotOf(l: Pick<LotRow, 'receivedAt' | 'manufacturedOn' | 'expiresOn'>) {
  return { receivedAt: l.receivedAt.toISOString(), manufacturedOn: l.manufacturedOn, expiresOn: l.expiresOn };
}

export function lotExpiryOf(l: LotRow, m: MaterialRow, zone = PLANT_ZONE): ExpiryResult {
  return lotExpiry(expiryMaterialOf(m), expiryLotOf(l), zone);
}

export function containerExpiryOf(c: ContainerRow, l: LotRow, m: MaterialRow, now = new Date(), zone = PLANT_ZONE): ExpiryResult {
  return containerExpiry(
    expiryMaterialOf(m),
    expiryLotOf(l),
    {
      openedAt: c.openedAt?.toISOString() ?? null,
      thawedAt: c.thawedAt?.toISOString() ?? null,
      outOfStorageMinutes: c.outOfStorageMinutes,
      outOfStorageSince: c.outOfStorageSince?.toISOString() ?? null,
    },
    zone,
    now,
  );
}

const iso = (d: Date | null) => (d ? d.toISOString() : null);

export function toLot(l: LotRow, m: MaterialRow): Lot {
  const expiry = lotExpiryOf(l, m);
  return {
    id: l.id,
    materialId: l.materialId,
    supplierId: l.supplierId,
    supplierLot: l.supplierLot,
    gtin: l.gtin,
    status: l.status,
    receivedAt: l.receivedAt.toISOString(),
    manufacturedOn: l.manufacturedOn,
    expiresOn: l.expiresOn,
    certificateId: l.certificateId,
    certificateExpiresOn: l.certificateExpiresOn,
    notes: l.notes,
    receivedBy: l.receivedBy,
    statusReason: l.statusReason,
    statusChangedAt: iso(l.statusChangedAt),
    effectiveExpiry: expiry.at,
    expiryCause: expiry.cause,
    createdAt: l.createdAt.toISOString(),
  };
}

export function toContainer(c: ContainerRow, l: LotRow, m: MaterialRow, now = new Date()): Container {
  const expiry = containerExpiryOf(c, l, m, now);
  return {
    id: c.id,
    code: c.code,
    lotId: c.lotId,
    seq: c.seq,
    quantity: Number(c.quantity),
    remaining: Number(c.remaining),
    status: c.status,
    openedAt: iso(c.openedAt),
    thawedAt: iso(c.thawedAt),
    location: c.location,
    outOfStorageMinutes: c.outOfStorageMinutes,
    outOfStorageSince: iso(c.outOfStorageSince),
    effectiveExpiry: expiry.at,
    expiryCause: expiry.cause,
    createdAt: c.createdAt.toISOString(),
    updatedAt: c.updatedAt.toISOString(),
  };
}

export function toAttachment(a: AttachmentRow): Attachment {
  return {
    id: a.id,
    kind: a.kind,
    filename: a.filename,
    mimeType: a.mimeType,
    sizeBytes: a.sizeBytes,
    sha256: a.sha256,
    uploadedBy: a.uploadedBy,
    uploadedAt: a.uploadedAt.toISOString(),
    url: `/api/attachments/${a.id}`,
  };
}
