/**
 * How the compliance watch's alerts read for people: kinds in plain words, and the statistics
 * of a suspect lot said in one sentence with the figures kept for a detail line. Pure; used by
 * the server (alert messages, e-mail subjects) and the client (alert cards, filters).
 */
// Kinds in plain words live with every other word list (shared/words.ts).
export { ALERT_KIND_WORDS, alertKindWords } from './words';

/** A rate as a percentage with one decimal: 0.0623 → "6.2 %". */
export function percent(rate: number): string {
  return `${(rate * 100).toFixed(1)} %`;
}

/** A small probability for a detail line: 0.0123 → "0.012", 1.9e-11 → "1.9e-11". */
export function probability(p: number): string {
  if (p >= 0.001) return String(Number(p.toPrecision(2)));
  return p.toExponential(1);
}

/**
 * How likely a lot's failure count is to be chance, in words, from its Benjamini–Hochberg
 * q-value (false discovery rate, the share of such flags expected to be wrong): below 0.1 %
 * "very unlikely", below the watch's FDR "unlikely"; a lot flagged only by the p-chart limit
 * is "more than lots usually vary"; otherwise it "may be chance".
 */
export function chanceWords(qValue: number, aboveUcl: boolean, fdr = 0.05): string {
  if (qValue < 0.001) return 'this is very unlikely to be chance';
  if (qValue < fdr) return 'this is unlikely to be chance';
  if (aboveUcl) return 'this is more than lots usually vary';
  return 'this may be chance';
}

export interface LotFailureFigures {
  tested: number;
  failures: number;
  /** The plant's long-run failure rate the lot is judged against. */
  baseline: number;
  pValue: number;
  qValue: number;
  /** Upper control limit of the p-chart for this many drivers (standard given). */
  ucl: number;
  aboveUcl: boolean;
  /** How many lots were tested together (the Benjamini–Hochberg family). */
  lotsCompared?: number;
}

/** "fails 6.2 % of drivers (12 of 194) against a plant rate of 1.1 %; this is very unlikely to be chance" */
export function lotFailureSentence(f: LotFailureFigures): string {
  const rate = f.tested > 0 ? f.failures / f.tested : 0;
  return `fails ${percent(rate)} of drivers at final test (${f.failures} of ${f.tested}) against a plant rate of ${percent(f.baseline)}; ${chanceWords(f.qValue, f.aboveUcl)}`;
}

/** The figures behind the sentence, for the detail line. */
export function lotFailureDetail(f: LotFailureFigures): string {
  const family = f.lotsCompared ? ` across ${f.lotsCompared} lots` : '';
  return (
    `Exact one-sided binomial test: p = ${probability(f.pValue)}; Benjamini–Hochberg q = ${probability(f.qValue)}${family}; ` +
    `p-chart upper limit for ${f.tested} drivers: ${percent(f.ucl)} (${f.aboveUcl ? 'above it' : 'within it'}).`
  );
}
