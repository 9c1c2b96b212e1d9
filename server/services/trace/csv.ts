import { CONTAINMENT_CSV_COLUMNS } from '../../../shared/schemas/trace';
import { loadLotTrace } from './lot-trace';
import { plantDate, plantDateTime } from '../../plant-time';
import { csvField, safeFileName, toCsv } from '../../csv';

export { csvField, toCsv, safeFileName };

export interface ContainmentCsv {
  filename: string;
  body: string;
}

/**
 * GET /api/lots/:id/trace.csv — the containment list: one row per driver and use of the lot
 * (a driver built in a run that used two containers of the lot gets two rows). Times are plant
 * time (TACKLOG_PLANT_ZONE) as people read them elsewhere: 2026-12-02 07:25.
 */
export async function lotContainmentCsv(lotId: string, now = new Date()): Promise<ContainmentCsv> {
  const { trace, usesRaw, driverIdsByRun, driverById } = await loadLotTrace(lotId);
  const records: { serial: string; finishedMs: number; row: (string | null)[] }[] = [];
  for (const u of usesRaw) {
    for (const id of driverIdsByRun.get(u.step_run_id) ?? []) {
      const d = driverById.get(id);
      if (!d) continue;
      const finishedAt = u.finished_at ? new Date(u.finished_at) : null;
      const finished = finishedAt ? plantDateTime(finishedAt) : '';
      records.push({
        serial: d.serial,
        finishedMs: finishedAt ? finishedAt.getTime() : Number.POSITIVE_INFINITY,
        row: [
          d.serial,
          d.status,
          u.batch_code,
          u.model_code,
          `${u.seq} ${u.step_name}`,
          u.station_code,
          finished,
          u.container_code,
          u.mix_code,
        ],
      });
    }
  }
  records.sort((a, b) => (a.serial < b.serial ? -1 : a.serial > b.serial ? 1 : a.finishedMs - b.finishedMs));
  const day = plantDate(now);
  return {
    filename: `containment-${safeFileName(`${trace.lot.materialCode}-${trace.lot.supplierLot}`)}-${day}.csv`,
    body: toCsv([[...CONTAINMENT_CSV_COLUMNS], ...records.map((r) => r.row)]),
  };
}
