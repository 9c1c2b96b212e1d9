/**
 * Driving the real Express app in API tests.
 *
 *   import { startApp, api, type TestApp } from '../helpers/api';
 *   import { ensureUser } from '../helpers/db';
 *
 *   let app: TestApp;
 *   beforeAll(async () => { app = await startApp(); });    // createApp() on 127.0.0.1:<free port>
 *   afterAll(() => app.close());
 *
 *   const admin = await ensureUser(['admin']);
 *   const res = await api(app.baseUrl, admin.token).get('/api/users');
 *   expect(res.status).toBe(200);
 *   expect(res.body.items.length).toBeGreaterThan(0);
 *   await api(app.baseUrl).post('/api/auth/login', { email, password });        // JSON body
 *   await api(app.baseUrl).post('/api/lots', undefined, { raw: '{"broken' });   // a body sent as is
 *   await api(app.baseUrl).get('/api/auth/me', { headers: { cookie: 'tacklog_session=…' } });
 *
 * Every call resolves to {status, body, headers}: body is the parsed JSON (text when the
 * response is not JSON, null when empty). It never throws for a 4xx/5xx; check `status`.
 * startApp migrates DATABASE_URL first (see tests/helpers/db.ts).
 */
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { createApp, type AppOptions } from '../../server/app';
import { httpServerFor } from '../../server/http-server';
import { migrateTestDatabase } from './db';

export interface TestApp {
  /** e.g. http://127.0.0.1:41234 */
  baseUrl: string;
  server: Server;
  close(): Promise<void>;
}

/** The real app (createApp) listening on an ephemeral port on 127.0.0.1. */
export async function startApp(options: AppOptions = {}): Promise<TestApp> {
  await migrateTestDatabase();
  return listen(createApp(options));
}

/** Listens with any Express app (e.g. one built from freshly imported modules) on a free port. */
export function listen(app: ReturnType<typeof createApp>): Promise<TestApp> {
  return new Promise((resolve, reject) => {
    const server = httpServerFor(app).listen(0, '127.0.0.1', () => {
      const { port } = server.address() as AddressInfo;
      resolve({
        baseUrl: `http://127.0.0.1:${port}`,
        server,
        close: () =>
          new Promise<void>((done, fail) => {
            server.close((err) => (err ? fail(err) : done()));
            server.closeAllConnections();
          }),
      });
    });
    server.on('error', reject);
  });
}

// Test bodies are checked field by field with expect(); `any` keeps that terse.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export interface ApiResponse<T = any> {
  status: number;
  body: T;
  headers: Headers;
}

export interface RequestOptions {
  headers?: Record<string, string>;
  /** Send this string as the body, as is (Content-Type: application/json unless headers say otherwise). */
  raw?: string;
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Call = <T = any>(path: string, options?: RequestOptions) => Promise<ApiResponse<T>>;
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type CallWithBody = <T = any>(path: string, body?: unknown, options?: RequestOptions) => Promise<ApiResponse<T>>;

export interface ApiClient {
  get: Call;
  delete: Call;
  post: CallWithBody;
  put: CallWithBody;
  patch: CallWithBody;
  request<T>(method: string, path: string, body?: unknown, options?: RequestOptions): Promise<ApiResponse<T>>;
}

/** A small fetch wrapper for `baseUrl`, signed in with a bearer `token` when given. */
export function api(baseUrl: string, token?: string): ApiClient {
  async function request<T>(method: string, path: string, body?: unknown, options: RequestOptions = {}): Promise<ApiResponse<T>> {
    const headers: Record<string, string> = { accept: 'application/json' };
    if (token) headers.authorization = `Bearer ${token}`;
    let payload: string | undefined;
    if (options.raw !== undefined) payload = options.raw;
    else if (body !== undefined) payload = JSON.stringify(body);
    if (payload !== undefined) headers['content-type'] = 'application/json';
    Object.assign(headers, options.headers);
    const res = await fetch(`${baseUrl}${path}`, { method, headers, body: payload, redirect: 'manual' });
    const text = await res.text();
    let parsed: unknown = null;
    if (text.length > 0) {
      parsed = (res.headers.get('content-type') ?? '').includes('json') ? JSON.parse(text) : text;
    }
    return { status: res.status, body: parsed as T, headers: res.headers };
  }
  return {
    get: (path, options) => request('GET', path, undefined, options),
    delete: (path, options) => request('DELETE', path, undefined, options),
    post: (path, body, options) => request('POST', path, body, options),
    put: (path, body, options) => request('PUT', path, body, options),
    patch: (path, body, options) => request('PATCH', path, body, options),
    request,
  };
}

/** Signs in through POST /api/auth/login and returns the bearer token (fails the test otherwise). */
export async function login(baseUrl: string, email: string, password: string): Promise<string> {
  const res = await api(baseUrl).post<{ token: string }>('/api/auth/login', { email, password });
  if (res.status !== 200) throw new Error(`login as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body.token;
}
