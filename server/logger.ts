/**
 * The server's one logger (pino): JSON lines on stdout, one per request with its id, and every
 * error with the id of the request it belongs to. TACKLOG_LOG_LEVEL sets the level
 * (fatal, error, warn, info, debug, trace or silent; default info).
 */
import crypto from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';
import { performance } from 'node:perf_hooks';
import express, { type Request, type RequestHandler } from 'express';
import { pino, type Logger } from 'pino';

const LEVELS = ['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent'];
const level = process.env.TACKLOG_LOG_LEVEL || 'info';
if (!LEVELS.includes(level)) throw new Error(`TACKLOG_LOG_LEVEL must be one of ${LEVELS.join(', ')}, got "${level}"`);

/**
 * Buffered writes to stdout (4 KiB at a time, flushed on exit by pino): a synchronous write per
 * line was a system call per request under load.
 */
export const logger = pino({ level, base: { pid: process.pid } }, pino.destination({ dest: 1, sync: false, minLength: 4096 }));

/** A request id: the caller's X-Request-Id when it is a sane token, else a new UUID. */
function requestId(req: IncomingMessage, res: ServerResponse): string {
  const given = req.headers['x-request-id'];
  const id = typeof given === 'string' && /^[A-Za-z0-9._:-]{1,100}$/.test(given) ? given : crypto.randomUUID();
  res.setHeader('X-Request-Id', id);
  return id;
}

/** The level of a request's line: errors for 5xx, warnings for 4xx. */
function levelOf(statusCode: number): 'error' | 'warn' | 'info' {
  return statusCode >= 500 ? 'error' : statusCode >= 400 ? 'warn' : 'info';
}

/**
 * `req.log`: made on first use from the request's id, method and URL, by a getter on Express's
 * request prototype (a property defined on each request object would slow every later access
 * to it).
 */
const childLoggers = new WeakMap<object, Logger>();
/** The logger a request's lines go to (the server's own, or a test's). */
const baseOf = new WeakMap<object, Logger>();
Object.defineProperty(express.request, 'log', {
  configurable: true,
  get(this: Request): Logger {
    let child = childLoggers.get(this);
    if (!child) {
      child = (baseOf.get(this) ?? logger).child({ req: { id: this.id, method: this.method, url: this.originalUrl } });
      childLoggers.set(this, child);
    }
    return child;
  },
});

/**
 * Logs each request once it is answered (method, URL, status, time in ms, request id) and gives
 * handlers `req.log`, a child logger carrying the request. Bodies, cookies and the authorization
 * header are never logged. The lines are what pino-http wrote ("request completed", or "request
 * aborted" when the client went away first), made with far less work per request (pino-http
 * built a child logger and wrapped request and response for its serializers on every request,
 * a fifth of a scan lookup's cost); the child logger is made only when a handler logs. `base`:
 * where the lines go.
 */
export const requestLoggerFor =
  (base: Logger): RequestHandler =>
  (req, res, next) => {
    const id = requestId(req, res);
    req.id = id;
    if (base !== logger) baseOf.set(req, base);
    // Health checks of a load balancer would drown the log.
    if (req.originalUrl === '/api/health') {
      next();
      return;
    }
    const started = performance.now();
    const line = (aborted: boolean) => {
      const statusCode = res.statusCode;
      const fields = {
        req: { id, method: req.method, url: req.originalUrl },
        res: { statusCode },
        responseTime: Math.round(performance.now() - started),
      };
      if (aborted) base.error({ ...fields, err: { message: 'request aborted' } }, 'request aborted');
      else base[levelOf(statusCode)](fields, 'request completed');
    };
    res.once('finish', () => line(false));
    res.once('close', () => {
      if (!res.writableFinished) line(true);
    });
    next();
  };

export const requestLogger = requestLoggerFor(logger);
