import type { QueryClient } from '@tanstack/react-query';
import type { Settings } from '#shared/schemas/settings.ts';
import { settingsQueryOptions } from '../features/settings/api/get-settings.ts';

/**
 * Prefetch that needs the plant's settings first (the confidence level a KPI page asks for when the
 * address names none, the currency of its amounts). Never throws, like prefetchQuery: a failure shows in
 * the page's sections.
 */
export function prefetchWithSettings(queryClient: QueryClient, prefetch: (settings: Settings) => Promise<unknown>[]): Promise<unknown> {
  return queryClient.ensureQueryData(settingsQueryOptions).then(
    (settings) => Promise.all(prefetch(settings)),
    () => undefined,
  );
}
