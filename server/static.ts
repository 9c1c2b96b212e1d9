import fs from 'node:fs';
import path from 'node:path';
import type { ServerResponse } from 'node:http';
import type { Express } from 'express';
import expressStaticGzip from 'express-static-gzip';

/**
 * Vite names built assets with a content hash (assets/index-D2kLx_9a.js, and the .br / .gz
 * copies beside them): they never change.
 */
const HASHED_ASSET = /\/assets\/[^/]+-[A-Za-z0-9_-]{8,}\.[a-z0-9]+(\.br|\.gz)?$/;

/** Cache-Control for a file of the built client. */
export function cacheControlFor(filePath: string): string {
  const normalised = filePath.split(path.sep).join('/');
  if (HASHED_ASSET.test(normalised)) return 'public, max-age=31536000, immutable';
  // index.html and unhashed files: always ask whether they changed (ETag keeps it cheap).
  return 'no-cache';
}

function setCacheHeaders(res: ServerResponse, filePath: string): void {
  res.setHeader('Cache-Control', cacheControlFor(filePath));
}

/**
 * Serves the built client from `dir`: the brotli (.br) or gzip (.gz) copy made at build time when
 * the browser accepts it (Vary: Accept-Encoding), hashed assets cached for a year as immutable,
 * index.html never cached without asking again, and index.html for every client-side route.
 */
export function serveClient(app: Express, dir: string): void {
  const indexHtml = path.join(dir, 'index.html');
  if (!fs.existsSync(indexHtml)) {
    throw new Error(`The client is not built (${indexHtml} is missing); run "npm run build".`);
  }
  app.use(
    expressStaticGzip(dir, {
      enableBrotli: true,
      orderPreference: ['br', 'gzip'],
      index: false,
      serveStatic: { index: false, maxAge: 0, setHeaders: setCacheHeaders },
    }),
  );
  // Client-side routes: every other GET gets the app shell.
  app.get(/^(?!\/api\/).*/, (_req, res) => {
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(indexHtml);
  });
}
