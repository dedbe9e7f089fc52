import { useQuery } from '@tanstack/react-query';
import { useId } from 'react';
import { Link } from 'react-router-dom';
import { TextField } from '@/components/ui/field';
import { EmptyState, Loading, Notice } from '@/components/ui/feedback';
import { MAILBOX_LIMIT, mailboxListOptions } from '../api/get-mailbox';
import { formatLabInstant, matchesRecipient, recipientsOf, serverRecipient } from '../utils/mail-format';
import { PaperclipIcon } from './paperclip-icon';

interface MailboxListProps {
  /** The recipient filter as typed: part of an address, or a whole one (then the server filters). */
  filter: string;
  onFilterChange: (value: string) => void;
  selectedId: number | undefined;
  /** Where a message's entry links to (the page with that message open). */
  messageHref: (id: number) => string;
  timeZone: string;
}

/** The captured messages, newest first, refreshed every few seconds, filtered by recipient. */
export function MailboxList({ filter, onFilterChange, selectedId, messageHref, timeZone }: MailboxListProps) {
  const exact = serverRecipient(filter);
  const list = useQuery(mailboxListOptions(exact ? { to: exact } : {}));
  // Suggestions come from the whole recent mailbox, also while one recipient is chosen (same query, cached).
  const everyone = useQuery(mailboxListOptions({}));
  const suggestionsId = useId();
  const messages = (list.data ?? []).filter((m) => matchesRecipient(m, filter));

  return (
    <section aria-label="Captured messages" className="space-y-3">
      <TextField
        label="Recipient"
        type="search"
        placeholder="Filter by address, e.g. ada"
        value={filter}
        list={suggestionsId}
        autoComplete="off"
        onChange={(e) => onFilterChange(e.target.value)}
      />
      <datalist id={suggestionsId}>
        {recipientsOf(everyone.data ?? []).map((address) => (
          <option key={address} value={address} />
        ))}
      </datalist>
      {list.isPending ? (
        <Loading label="Loading captured mail…" />
      ) : list.isError ? (
        <Notice tone="fault">{list.error.message}</Notice>
      ) : messages.length === 0 ? (
        <EmptyState title={filter.trim() ? 'No message to this recipient' : 'No mail captured yet'}>
          {filter.trim() ? 'Clear the filter to see every message.' : 'Messages appear here a few seconds after Skewbench sends them.'}
        </EmptyState>
      ) : (
        <>
          <ul className="divide-y divide-ink-100 overflow-hidden rounded-panel bg-white shadow-panel ring-1 ring-ink-100">
            {messages.map((m) => {
              const selected = m.id === selectedId;
              const count = m.attachments.length;
              return (
                <li key={m.id}>
                  <Link
                    to={messageHref(m.id)}
                    aria-current={selected ? 'true' : undefined}
                    className={`block border-l-4 px-3.5 py-2.5 hover:bg-ptfe-50 focus:outline-none focus-visible:shadow-focus ${
                      selected ? 'border-copper-500 bg-copper-50 hover:bg-copper-50' : 'border-transparent'
                    }`}
                  >
                    <div className="flex items-baseline justify-between gap-3">
                      <span className="min-w-0 truncate text-caption font-semibold text-ink-600">{m.to}</span>
                      <time dateTime={m.receivedAt} className="shrink-0 text-caption tabular-nums text-ink-500">
                        {formatLabInstant(m.receivedAt, timeZone)}
                      </time>
                    </div>
                    <div className="mt-0.5 flex items-start justify-between gap-3">
                      <span className={`min-w-0 break-words text-body ${selected ? 'font-bold text-ink-900' : 'font-semibold text-ink-800'}`}>{m.subject || '(no subject)'}</span>
                      {count ? (
                        <span className="mt-0.5 inline-flex shrink-0 items-center gap-0.5 text-caption font-semibold text-ink-500" title={`${count} attachment${count === 1 ? '' : 's'}`}>
                          <PaperclipIcon className="h-3.5 w-3.5" />
                          <span aria-hidden>{count}</span>
                          <span className="sr-only">, {count} attachment{count === 1 ? '' : 's'}</span>
                        </span>
                      ) : null}
                    </div>
                  </Link>
                </li>
              );
            })}
          </ul>
          <p className="text-caption text-ink-500">
            {messages.length === 1 ? '1 message' : `${messages.length} messages`}
            {(list.data?.length ?? 0) >= MAILBOX_LIMIT ? ` (the newest ${MAILBOX_LIMIT}; type a whole address to search all of one person's mail)` : ''}. New mail
            shows up on its own.
          </p>
        </>
      )}
    </section>
  );
}
