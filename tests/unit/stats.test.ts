import { describe, expect, it } from 'vitest';
import binomialTest from '@stdlib/stats-binomial-test';
import stdlibCdf from '@stdlib/stats-base-dists-binomial-cdf';
import {
  benjaminiHochberg,
  binomialCdf,
  binomialPmf,
  binomialTestGreater,
  binomialUpperTail,
  flagLots,
  pChart,
  pChartLimits,
} from '../../shared/stats';
import { binomialTestTwoSided, clopperPearson } from '../helpers/binomial-reference';

/** Small seeded PRNG (mulberry32) so the random cross-checks are repeatable. */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** |a − b| within an absolute floor or a relative tolerance. */
function close(a: number, b: number, rel: number, abs: number): boolean {
  return Math.abs(a - b) <= Math.max(abs, rel * Math.abs(b));
}

describe('p-chart', () => {
  it('reproduces An Introduction to Business Statistics, Ex. 16.6', () => {
    // 10 samples of 200 → p̄ = 0.16, UCL = 0.2378, LCL = 0.0822, all in control
    // (limits p̄ ± 3√(p̄(1−p̄)/n), Montgomery §7.3)
    const defectives = [40, 44, 22, 34, 24, 32, 28, 32, 34, 30];
    const chart = pChart(defectives.map((d) => ({ defectives: d, inspected: 200 })));
    expect(chart.center).toBeCloseTo(0.16, 12);
    for (const pt of chart.points) {
      expect(pt.ucl).toBeCloseTo(0.2378, 4);
      expect(pt.lcl).toBeCloseTo(0.0822, 4);
      expect(pt.above || pt.below).toBe(false);
    }
  });

  it('flags points outside, floors the LCL at 0 and varies limits with sample size', () => {
    const chart = pChart([
      { defectives: 2, inspected: 100 },
      { defectives: 2, inspected: 100 },
      { defectives: 20, inspected: 100 },
    ]);
    expect(chart.center).toBeCloseTo(24 / 300, 12);
    expect(chart.points[2].above).toBe(true);
    // Montgomery §7.3: a negative lower limit is set to 0
    expect(pChartLimits(0.01, 50).lcl).toBe(0);
    expect(pChartLimits(0.1, 400).ucl).toBeCloseTo(0.1 + 3 * Math.sqrt(0.09 / 400), 12);
    expect(pChartLimits(0.1, 100).ucl).toBeGreaterThan(pChartLimits(0.1, 400).ucl);
    expect(() => pChart([])).toThrow(RangeError);
    expect(() => pChart([{ defectives: 3, inspected: 2 }])).toThrow(RangeError);
    expect(() => pChartLimits(0.1, 0)).toThrow(RangeError);
  });
});

describe('exact binomial test', () => {
  it("matches R's binom.test(58, 100)", () => {
    // R binom.test(58, 100): two-sided p = 0.1332, 95 % CI 0.4771–0.6780; greater p = 0.06661
    expect(binomialTestTwoSided(58, 100, 0.5)).toBeCloseTo(0.1332, 4);
    expect(binomialTestGreater(58, 100, 0.5)).toBeCloseTo(0.06661, 5);
    const [lo, hi] = clopperPearson(58, 100);
    expect(lo).toBeCloseTo(0.4771, 4);
    expect(hi).toBeCloseTo(0.678, 4);
  });

  it('agrees with closed forms in the far tails (probability theory)', () => {
    // P(X = n) = p^n, so P(X ≥ 100 | n = 100, p = ½) = 2^−100 — far below 1 − cdf's precision
    expect(binomialUpperTail(100, 100, 0.5) / 2 ** -100).toBeCloseTo(1, 12);
    // P(X ≥ 1) = 1 − (1 − p)^n
    expect(binomialUpperTail(1, 500, 0.001)).toBeCloseTo(-Math.expm1(500 * Math.log1p(-0.001)), 14);
    // P(X ≤ 0) = (1 − p)^n for a large n
    expect(binomialCdf(0, 1_000_000, 1e-5) / Math.exp(1e6 * Math.log1p(-1e-5))).toBeCloseTo(1, 10);
    // pmf sums to 1
    let total = 0;
    for (let k = 0; k <= 60; k++) total += binomialPmf(k, 60, 0.3);
    expect(total).toBeCloseTo(1, 13);
    // edge cases
    expect(binomialUpperTail(0, 10, 0.2)).toBe(1);
    expect(binomialUpperTail(11, 10, 0.2)).toBe(0);
    expect(binomialUpperTail(1, 10, 0)).toBe(0);
    expect(binomialUpperTail(10, 10, 1)).toBe(1);
    expect(binomialTestTwoSided(50, 100, 0.5)).toBe(1);
  });

  it('agrees with @stdlib/stats-base-dists-binomial-cdf on many random cases', () => {
    const rand = rng(20250610);
    for (let t = 0; t < 400; t++) {
      const n = 1 + Math.floor(rand() ** 3 * 5000);
      const p = rand() < 0.1 ? rand() * 0.002 : rand();
      const k = Math.floor(rand() * (n + 1));
      const ref = stdlibCdf(k, n, p);
      expect(close(binomialCdf(k, n, p), ref, 1e-9, 1e-13), `cdf(${k}, ${n}, ${p})`).toBe(true);
      const refUpper = 1 - stdlibCdf(k - 1, n, p);
      expect(close(binomialUpperTail(k, n, p), refUpper, 1e-9, 1e-13), `upper(${k}, ${n}, ${p})`).toBe(true);
    }
  });

  it('agrees with @stdlib/stats-binomial-test (R binom.test port) on many random cases', () => {
    const rand = rng(42);
    for (let t = 0; t < 200; t++) {
      const n = 1 + Math.floor(rand() ** 2 * 2000);
      const p = Math.round(rand() * 1000) / 1000 || 0.001;
      const k = Math.min(n, Math.max(0, Math.round(n * p + (rand() - 0.5) * 8 * Math.sqrt(n * p * (1 - p) + 1))));
      const two = binomialTest(k, n, { p }) as unknown as { pValue: number; ci: [number, number] };
      const greater = binomialTest(k, n, { p, alternative: 'greater' }) as unknown as { pValue: number };
      const label = `(${k}, ${n}, ${p})`;
      expect(close(binomialTestTwoSided(k, n, p), Math.min(1, two.pValue), 1e-7, 1e-12), `two-sided ${label}`).toBe(true);
      expect(close(binomialTestGreater(k, n, p), greater.pValue, 1e-7, 1e-12), `greater ${label}`).toBe(true);
      const [lo, hi] = clopperPearson(k, n);
      expect(close(lo, two.ci[0], 1e-7, 1e-10), `CI low ${label}`).toBe(true);
      expect(close(hi, two.ci[1], 1e-7, 1e-10), `CI high ${label}`).toBe(true);
    }
  });

  // Speed is the benchmark's business, not a test's: this only checks agreement at large n.
  // The @stdlib reference takes a few seconds per case at n = 1e6, hence the long timeout.
  it('agrees with @stdlib up to n = 1e6', { timeout: 120_000 }, () => {
    const cases = [
      [10_300, 1_000_000, 0.01],
      [9_800, 1_000_000, 0.01],
      [500_400, 1_000_000, 0.5],
      [12, 1_000_000, 1e-5],
    ];
    const ours = cases.map(([k, n, p]) => [binomialUpperTail(k, n, p), binomialTestTwoSided(k, n, p)]);
    cases.forEach(([k, n, p], i) => {
      expect(close(ours[i][0], 1 - stdlibCdf(k - 1, n, p), 1e-8, 1e-12), `upper(${k}, ${n}, ${p})`).toBe(true);
      const ref = binomialTest(k, n, { p }) as unknown as { pValue: number };
      expect(close(ours[i][1], Math.min(1, ref.pValue), 1e-7, 1e-12), `two-sided (${k}, ${n}, ${p})`).toBe(true);
    });
  });

  it('refuses invalid input', () => {
    expect(() => binomialTestGreater(5, 4, 0.5)).toThrow(RangeError);
    expect(() => binomialTestGreater(-1, 4, 0.5)).toThrow(RangeError);
    expect(() => binomialTestGreater(1, 4.5, 0.5)).toThrow(RangeError);
    expect(() => binomialTestGreater(1, 4, 1.5)).toThrow(RangeError);
    expect(() => binomialTestTwoSided(1, 4, Number.NaN)).toThrow(RangeError);
    expect(() => clopperPearson(0, 0)).toThrow(RangeError);
    expect(() => clopperPearson(1, 10, 1)).toThrow(RangeError);
  });
});

describe('Benjamini–Hochberg', () => {
  it('rejects by the step-up rule of Benjamini & Hochberg (1995), worked by hand', () => {
    // p = .01 .039 .029 .005 .20 .041, m = 6, q = .05. Sorted: .005 .01 .029 .039 .041 .20 against
    // (k/6)·.05 = .00833 .01667 .025 .03333 .04167 .05: ranks 1, 2 and 5 pass; the largest is 5,
    // so the five smallest are rejected, including .029 and .039 which fail on their own rank.
    const p = [0.01, 0.039, 0.029, 0.005, 0.2, 0.041];
    const r = benjaminiHochberg(p, 0.05);
    expect(r.rejected).toEqual([true, true, true, true, false, true]);
    // R p.adjust(p, "BH") worked by hand: m/i·p₍ᵢ₎ from the largest down = .2, .0492, .0585, .058,
    // .03, .03; running minimum → .2, .0492, .0492, .0492, .03, .03; back in input order:
    const expected = [0.03, 0.0492, 0.0492, 0.03, 0.2, 0.0492];
    r.adjusted.forEach((a, i) => expect(a).toBeCloseTo(expected[i], 12));
    // the adjusted values reproduce the decisions at any level
    for (const q of [0.01, 0.031, 0.05, 0.2]) {
      expect(benjaminiHochberg(p, q).rejected).toEqual(r.adjusted.map((a) => a <= q));
    }
  });

  it('gives tied p-values the same q-value and handles empty input', () => {
    const r = benjaminiHochberg([0.02, 0.02, 0.5]);
    expect(r.adjusted[0]).toBeCloseTo(0.03, 12); // 3/2 · 0.02
    expect(r.adjusted[1]).toBe(r.adjusted[0]);
    expect(benjaminiHochberg([])).toEqual({ rejected: [], adjusted: [] });
    expect(() => benjaminiHochberg([0.5, Number.NaN])).toThrow(RangeError);
    expect(() => benjaminiHochberg([0.5], 0)).toThrow(RangeError);
  });
});

describe('flagLots', () => {
  it('flags lots unlikely under the baseline or above the p-chart UCL', () => {
    // baseline 1 % failures (common practice: about 1 driver in 100 fails final test)
    const lots = [
      { id: 'A', defectives: 1, inspected: 200 },
      { id: 'B', defectives: 8, inspected: 200 },
      { id: 'C', defectives: 2, inspected: 150 },
      { id: 'D', defectives: 1, inspected: 5 },
      { id: 'E', defectives: 0, inspected: 0 },
    ];
    const out = flagLots(lots, 0.01);
    expect(out.map((l) => l.id)).toEqual(['A', 'B', 'C', 'D', 'E']);
    // one-sided p-value from the reference library: P(X ≥ 8 | 200, 0.01)
    expect(out[1].pValue).toBeCloseTo(1 - stdlibCdf(7, 200, 0.01), 12);
    expect(out[1]).toMatchObject({ flaggedBinomial: true, aboveUcl: true, flagged: true });
    expect(out[0].flagged).toBe(false);
    expect(out[2].flagged).toBe(false);
    // D: 1 of 5 is above the UCL 0.01 + 3√(0.0099/5) ≈ 0.143, but P(X ≥ 1) = 1 − 0.99⁵ ≈ 0.049
    // is not significant once corrected for four lots
    expect(out[3].pValue).toBeCloseTo(1 - 0.99 ** 5, 12);
    expect(out[3]).toMatchObject({ flaggedBinomial: false, aboveUcl: true, flagged: true });
    expect(out[4]).toMatchObject({ pValue: 1, qValue: 1, flagged: false });
    // q-values are BH over the four tested lots only
    const bh = benjaminiHochberg(out.slice(0, 4).map((l) => l.pValue));
    out.slice(0, 4).forEach((l, i) => expect(l.qValue).toBe(bh.adjusted[i]));
  });
});
