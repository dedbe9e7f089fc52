import { useQuery } from '@tanstack/react-query';
import type { OutboxEntry } from '@shared/schemas/mail';
import { Button } from '@/components/ui/button';
import { Badge, Loading, Notice, Panel } from '@/components/ui/feedback';
import { outboxOptions } from '../api/get-outbox';
import { useRetryOutboxEntry } from '../api/retry-outbox';
import { formatLabInstant, kindLabel } from '../utils/mail-format';

/** How many of the newest pending and failed messages the panel lists. */
const SHOWN = 10;

function Count({ label, value, tone, hint }: { label: string; value: number; tone: 'caution' | 'pass' | 'fault' | 'muted'; hint?: string }) {
  const look = { caution: 'text-caution-700', pass: 'text-pass-700', fault: 'text-fault-700', muted: 'text-ink-400' }[value ? tone : 'muted'];
  return (
    <div className="rounded-chip bg-ptfe-50 px-3.5 py-2 ring-1 ring-ink-100">
      <dt className="text-caption font-semibold uppercase tracking-wide text-ink-500">{label}</dt>
      <dd className={`text-title tabular-nums ${look}`} data-testid={`outbox-${label.toLowerCase().replace(/\W+/g, '-')}`}>
        {value}
      </dd>
      {hint ? <dd className="text-caption text-ink-500">{hint}</dd> : null}
    </div>
  );
}

function RetryButton({ entry }: { entry: OutboxEntry }) {
  const retry = useRetryOutboxEntry();
  return (
    <span className="inline-flex items-center gap-2">
      <Button variant="secondary" className="!py-1" disabled={retry.isPending} onClick={() => retry.mutate(entry.id)}>
        {retry.isPending ? 'Queuing…' : 'Try again'}
        <span className="sr-only"> to send {entry.subject}</span>
      </Button>
      {retry.error ? <span className="text-caption text-fault-700">{retry.error.message}</span> : null}
    </span>
  );
}

function EntryItem({ entry, timeZone }: { entry: OutboxEntry; timeZone: string }) {
  const failed = entry.status === 'failed';
  return (
    <li aria-label={`${failed ? 'Failed' : 'Waiting'}: ${entry.subject}`} className="px-3.5 py-2.5">
      <div className="flex flex-wrap items-baseline gap-x-2.5 gap-y-1">
        {failed ? <Badge tone="fault">Failed</Badge> : <Badge tone="caution">Waiting</Badge>}
        <span className="min-w-0 break-words font-semibold text-ink-800">{entry.subject}</span>
        {failed ? <RetryButton entry={entry} /> : null}
      </div>
      <div className="mt-1 flex flex-wrap gap-x-4 gap-y-0.5 text-caption text-ink-500">
        <span className="break-all">
          {kindLabel(entry.kind)} · to {entry.to}
        </span>
        <span>queued {formatLabInstant(entry.createdAt, timeZone)}</span>
        <span data-testid="outbox-attempts">
          {entry.attempts === 1 ? '1 attempt' : `${entry.attempts} attempts`}
          {failed ? ', refused by the mail server' : entry.attempts ? `, next try ${formatLabInstant(entry.nextAttemptAt, timeZone)}` : ''}
        </span>
      </div>
      {entry.lastError ? (
        <p className="mt-1 break-words font-mono text-caption text-fault-700">
          <span className="sr-only">Last error: </span>
          {entry.lastError}
        </p>
      ) : null}
    </li>
  );
}

/** What is waiting to be sent or failed for good, and how much went out: a relay that stopped answering shows here. */
export function OutboxPanel({ timeZone, destination }: { timeZone: string; destination: string }) {
  const pending = useQuery(outboxOptions({ status: 'pending', limit: SHOWN }));
  const failed = useQuery(outboxOptions({ status: 'failed', limit: SHOWN }));

  let body;
  if (pending.isPending || failed.isPending) body = <Loading label="Loading the outbox…" />;
  else if (pending.isError || failed.isError) body = <Notice tone="fault">{(pending.error ?? failed.error)!.message}</Notice>;
  else {
    // Both answers carry the counts; the later one is the fresher.
    const counts = (pending.dataUpdatedAt >= failed.dataUpdatedAt ? pending.data : failed.data).counts;
    const entries = [...pending.data.entries, ...failed.data.entries].sort((a, b) => b.createdAt.localeCompare(a.createdAt) || b.id - a.id);
    const retrying = pending.data.entries.some((e) => e.attempts > 0);
    body = (
      <div className="space-y-4">
        <dl className="grid grid-cols-3 gap-2 sm:max-w-md">
          <Count label="Waiting" value={counts.pending} tone="caution" />
          <Count label="Sent" value={counts.sent} tone="pass" hint="last 7 days" />
          <Count label="Failed" value={counts.failed} tone="fault" />
        </dl>
        {retrying ? (
          <Notice tone="caution">
            Some mail could not be handed to {destination} yet. Skewbench keeps it and tries again with growing pauses; nothing is lost while it waits.
          </Notice>
        ) : null}
        {entries.length ? (
          <div>
            <h3 className="mb-1.5 text-caption font-semibold uppercase tracking-wide text-ink-500">Latest waiting and failed</h3>
            <ul className="divide-y divide-ink-100 rounded-panel ring-1 ring-ink-100">
              {entries.map((e) => (
                <EntryItem key={e.id} entry={e} timeZone={timeZone} />
              ))}
            </ul>
          </div>
        ) : (
          <p className="text-body text-ink-500">Nothing is waiting: every message so far has been handed to {destination}.</p>
        )}
        {counts.pending > SHOWN || counts.failed > SHOWN ? <p className="text-caption text-ink-500">Showing the newest {SHOWN} waiting and the newest {SHOWN} failed.</p> : null}
      </div>
    );
  }
  return <Panel title="Outbox">{body}</Panel>;
}
