import type { BookingEvent } from '@shared/schemas/bookings';
import { EmptyState, Panel } from '@/components/ui/feedback';
import { formatLabDateTime } from '../utils/lab-time';

const isoInstant = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})$/;

/** `startsAt` → `Starts at`, `checked-in` → `Checked in`. */
function words(key: string): string {
  const spaced = key.replace(/[-_]/g, ' ').replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase();
  return spaced.charAt(0).toUpperCase() + spaced.slice(1);
}

/** A recorded value as a reader wants it: instants on the lab's clock, lists joined, nothing as a dash. */
function show(value: unknown, timeZone: string): string {
  if (value === null || value === undefined || value === '') return '—';
  if (typeof value === 'string') return isoInstant.test(value) ? formatLabDateTime(value, timeZone) : value;
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (Array.isArray(value)) return value.map((v) => show(v, timeZone)).join(', ');
  if (typeof value === 'object') {
    // Instruments and people are recorded as objects: their tag or name says enough.
    const named = value as { tag?: unknown; name?: unknown };
    if (typeof named.tag === 'string') return named.tag;
    if (typeof named.name === 'string') return named.name;
    return JSON.stringify(value);
  }
  return String(value);
}

/** Fields in the order a reader looks for them; others follow as recorded. */
const fieldOrder = ['status', 'instruments', 'startsAt', 'endsAt', 'purpose', 'projectCode', 'notes', 'reason', 'handoverNote', 'leftConnected'];
const rank = (key: string) => (fieldOrder.includes(key) ? fieldOrder.indexOf(key) : fieldOrder.length);

const asRecord = (value: unknown): Record<string, unknown> | null =>
  value && typeof value === 'object' && !Array.isArray(value) ? (value as Record<string, unknown>) : null;

/** The fields that changed, `before → after`; a value recorded on one side only is shown as it is. */
function changes(event: BookingEvent, timeZone: string): string[] {
  const before = asRecord(event.before);
  const after = asRecord(event.after);
  if (!before && !after) {
    if (event.before === null && event.after === null) return [];
    return [`${show(event.before, timeZone)} → ${show(event.after, timeZone)}`];
  }
  const keys = [...new Set([...Object.keys(before ?? {}), ...Object.keys(after ?? {})])].sort((a, b) => rank(a) - rank(b));
  return keys.flatMap((key) => {
    if (!before || !after) return [`${words(key)}: ${show((after ?? before)![key], timeZone)}`];
    const [was, now] = [show(before[key], timeZone), show(after[key], timeZone)];
    return was === now ? [] : [`${words(key)}: ${was} → ${now}`];
  });
}

/** The booking's audit trail: who did what when, oldest first, with each change as before → after. */
export function BookingHistory({ events, timeZone }: { events: BookingEvent[]; timeZone: string }) {
  return (
    <Panel title="History">
      {events.length === 0 ? (
        <EmptyState title="Nothing recorded yet" />
      ) : (
        <ol className="divide-y divide-ink-100" aria-label="Audit trail">
          {[...events]
            .sort((a, b) => Date.parse(a.at) - Date.parse(b.at))
            .map((event) => {
              const lines = changes(event, timeZone);
              return (
                <li key={event.id} className="py-2.5">
                  <div className="flex flex-wrap items-baseline justify-between gap-x-3">
                    <span className="font-semibold text-ink-800">
                      {words(event.action)}
                      <span className="font-normal text-ink-600"> by {event.actor?.name ?? 'Skewbench'}</span>
                    </span>
                    <time dateTime={event.at} className="text-caption text-ink-500">
                      {formatLabDateTime(event.at, timeZone)}
                    </time>
                  </div>
                  {lines.length ? (
                    <ul className="mt-1 space-y-0.5 text-caption text-ink-600">
                      {lines.map((line, index) => (
                        <li key={index}>{line}</li>
                      ))}
                    </ul>
                  ) : null}
                </li>
              );
            })}
        </ol>
      )}
    </Panel>
  );
}
