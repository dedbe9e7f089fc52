import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { instrumentSchema, qualificationSchema, type InstrumentKind, type InstrumentStatus } from '@shared/schemas/instruments';
import { api } from '@/lib/api-client';

export interface InstrumentFilters {
  kind?: InstrumentKind;
  status?: InstrumentStatus;
}

export const instrumentKeys = {
  all: ['instruments'] as const,
  lists: () => [...instrumentKeys.all, 'list'] as const,
  list: (filters: InstrumentFilters) => [...instrumentKeys.lists(), filters] as const,
  details: () => [...instrumentKeys.all, 'detail'] as const,
  detail: (id: number) => [...instrumentKeys.details(), id] as const,
  qualifications: (id: number) => [...instrumentKeys.detail(id), 'qualifications'] as const,
};

const listSchema = z.object({ instruments: z.array(instrumentSchema) });
const detailSchema = z.object({ instrument: instrumentSchema });
export const qualificationListSchema = z.object({ qualifications: z.array(qualificationSchema) });

async function getInstruments(filters: InstrumentFilters) {
  const params = new URLSearchParams(Object.entries(filters).filter(([, v]) => v) as [string, string][]);
  return (await api(`/instruments${params.size ? `?${params}` : ''}`, { schema: listSchema })).instruments;
}

export const instrumentListOptions = (filters: InstrumentFilters = {}) =>
  queryOptions({ queryKey: instrumentKeys.list(filters), queryFn: () => getInstruments(filters) });

export const instrumentDetailOptions = (id: number) =>
  queryOptions({ queryKey: instrumentKeys.detail(id), queryFn: async () => (await api(`/instruments/${id}`, { schema: detailSchema })).instrument });

export const qualificationListOptions = (id: number) =>
  queryOptions({
    queryKey: instrumentKeys.qualifications(id),
    queryFn: async () => (await api(`/instruments/${id}/qualifications`, { schema: qualificationListSchema })).qualifications,
  });
