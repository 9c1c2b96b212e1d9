import type { AddressInfo } from 'node:net';
import type { IncomingMessage } from 'node:http';
import express from 'express';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { httpServerFor } from '../../server/http-server';

// The HTTP server makes each request and response with the app's own prototypes, so Express's
// Object.setPrototypeOf (slow in V8, and garbage that outlives the request) changes nothing —
// and everything Express gives a request still works.
const app = express();
app.set('etag', false);
(app.request as unknown as Record<string, unknown>).plantNote = 'added to the app prototype before the server was made';
app.get('/probe', (req, res) => {
  res.status(203).json({
    header: req.get('x-probe'),
    query: req.query,
    path: req.path,
    sameApp: req.app === app,
    note: (req as unknown as Record<string, unknown>).plantNote,
    protoIsApps: Object.getPrototypeOf(req) === app.request && Object.getPrototypeOf(res) === app.response,
  });
});
app.post('/echo', express.json(), (req, res) => {
  res.type('application/json').send(JSON.stringify({ got: req.body as unknown }));
});

const before: boolean[] = [];
let base = '';
let server: ReturnType<typeof httpServerFor>;
beforeAll(async () => {
  server = httpServerFor(app);
  // Runs before Express's own listener: the prototype must be the app's already.
  server.prependListener('request', (req: IncomingMessage) => before.push(Object.getPrototypeOf(req) === app.request));
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', () => resolve()));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(() => new Promise<void>((resolve) => server.close(() => resolve())));

describe('httpServerFor', () => {
  it('makes requests with the app prototype before Express sees them', async () => {
    before.length = 0;
    await fetch(`${base}/probe`);
    await fetch(`${base}/probe`);
    expect(before).toEqual([true, true]);
  });

  it("keeps Express's request and response features and what the app's prototypes carried", async () => {
    const res = await fetch(`${base}/probe?lot=L-7&lot=L-8`, { headers: { 'X-Probe': 'adhesive bay' } });
    expect(res.status).toBe(203);
    expect(await res.json()).toEqual({
      header: 'adhesive bay',
      query: { lot: ['L-7', 'L-8'] },
      path: '/probe',
      sameApp: true,
      note: 'added to the app prototype before the server was made',
      protoIsApps: true,
    });
  });

  it('serves the same app from a second server (as a test that listens again would)', async () => {
    const second = httpServerFor(app);
    await new Promise<void>((resolve) => second.listen(0, '127.0.0.1', () => resolve()));
    try {
      const port = (second.address() as AddressInfo).port;
      for (const url of [`http://127.0.0.1:${port}/probe`, `${base}/probe`]) {
        const res = await fetch(url, { headers: { 'X-Probe': 'second' } });
        expect(await res.json()).toMatchObject({ header: 'second', sameApp: true, protoIsApps: true });
      }
    } finally {
      await new Promise((resolve) => second.close(resolve));
    }
  });

  it('reads a JSON body and answers with send', async () => {
    const res = await fetch(`${base}/echo`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{"code":"TLC-1"}' });
    expect(await res.json()).toEqual({ got: { code: 'TLC-1' } });
  });
});
