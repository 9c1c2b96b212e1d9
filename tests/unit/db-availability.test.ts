import { describe, expect, it } from 'vitest';
import { isDatabaseUnavailable } from '../../server/db/availability';

const withCode = (code: string, message = 'x') => Object.assign(new Error(message), { code });

describe('isDatabaseUnavailable', () => {
  it('recognises an unreachable or stopping server (PostgreSQL documentation, Appendix A "Error Codes")', () => {
    expect(isDatabaseUnavailable(withCode('ECONNREFUSED'))).toBe(true);
    expect(isDatabaseUnavailable(withCode('ECONNRESET'))).toBe(true);
    expect(isDatabaseUnavailable(withCode('57P01', 'terminating connection due to administrator command'))).toBe(true);
    expect(isDatabaseUnavailable(withCode('57P03', 'the database system is starting up'))).toBe(true);
    expect(isDatabaseUnavailable(withCode('08006'))).toBe(true); // connection_failure
    expect(isDatabaseUnavailable(new Error('Connection terminated unexpectedly'))).toBe(true);
    expect(isDatabaseUnavailable(new Error('timeout exceeded when trying to connect'))).toBe(true);
  });

  it('looks through wrappers: a query error with a cause (as Drizzle wraps), an AggregateError', () => {
    const wrapped = Object.assign(new Error('Failed query: select 1'), { cause: withCode('57P01') });
    expect(isDatabaseUnavailable(wrapped)).toBe(true);
    expect(isDatabaseUnavailable(new AggregateError([withCode('ECONNREFUSED'), withCode('ECONNREFUSED')]))).toBe(true);
  });

  it('leaves every other failure alone: rule and data errors, files, plain values', () => {
    expect(isDatabaseUnavailable(withCode('23505', 'duplicate key value'))).toBe(false); // unique_violation
    expect(isDatabaseUnavailable(withCode('22P02'))).toBe(false); // invalid_text_representation
    expect(isDatabaseUnavailable(withCode('40001'))).toBe(false); // serialization_failure
    expect(isDatabaseUnavailable(withCode('ENOENT'))).toBe(false); // a missing upload is not the database
    expect(isDatabaseUnavailable(Object.assign(new Error('Failed query'), { cause: withCode('23503') }))).toBe(false);
    expect(isDatabaseUnavailable(new Error('boom'))).toBe(false);
    expect(isDatabaseUnavailable(null)).toBe(false);
    expect(isDatabaseUnavailable('ECONNREFUSED')).toBe(false);
  });
});
