import type { AuditCheck, HomeAssembler, OnHoldFigures } from '@shared/schemas/home';
import { formatDuration } from '@shared/plant-time';

/** How a figure stands, always told as a word with an icon and a colour (never colour alone). */
export interface FigureStatus {
  label: string;
  /** A Quasar brand colour: positive, warning, negative, info, primary, grey-7. */
  color: string;
  icon: string;
}

export const ALL_CLEAR = (label: string): FigureStatus => ({ label, color: 'positive', icon: 'check_circle' });
export const ATTENTION = (label: string): FigureStatus => ({ label, color: 'warning', icon: 'schedule' });
export const ACT_NOW = (label: string): FigureStatus => ({ label, color: 'negative', icon: 'error' });
export const NEUTRAL = (label: string): FigureStatus => ({ label, color: 'grey-7', icon: 'remove_circle_outline' });
export const UNDER_WAY = (label: string): FigureStatus => ({ label, color: 'info', icon: 'play_circle' });

/** "1 lot", "3 lots". */
export function count(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

/** Lots on hold: nothing waiting, or how long the oldest has waited. */
export function onHoldStatus(onHold: OnHoldFigures, now: number): FigureStatus {
  if (onHold.count === 0) return ALL_CLEAR('Nothing awaits inspection');
  const waited = onHold.oldestReceivedAt ? now - Date.parse(onHold.oldestReceivedAt) : 0;
  return ATTENTION(`Oldest waiting ${formatDuration(Math.max(0, waited))}`);
}

/** The audit chain as its last verification found it. */
export function auditStatus(check: AuditCheck | null): FigureStatus {
  if (!check) return NEUTRAL('Not verified yet');
  if (check.ok) return ALL_CLEAR('Intact');
  return ACT_NOW(check.firstBroken ? `Broken at entry ${check.firstBroken.id}` : 'Broken');
}

type Batch = NonNullable<HomeAssembler['batch']>;

/** What the batch at my station is doing, in words. */
export function batchStatus(batch: Batch, now: number): FigureStatus {
  if (batch.state === 'running') return UNDER_WAY('Step running');
  if (batch.state === 'loaded') return ATTENTION('Loaded, step not started');
  if (batch.cureCompleteAt && Date.parse(batch.cureCompleteAt) > now) return ATTENTION('Finished, curing');
  return ALL_CLEAR(batch.cureCompleteAt ? 'Finished and cured' : 'Finished');
}

/** Time left until an instant, "1 h 20 min" (never negative: "due now"). */
export function timeLeft(at: string, now: number): string {
  const left = Date.parse(at) - now;
  return left <= 60_000 ? 'due now' : `${formatDuration(left)} left`;
}
