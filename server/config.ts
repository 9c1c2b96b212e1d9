import crypto from 'node:crypto';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

// server/config.ts, or the built server (.server-build/index.js): either way one folder below the root.
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

function intFromEnv(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n <= 0) throw new Error(`${name} must be a positive whole number, got "${raw}"`);
  return n;
}

export const config = {
  root,
  port: intFromEnv('PORT', 3000),
  host: process.env.HOST ?? '127.0.0.1',
  /** Signing key for session tokens; the start script keeps one in the data folder. */
  jwtSecret: process.env.TACKLOG_JWT_SECRET || crypto.randomBytes(32).toString('hex'),
  sessionHours: intFromEnv('TACKLOG_SESSION_HOURS', 12),
  /** Where uploaded documents are stored. */
  uploadDir: process.env.TACKLOG_UPLOAD_DIR ?? path.join(root, '.data', 'uploads'),
  maxUploadBytes: intFromEnv('TACKLOG_MAX_UPLOAD_BYTES', 10 * 1024 * 1024),
  /** Built client (vite build output) served by Express. */
  clientDir: path.join(root, 'dist'),
  demoPassword: process.env.TACKLOG_DEMO_PASSWORD || 'tacklog-demo',
  /** Login attempts per address per window. */
  loginRateLimit: intFromEnv('TACKLOG_LOGIN_RATE_LIMIT', 20),
  smtp: {
    host: process.env.TACKLOG_SMTP_HOST ?? '127.0.0.1',
    port: intFromEnv('TACKLOG_SMTP_PORT', 2525),
    from: process.env.TACKLOG_MAIL_FROM ?? 'Tacklog <tacklog@plant.test>',
  },
  /** Compliance watch schedule (node-cron syntax); 'off' disables it. */
  watchSchedule: process.env.TACKLOG_WATCH_CRON ?? '*/5 * * * *',
  secureCookies: process.env.TACKLOG_SECURE_COOKIES === '1',
  /** The plant's time zone: a supplier's expiry date is usable through that whole day there. */
  plantZone: process.env.TACKLOG_PLANT_ZONE || 'UTC',
} as const;
