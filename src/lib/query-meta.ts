import type { ApiError } from './api-client.ts';

// Typed `meta` for queries and mutations. The app's query client reads mutation meta to decide how
// a failure is reported: a toast titled `errorTitle`, or nothing when the form shows it inline.
declare module '@tanstack/react-query' {
  interface Register {
    defaultError: ApiError | Error;
    mutationMeta: {
      /** Title of the toast raised when the mutation fails; false when the caller shows the error itself. */
      errorTitle?: string | false;
      /** Title of the toast raised when the mutation succeeds. */
      successTitle?: string;
    };
  }
}

export {};
