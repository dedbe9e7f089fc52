import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { partSchema, type PartKind, type PartStatus } from '@shared/schemas/parts';
import { api } from '@/lib/api-client';

export interface PartFilters {
  kind?: PartKind;
  status?: PartStatus;
}

export const partKeys = {
  all: ['parts'] as const,
  lists: () => [...partKeys.all, 'list'] as const,
  list: (filters: PartFilters) => [...partKeys.lists(), filters] as const,
  details: () => [...partKeys.all, 'detail'] as const,
  detail: (id: number) => [...partKeys.details(), id] as const,
};

const listSchema = z.object({ parts: z.array(partSchema) });
export const partResponseSchema = z.object({ part: partSchema });

async function getParts(filters: PartFilters) {
  const params = new URLSearchParams(Object.entries(filters).filter(([, v]) => v) as [string, string][]);
  return (await api(`/parts${params.size ? `?${params}` : ''}`, { schema: listSchema })).parts;
}

export const partListOptions = (filters: PartFilters = {}) => queryOptions({ queryKey: partKeys.list(filters), queryFn: () => getParts(filters) });

export const partDetailOptions = (id: number) =>
  queryOptions({ queryKey: partKeys.detail(id), queryFn: async () => (await api(`/parts/${id}`, { schema: partResponseSchema })).part });
