import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { ApiError, apiFetch, errorText, onUnauthorized } from '@/api/http';
import { connection, reportDatabaseUp, retryDelayMs } from '@/api/connection';

type Call = { url: string; init: RequestInit };
let calls: Call[] = [];

/** Answers every request with `status` and `body` (JSON unless a string), recording what was sent. */
function answer(status: number, body?: unknown, contentType = 'application/json') {
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string, init: RequestInit) => {
      calls.push({ url, init });
      const text = body === undefined ? null : typeof body === 'string' ? body : JSON.stringify(body);
      return new Response(text, { status, headers: { 'Content-Type': contentType } });
    }),
  );
}

const okSchema = z.object({ ok: z.literal(true) });

beforeEach(() => {
  calls = [];
});

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('apiFetch requests', () => {
  it('sends JSON with the same-origin cookie and an Idempotency-Key when given', async () => {
    answer(201, { ok: true });
    const result = await apiFetch('/api/lots', {
      method: 'POST',
      body: { supplierLot: 'L-0042' },
      schema: okSchema,
      idempotencyKey: 'key-1',
    });
    expect(result).toEqual({ ok: true });
    const [{ url, init }] = calls;
    expect(url).toBe('/api/lots');
    expect(init.method).toBe('POST');
    expect(init.credentials).toBe('same-origin');
    expect(init.body).toBe('{"supplierLot":"L-0042"}');
    expect(init.headers).toMatchObject({ 'Content-Type': 'application/json', 'Idempotency-Key': 'key-1' });
  });

  it('puts non-empty query values in the URL and leaves empty ones out', async () => {
    answer(200, { ok: true });
    await apiFetch('/api/lots', {
      schema: okSchema,
      query: { status: 'on_hold', materialId: undefined, expiringWithinDays: 14, q: '', limit: null },
    });
    expect(calls[0].url).toBe('/api/lots?status=on_hold&expiringWithinDays=14');
    expect(calls[0].init.method).toBe('GET');
    expect(calls[0].init.body).toBeUndefined();
  });

  it('sends FormData as multipart (the browser sets the boundary)', async () => {
    answer(201, { ok: true });
    const form = new FormData();
    form.append('kind', 'certificate');
    await apiFetch('/api/attachments', { method: 'POST', body: form, schema: okSchema });
    expect(calls[0].init.body).toBe(form);
    expect(calls[0].init.headers).not.toHaveProperty('Content-Type');
  });
});

describe('apiFetch errors', () => {
  it('builds an ApiError from the error shape, with the fields in error', async () => {
    answer(400, {
      error: {
        code: 'VALIDATION_FAILED',
        message: 'containers must be at least 1',
        details: [{ field: 'containers', message: 'must be at least 1' }],
      },
    });
    const err = await apiFetch('/api/lots', { method: 'POST', body: {}, schema: okSchema }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ApiError);
    expect(err).toMatchObject({ status: 400, code: 'VALIDATION_FAILED', message: 'containers must be at least 1' });
    expect((err as ApiError).details).toEqual([{ field: 'containers', message: 'must be at least 1' }]);
    expect((err as ApiError).fieldMessage('containers')).toBe('must be at least 1');
    expect((err as ApiError).fieldMessage('supplierLot')).toBeUndefined();
  });

  it('keeps a 409 rule refusal with its code and no field details', async () => {
    answer(409, { error: { code: 'LOT_ON_HOLD', message: 'Lot L-0042 is on hold for inspection.', details: { lotId: 'x' } } });
    await expect(apiFetch('/api/stations/s/load', { method: 'POST', body: {}, schema: okSchema })).rejects.toMatchObject({
      status: 409,
      code: 'LOT_ON_HOLD',
      message: 'Lot L-0042 is on hold for inspection.',
      details: [],
    });
  });

  it('reads a refusal for people as its plain title and the message, never the code', async () => {
    answer(409, { error: { code: 'LOT_ON_HOLD', message: 'Lot L-0042 is on hold for inspection.' } });
    const err = await apiFetch('/api/x', { schema: okSchema }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ApiError);
    expect((err as ApiError).title).toBe('Lot on hold');
    expect(errorText(err)).toBe('Lot on hold. Lot L-0042 is on hold for inspection.');
    expect(errorText(err)).not.toContain('LOT_ON_HOLD');
    expect(errorText(new Error('boom'))).toBe('boom');
  });

  it('keeps a code this client does not know as serverCode and reads it as a general refusal', async () => {
    answer(409, { error: { code: 'SOME_NEWER_RULE', message: 'A newer server refused it.' } });
    const err = (await apiFetch('/api/x', { schema: okSchema }).catch((e: unknown) => e)) as ApiError;
    expect(err).toMatchObject({ status: 409, code: 'HTTP_ERROR', serverCode: 'SOME_NEWER_RULE' });
    expect(err.text).toBe('Request refused. A newer server refused it.');
  });

  it('tells 401 listeners, and only on 401', async () => {
    const listener = vi.fn();
    const unsubscribe = onUnauthorized(listener);
    answer(403, { error: { code: 'FORBIDDEN', message: 'Your role does not allow this.' } });
    await expect(apiFetch('/api/users', { schema: okSchema })).rejects.toMatchObject({ status: 403 });
    expect(listener).not.toHaveBeenCalled();

    answer(401, { error: { code: 'NOT_SIGNED_IN', message: 'Sign in to continue.' } });
    await expect(apiFetch('/api/users', { schema: okSchema })).rejects.toMatchObject({ status: 401 });
    expect(listener).toHaveBeenCalledTimes(1);

    unsubscribe();
    await expect(apiFetch('/api/users', { schema: okSchema })).rejects.toMatchObject({ status: 401 });
    expect(listener).toHaveBeenCalledTimes(1);
  });

  it('reports a non-JSON error page by its status', async () => {
    answer(502, '<html>Bad gateway</html>', 'text/html');
    await expect(apiFetch('/api/health', { schema: okSchema })).rejects.toMatchObject({ status: 502, code: 'BAD_RESPONSE' });
  });

  it('refuses a 2xx answer that does not match the schema', async () => {
    answer(200, { ok: 'yes' });
    const error = vi.spyOn(console, 'error').mockImplementation(() => undefined);
    await expect(apiFetch('/api/health', { schema: okSchema })).rejects.toMatchObject({ status: 200, code: 'BAD_RESPONSE' });
    expect(error).toHaveBeenCalledTimes(1);
    error.mockRestore();
  });

  it('turns an unreachable server into status 0 NETWORK', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => {
        throw new TypeError('fetch failed');
      }),
    );
    await expect(apiFetch('/api/health', { schema: okSchema })).rejects.toMatchObject({ status: 0, code: 'NETWORK' });
  });
});

describe('apiFetch while the database is unreachable (503 DB_UNAVAILABLE)', () => {
  const down = { error: { code: 'DB_UNAVAILABLE', message: 'The database cannot be reached right now.' } };

  /** Answers 503 DB_UNAVAILABLE (Retry-After: 2) `times` times, then 200 {ok: true}. */
  function downThenUp(times: number) {
    let left = times;
    vi.stubGlobal(
      'fetch',
      vi.fn(async (url: string, init: RequestInit) => {
        calls.push({ url, init });
        if (left-- > 0)
          return new Response(JSON.stringify(down), { status: 503, headers: { 'Content-Type': 'application/json', 'Retry-After': '2' } });
        return new Response(JSON.stringify({ ok: true }), { status: 200, headers: { 'Content-Type': 'application/json' } });
      }),
    );
  }

  beforeEach(() => {
    vi.useFakeTimers();
    reportDatabaseUp();
  });
  afterEach(() => {
    vi.useRealTimers();
    reportDatabaseUp();
  });

  it('a read waits Retry-After, sends again by itself, and reports the outage and its end', async () => {
    downThenUp(2);
    const result = apiFetch('/api/lots', { schema: okSchema });
    await vi.advanceTimersByTimeAsync(0);
    expect(calls).toHaveLength(1);
    expect(connection.databaseDown).toBe(true);
    expect(connection.retryAfterMs).toBe(2000);
    await vi.advanceTimersByTimeAsync(1999);
    expect(calls).toHaveLength(1); // waits the whole Retry-After
    await vi.advanceTimersByTimeAsync(1);
    expect(calls).toHaveLength(2);
    await vi.advanceTimersByTimeAsync(2000);
    await expect(result).resolves.toEqual({ ok: true });
    expect(calls).toHaveLength(3);
    expect(connection.databaseDown).toBe(false);
  });

  it('a write with an Idempotency-Key is sent again with the same key', async () => {
    downThenUp(1);
    const result = apiFetch('/api/stations/s1/load', { method: 'POST', body: { a: 1 }, idempotencyKey: 'key-7', schema: okSchema });
    await vi.advanceTimersByTimeAsync(2000);
    await expect(result).resolves.toEqual({ ok: true });
    expect(calls.map((c) => (c.init.headers as Record<string, string>)['Idempotency-Key'])).toEqual(['key-7', 'key-7']);
  });

  it('after an outage, a keyed write whose first try is still held (409 IDEMPOTENCY_IN_PROGRESS) waits and is sent again', async () => {
    const answers = [
      { status: 503, body: down },
      { status: 409, body: { error: { code: 'IDEMPOTENCY_IN_PROGRESS', message: 'still running' } } },
      { status: 200, body: { ok: true } },
    ];
    vi.stubGlobal(
      'fetch',
      vi.fn(async (url: string, init: RequestInit) => {
        calls.push({ url, init });
        const a = answers.shift()!;
        return new Response(JSON.stringify(a.body), {
          status: a.status,
          headers: { 'Content-Type': 'application/json', 'Retry-After': '1' },
        });
      }),
    );
    const result = apiFetch('/api/stations/s1/load', { method: 'POST', body: {}, idempotencyKey: 'key-8', schema: okSchema });
    await vi.advanceTimersByTimeAsync(10_000);
    await expect(result).resolves.toEqual({ ok: true });
    expect(calls).toHaveLength(3);
    // Without an outage first, the same 409 is an error at once.
    answer(409, { error: { code: 'IDEMPOTENCY_IN_PROGRESS', message: 'still running' } });
    await expect(
      apiFetch('/api/stations/s1/load', { method: 'POST', body: {}, idempotencyKey: 'key-9', schema: okSchema }),
    ).rejects.toMatchObject({ status: 409 });
  });

  it('a write without a key is not repeated: it fails with DB_UNAVAILABLE and the banner shows', async () => {
    downThenUp(1);
    const err = await apiFetch('/api/suppliers', { method: 'POST', body: { name: 'x' }, schema: okSchema }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ApiError);
    expect(err).toMatchObject({ status: 503, code: 'DB_UNAVAILABLE' });
    expect((err as ApiError).message).toMatch(/may not have been saved/);
    expect(calls).toHaveLength(1);
    expect(connection.databaseDown).toBe(true);
  });

  it('another 503 is an error at once, and an abort ends the wait', async () => {
    answer(503, { error: { code: 'MAINTENANCE', message: 'Down for maintenance.' } });
    await expect(apiFetch('/api/lots', { schema: okSchema })).rejects.toMatchObject({
      status: 503,
      code: 'HTTP_ERROR',
      serverCode: 'MAINTENANCE',
    });
    expect(connection.databaseDown).toBe(false);

    downThenUp(5);
    const controller = new AbortController();
    const result = apiFetch('/api/lots', { schema: okSchema, signal: controller.signal });
    const settled = expect(result).rejects.toMatchObject({ name: 'AbortError' });
    await vi.advanceTimersByTimeAsync(500);
    controller.abort();
    await settled;
  });

  it('reads Retry-After as seconds or an HTTP date (RFC 9110 §10.2.3), within 1–30 s', () => {
    const now = Date.parse('2026-12-02T10:00:00Z');
    expect(retryDelayMs('5', now)).toBe(5000);
    expect(retryDelayMs('Wed, 02 Dec 2026 10:00:12 GMT', now)).toBe(12_000);
    expect(retryDelayMs('0', now)).toBe(1000);
    expect(retryDelayMs('3600', now)).toBe(30_000);
    expect(retryDelayMs(null, now)).toBe(5000);
    expect(retryDelayMs('soon', now)).toBe(5000);
  });
});
