import type { BatchDetail, TravelerStep } from '@shared/schemas/batches';
import { formatWhen } from '@shared/plant-time';

/**
 * Why the station's Start button is disabled, decided from the traveler before anyone presses
 * it (the server checks the same again): no step here, already running, an earlier step not
 * finished, or the previous step's adhesive still curing (unless quality signed an early start).
 */
export type StartBlock =
  | { kind: 'no-step'; text: string }
  | { kind: 'running'; text: string }
  | { kind: 'out-of-order'; text: string }
  | { kind: 'curing'; text: string; stepName: string; cureCompleteAt: string; handlingAt: string | null; when: string };

/** The step before `step` whose cure it waits for, when that step waits for cure. */
export function previousCureStep(traveler: BatchDetail, step: TravelerStep): TravelerStep | null {
  const before = traveler.steps.filter((s) => s.seq < step.seq).sort((a, b) => b.seq - a.seq)[0];
  return before?.waitForCure ? before : null;
}

/** The running cure gate before `step`, if its full cure lies after `nowMs`. */
export function activeCureGate(traveler: BatchDetail, step: TravelerStep, nowMs: number): TravelerStep | null {
  const before = previousCureStep(traveler, step);
  if (!before?.cureCompleteAt || (before.state !== 'curing' && before.state !== 'done')) return null;
  return Date.parse(before.cureCompleteAt) > nowMs ? before : null;
}

export function startBlock(
  traveler: BatchDetail,
  step: TravelerStep | null,
  nowMs: number,
  zone: string,
  earlyStartSigned = false,
): StartBlock | null {
  if (!step) return { kind: 'no-step', text: 'This batch has no step left at this station.' };
  if (step.state === 'running') return { kind: 'running', text: `"${step.name}" is running: finish it when the batch is done here.` };
  const waiting = traveler.steps.find((s) => s.seq < step.seq && (s.state === 'pending' || s.state === 'running'));
  if (waiting) return { kind: 'out-of-order', text: `Step ${waiting.seq} "${waiting.name}" must be finished first.` };
  const gate = activeCureGate(traveler, step, nowMs);
  if (gate?.cureCompleteAt && !earlyStartSigned) {
    const when = formatWhen(gate.cureCompleteAt, zone, nowMs);
    return {
      kind: 'curing',
      text: `Still curing: "${gate.name}" is ready ${when}.`,
      stepName: gate.name,
      cureCompleteAt: gate.cureCompleteAt,
      handlingAt: gate.handlingAt,
      when,
    };
  }
  return null;
}
