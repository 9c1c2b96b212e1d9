import { testCreatedSchema, type TestCreated, type TestInput } from '@shared/schemas/tests';
import { apiFetch } from './http';

/** POST /api/tests (assembler, quality): one driver's final-test result; a fail names a defect code. */
export function recordTest(input: TestInput, idempotencyKey?: string): Promise<TestCreated> {
  return apiFetch('/api/tests', { method: 'POST', body: input, schema: testCreatedSchema, idempotencyKey });
}
