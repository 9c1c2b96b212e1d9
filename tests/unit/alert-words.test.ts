import { describe, expect, it } from 'vitest';
import stdlibCdf from '@stdlib/stats-base-dists-binomial-cdf';
import { alertKindWords, chanceWords, lotFailureDetail, lotFailureSentence, percent, probability } from '../../shared/alert-words';
import { ALERT_KINDS } from '../../shared/constants';
import { pChartLimits } from '../../shared/stats';

describe('alert words', () => {
  it('names every alert kind in words, never its code', () => {
    for (const kind of ALERT_KINDS) {
      expect(alertKindWords(kind)).not.toContain('_');
      expect(alertKindWords(kind)).toMatch(/^[A-Z]/);
    }
    expect(alertKindWords('humidity_high')).toBe('Humidity high');
  });

  it('says how likely chance is from the Benjamini–Hochberg q-value', () => {
    expect(chanceWords(1.9e-11, true)).toBe('this is very unlikely to be chance');
    expect(chanceWords(0.01, false)).toBe('this is unlikely to be chance');
    expect(chanceWords(0.2, true)).toBe('this is more than lots usually vary');
    expect(chanceWords(0.2, false)).toBe('this may be chance');
  });

  it('reads a suspect lot in one sentence, with the figures in the detail line', () => {
    // 12 failures in 194 drivers against a 1.1 % plant rate. One-sided exact binomial p = P(X ≥ 12)
    // from the reference library @stdlib/stats-base-dists-binomial-cdf.
    const pValue = 1 - stdlibCdf(11, 194, 0.011);
    const ucl = pChartLimits(0.011, 194).ucl; // Montgomery §7.3, standard given
    const figures = { tested: 194, failures: 12, baseline: 0.011, pValue, qValue: pValue * 3, ucl, aboveUcl: 12 / 194 > ucl };
    expect(lotFailureSentence(figures)).toBe(
      'fails 6.2 % of drivers at final test (12 of 194) against a plant rate of 1.1 %; this is very unlikely to be chance',
    );
    expect(lotFailureDetail(figures)).toBe(
      `Exact one-sided binomial test: p = ${probability(pValue)}; Benjamini–Hochberg q = ${probability(pValue * 3)}; ` +
        `p-chart upper limit for 194 drivers: ${percent(ucl)} (above it).`,
    );
    expect(percent(0.0623)).toBe('6.2 %');
    expect(probability(0.0123)).toBe('0.012');
    expect(probability(1.94e-11)).toBe('1.9e-11');
  });
});
