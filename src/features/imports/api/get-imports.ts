import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { importDetailSchema, importHistorySchema, type ImportDetail, type ImportHistory } from '#shared/schemas/imports.ts';
import { apiRequest } from '../../../lib/api-client.ts';

export type ImportHistoryItem = ImportHistory['imports'][number];

export const importsKeys = {
  all: ['imports'] as const,
  history: () => [...importsKeys.all, 'history'] as const,
  detail: (id: number) => [...importsKeys.all, 'detail', id] as const,
};

/** How often the history is asked again while an import runs (its progress moves). */
export const runningPollMs = 1500;

/** GET /api/imports: the history, newest first; a running import carries its progress. */
export async function getImports(signal?: AbortSignal): Promise<ImportHistoryItem[]> {
  const { imports } = await apiRequest('/imports', { schema: importHistorySchema, signal });
  return imports;
}

export const importsQueryOptions = queryOptions({
  queryKey: importsKeys.history(),
  queryFn: ({ signal }) => getImports(signal),
  // Poll only while something runs (an upload here or a CLI import on the server).
  refetchInterval: (query) => (query.state.data?.some((i) => i.status === 'running') ? runningPollMs : false),
});

export function useImports(): ImportHistoryItem[] {
  return useSuspenseQuery(importsQueryOptions).data;
}

/** GET /api/imports/:id: one import with its first rejects. */
export function getImport(id: number, signal?: AbortSignal): Promise<ImportDetail> {
  return apiRequest(`/imports/${id}`, { schema: importDetailSchema, signal });
}

export const importQueryOptions = (id: number) =>
  queryOptions({
    queryKey: importsKeys.detail(id),
    queryFn: ({ signal }) => getImport(id, signal),
    refetchInterval: (query) => (query.state.data?.status === 'running' ? runningPollMs : false),
  });

export function useImport(id: number): ImportDetail {
  return useSuspenseQuery(importQueryOptions(id)).data;
}
