import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import type { AnalysisResult } from '@shared/domain/analysis';
import type { SetupDiff } from '@shared/domain/setup-diff';
import { setupDocumentSchema, setupListSchema, setupSchema, type Setup, type SetupDocument } from '@shared/schemas/setups';
import { api } from '@/lib/api-client';

/** `bookingId` lists one booking's setups; `mine` only the signed-in person's; neither lists every setup. */
export interface SetupListFilters {
  bookingId?: number;
  mine?: boolean;
}

export const setupKeys = {
  all: ['setups'] as const,
  lists: () => [...setupKeys.all, 'list'] as const,
  list: (filters: SetupListFilters) => [...setupKeys.lists(), filters] as const,
  details: () => [...setupKeys.all, 'detail'] as const,
  detail: (id: number) => [...setupKeys.details(), id] as const,
  revision: (id: number, number: number) => [...setupKeys.detail(id), 'revision', number] as const,
  compare: (fromRevisionId: number, toRevisionId: number) => [...setupKeys.all, 'compare', { from: fromRevisionId, to: toRevisionId }] as const,
};

/**
 * A setup with its revision's document parsed by the shared schema (so a contract drift fails loudly here)
 * and the server's stored analysis, which the pages show as the authoritative result.
 */
export interface LoadedSetup extends Setup {
  document: SetupDocument;
  analysis: AnalysisResult;
}

export const setupResponseSchema = z.object({ setup: setupSchema });
const compareResponseSchema = z.object({ diff: z.custom<SetupDiff>((value) => typeof value === 'object' && value !== null) });

function loaded(setup: Setup): LoadedSetup {
  return { ...setup, document: setupDocumentSchema.parse(setup.revision.document), analysis: setup.revision.analysis as AnalysisResult };
}

async function getSetups(filters: SetupListFilters) {
  const params = new URLSearchParams();
  if (filters.bookingId !== undefined) params.set('bookingId', String(filters.bookingId));
  if (filters.mine) params.set('mine', 'true');
  return (await api(`/setups${params.size ? `?${params}` : ''}`, { schema: setupListSchema })).setups;
}

export const setupListOptions = (filters: SetupListFilters = {}) => queryOptions({ queryKey: setupKeys.list(filters), queryFn: () => getSetups(filters) });

/** A setup at its latest revision, with its history. */
export const setupDetailOptions = (id: number) =>
  queryOptions({ queryKey: setupKeys.detail(id), queryFn: async () => loaded((await api(`/setups/${id}`, { schema: setupResponseSchema })).setup) });

/** A setup at one earlier (or the latest) revision; revisions never change, so this stays fresh. */
export const setupRevisionOptions = (id: number, number: number) =>
  queryOptions({
    queryKey: setupKeys.revision(id, number),
    queryFn: async () => loaded((await api(`/setups/${id}/revisions/${number}`, { schema: setupResponseSchema })).setup),
    staleTime: Infinity,
  });

/** What changed between two revisions (by revision id, so revisions of a reloaded setup and its origin compare too). */
export const setupCompareOptions = (fromRevisionId: number, toRevisionId: number) =>
  queryOptions({
    queryKey: setupKeys.compare(fromRevisionId, toRevisionId),
    queryFn: async () => (await api(`/setups/compare?from=${fromRevisionId}&to=${toRevisionId}`, { schema: compareResponseSchema })).diff,
    staleTime: Infinity,
  });

/** The path/segment table of a revision as CSV, for a download link. */
export const setupCsvUrl = (id: number, number: number) => `/api/setups/${id}/revisions/${number}/paths.csv`;
