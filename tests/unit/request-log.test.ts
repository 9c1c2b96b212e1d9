import type { AddressInfo } from 'node:net';
import { Writable } from 'node:stream';
import express from 'express';
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { requestLoggerFor } from '../../server/logger';

// The request log: one line per answered request with its id, method, URL, status and time;
// req.log carries the same request; health checks are not logged; bodies and headers never are.
const lines: Record<string, unknown>[] = [];
const sink = new Writable({
  write(chunk: Buffer, _enc, done) {
    for (const l of chunk.toString().split('\n').filter(Boolean)) lines.push(JSON.parse(l));
    done();
  },
});
const log = pino({ level: 'info' }, sink);

let base = '';
let server: ReturnType<express.Express['listen']>;
beforeAll(async () => {
  const app = express();
  app.use(requestLoggerFor(log));
  app.get('/api/health', (_req, res) => res.json({ ok: true }));
  app.post('/api/things', express.json(), (req, res) => {
    req.log.warn({ detail: 'a handler note' }, 'noted');
    res.status(201).json({ made: true });
  });
  app.use((_req, res) => res.status(404).json({ error: 'no' }));
  await new Promise<void>((resolve) => {
    server = app.listen(0, '127.0.0.1', () => resolve());
  });
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(() => new Promise<void>((resolve) => server.close(() => resolve())));

const settle = () => new Promise((r) => setTimeout(r, 50));

describe('request log', () => {
  it("logs an answered request once, with the caller's request id, and req.log carries it", async () => {
    lines.length = 0;
    const res = await fetch(`${base}/api/things?x=1`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'x-request-id': 'scan-42', authorization: 'Bearer secret-token' },
      body: JSON.stringify({ password: 'not-in-the-log' }),
    });
    expect(res.status).toBe(201);
    expect(res.headers.get('x-request-id')).toBe('scan-42');
    await settle();
    const note = lines.find((l) => l.msg === 'noted');
    expect(note).toMatchObject({ level: 40, detail: 'a handler note', req: { id: 'scan-42', method: 'POST', url: '/api/things?x=1' } });
    const done = lines.filter((l) => l.msg === 'request completed');
    expect(done).toHaveLength(1);
    expect(done[0]).toMatchObject({ level: 30, req: { id: 'scan-42', method: 'POST', url: '/api/things?x=1' }, res: { statusCode: 201 } });
    expect(typeof done[0].responseTime).toBe('number');
    expect(JSON.stringify(lines)).not.toMatch(/not-in-the-log|secret-token/);
  });

  it('gives a request without a usable id a new one, logs a 4xx as a warning, and skips health checks', async () => {
    lines.length = 0;
    const res = await fetch(`${base}/api/nowhere`, { headers: { 'x-request-id': 'bad id with spaces' } });
    expect(res.status).toBe(404);
    const id = res.headers.get('x-request-id');
    expect(id).toMatch(/^[0-9a-f-]{36}$/);
    await fetch(`${base}/api/health`);
    await settle();
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatchObject({ level: 40, msg: 'request completed', req: { id, url: '/api/nowhere' }, res: { statusCode: 404 } });
  });
});
