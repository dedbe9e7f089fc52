import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { outboxEntrySchema } from '@shared/schemas/mail';
import { api } from '@/lib/api-client';
import { MAIL_REFRESH_MS, mailKeys, type OutboxFilters } from './mail-keys';

const outboxSchema = z.object({
  entries: z.array(outboxEntrySchema),
  counts: z.object({ pending: z.number().int(), sent: z.number().int(), failed: z.number().int() }),
});
export type Outbox = z.infer<typeof outboxSchema>;

async function getOutbox(filters: OutboxFilters) {
  const params = new URLSearchParams();
  if (filters.status) params.set('status', filters.status);
  if (filters.limit) params.set('limit', String(filters.limit));
  return api(`/outbox${params.size ? `?${params}` : ''}`, { schema: outboxSchema });
}

/** GET /api/outbox: the newest outgoing messages (optionally of one status) and the count of each status. */
export const outboxOptions = (filters: OutboxFilters = {}) =>
  queryOptions({ queryKey: mailKeys.outboxList(filters), queryFn: () => getOutbox(filters), refetchInterval: MAIL_REFRESH_MS });
