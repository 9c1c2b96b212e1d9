/**
 * The server's one logger (pino): JSON lines on stdout, one per request with its id, and every
 * error with the id of the request it belongs to. TACKLOG_LOG_LEVEL sets the level
 * (fatal, error, warn, info, debug, trace or silent; default info).
 */
import crypto from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';
import { pino } from 'pino';
import { pinoHttp } from 'pino-http';

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

/**
 * Logs each request once it is answered (method, URL, status, time, request id) and gives
 * handlers `req.log`, a child logger carrying the id. Bodies, cookies and the authorization
 * header are never logged.
 */
export const requestLogger = pinoHttp({
  logger,
  genReqId: requestId,
  customLogLevel: (_req, res, err) => (err || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'warn' : 'info'),
  serializers: {
    req: (req: { id: string; method: string; url: string }) => ({ id: req.id, method: req.method, url: req.url }),
    res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
  },
  // Health checks of a load balancer would drown the log.
  autoLogging: { ignore: (req) => req.url === '/api/health' },
});
