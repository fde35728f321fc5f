import { useMutation, useQueryClient } from '@tanstack/react-query';
import { settingsSchema, type Settings } from '#shared/schemas/settings.ts';
import { apiRequest } from '../../../lib/api-client.ts';
import { settingsKeys } from './get-settings.ts';

/**
 * Sends every setting, not only the changed ones: the answer then cannot depend on how the server
 * fills the keys a request leaves out.
 */
export function updateSettings(settings: Settings): Promise<Settings> {
  return apiRequest('/settings', { method: 'PUT', body: settings, schema: settingsSchema });
}

export function useUpdateSettings() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateSettings,
    // The form shows a refusal beside the field it concerns.
    meta: { errorTitle: false },
    onSuccess: (saved) => {
      queryClient.setQueryData(settingsKeys.current(), saved);
      return queryClient.invalidateQueries({ queryKey: settingsKeys.all });
    },
  });
}
