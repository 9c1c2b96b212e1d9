/** Numbers on the quality overview as people read them. */

/** A fraction as a percentage: "1.25 %", small ones with more digits ("0.041 %"). */
export function percentText(fraction: number | null | undefined): string {
  if (fraction === null || fraction === undefined || Number.isNaN(fraction)) return '—';
  const pct = fraction * 100;
  const digits = pct !== 0 && Math.abs(pct) < 1 ? 3 : pct < 10 ? 2 : 1;
  return `${pct.toFixed(digits)} %`;
}

/** A p-value or q-value: 3 significant digits, very small ones as "< 0.0001". */
export function probabilityText(p: number): string {
  if (p < 0.0001) return '< 0.0001';
  return p.toPrecision(3).replace(/\.?0+$/, '');
}

/** An age in hours as words: "5 h", "3 days", "2 days 4 h". */
export function ageText(hours: number): string {
  if (hours < 1) return 'under an hour';
  if (hours < 24) return `${Math.floor(hours)} h`;
  const days = Math.floor(hours / 24);
  const rest = Math.floor(hours - days * 24);
  return `${days} ${days === 1 ? 'day' : 'days'}${rest ? ` ${rest} h` : ''}`;
}

/** Where the baseline comes from, in words. */
export const BASELINE_SOURCE_WORDS: Record<'override' | 'window' | 'default', string> = {
  override: 'set by hand',
  window: 'computed from recent final tests',
  default: 'the plant default (too few recent tests to compute one)',
};
