import http from 'node:http';
import zlib from 'node:zlib';
import { describe, expect, inject, it } from 'vitest';

/**
 * How the built client is delivered (issue: a fresh page sent 328 KB of JS and 211 KB of CSS
 * uncompressed): the precompressed brotli or gzip copy by Accept-Encoding, hashed assets cached
 * as immutable for a year, index.html revalidated every time. Raw HTTP, so nothing decompresses
 * or adds headers behind the test's back.
 */
const baseUrl = inject('baseUrl');

interface Raw {
  status: number;
  headers: http.IncomingHttpHeaders;
  body: Buffer;
}

function get(path: string, acceptEncoding?: string): Promise<Raw> {
  return new Promise((resolve, reject) => {
    const req = http.get(`${baseUrl}${path}`, { headers: acceptEncoding ? { 'accept-encoding': acceptEncoding } : {} }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }));
      res.on('error', reject);
    });
    req.on('error', reject);
  });
}

async function mainAssets(): Promise<{ js: string; css: string }> {
  const index = await get('/');
  const html = index.body.toString('utf8');
  const js = /src="(\/assets\/index-[^"]+\.js)"/.exec(html)?.[1];
  const css = /href="(\/assets\/index-[^"]+\.css)"/.exec(html)?.[1];
  if (!js || !css) throw new Error(`index.html names no main script or style sheet:\n${html}`);
  return { js, css };
}

describe('delivery of the built client', () => {
  it('sends the main JS asset brotli-compressed to a browser that accepts br, and it unpacks to the plain file', async () => {
    const { js } = await mainAssets();
    const plain = await get(js);
    const br = await get(js, 'gzip, deflate, br');
    expect(br.status).toBe(200);
    expect(br.headers['content-encoding']).toBe('br');
    expect(br.headers.vary).toMatch(/accept-encoding/i);
    expect(br.headers['content-type']).toMatch(/javascript/);
    expect(br.body.length).toBeLessThan(plain.body.length / 2);
    expect(zlib.brotliDecompressSync(br.body).equals(plain.body)).toBe(true);
  });

  it('sends gzip to a client that accepts only gzip, and the plain file to one that accepts nothing', async () => {
    const { js, css } = await mainAssets();
    for (const path of [js, css]) {
      const gz = await get(path, 'gzip');
      const plain = await get(path);
      expect(gz.headers['content-encoding']).toBe('gzip');
      expect(zlib.gunzipSync(gz.body).equals(plain.body)).toBe(true);
      expect(plain.headers['content-encoding']).toBeUndefined();
    }
  });

  it('caches hashed assets for a year as immutable and never caches index.html without asking', async () => {
    const { js, css } = await mainAssets();
    for (const path of [js, css]) {
      expect((await get(path, 'br')).headers['cache-control']).toBe('public, max-age=31536000, immutable');
    }
    for (const path of ['/', '/index.html', '/lots', '/station']) {
      const page = await get(path, 'gzip, br');
      expect(page.status).toBe(200);
      expect(page.headers['content-type']).toMatch(/text\/html/);
      expect(page.headers['cache-control']).toBe('no-cache');
    }
  });
});
