import type { AdviceActionValue } from '@shared/schemas/stock';

/** Advice as people read it: a word, an icon and a colour together (never colour alone). */
export const ADVICE_LOOK: Record<AdviceActionValue, { label: string; icon: string; color: string }> = {
  order_now: { label: 'Order now', icon: 'priority_high', color: 'negative' },
  order_soon: { label: 'Order soon', icon: 'schedule', color: 'warning' },
  enough: { label: 'Enough stock', icon: 'check_circle', color: 'positive' },
  not_used: { label: 'Not in use', icon: 'pause_circle', color: 'grey-8' },
};

export const USE_SOURCE_WORDS = { history: 'from use', plan: 'from the plan' } as const;

/** Quantities as people read them: at most three decimals, grouped thousands. */
export function quantityText(n: number | null | undefined, unit?: string): string {
  if (n === null || n === undefined) return '—';
  const text = (Math.round(n * 1000) / 1000).toLocaleString('en-GB', { maximumFractionDigits: 3 });
  return unit ? `${text} ${unit}` : text;
}

export function daysText(n: number | null, beyond: boolean, horizonDays: number): string {
  if (n === null) return beyond ? `more than ${horizonDays}` : '—';
  return (Math.round(n * 10) / 10).toLocaleString('en-GB', { maximumFractionDigits: 1 });
}

/** A daily rate with three significant figures at most: "96.4 pcs/day", "0.357 g/day". */
export function rateText(n: number, unit: string): string {
  const text = n === 0 ? '0' : n.toLocaleString('en-GB', { maximumSignificantDigits: n >= 1000 ? 6 : 3 });
  return `${text} ${unit}/day`;
}
