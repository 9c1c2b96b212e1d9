import {
  baselineSchema,
  qualityOverviewSchema,
  type Baseline,
  type BaselineOverrideInput,
  type QualityOverview,
  type QualityOverviewQuery,
} from '@shared/schemas/quality';
import { apiFetch } from './http';

/** GET /api/quality/overview: p-chart, Pareto, first-pass yield and the lists, for a period (plant dates). */
export function getQualityOverview(query: Partial<QualityOverviewQuery>, signal?: AbortSignal): Promise<QualityOverview> {
  return apiFetch('/api/quality/overview', { query: { ...query }, schema: qualityOverviewSchema, signal });
}

/** POST /api/quality/baseline: override the baseline failure rate (a fraction) with a reason, or `rate: null` to go back. */
export function setBaseline(input: BaselineOverrideInput): Promise<Baseline> {
  return apiFetch('/api/quality/baseline', { method: 'POST', body: input, schema: baselineSchema });
}
