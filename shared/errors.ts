// Every error code Osmia answers with, and the sentence a person reads by default.
export const errorMessages = {
  'bad-request': 'The request is not valid.',
  'invalid-json': 'The request body is not valid JSON.',
  'validation-failed': 'Some fields are missing or not valid.',
  'not-found': 'There is nothing at this address.',
  'route-not-found': 'No API route matches this method and path.',
  'unauthenticated': 'Sign in to continue.',
  'session-expired': 'Your session has expired or is not valid: sign in again.',
  'forbidden': 'Your role does not allow this.',
  'invalid-credentials': 'E-mail or password is wrong.',
  'account-disabled': 'This account is disabled: ask an administrator.',
  'too-many-attempts': 'Too many sign-in attempts: wait a few minutes and try again.',
  'email-taken': 'A user with this e-mail already exists.',
  'user-not-found': 'No such user.',
  'last-admin': 'At least one active administrator must remain.',
  'site-not-found': 'No such site.',
  'site-required': 'Several sites exist: name one with --site (or the site field).',
  'asset-not-found': 'No such asset on this site.',
  'import-not-found': 'No such import.',
  'invalid-window': 'The time window is not valid: from must be before to.',
  'file-too-large': 'The file is larger than the upload limit.',
  'file-missing': 'Attach a file to import.',
  'unknown-setting': 'No such setting.',
  'report-not-found': 'No such report.',
  'mail-not-found': 'No such message.',
  'database-unavailable': 'The database cannot be reached right now: try again in a minute. If it lasts, ask an administrator to check the database server.',
  'internal-error': 'Something went wrong on the server; the error was logged.',
} as const;

export type ErrorCode = keyof typeof errorMessages;

export function messageFor(code: ErrorCode): string {
  return errorMessages[code];
}
