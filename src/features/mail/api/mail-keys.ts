/** Query keys of the mail page: the mailbox (captured messages) and the outbox, each invalidated on its own. */
export interface MailboxFilters {
  /** An exact recipient address; the server then returns that person's messages only. */
  to?: string;
}

export interface OutboxFilters {
  status?: 'pending' | 'sent' | 'failed';
  limit?: number;
}

export const mailKeys = {
  all: ['mail'] as const,
  mailbox: () => [...mailKeys.all, 'mailbox'] as const,
  lists: () => [...mailKeys.mailbox(), 'list'] as const,
  list: (filters: MailboxFilters) => [...mailKeys.lists(), filters] as const,
  details: () => [...mailKeys.mailbox(), 'detail'] as const,
  detail: (id: number) => [...mailKeys.details(), id] as const,
  outbox: () => [...mailKeys.all, 'outbox'] as const,
  outboxList: (filters: OutboxFilters) => [...mailKeys.outbox(), filters] as const,
};

/** How often the page looks for new mail, ms: often enough that a message appears while the manager watches. */
export const MAIL_REFRESH_MS = 4_000;
