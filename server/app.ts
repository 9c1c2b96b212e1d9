import express, { type Express } from 'express';
import helmet from 'helmet';
import cookieParser from 'cookie-parser';
import { config } from './config';
import { attachActor } from './middleware/auth';
import { idempotency } from './middleware/idempotency';
import { jsonBodiesOnly, sameOriginOnly } from './middleware/csrf';
import { errorHandler, notFoundApi } from './middleware/errors';
import { apiRouter } from './routes';
import { serveClient } from './static';
import { requestLogger } from './logger';
import { fixedHeaders, helmetOptions } from './middleware/security-headers';

export interface AppOptions {
  /** Serve the built client from dist/ (production). */
  serveClient?: boolean;
}

/** Builds the Express app without listening, so tests can drive it. */
export function createApp(options: AppOptions = {}): Express {
  const app = express();
  app.disable('x-powered-by');
  // No ETag on API answers: they are JSON for one request, and hashing every body (a trace can be
  // hundreds of KB) cost CPU for nothing. The built client's files carry their own (server/static.ts).
  app.set('etag', false);
  // X-Forwarded-For is believed only from a proxy the operator named (TACKLOG_TRUST_PROXY).
  app.set('trust proxy', config.trustProxy);
  app.use(fixedHeaders(helmet(helmetOptions)));
  app.use(requestLogger);
  app.use(cookieParser());
  app.use('/api', sameOriginOnly, jsonBodiesOnly, express.json({ limit: '1mb' }), attachActor, idempotency, apiRouter, notFoundApi);

  if (options.serveClient) serveClient(app, config.clientDir);

  app.use(errorHandler);
  return app;
}
