import { mailboxQuerySchema, type CapturedMailSummary } from '@shared/schemas/mail';

const formatters = new Map<string, Intl.DateTimeFormat>();

/** An instant on the lab's clock, e.g. `12 Dec 2026, 14:05`, whatever zone the browser is in. */
export function formatLabInstant(iso: string, timeZone: string): string {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat(undefined, { timeZone, dateStyle: 'medium', timeStyle: 'short', hourCycle: 'h23' });
    formatters.set(timeZone, f);
  }
  return f.format(new Date(iso));
}

/** A size in bytes for people: `512 B`, `3.4 kB`, `1.2 MB` (powers of 1000, as file managers show them). */
export function formatBytes(bytes: number): string {
  if (bytes < 1000) return `${bytes} B`;
  if (bytes < 1_000_000) return `${Number((bytes / 1000).toFixed(1))} kB`;
  return `${Number((bytes / 1_000_000).toFixed(1))} MB`;
}

/**
 * The recipient filter as the server's exact `to` filter: the address, lower-cased, when the text is a complete
 * e-mail address (checked with the API's own schema), else undefined and the list is filtered here as typed.
 */
export function serverRecipient(filter: string): string | undefined {
  const parsed = mailboxQuerySchema.pick({ to: true }).safeParse({ to: filter });
  return parsed.success ? parsed.data.to : undefined;
}

/** Whether a message went to someone matching the filter: any part of an envelope recipient or the To header. */
export function matchesRecipient(message: Pick<CapturedMailSummary, 'toAddresses' | 'toHeader'>, filter: string): boolean {
  const needle = filter.trim().toLowerCase();
  if (!needle) return true;
  return message.toAddresses.some((a) => a.toLowerCase().includes(needle)) || message.toHeader.toLowerCase().includes(needle);
}

/** The distinct recipients of some messages, sorted, for the filter's suggestions. */
export function recipientsOf(messages: Pick<CapturedMailSummary, 'toAddresses'>[]): string[] {
  return [...new Set(messages.flatMap((m) => m.toAddresses))].sort();
}

/** An outbox kind for people: `booking-confirmed` → `Booking confirmed`. */
export function kindLabel(kind: string): string {
  const words = kind.replace(/-/g, ' ');
  return words.charAt(0).toUpperCase() + words.slice(1);
}
