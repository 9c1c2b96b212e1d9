import { describe, expect, it } from 'vitest';
import { firstPassYield, pareto } from '../../shared/quality';
import { pChartLimits } from '../../shared/stats';

describe('Pareto of failures by defect code', () => {
  // Worked example of a published statistics exercise (wizedu.com, question 114336, "Pareto chart
  // in Excel"): ten defect causes with 102, 97, 23, 12, 9, 7, 6, 5, 4, 2 defects, total 267;
  // the first two causes give about 75 % of the defects (199 / 267 = 74.53 %, computed).
  const counts = [
    { defectCode: '1', count: 2 },
    { defectCode: '2', count: 23 },
    { defectCode: '3', count: 97 },
    { defectCode: '4', count: 6 },
    { defectCode: '5', count: 102 },
    { defectCode: '6', count: 12 },
    { defectCode: '7', count: 4 },
    { defectCode: '8', count: 9 },
    { defectCode: '9', count: 5 },
    { defectCode: '10', count: 7 },
  ];

  it('orders the bars largest first, as the worked example does', () => {
    expect(pareto(counts).map((b) => b.defectCode)).toEqual(['5', '3', '2', '6', '8', '10', '4', '9', '7', '1']);
  });

  it('accumulates to 100 % over the total of 267, the first two causes 74.5 %', () => {
    const bars = pareto(counts);
    expect(bars[0].cumulativePct).toBeCloseTo((100 * 102) / 267, 10);
    expect(bars[1].cumulativePct).toBeCloseTo(74.53, 2);
    expect(bars[2].cumulativePct).toBeCloseTo((100 * 222) / 267, 10);
    expect(bars[bars.length - 1].cumulativePct).toBeCloseTo(100, 10);
  });

  it('leaves out codes with no failure and refuses negative counts', () => {
    expect(
      pareto([
        { defectCode: 'A', count: 0 },
        { defectCode: 'B', count: 3 },
      ]),
    ).toEqual([{ defectCode: 'B', count: 3, cumulativePct: 100 }]);
    expect(() => pareto([{ defectCode: 'A', count: -1 }])).toThrow(/whole number/);
  });
});

describe('p-chart against a given baseline (Montgomery §7.3)', () => {
  it('matches the textbook example: p̄ = 0.16, n = 200 → UCL 0.2378, LCL 0.0822 (An Introduction to Business Statistics, Ex. 16.6)', () => {
    const { ucl, lcl } = pChartLimits(0.16, 200);
    expect(ucl).toBeCloseTo(0.2378, 4);
    expect(lcl).toBeCloseTo(0.0822, 4);
  });
});

describe('first-pass yield', () => {
  it('is the share passing their first test; none built is no figure', () => {
    expect(firstPassYield(200, 198)).toBeCloseTo(0.99, 10);
    expect(firstPassYield(0, 0)).toBeNull();
    expect(() => firstPassYield(5, 6)).toThrow();
  });
});
