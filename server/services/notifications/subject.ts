/**
 * An alert's subject in words ("lot AC-2231 of Anaerobic retainer") and the Tacklog page that
 * shows it, for e-mail subjects, bodies and links.
 */
import { eq } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { buildBatches, containers, lots, materials, stepRuns } from '../../db/schema';

export interface AlertSubjectRef {
  subjectType: string;
  subjectId: string;
  data: Record<string, unknown> | null;
}

export interface SubjectInWords {
  words: string;
  path: string | null;
  label: string;
}

const str = (v: unknown) => (typeof v === 'string' && v ? v : undefined);

export async function describeSubject(tx: DbOrTx, a: AlertSubjectRef): Promise<SubjectInWords> {
  const data = a.data ?? {};
  switch (a.subjectType) {
    case 'lot': {
      const [row] = await tx
        .select({ supplierLot: lots.supplierLot, material: materials.name })
        .from(lots)
        .innerJoin(materials, eq(materials.id, lots.materialId))
        .where(eq(lots.id, a.subjectId));
      return { words: row ? `lot ${row.supplierLot} of ${row.material}` : 'a lot', path: `/lots/${a.subjectId}`, label: 'Open the lot' };
    }
    case 'container': {
      const [row] = await tx
        .select({ code: containers.code, lotId: lots.id, supplierLot: lots.supplierLot, material: materials.name })
        .from(containers)
        .innerJoin(lots, eq(lots.id, containers.lotId))
        .innerJoin(materials, eq(materials.id, lots.materialId))
        .where(eq(containers.id, a.subjectId));
      if (!row) return { words: `container ${str(data.containerCode) ?? ''}`.trim(), path: null, label: '' };
      return {
        words: `container ${row.code} of ${row.material}, lot ${row.supplierLot}`,
        path: `/lots/${row.lotId}`,
        label: 'Open its lot',
      };
    }
    case 'material': {
      const [row] = await tx.select({ code: materials.code, name: materials.name }).from(materials).where(eq(materials.id, a.subjectId));
      return {
        words: row ? `${row.name} (${row.code})` : 'a material',
        path: `/lots?materialId=${a.subjectId}`,
        label: 'Lots of this material',
      };
    }
    case 'step_run': {
      const [row] = await tx
        .select({ batchId: buildBatches.id, code: buildBatches.code })
        .from(stepRuns)
        .innerJoin(buildBatches, eq(buildBatches.id, stepRuns.batchId))
        .where(eq(stepRuns.id, a.subjectId));
      const step = str(data.step);
      const batch = row?.code ?? str(data.batchCode);
      return {
        words: `batch ${batch ?? '?'}${step ? `, step "${step}"` : ''}`,
        path: row ? `/batches/${row.batchId}` : null,
        label: 'Open the batch traveler',
      };
    }
    case 'mix': {
      const mix = str(data.mixCode);
      const station = str(data.station);
      return { words: `mix ${mix ?? '?'}${station ? ` at ${station}` : ''}`, path: null, label: '' };
    }
    default:
      return { words: a.subjectType.replace(/_/g, ' '), path: null, label: '' };
  }
}
