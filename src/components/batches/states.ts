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
