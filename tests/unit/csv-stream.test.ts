import type { AddressInfo } from 'node:net';
import express from 'express';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { streamCsv, type CsvSink } from '../../server/csv';

/**
 * How a streamed export ends: whole (header, every page, CRLF records), refused before the first
 * byte (an ordinary error answer), or cut off when it fails half-way, so a broken download never
 * looks complete.
 */
let baseUrl: string;
let close: () => void;
const produce: Record<string, (sink: CsvSink) => Promise<void>> = {
  async whole(sink) {
    sink.start('tacklog-test-2026-12-02.csv', ['A', 'B']);
    await sink.write([['1', 'x,y']]);
    await sink.write([[2, null]]);
  },
  async refused() {
    throw Object.assign(new Error('too many rows'), { status: 409 });
  },
  async halfway(sink) {
    sink.start('tacklog-test-2026-12-02.csv', ['A']);
    await sink.write(Array.from({ length: 2000 }, (_, i) => [`row ${i}`]));
    throw new Error('database went away');
  },
};

beforeAll(async () => {
  const app = express();
  app.get('/:case', async (req, res) => {
    try {
      await streamCsv(res, produce[req.params.case]);
    } catch (err) {
      res.status((err as { status?: number }).status ?? 500).json({ error: (err as Error).message });
    }
  });
  await new Promise<void>((resolve) => {
    const server = app.listen(0, '127.0.0.1', () => {
      baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
      close = () => server.close();
      resolve();
    });
  });
});
afterAll(() => close());

describe('streamCsv', () => {
  it('sends the header row and every page as CRLF records, with the file named in quotes', async () => {
    const res = await fetch(`${baseUrl}/whole`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-disposition')).toBe('attachment; filename="tacklog-test-2026-12-02.csv"');
    expect(res.headers.get('content-type')).toMatch(/^text\/csv; charset=utf-8/);
    expect(await res.text()).toBe('A,B\r\n1,"x,y"\r\n2,\r\n');
  });

  it('a refusal before the first byte is an ordinary error answer', async () => {
    const res = await fetch(`${baseUrl}/refused`);
    expect(res.status).toBe(409);
    expect(await res.json()).toEqual({ error: 'too many rows' });
  });

  it('a failure half-way cuts the connection: the download fails instead of looking complete', async () => {
    const res = await fetch(`${baseUrl}/halfway`);
    expect(res.status).toBe(200);
    await expect(res.text()).rejects.toThrow();
  });
});
