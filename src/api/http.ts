import { z } from 'zod';
import { errorBodySchema, fieldIssueSchema, type FieldIssue } from '@shared/schemas/common';
import { isRefusalCode, refusalText, refusalTitle, type RefusalCode } from '@shared/refusals';
import { reportDatabaseDown, reportDatabaseUp, retryDelayMs } from './connection';

/**
 * A failed API call, built from the API's error shape {error: {code, message, details}}.
 * `status` is 0 when the server could not be reached at all. `code` is from the one catalogue
 * (`shared/refusals.ts`), so comparisons are checked; a code this client does not know (a newer
 * server) reads as HTTP_ERROR, with the server's own in `serverCode`. People read `text` (the
 * plain title and the server's message), never the code.
 */
export class ApiError extends Error {
  constructor(
    public readonly status: number,
    public readonly code: RefusalCode,
    message: string,
    public readonly details: FieldIssue[] = [],
    /** The error's `details` as sent, when they are not a list of fields (e.g. {cureCompleteAt} of CURE_INCOMPLETE). */
    public readonly info: unknown = undefined,
    /** The code as the server sent it (the same as `code` unless this client does not know it). */
    public readonly serverCode: string = code,
  ) {
    super(message);
    this.name = 'ApiError';
  }

  /** The refusal's plain title ("Lot on hold"). */
  get title(): string {
    return refusalTitle(this.code);
  }

  /** What a person reads: the title, then the server's message. */
  get text(): string {
    return refusalText(this.code, this.message);
  }

  /** The server's message for one field (400 responses list the fields in error). */
  fieldMessage(field: string): string | undefined {
    return this.details.find((d) => d.field === field)?.message;
  }
}

export type QueryValue = string | number | boolean | null | undefined;

export interface ApiRequest<S extends z.ZodTypeAny> {
  method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  /** Sent as JSON, or as multipart when it is a FormData. */
  body?: unknown;
  /** Empty values (undefined, null, '') are left out. */
  query?: Record<string, QueryValue>;
  /** The zod schema (from shared/schemas) the response must match. */
  schema: S;
  /** Repeating a request with the same key returns the first response and changes nothing. */
  idempotencyKey?: string;
  signal?: AbortSignal;
  /**
   * While the server answers 503 DB_UNAVAILABLE, wait as long as its Retry-After says and send
   * again, until it answers otherwise (or `signal` aborts). Default: for reads, and for writes
   * that carry an Idempotency-Key (a repeat cannot apply them twice). A write without a key is
   * not repeated: it fails with that 503 for the page to show.
   */
  retryWhileDatabaseDown?: boolean;
}

type UnauthorizedListener = () => void;
const unauthorizedListeners = new Set<UnauthorizedListener>();

/** Called on every 401, so the session can drop the user. Returns a function that unsubscribes. */
export function onUnauthorized(listener: UnauthorizedListener): () => void {
  unauthorizedListeners.add(listener);
  return () => unauthorizedListeners.delete(listener);
}

const fieldIssuesSchema = z.array(fieldIssueSchema);

function withQuery(path: string, query: Record<string, QueryValue> | undefined): string {
  if (!query) return path;
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value === undefined || value === null || value === '') continue;
    params.append(key, String(value));
  }
  const text = params.toString();
  if (!text) return path;
  return `${path}${path.includes('?') ? '&' : '?'}${text}`;
}

async function readJson(response: Response): Promise<unknown> {
  if (response.status === 204) return undefined;
  const text = await response.text();
  if (!text) return undefined;
  try {
    return JSON.parse(text) as unknown;
  } catch {
    throw new ApiError(response.status, 'BAD_RESPONSE', `The answer could not be read (HTTP ${response.status}).`);
  }
}

function errorFrom(status: number, payload: unknown): ApiError {
  const parsed = errorBodySchema.safeParse(payload);
  if (!parsed.success) {
    return new ApiError(status, 'HTTP_ERROR', `The server answered HTTP ${status}.`);
  }
  const { code, message, details } = parsed.data.error;
  const issues = fieldIssuesSchema.safeParse(details);
  const known = isRefusalCode(code) ? code : 'HTTP_ERROR';
  return new ApiError(status, known, message, issues.success ? issues.data : [], issues.success ? undefined : details, code);
}

/**
 * What a person reads for anything a call or an action threw: for a refusal its plain title and
 * the server's message (never the code); for other errors their message.
 */
export function errorText(err: unknown): string {
  if (err instanceof ApiError) return err.text;
  return err instanceof Error ? err.message : String(err);
}

/** Resolves after `ms`, or rejects with the AbortError when `signal` aborts first. */
function wait(ms: number, signal?: AbortSignal): Promise<void> {
  return new Promise((resolve, reject) => {
    const aborted = () => {
      clearTimeout(timer);
      reject(signal?.reason instanceof DOMException ? signal.reason : new DOMException('The request was aborted.', 'AbortError'));
    };
    const timer = setTimeout(() => {
      signal?.removeEventListener('abort', aborted);
      resolve();
    }, ms);
    if (signal?.aborted) aborted();
    else signal?.addEventListener('abort', aborted, { once: true });
  });
}

/**
 * Calls the Tacklog API: sends JSON with the session cookie, parses the answer with `schema`,
 * and throws an ApiError for any non-2xx answer (after telling 401 listeners). While the database
 * is unreachable (503 DB_UNAVAILABLE) it reports that for the banner and, for reads and keyed
 * writes, waits and sends again by itself (see `retryWhileDatabaseDown`).
 */
export async function apiFetch<S extends z.ZodTypeAny>(path: string, request: ApiRequest<S>): Promise<z.infer<S>> {
  const headers: Record<string, string> = { Accept: 'application/json' };
  let body: BodyInit | undefined;
  if (request.body instanceof FormData) {
    body = request.body;
  } else if (request.body !== undefined) {
    headers['Content-Type'] = 'application/json';
    body = JSON.stringify(request.body);
  }
  if (request.idempotencyKey) headers['Idempotency-Key'] = request.idempotencyKey;

  const method = request.method ?? 'GET';
  const retry = request.retryWhileDatabaseDown ?? (method === 'GET' || Boolean(request.idempotencyKey));
  let response: Response;
  let sawDatabaseDown = false;
  for (;;) {
    try {
      response = await fetch(withQuery(path, request.query), {
        method,
        headers,
        body,
        credentials: 'same-origin',
        signal: request.signal,
      });
    } catch (err) {
      if (err instanceof DOMException && err.name === 'AbortError') throw err;
      throw new ApiError(0, 'NETWORK', 'The Tacklog server could not be reached. Check the connection and try again.');
    }
    if (response.status === 409 && sawDatabaseDown && request.idempotencyKey) {
      // An earlier try of this key was cut off by the outage; the server releases it shortly.
      const refusal = errorFrom(409, await readJson(response).catch(() => undefined));
      if (refusal.code !== 'IDEMPOTENCY_IN_PROGRESS') throw refusal;
      await wait(retryDelayMs(null), request.signal);
      continue;
    }
    if (response.status !== 503) break;
    const refusal = errorFrom(503, await readJson(response).catch(() => undefined));
    if (refusal.code !== 'DB_UNAVAILABLE') throw refusal;
    sawDatabaseDown = true;
    const delay = retryDelayMs(response.headers.get('Retry-After'));
    reportDatabaseDown(delay);
    if (!retry) {
      throw new ApiError(
        503,
        'DB_UNAVAILABLE',
        'The database could not be reached, so this may not have been saved. Tacklog is reconnecting by itself; try again in a moment.',
      );
    }
    await wait(delay, request.signal);
  }
  if (response.ok) reportDatabaseUp();

  const payload = await readJson(response);
  if (!response.ok) {
    const error = errorFrom(response.status, payload);
    if (response.status === 401) unauthorizedListeners.forEach((listener) => listener());
    throw error;
  }
  const parsed = request.schema.safeParse(payload);
  if (!parsed.success) {
    console.error(`[api] ${request.method ?? 'GET'} ${path}: unexpected response shape`, parsed.error.issues);
    throw new ApiError(response.status, 'BAD_RESPONSE', 'The page may be out of date: reload it.');
  }
  return parsed.data as z.infer<S>;
}

/** A file the API sent for download: its bytes and the name from Content-Disposition. */
export interface DownloadedFile {
  blob: Blob;
  filename: string;
}

/** The file name in `attachment; filename="tacklog-lots-2026-12-02.csv"` (or `fallback`). */
export function filenameFrom(disposition: string | null, fallback: string): string {
  const match = /filename="?([^";]+)"?/i.exec(disposition ?? '');
  return match ? match[1] : fallback;
}

/**
 * GET a file (a CSV export) with the session cookie. A refusal (409 too many rows, 401, 403…) is
 * thrown as an ApiError like any other call, so the page can say what is wrong instead of the
 * browser saving an error as a file.
 */
export async function apiDownload(path: string, query: Record<string, QueryValue>, fallbackName: string): Promise<DownloadedFile> {
  let response: Response;
  try {
    response = await fetch(withQuery(path, query), { headers: { Accept: 'text/csv' }, credentials: 'same-origin' });
  } catch {
    throw new ApiError(0, 'NETWORK', 'The Tacklog server could not be reached. Check the connection and try again.');
  }
  if (!response.ok) {
    const error = errorFrom(response.status, await readJson(response).catch(() => undefined));
    if (response.status === 401) unauthorizedListeners.forEach((listener) => listener());
    if (error.code === 'DB_UNAVAILABLE') reportDatabaseDown(retryDelayMs(response.headers.get('Retry-After')));
    throw error;
  }
  reportDatabaseUp();
  return { blob: await response.blob(), filename: filenameFrom(response.headers.get('Content-Disposition'), fallbackName) };
}

/** A fresh Idempotency-Key for one user action (reuse it when retrying that same action). */
export function newIdempotencyKey(): string {
  return crypto.randomUUID();
}
