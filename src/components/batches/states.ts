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
    open: { label: 'Open', color: 'info', icon: 'radio_button_unchecked' },
    in_process: { label: 'In process', color: 'primary', icon: 'autorenew' },
    completed: { label: 'Completed', color: 'positive', icon: 'check_circle' },
    cancelled: { label: 'Cancelled', color: 'grey-7', icon: 'cancel' },
  },
  step: {
    pending: { label: 'Pending', color: 'grey-7', icon: 'radio_button_unchecked' },
    running: { label: 'Running', color: 'primary', icon: 'play_circle' },
    curing: { label: 'Curing', color: 'warning', icon: 'hourglass_top' },
    done: { label: 'Done', color: 'positive', icon: 'check_circle' },
  },
  driver: {
    in_process: { label: 'In process', color: 'primary', icon: 'autorenew' },
    passed: { label: 'Passed', color: 'positive', icon: 'verified' },
    failed: { label: 'Failed', color: 'negative', icon: 'report' },
    reworked: { label: 'Reworked', color: 'warning', icon: 'build' },
    scrapped: { label: 'Scrapped', color: 'grey-8', icon: 'delete' },
  },
};

export function stateLook(kind: StateKind, state: string): StateLook {
  return LOOKS[kind][state] ?? { label: state.replace(/_/g, ' '), color: 'grey-7', icon: 'help' };
}
