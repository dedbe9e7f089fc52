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

/** The session's CSRF token, fetched once; a failed fetch is forgotten so the next write tries again. */
async function currentCsrfToken(): Promise<string> {
  csrfToken ??= fetchCsrfToken();
  try {
    return await csrfToken;
  } catch (err) {
    csrfToken = null;
    throw err;
  }
}

async function toApiError(res: Response): Promise<ApiError> {
  return errorFromBody(res.status, res.statusText, await res.json().catch(() => null));
}

function errorFromBody(status: number, statusText: string, body: unknown): ApiError {
  const parsed = apiErrorBodySchema.safeParse(body);
  if (parsed.success) {
    const { code, message, details } = parsed.data.error;
    return new ApiError(status, code, message, details);
  }
  return new ApiError(status, status === 503 ? 'db_unavailable' : 'internal', `The server answered ${status} ${statusText}.`);
}

const networkError = () => new ApiError(0, 'network', 'Skewbench cannot reach its server. Check the connection and try again.');

interface RequestOptions<T> {
  method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
  body?: unknown;
  /** A non-JSON body, e.g. a CSV file. */
  rawBody?: { contentType: string; text: string };
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
    if (options.rawBody) headers['content-type'] = options.rawBody.contentType;
    if (method !== 'GET') headers['x-csrf-token'] = await currentCsrfToken();
    let res: Response;
    try {
      res = await fetch(`/api${path}`, {
        method,
        headers,
        credentials: 'same-origin',
        body: options.rawBody ? options.rawBody.text : options.body === undefined ? undefined : JSON.stringify(options.body),
        signal: options.signal,
      });
    } catch (err) {
      if ((err as Error).name === 'AbortError') throw err;
      throw networkError();
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

interface UploadOptions<T> {
  schema?: z.ZodType<T>;
  /** Called as the body goes out, with the fraction sent (0…1). */
  onProgress?: (fraction: number) => void;
  signal?: AbortSignal;
}

interface XhrAnswer {
  status: number;
  statusText: string;
  body: unknown;
}

/**
 * POST a multipart form, reporting upload progress. XMLHttpRequest, because fetch cannot report how much
 * of a request body has been sent. Same cookies, CSRF token (renewed once on csrf_invalid) and ApiError as api().
 */
export async function upload<T = unknown>(path: string, form: FormData, options: UploadOptions<T> = {}): Promise<T> {
  const send = async (): Promise<XhrAnswer> => {
    const token = await currentCsrfToken();
    return new Promise((resolve, reject) => {
      const xhr = new XMLHttpRequest();
      xhr.open('POST', `/api${path}`);
      xhr.setRequestHeader('accept', 'application/json');
      xhr.setRequestHeader('x-csrf-token', token);
      xhr.upload.onprogress = (event) => {
        if (event.lengthComputable) options.onProgress?.(event.loaded / event.total);
      };
      xhr.onload = () => {
        let body: unknown = null;
        try {
          body = xhr.responseText ? JSON.parse(xhr.responseText) : null;
        } catch {
          body = null;
        }
        resolve({ status: xhr.status, statusText: xhr.statusText, body });
      };
      xhr.onerror = () => reject(networkError());
      xhr.onabort = () => reject(new DOMException('The upload was cancelled.', 'AbortError'));
      options.signal?.addEventListener('abort', () => xhr.abort(), { once: true });
      xhr.send(form);
    });
  };

  let answer = await send();
  if (answer.status === 403 && errorFromBody(403, '', answer.body).code === 'csrf_invalid') {
    csrfToken = null;
    answer = await send();
  }
  if (answer.status < 200 || answer.status >= 300) throw errorFromBody(answer.status, answer.statusText, answer.body);
  return options.schema ? options.schema.parse(answer.body) : (answer.body as T);
}
