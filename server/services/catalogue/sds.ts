import { eq } from 'drizzle-orm';
import { db } from '../../db/client';
import { materials } from '../../db/schema';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import { checkUpload, insertAttachment, withStoredFile, type UploadedFile } from '../attachments';
import { toAttachment } from '../lots/present';
import { findMaterial, toMaterial } from './materials-read';
import type { Attachment } from '../../../shared/schemas/attachments';
import type { Material } from '../../../shared/schemas/materials';

/** Stores a material's safety data sheet; the previous one stays in the records. */
export async function attachSds(
  actor: Actor,
  materialId: string,
  file: UploadedFile | undefined,
): Promise<{ attachment: Attachment; material: Material }> {
  requirePermission(actor, 'materials.edit');
  const type = checkUpload(file);
  await findMaterial(db, materialId); // 404 before anything is written
  const upload = file as UploadedFile;
  return withStoredFile(upload, type, (stored) =>
    db.transaction(async (tx) => {
      const row = await findMaterial(tx, materialId, true);
      const attachment = await insertAttachment(tx, { kind: 'sds', file: upload, type, ...stored, uploadedBy: actor.id });
      const [updated] = await tx
        .update(materials)
        .set({ sdsAttachmentId: attachment.id, updatedAt: new Date() })
        .where(eq(materials.id, materialId))
        .returning();
      await recordAudit(tx, {
        actorId: actor.id,
        action: 'material.sds',
        entityType: 'material',
        entityId: materialId,
        before: { sdsAttachmentId: row.sdsAttachmentId },
        after: { sdsAttachmentId: attachment.id, filename: attachment.filename, sha256: attachment.sha256 },
      });
      return { attachment: toAttachment(attachment), material: toMaterial(updated) };
    }),
  );
}
