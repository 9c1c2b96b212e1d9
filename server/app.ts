import fs from 'node:fs';
import path from 'node:path';
import express, { type Express } from 'express';
import helmet from 'helmet';
import cookieParser from 'cookie-parser';
import { config } from './config';
import { attachActor } from './middleware/auth';
import { idempotency } from './middleware/idempotency';
import { errorHandler, notFoundApi } from './middleware/errors';
import { apiRouter } from './routes';
import { requestLogger } from './logger';

export interface AppOptions {
  /** Serve the built client from dist/ (production). */
  serveClient?: boolean;
}

/** Builds the Express app without listening, so tests can drive it. */
export function createApp(options: AppOptions = {}): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: true,
        directives: {
          // Everything is bundled: no source outside this origin.
          'default-src': ["'self'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          'media-src': ["'self'", 'data:', 'blob:'],
          'style-src': ["'self'", "'unsafe-inline'"],
          'script-src': ["'self'"],
          'connect-src': ["'self'"],
          'upgrade-insecure-requests': null,
        },
      },
      crossOriginEmbedderPolicy: false,
    }),
  );
  app.use(requestLogger);
  app.use(cookieParser());
  app.use('/api', express.json({ limit: '1mb' }), attachActor, idempotency, apiRouter, notFoundApi);

  if (options.serveClient) {
    const indexHtml = path.join(config.clientDir, 'index.html');
    if (!fs.existsSync(indexHtml)) {
      throw new Error(`The client is not built (${indexHtml} is missing); run "npm run build".`);
    }
    app.use(express.static(config.clientDir, { index: false, maxAge: '1h' }));
    // Client-side routes: every other GET gets the app shell.
    app.get(/^(?!\/api\/).*/, (_req, res) => res.sendFile(indexHtml));
  }

  app.use(errorHandler);
  return app;
}
