import { z } from 'zod';

/** Every error code the API answers with. Lab scripts match on these: only ever add to the list. */
export const errorCodes = [
  'validation_failed',
  'invalid_json',
  'unauthenticated',
  'invalid_credentials',
  'forbidden',
  'csrf_invalid',
  'not_found',
  'conflict',
  'email_taken',
  'tag_taken',
  'invalid_csv',
  'booking_clash',
  'booking_rule',
  'invalid_state',
  'last_manager',
  'payload_too_large',
  'rate_limited',
  'db_unavailable',
  'internal',
  'invalid_image',
  'image_too_large',
  'mail_capture_off',
  'token_invalid',
  'solver_limit',
] as const;
export type ErrorCode = (typeof errorCodes)[number];

/** One problem with one input field; `path` is dotted (`"sources.0.powerDbm"`), empty for the whole input. */
export const fieldIssueSchema = z.object({ path: z.string(), message: z.string() });
export type FieldIssue = z.infer<typeof fieldIssueSchema>;

/** The body of every error response: `{"error":{"code","message","details"}}`. */
export const apiErrorBodySchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    details: z.unknown().optional(),
  }),
});
export type ApiErrorBody = z.infer<typeof apiErrorBodySchema>;

/** Turn zod issues into field issues with dotted paths. */
export function toFieldIssues(issues: readonly { path: readonly PropertyKey[]; message: string }[]): FieldIssue[] {
  return issues.map((issue) => ({ path: issue.path.map(String).join('.'), message: issue.message }));
}
