import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { ApiError } from './api-client';

/**
 * Put the server's field messages (`details: [{path, message}]`) on the form's fields.
 * Returns true when at least one landed on a field, so the caller can skip a general banner.
 */
export function applyServerFieldErrors<T extends FieldValues>(error: unknown, setError: UseFormSetError<T>, fields: readonly string[]): boolean {
  if (!(error instanceof ApiError)) return false;
  let placed = false;
  for (const issue of error.fieldIssues) {
    if (fields.includes(issue.path)) {
      setError(issue.path as Path<T>, { type: 'server', message: issue.message });
      placed = true;
    }
  }
  return placed;
}
