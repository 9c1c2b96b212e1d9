import { describe, expect, it } from 'vitest';
import type { DriverModel } from '../../shared/schemas/models';
import { batchUseWords, draftOf, groupRevisions, revisionStanding } from '@/components/admin/revisions';
import { stepCureMethod } from '../../shared/cure-methods';

const id = (n: number) => `00000000-0000-4000-8000-${String(n).padStart(12, '0')}`;
function rev(code: string, revision: number, over: Partial<DriverModel> = {}): DriverModel {
  return {
    id: id(revision + code.length * 100),
    code,
    name: code,
    description: null,
    active: true,
    steps: [],
    inUse: false,
    batchCount: 0,
    createdAt: '2026-12-01T06:00:00.000Z',
    revision,
    current: false,
    ...over,
  };
}

describe('recipe revisions on the admin pages', () => {
  it('names each revision: current, frozen by batches, the draft above current, an unused older one not current', () => {
    expect(revisionStanding(rev('A', 2, { current: true, inUse: true }), 2)).toBe('current');
    expect(revisionStanding(rev('A', 1, { inUse: true, batchCount: 4 }), 2)).toBe('frozen');
    expect(revisionStanding(rev('A', 3), 2)).toBe('draft');
    expect(revisionStanding(rev('A', 1), 2)).toBe('superseded');
  });

  it('groups by code, newest first, and finds the one draft', () => {
    const models = [
      rev('HB65F', 1, { current: true }),
      rev('HB12W', 1, { inUse: true, batchCount: 3 }),
      rev('HB12W', 3),
      rev('HB12W', 2, { current: true, inUse: true }),
    ];
    const groups = groupRevisions(models);
    expect(groups.map((g) => g.code)).toEqual(['HB12W', 'HB65F']);
    expect(groups[0].revisions.map((r) => r.revision)).toEqual([3, 2, 1]);
    expect(groups[0].current?.revision).toBe(2);
    expect(draftOf(groups[0].revisions)?.revision).toBe(3);
    expect(draftOf(groups[1].revisions)).toBeNull();
  });

  it('says how many batches use a revision in words', () => {
    expect(batchUseWords(0)).toBe('no batch yet');
    expect(batchUseWords(1)).toBe('used by 1 batch');
    expect(batchUseWords(12)).toBe('used by 12 batches');
  });

  it("names a step's cure by its adhesives: UV before heat before ambient; none without a profile", () => {
    expect(stepCureMethod([{ method: 'ambient' }, { method: 'uv' }])).toBe('uv');
    expect(stepCureMethod([{}, { method: 'heat' }])).toBe('heat');
    expect(stepCureMethod([{}])).toBe('ambient');
    expect(stepCureMethod([null, undefined])).toBeNull();
  });
});
