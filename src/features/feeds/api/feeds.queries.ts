import { queryOptions } from '@tanstack/react-query';
import { feedListSchema } from '@shared/schemas/feeds';
import { api } from '@/lib/api-client';

export const feedKeys = {
  all: ['feeds'] as const,
  lists: () => [...feedKeys.all, 'list'] as const,
};

async function getFeeds() {
  return (await api('/feeds', { schema: feedListSchema })).feeds;
}

/** The signed-in person's feeds; their URLs are null, since the server keeps only the tokens' hashes. */
export const feedListOptions = () => queryOptions({ queryKey: feedKeys.lists(), queryFn: getFeeds });
