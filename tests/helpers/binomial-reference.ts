/**
 * The two-sided exact binomial test (as R's binom.test) and the Clopper–Pearson interval: Tacklog
 * flags lots with the one-sided test only, so these live with the tests, where they check the
 * binomial tails of shared/stats.ts against R's published values from another direction.
 */
import { binomialCdf, binomialPmf, binomialUpperTail } from '../../shared/stats';

function checkTest(k: number, n: number, p: number): void {
  if (!Number.isInteger(k) || k < 0) throw new RangeError(`k must be a whole number ≥ 0, got ${String(k)}`);
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`n must be a whole number ≥ 0, got ${String(n)}`);
  if (typeof p !== 'number' || !(p >= 0 && p <= 1)) throw new RangeError(`p must be a probability in [0, 1], got ${String(p)}`);
  if (k > n) throw new RangeError(`k (${k}) cannot exceed n (${n})`);
}

/** Two-sided exact binomial test p-value, as R's binom.test. */
export function binomialTestTwoSided(k: number, n: number, p: number): number {
  checkTest(k, n, p);
  const m = n * p;
  if (k === m) return 1;
  const d = binomialPmf(k, n, p) * (1 + 1e-7);
  const mode = Math.floor((n + 1) * p);
  if (k < m) {
    // y = #{i in [ceil(m), n] : pmf(i) ≤ d}; pmf falls from max(ceil(m), mode) onwards.
    const lo = Math.ceil(m);
    const start = Math.max(lo, mode);
    let y = 0;
    for (let i = lo; i < start && i <= n; i++) if (binomialPmf(i, n, p) <= d) y++;
    y += countFalling(start, n, (i) => binomialPmf(i, n, p) <= d);
    return Math.min(1, binomialCdf(k, n, p) + binomialUpperTail(n - y + 1, n, p));
  }
  // y = #{i in [0, floor(m)] : pmf(i) ≤ d}; pmf rises up to min(floor(m), mode).
  const hi = Math.floor(m);
  const end = Math.min(hi, mode);
  let y = 0;
  for (let i = end + 1; i <= hi; i++) if (binomialPmf(i, n, p) <= d) y++;
  y += countRising(0, end, (i) => binomialPmf(i, n, p) <= d);
  return Math.min(1, binomialCdf(y - 1, n, p) + binomialUpperTail(k, n, p));
}

/** In [a, b], where ok(i) is false then true (pmf falling), count the i with ok(i). */
function countFalling(a: number, b: number, ok: (i: number) => boolean): number {
  if (a > b) return 0;
  let lo = a,
    hi = b + 1; // first ok index in [a, b+1]
  while (lo < hi) {
    const mid = Math.floor((lo + hi) / 2);
    if (ok(mid)) hi = mid;
    else lo = mid + 1;
  }
  return b + 1 - lo;
}

/** In [a, b], where ok(i) is true then false (pmf rising), count the i with ok(i). */
function countRising(a: number, b: number, ok: (i: number) => boolean): number {
  if (a > b) return 0;
  let lo = a - 1,
    hi = b; // last ok index in [a−1, b]
  while (lo < hi) {
    const mid = Math.ceil((lo + hi) / 2);
    if (ok(mid)) lo = mid;
    else hi = mid - 1;
  }
  return lo - a + 1;
}

/** Root of a monotone function on [0, 1] by bisection. */
function bisect(f: (x: number) => number, increasing: boolean): number {
  let lo = 0,
    hi = 1;
  for (let i = 0; i < 200 && hi - lo > 1e-16; i++) {
    const mid = (lo + hi) / 2;
    if (f(mid) < 0 === increasing) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

/** Clopper–Pearson ("exact") two-sided confidence interval for a proportion k/n. */
export function clopperPearson(k: number, n: number, confidence = 0.95): [number, number] {
  checkTest(k, n, 0.5);
  if (n === 0) throw new RangeError('n must be at least 1 for a confidence interval');
  if (!(confidence > 0 && confidence < 1)) throw new RangeError(`confidence must be between 0 and 1, got ${confidence}`);
  const a = (1 - confidence) / 2;
  // lower: P(X ≥ k | p) = a (rises with p); upper: P(X ≤ k | p) = a (falls with p)
  const lower = k === 0 ? 0 : bisect((p) => binomialUpperTail(k, n, p) - a, true);
  const upper = k === n ? 1 : bisect((p) => binomialCdf(k, n, p) - a, false);
  return [lower, upper];
}
