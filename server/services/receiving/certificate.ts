import { eq } from 'drizzle-orm';
import { db } from '../../db/client';
import { lots, materials } from '../../db/schema';
import { notFound } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import { checkUpload, insertAttachment, withStoredFile, type UploadedFile } from '../attachments';
import { toAttachment, toLot } from '../lots/present';
import type { Attachment, CertificateFields } from '../../../shared/schemas/attachments';
import type { Lot } from '../../../shared/schemas/lots';

/**
 * Stores a lot's certificate of analysis (PDF, PNG or JPEG). A new certificate replaces the
 * lot's current one; the earlier file stays in the records and the audit trail.
 */
export async function attachCertificate(
  actor: Actor,
  lotId: string,
  file: UploadedFile | undefined,
  fields: CertificateFields,
): Promise<{ attachment: Attachment; lot: Lot }> {
  requirePermission(actor, 'lots.attachCertificate');
  const type = checkUpload(file);
  const [exists] = await db.select({ id: lots.id }).from(lots).where(eq(lots.id, lotId));
  if (!exists) throw notFound('The lot'); // before anything is written
  const upload = file as UploadedFile;
  return withStoredFile(upload, type, (stored) =>
    db.transaction(async (tx) => {
      const [row] = await tx.select().from(lots).where(eq(lots.id, lotId)).for('update');
      const [material] = await tx.select().from(materials).where(eq(materials.id, row.materialId));
      const attachment = await insertAttachment(tx, { kind: 'certificate', file: upload, type, ...stored, uploadedBy: actor.id });
      const [updated] = await tx
        .update(lots)
        .set({ certificateId: attachment.id, certificateExpiresOn: fields.expiresOn ?? null })
        .where(eq(lots.id, lotId))
        .returning();
      await recordAudit(tx, {
        actorId: actor.id,
        action: 'lot.certificate',
        entityType: 'lot',
        entityId: lotId,
        before: { certificateId: row.certificateId, certificateExpiresOn: row.certificateExpiresOn },
        after: {
          certificateId: attachment.id,
          certificateExpiresOn: updated.certificateExpiresOn,
          filename: attachment.filename,
          sha256: attachment.sha256,
        },
      });
      return { attachment: toAttachment(attachment), lot: toLot(updated, material) };
    }),
  );
}
