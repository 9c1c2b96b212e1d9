/** What a load phase measured (scripts/bench/wrk.ts runs them). */
export interface LoadResult {
  /** Requests answered in the measured time. */
  ops: number;
  perSec: number;
  /** Latency percentiles in ms. */
  p50: number;
  p99: number;
  /** Answers with another status than expected, and connection errors or timeouts. */
  errors: number;
  firstError?: string;
}
