import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ConnectionError, ForeignKeyConstraintError, UniqueConstraintError, ExclusionConstraintError, DatabaseError } from 'sequelize';
import { ZodError } from 'zod';
import { toFieldIssues, type ApiErrorBody, type ErrorCode } from '../../shared/errors.js';
import { AppError } from './errors.js';
import { logger } from './logger.js';

/** Error codes of node and PostgreSQL that mean "the database cannot be reached right now". */
const unreachableCodes = new Set([
  'ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'ENOTFOUND', 'EHOSTUNREACH',
  '57P01', '57P02', '57P03', '08000', '08001', '08003', '08004', '08006',
]);

/** True for connection failures of Sequelize, pg or the session store. */
export function isDatabaseUnreachable(err: unknown): boolean {
  if (err instanceof ConnectionError) return true;
  const e = err as { code?: unknown; parent?: { code?: unknown }; message?: unknown } | null;
  if (!e || typeof e !== 'object') return false;
  if (typeof e.code === 'string' && unreachableCodes.has(e.code)) return true;
  if (e.parent && typeof e.parent.code === 'string' && unreachableCodes.has(e.parent.code)) return true;
  return typeof e.message === 'string' && /Connection terminated|connect ECONNREFUSED|the database system is (starting|shutting) down/.test(e.message);
}

interface Mapped {
  status: number;
  code: ErrorCode;
  message: string;
  details?: unknown;
}

function map(err: unknown): Mapped | null {
  if (err instanceof AppError) return { status: err.status, code: err.code, message: err.message, details: err.details };
  if (err instanceof ZodError) {
    return { status: 400, code: 'validation_failed', message: 'Some fields are not valid.', details: toFieldIssues(err.issues) };
  }
  const bodyError = err as { type?: string; status?: number; expose?: boolean; message?: string };
  if (bodyError?.type === 'entity.parse.failed') {
    return { status: 400, code: 'invalid_json', message: 'The request body is not valid JSON.' };
  }
  if (bodyError?.type === 'entity.too.large') {
    return { status: 413, code: 'payload_too_large', message: 'The request body is too large.' };
  }
  if (bodyError?.expose && typeof bodyError.status === 'number' && bodyError.status >= 400 && bodyError.status < 500) {
    const code: ErrorCode = bodyError.status === 404 ? 'not_found' : bodyError.status === 413 ? 'payload_too_large' : 'validation_failed';
    return { status: bodyError.status, code, message: bodyError.message ?? 'Bad request.' };
  }
  if (err instanceof UniqueConstraintError) {
    const details = err.errors.map((e) => ({ path: e.path ?? '', message: `${e.path ?? 'value'} is already taken` }));
    return { status: 409, code: 'conflict', message: 'A record with that value already exists.', details };
  }
  if (err instanceof ExclusionConstraintError) {
    return { status: 409, code: 'conflict', message: 'That clashes with an existing record.' };
  }
  if (err instanceof ForeignKeyConstraintError) {
    return { status: 409, code: 'conflict', message: 'That refers to a record that does not exist or is still in use.' };
  }
  if (isDatabaseUnreachable(err)) {
    return { status: 503, code: 'db_unavailable', message: 'The database is not reachable right now. Try again in a moment.' };
  }
  if (err instanceof DatabaseError) {
    const code = (err.parent as { code?: string } | undefined)?.code ?? '';
    // Class 22 is "data exception": a value the database cannot store, i.e. bad input that slipped past validation.
    if (code.startsWith('22')) return { status: 400, code: 'validation_failed', message: 'A value is out of range or malformed.' };
  }
  return null;
}

/** The one error middleware: every failure leaves as `{"error":{"code","message","details"}}`. */
export const errorHandler: ErrorRequestHandler = (err, req, res, next) => {
  if (res.headersSent) {
    next(err);
    return;
  }
  const mapped = map(err);
  const requestId = res.locals.requestId as string | undefined;
  let body: ApiErrorBody;
  let status: number;
  if (mapped) {
    status = mapped.status;
    body = { error: { code: mapped.code, message: mapped.message, ...(mapped.details !== undefined ? { details: mapped.details } : {}) } };
    if (status === 503) logger.warn(`${req.method} ${req.originalUrl} → 503 database unreachable [${requestId}]`);
  } else {
    status = 500;
    body = { error: { code: 'internal', message: 'Something went wrong on the server. It has been logged.', details: { requestId } } };
    logger.error(`${req.method} ${req.originalUrl} → 500 [${requestId}]`, err);
  }
  res.status(status).json(body);
};

/** JSON 404 for unknown /api routes. */
export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new AppError(404, 'not_found', `No API route ${req.method} ${req.path}.`));
};
