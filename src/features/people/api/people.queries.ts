import { queryOptions } from '@tanstack/react-query';
import { userListSchema } from '@shared/schemas/people';
import { api } from '@/lib/api-client';

export const peopleKeys = {
  all: ['people'] as const,
  lists: () => [...peopleKeys.all, 'list'] as const,
  list: () => [...peopleKeys.lists(), 'all'] as const,
};

async function getPeople() {
  return (await api('/users', { schema: userListSchema })).users;
}

export const peopleListOptions = () => queryOptions({ queryKey: peopleKeys.list(), queryFn: getPeople });
