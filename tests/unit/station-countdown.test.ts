import { describe, expect, it } from 'vitest';
import type { StationLoad } from '@shared/schemas/station-loads';
import { loadLimitText, loadSoonMs } from '@/components/station/countdown';
import { describeCountdown } from '@/composables/useCountdown';

const MIN = 60_000;
const base = {
  id: '00000000-0000-4000-8000-000000000001',
  stationId: '00000000-0000-4000-8000-000000000002',
  batchId: '00000000-0000-4000-8000-000000000003',
  batchCode: 'HB12W-260304-01',
  loadedAt: '2026-03-04T08:00:00.000Z',
  loadedBy: null,
  lot: { id: '00000000-0000-4000-8000-000000000004', supplierLot: 'L1', status: 'released' as const },
  material: {
    id: '00000000-0000-4000-8000-000000000005',
    code: 'ADH',
    name: 'Adhesive',
    kind: 'adhesive' as const,
    unit: 'g',
    hazards: { pictograms: [], statements: [] },
    sdsAttachmentId: null,
  },
  partMaterial: null,
  partLot: null,
};

function mixLoad(mixedAt: string, endsAt: string): StationLoad {
  return {
    ...base,
    container: null,
    expiryCause: 'pot_life',
    expiresAt: endsAt,
    mix: {
      id: '00000000-0000-4000-8000-000000000006',
      code: 'MX-260304-1',
      remaining: 50,
      status: 'active',
      mixedAt,
      potLifeEndsAt: endsAt,
    },
  };
}

describe('station countdown thresholds', () => {
  it('a mix turns amber in the last quarter of its pot life, red at its end (pot life from mixing: ASTM D907 "working life")', () => {
    const load = mixLoad('2026-03-04T08:00:00.000Z', '2026-03-04T09:00:00.000Z'); // 60 min pot life
    expect(loadSoonMs(load)).toBe(15 * MIN);
    expect(loadLimitText(load)).toBe('pot life');
    const at = (iso: string) => describeCountdown(load.expiresAt, Date.parse(iso), loadSoonMs(load)).tone;
    expect(at('2026-03-04T08:44:00.000Z')).toBe('ok');
    expect(at('2026-03-04T08:46:00.000Z')).toBe('soon');
    expect(at('2026-03-04T09:00:00.000Z')).toBe('expired');
  });

  it('a short pot life still warns at least 15 minutes ahead (common practice: time to use up or discard a mix)', () => {
    expect(loadSoonMs(mixLoad('2026-03-04T08:00:00.000Z', '2026-03-04T08:20:00.000Z'))).toBe(15 * MIN);
  });

  it('an opened container warns in the last fifth of its after-opening life', () => {
    const load: StationLoad = {
      ...base,
      mix: null,
      expiryCause: 'open_life',
      expiresAt: '2026-03-09T08:00:00.000Z',
      container: {
        id: '00000000-0000-4000-8000-000000000007',
        code: 'TLC-4D7QX2MB9',
        lotId: base.lot.id,
        quantity: 50,
        remaining: 40,
        status: 'open',
        openedAt: '2026-03-04T08:00:00.000Z',
      },
    };
    expect(loadSoonMs(load)).toBe(24 * 60 * MIN); // 5 days / 5
    expect(loadLimitText(load)).toBe('after-opening life');
  });
});
