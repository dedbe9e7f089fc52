import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { capturedMailSummarySchema } from '@shared/schemas/mail';
import { api } from '@/lib/api-client';
import { MAIL_REFRESH_MS, mailKeys, type MailboxFilters } from './mail-keys';

/** How many of the newest messages the list shows. */
export const MAILBOX_LIMIT = 200;

const listSchema = z.array(capturedMailSummarySchema);

async function getMailbox(filters: MailboxFilters) {
  const params = new URLSearchParams({ limit: String(MAILBOX_LIMIT) });
  if (filters.to) params.set('to', filters.to);
  return api(`/mailbox?${params}`, { schema: listSchema });
}

/** GET /api/mailbox: captured messages, newest first, refreshed every few seconds so new mail shows up. */
export const mailboxListOptions = (filters: MailboxFilters = {}) =>
  queryOptions({
    queryKey: mailKeys.list(filters),
    queryFn: () => getMailbox(filters),
    refetchInterval: MAIL_REFRESH_MS,
    // Keep the old list on screen while a new filter loads, instead of flashing "Loading".
    placeholderData: keepPreviousData,
  });
