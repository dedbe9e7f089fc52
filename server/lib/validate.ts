import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { toFieldIssues } from '../../shared/errors.js';
import { AppError } from './errors.js';

type Part = 'body' | 'params' | 'query';

/**
 * Parse the request's body, params and query with shared zod schemas.
 * Parsed values land on res.locals.body / .params / .query (Express 5's req.query is read-only).
 */
export function validate(schemas: Partial<Record<Part, z.ZodType>>): RequestHandler {
  return (req, res, next) => {
    const issues: { path: string; message: string }[] = [];
    for (const part of ['params', 'query', 'body'] as const) {
      const schema = schemas[part];
      if (!schema) continue;
      const input = part === 'body' ? (req.body ?? {}) : req[part];
      const result = schema.safeParse(input);
      if (result.success) {
        res.locals[part] = result.data;
      } else {
        for (const issue of toFieldIssues(result.error.issues)) {
          issues.push(part === 'body' ? issue : { ...issue, path: issue.path ? `${part}.${issue.path}` : part });
        }
      }
    }
    if (issues.length) {
      next(new AppError(400, 'validation_failed', 'Some fields are not valid.', issues));
      return;
    }
    next();
  };
}
