import { BATCH_STATUS_WORDS as B, DRIVER_STATUS_WORDS as D, humanize } from '@shared/words';

/**
 * How batch, step and driver states read on screen: a word, an icon and a colour together
 * (never colour alone). Colours are Quasar brand names from src/theme.ts.
 */
export interface StateLook {
  label: string;
  color: string;
  icon: string;
}

export type StateKind = 'batch' | 'step' | 'driver';

const LOOKS: Record<StateKind, Record<string, StateLook>> = {
  batch: {
    open: { label: B.open, color: 'info', icon: 'radio_button_unchecked' },
    in_process: { label: B.in_process, color: 'primary', icon: 'autorenew' },
    completed: { label: B.completed, color: 'positive', icon: 'check_circle' },
    cancelled: { label: B.cancelled, color: 'grey-7', icon: 'cancel' },
  },
  step: {
    pending: { label: 'Pending', color: 'grey-7', icon: 'radio_button_unchecked' },
    running: { label: 'Running', color: 'primary', icon: 'play_circle' },
    curing: { label: 'Curing', color: 'warning', icon: 'hourglass_top' },
    done: { label: 'Done', color: 'positive', icon: 'check_circle' },
  },
  driver: {
    in_process: { label: D.in_process, color: 'primary', icon: 'autorenew' },
    passed: { label: D.passed, color: 'positive', icon: 'verified' },
    failed: { label: D.failed, color: 'negative', icon: 'report' },
    reworked: { label: D.reworked, color: 'warning', icon: 'build' },
    scrapped: { label: D.scrapped, color: 'grey-8', icon: 'delete' },
  },
};

export function stateLook(kind: StateKind, state: string): StateLook {
  return LOOKS[kind][state] ?? { label: humanize(state), color: 'grey-7', icon: 'help' };
}

/** "14:05" today, "Tue 14:05" within a week, else the date and time. */
export function shortTime(iso: string | null | undefined, now = Date.now()): string {
  if (!iso) return '';
  const d = new Date(iso);
  const time = d.toLocaleTimeString([], { hour: '2-digit', minute: '2-digit' });
  const today = new Date(now);
  if (d.toDateString() === today.toDateString()) return time;
  if (Math.abs(d.getTime() - now) < 6 * 86_400_000) return `${d.toLocaleDateString([], { weekday: 'short' })} ${time}`;
  return `${d.toLocaleDateString()} ${time}`;
}
