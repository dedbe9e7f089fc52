import { apiErrorBodySchema, type FieldIssue } from '@shared/errors';
import type { z } from 'zod';

/** Any non-2xx answer of the API, with the shared error body's code, message and details. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = 'ApiError';
  }

  /** Field problems of a validation error (`details` as `[{path, message}]`), else []. */
  get fieldIssues(): FieldIssue[] {
    return Array.isArray(this.details)
      ? this.details.filter((d): d is FieldIssue => typeof d?.path === 'string' && typeof d?.message === 'string')
      : [];
  }
}

let csrfToken: Promise<string> | null = null;

async function fetchCsrfToken(): Promise<string> {
  const res = await fetch('/api/auth/csrf', { credentials: 'same-origin', headers: { accept: 'application/json' } });
  if (!res.ok) throw await toApiError(res);
  return ((await res.json()) as { token: string }).token;
}

/** Forget the CSRF token; the session changed (sign-in, sign-out) and the next write fetches a new one. */
export function resetCsrfToken(): void {
  csrfToken = null;
}

async function toApiError(res: Response): Promise<ApiError> {
  const body = await res.json().catch(() => null);
  const parsed = apiErrorBodySchema.safeParse(body);
  if (parsed.success) {
    const { code, message, details } = parsed.data.error;
    return new ApiError(res.status, code, message, details);
  }
  return new ApiError(res.status, res.status === 503 ? 'db_unavailable' : 'internal', `The server answered ${res.status} ${res.statusText}.`);
}

interface RequestOptions<T> {
  method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
  body?: unknown;
  /** When given, the response is parsed with it, so a contract drift fails loudly here. */
  schema?: z.ZodType<T>;
  signal?: AbortSignal;
}

/** The one fetch wrapper: same-origin cookies, JSON, CSRF token on writes, ApiError on failure. */
export async function api<T = unknown>(path: string, options: RequestOptions<T> = {}): Promise<T> {
  const method = options.method ?? 'GET';
  const send = async () => {
    const headers: Record<string, string> = { accept: 'application/json' };
    if (options.body !== undefined) headers['content-type'] = 'application/json';
    if (method !== 'GET') {
      csrfToken ??= fetchCsrfToken();
      try {
        headers['x-csrf-token'] = await csrfToken;
      } catch (err) {
        csrfToken = null;
        throw err;
      }
    }
    let res: Response;
    try {
      res = await fetch(`/api${path}`, {
        method,
        headers,
        credentials: 'same-origin',
        body: options.body === undefined ? undefined : JSON.stringify(options.body),
        signal: options.signal,
      });
    } catch (err) {
      if ((err as Error).name === 'AbortError') throw err;
      throw new ApiError(0, 'network', 'Skewbench cannot reach its server. Check the connection and try again.');
    }
    return res;
  };

  let res = await send();
  if (res.status === 403 && method !== 'GET') {
    const error = await toApiError(res.clone());
    if (error.code === 'csrf_invalid') {
      // The session was renewed since the token was fetched: fetch a new one and try once more.
      csrfToken = null;
      res = await send();
    }
  }
  if (!res.ok) throw await toApiError(res);
  if (res.status === 204) return undefined as T;
  const data: unknown = await res.json();
  return options.schema ? options.schema.parse(data) : (data as T);
}
