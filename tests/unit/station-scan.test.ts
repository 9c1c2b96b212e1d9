import { describe, expect, it } from 'vitest';
import type { Station } from '@shared/schemas/stations';
import { interpretScan } from '@/stores/station-scan';

const station: Station = {
  id: '00000000-0000-4000-8000-000000000001',
  code: 'ST-MAG-1',
  name: 'Magnet bond robot 1',
  kind: 'magnet_assembly',
  area: 'Line A',
  cureEnvironment: 'area',
  active: true,
  createdAt: '2026-03-04T08:00:00.000Z',
};

describe('what a scan at the station means', () => {
  it('a station code, whatever its case, is the station', () => {
    expect(interpretScan(' st-mag-1 ', [station], true)).toEqual({ type: 'station', station });
  });

  it('before a batch is chosen, anything else is taken as the batch code', () => {
    expect(interpretScan('TLC-4D7QX2MB9', [station], false)).toEqual({ type: 'batch', code: 'TLC-4D7QX2MB9' });
  });

  it('with a batch chosen: batch codes switch batch, mix codes load a mix, the rest load a container', () => {
    // Batch code format <model>-<yyMMdd>-<nn> (shared/schemas/batches.ts).
    expect(interpretScan('HB12W-260304-01', [station], true)).toEqual({ type: 'batch', code: 'HB12W-260304-01' });
    // Mix code format MX-<yyMMdd>-<seq> (shared/schemas/mixes.ts).
    expect(interpretScan('MX-260304-3', [station], true)).toEqual({ type: 'mix', code: 'MX-260304-3' });
    expect(interpretScan('TLC-4D7QX2MB9', [station], true)).toEqual({ type: 'container', code: 'TLC-4D7QX2MB9' });
  });
});
