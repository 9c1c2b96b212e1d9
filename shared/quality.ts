/**
 * Pure computations behind the quality overview: the Pareto ordering of failures by defect code
 * and first-pass yield. The p-chart and the lot tests live in shared/stats.ts.
 */

export interface ParetoBar {
  defectCode: string;
  count: number;
  /** Share of all failures in this and every bigger bar, 0–100. */
  cumulativePct: number;
}

/**
 * Bars in descending order of count (ties by code, so the order is stable) with the cumulative
 * percentage line of a Pareto chart.
 */
export function pareto(counts: { defectCode: string; count: number }[]): ParetoBar[] {
  for (const c of counts) {
    if (!Number.isInteger(c.count) || c.count < 0) throw new RangeError(`count of ${c.defectCode} must be a whole number ≥ 0`);
  }
  const total = counts.reduce((a, c) => a + c.count, 0);
  const sorted = counts.filter((c) => c.count > 0).sort((a, b) => b.count - a.count || a.defectCode.localeCompare(b.defectCode));
  let running = 0;
  return sorted.map((c) => {
    running += c.count;
    return { defectCode: c.defectCode, count: c.count, cumulativePct: (100 * running) / total };
  });
}

/** First-pass yield: the share of drivers whose first final test passed; null with none built. */
export function firstPassYield(built: number, passedFirstTime: number): number | null {
  if (!Number.isInteger(built) || built < 0 || !Number.isInteger(passedFirstTime) || passedFirstTime < 0 || passedFirstTime > built) {
    throw new RangeError(`first-pass yield needs 0 ≤ passed (${passedFirstTime}) ≤ built (${built})`);
  }
  return built === 0 ? null : passedFirstTime / built;
}
