import { useMutation } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client.ts';

export function signOut(): Promise<undefined> {
  return apiRequest('/auth/logout', { method: 'POST' });
}

/**
 * Ends the session on the server. The caller goes to the sign-in page, whose loader finds no session
 * and drops everything the signed-out user had loaded.
 */
export function useSignOut() {
  return useMutation({
    mutationFn: signOut,
    meta: { errorTitle: 'Could not sign out' },
  });
}
