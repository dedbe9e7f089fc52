import { z } from 'zod';

/** Tags of instruments and parts: letters, digits and dashes, stored in upper case (`PS-2`, `C-017`). */
export const tagSchema = z
  .string({ error: 'Enter a tag' })
  .trim()
  .toUpperCase()
  .regex(/^[A-Z0-9][A-Z0-9-]{0,23}$/, { error: 'Use up to 24 letters, digits and dashes, e.g. C-017' });

export const notesSchema = z.string().trim().max(4000, { error: 'Notes must be at most 4000 characters' });

/** A calendar date `YYYY-MM-DD` that exists. */
export const isoDateSchema = z.iso.date({ error: 'Enter a date as YYYY-MM-DD' });

/** A finite number, with a readable message when it is missing or not a number. */
export const num = (what: string) => z.number({ error: `${what} must be a number` }).finite({ error: `${what} must be a finite number` });

export const frequencyHzSchema = (what: string) =>
  num(what).positive({ error: `${what} must be above 0 Hz` }).max(1e13, { error: `${what} must be at most 10 THz` });

/** Checks that min ≤ max for a frequency range. */
export function frequencyRangeIssue(min: number | null | undefined, max: number | null | undefined): boolean {
  return min != null && max != null && min > max;
}
