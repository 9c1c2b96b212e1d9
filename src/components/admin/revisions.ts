import type { DriverModel } from '@shared/schemas/models';

/** Where a recipe revision stands, in the words the admin pages use. */
export type RevisionStanding = 'current' | 'draft' | 'frozen' | 'superseded';

/**
 * current: new batches are built with it; draft: not current and no batch uses it (editable);
 * frozen: batches use it (its steps cannot change); superseded: an older revision no batch used.
 */
export function revisionStanding(m: Pick<DriverModel, 'current' | 'inUse' | 'revision'>, currentRevision: number | null): RevisionStanding {
  if (m.current) return 'current';
  if (m.inUse) return 'frozen';
  return currentRevision !== null && m.revision < currentRevision ? 'superseded' : 'draft';
}

export const STANDING_LOOK: Record<RevisionStanding, { label: string; color: string; icon: string }> = {
  current: { label: 'Current', color: 'positive', icon: 'check_circle' },
  draft: { label: 'Draft (editable)', color: 'info', icon: 'edit_note' },
  frozen: { label: 'Frozen', color: 'grey-8', icon: 'lock' },
  superseded: { label: 'Not current', color: 'grey-7', icon: 'history' },
};

/** "used by 1 batch", "used by 12 batches", "no batch yet". */
export function batchUseWords(n: number): string {
  if (n === 0) return 'no batch yet';
  return `used by ${n} batch${n === 1 ? '' : 'es'}`;
}

/** Revisions grouped by model code, each group newest revision first; groups in code order. */
export function groupRevisions(models: readonly DriverModel[]): { code: string; current: DriverModel | null; revisions: DriverModel[] }[] {
  const byCode = new Map<string, DriverModel[]>();
  for (const m of models) byCode.set(m.code, [...(byCode.get(m.code) ?? []), m]);
  return [...byCode.entries()]
    .sort(([a], [b]) => a.localeCompare(b))
    .map(([code, revisions]) => {
      const sorted = [...revisions].sort((a, b) => b.revision - a.revision);
      return { code, current: sorted.find((r) => r.current) ?? null, revisions: sorted };
    });
}

/** The draft of a code (a revision above the current one that no batch uses), if any. */
export function draftOf(revisions: readonly DriverModel[]): DriverModel | null {
  const current = revisions.find((r) => r.current);
  return revisions.find((r) => !r.current && !r.inUse && (!current || r.revision > current.revision)) ?? null;
}
