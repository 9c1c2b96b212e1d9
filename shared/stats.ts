/**
 * Lot failure statistics (product brief, "What Tacklog computes", point 5).
 *
 *  - Exact binomial probabilities with Loader's saddle-point formula for the mass function
 *    (C. Loader, "Fast and Accurate Computation of Binomial Probabilities", 2000; the method R's
 *    dbinom uses), summed over the smaller tail, so tiny p-values keep their precision and n up to
 *    1e6 stays fast.
 *  - Exact binomial tests: one-sided "greater", and two-sided by R's binom.test rule (sum of the
 *    probabilities not above the observed one, with relative tolerance 1e-7).
 *  - Clopper–Pearson confidence interval by bisection on the binomial tails.
 *  - Benjamini–Hochberg (1995) step-up procedure and q-values as R's p.adjust(method = "BH").
 *  - p-chart (Montgomery, Introduction to Statistical Quality Control, §7.3).
 * Pure functions. Invalid input throws RangeError.
 */

const LN_2PI = Math.log(2 * Math.PI);

function checkCount(n: number, what: string): void {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`${what} must be a whole number ≥ 0, got ${String(n)}`);
}

function checkProb(p: number, what = 'p'): void {
  if (typeof p !== 'number' || !(p >= 0 && p <= 1)) throw new RangeError(`${what} must be a probability in [0, 1], got ${String(p)}`);
}

/** ln(n!) − ln(√(2π n) (n/e)^n): the error of Stirling's formula (Loader 2000). */
function stirlerr(n: number): number {
  if (n === 0) return 0;
  if (n <= 15) {
    let lf = 0;
    for (let i = 2; i <= n; i++) lf += Math.log(i);
    return lf - (n + 0.5) * Math.log(n) + n - 0.5 * LN_2PI;
  }
  const S0 = 1 / 12,
    S1 = 1 / 360,
    S2 = 1 / 1260,
    S3 = 1 / 1680,
    S4 = 1 / 1188;
  const nn = n * n;
  if (n > 500) return (S0 - S1 / nn) / n;
  if (n > 80) return (S0 - (S1 - S2 / nn) / nn) / n;
  if (n > 35) return (S0 - (S1 - (S2 - S3 / nn) / nn) / nn) / n;
  return (S0 - (S1 - (S2 - (S3 - S4 / nn) / nn) / nn) / nn) / n;
}

/** Deviance term x·ln(x/np) + np − x, computed without cancellation (Loader 2000). */
function bd0(x: number, np: number): number {
  if (Math.abs(x - np) < 0.1 * (x + np)) {
    let v = (x - np) / (x + np);
    let s = (x - np) * v;
    let ej = 2 * x * v;
    v *= v;
    for (let j = 1; j < 1000; j++) {
      ej *= v;
      const s1 = s + ej / (2 * j + 1);
      if (s1 === s) return s1;
      s = s1;
    }
    return s;
  }
  return x * Math.log(x / np) + np - x;
}

/** P(X = k) for X ~ Binomial(n, p). */
export function binomialPmf(k: number, n: number, p: number): number {
  checkCount(n, 'n');
  checkProb(p);
  if (!Number.isInteger(k) || k < 0 || k > n) return 0;
  const q = 1 - p;
  if (p === 0) return k === 0 ? 1 : 0;
  if (q === 0) return k === n ? 1 : 0;
  if (k === 0) return Math.exp(n === 0 ? 0 : p < 0.1 ? -bd0(n, n * q) - n * p : n * Math.log(q));
  if (k === n) return Math.exp(q < 0.1 ? -bd0(n, n * p) - n * q : n * Math.log(p));
  const lc = stirlerr(n) - stirlerr(k) - stirlerr(n - k) - bd0(k, n * p) - bd0(n - k, n * q);
  const lf = LN_2PI + Math.log(k) + Math.log1p(-k / n);
  return Math.exp(lc - 0.5 * lf);
}

/** Sum of pmf from `from` stepping by `step` while terms matter (terms must be decreasing). */
function sumDecreasing(from: number, step: 1 | -1, n: number, p: number): number {
  let sum = 0;
  for (let i = from; i >= 0 && i <= n; i += step) {
    const term = binomialPmf(i, n, p);
    sum += term;
    if (term === 0 || term < sum * 1e-17) break;
  }
  return sum;
}

/** Both tails split at k: lower = P(X ≤ k − 1), upper = P(X ≥ k); the smaller one summed directly. */
function tails(k: number, n: number, p: number): { lower: number; upper: number } {
  checkCount(n, 'n');
  checkProb(p);
  if (!Number.isInteger(k)) throw new RangeError(`k must be a whole number, got ${String(k)}`);
  if (k <= 0) return { lower: 0, upper: 1 };
  if (k > n) return { lower: 1, upper: 0 };
  const mode = Math.floor((n + 1) * p); // pmf rises up to the mode and falls after it
  if (k > mode) {
    const upper = Math.min(1, sumDecreasing(k, 1, n, p));
    return { lower: 1 - upper, upper };
  }
  const lower = Math.min(1, sumDecreasing(k - 1, -1, n, p));
  return { lower, upper: 1 - lower };
}

/** P(X ≥ k) for X ~ Binomial(n, p), exact. */
export function binomialUpperTail(k: number, n: number, p: number): number {
  return tails(k, n, p).upper;
}

/** P(X ≤ k) for X ~ Binomial(n, p), exact. */
export function binomialCdf(k: number, n: number, p: number): number {
  return tails(k + 1, n, p).lower;
}

function checkTest(k: number, n: number, p: number): void {
  checkCount(k, 'k');
  checkCount(n, 'n');
  checkProb(p);
  if (k > n) throw new RangeError(`k (${k}) cannot exceed n (${n})`);
}

/** One-sided exact binomial test, alternative "true rate greater than p": P(X ≥ k). */
export function binomialTestGreater(k: number, n: number, p: number): number {
  checkTest(k, n, p);
  return binomialUpperTail(k, n, p);
}

/**
 * Benjamini–Hochberg (1995) at false discovery rate q: reject the k smallest p-values, k the
 * largest rank with p₍ₖ₎ ≤ (k/m)·q. `adjusted` are the BH q-values as R's p.adjust(…, "BH").
 */
export function benjaminiHochberg(pValues: number[], q = 0.05): { rejected: boolean[]; adjusted: number[] } {
  if (!(q > 0 && q < 1)) throw new RangeError(`q must be between 0 and 1, got ${q}`);
  pValues.forEach((p, i) => checkProb(p, `p-value ${i + 1}`));
  const m = pValues.length;
  const order = pValues.map((p, i) => ({ p, i })).sort((a, b) => a.p - b.p);
  let cutoff = 0;
  order.forEach(({ p }, r) => {
    if (p <= ((r + 1) / m) * q) cutoff = r + 1;
  });
  const rejected = new Array<boolean>(m).fill(false);
  const adjusted = new Array<number>(m).fill(1);
  let running = 1;
  for (let r = m - 1; r >= 0; r--) {
    running = Math.min(running, (m / (r + 1)) * order[r].p);
    adjusted[order[r].i] = running;
    rejected[order[r].i] = r < cutoff;
  }
  return { rejected, adjusted };
}

/** p-chart limits p ± 3·√(p(1−p)/n), LCL floored at 0 and UCL capped at 1 (Montgomery §7.3). */
export function pChartLimits(pBar: number, n: number): { ucl: number; lcl: number } {
  checkProb(pBar, 'centre line');
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`sample size must be a whole number ≥ 1, got ${String(n)}`);
  const sigma = Math.sqrt((pBar * (1 - pBar)) / n);
  return { ucl: Math.min(1, pBar + 3 * sigma), lcl: Math.max(0, pBar - 3 * sigma) };
}

/** p-chart with centre p̄ = Σ defectives / Σ inspected and limits per sample size. */
export function pChart(samples: { defectives: number; inspected: number }[]): {
  center: number;
  points: { p: number; ucl: number; lcl: number; above: boolean; below: boolean }[];
} {
  samples.forEach((s, i) => {
    checkCount(s.inspected, `sample ${i + 1} inspected`);
    checkCount(s.defectives, `sample ${i + 1} defectives`);
    if (s.inspected < 1) throw new RangeError(`sample ${i + 1} has nothing inspected`);
    if (s.defectives > s.inspected) throw new RangeError(`sample ${i + 1} has more defectives than inspected`);
  });
  if (samples.length === 0) throw new RangeError('a p-chart needs at least one sample');
  const center = samples.reduce((a, s) => a + s.defectives, 0) / samples.reduce((a, s) => a + s.inspected, 0);
  const points = samples.map((s) => {
    const p = s.defectives / s.inspected;
    const { ucl, lcl } = pChartLimits(center, s.inspected);
    return { p, ucl, lcl, above: p > ucl, below: p < lcl };
  });
  return { center, points };
}

/**
 * Flag lots whose failures are unlikely under the plant's baseline failure rate: one-sided exact
 * binomial test with Benjamini–Hochberg over the lots tested (at FDR q), or a p-chart point above
 * its UCL. The p-chart here uses the baseline as a given standard for its centre line
 * (Montgomery §7.3, "standard given"), so a bad lot does not raise its own limit. Lots with
 * nothing inspected get p = q = 1 and are not counted in the correction.
 */
export function flagLots<T extends { defectives: number; inspected: number }>(
  lots: T[],
  baseline: number,
  q = 0.05,
): (T & { pValue: number; qValue: number; flaggedBinomial: boolean; aboveUcl: boolean; flagged: boolean })[] {
  checkProb(baseline, 'baseline');
  const tested: number[] = [];
  const pValues = lots.map((lot, i) => {
    checkTest(lot.defectives, lot.inspected, baseline);
    if (lot.inspected === 0) return 1;
    tested.push(i);
    return binomialTestGreater(lot.defectives, lot.inspected, baseline);
  });
  const bh = benjaminiHochberg(
    tested.map((i) => pValues[i]),
    q,
  );
  const qValues = new Array<number>(lots.length).fill(1);
  const rejected = new Array<boolean>(lots.length).fill(false);
  tested.forEach((lotIndex, j) => {
    qValues[lotIndex] = bh.adjusted[j];
    rejected[lotIndex] = bh.rejected[j];
  });
  return lots.map((lot, i) => {
    const aboveUcl = lot.inspected > 0 && lot.defectives / lot.inspected > pChartLimits(baseline, lot.inspected).ucl;
    return { ...lot, pValue: pValues[i], qValue: qValues[i], flaggedBinomial: rejected[i], aboveUcl, flagged: rejected[i] || aboveUcl };
  });
}
