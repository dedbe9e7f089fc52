import { useMutation, useQueryClient } from '@tanstack/react-query';
import { feedResponseSchema, type CreateFeedInput } from '@shared/schemas/feeds';
import { api } from '@/lib/api-client';
import { feedKeys } from './feeds.queries';

/** Which feed: the person's own, or one instrument's. */
export type FeedTarget = CreateFeedInput;

/** Make the feed's link, or replace it (the old link stops working). The answer is the only time the URL is shown. */
export function useCreateFeed() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (target: FeedTarget) => api('/feeds', { method: 'POST', body: target, schema: feedResponseSchema }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: feedKeys.lists() }),
  });
}

export function useRevokeFeed() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (target: FeedTarget) =>
      api<void>(target.scope === 'person' ? '/feeds/person' : `/feeds/instrument/${target.instrumentId}`, { method: 'DELETE' }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: feedKeys.lists() }),
  });
}
