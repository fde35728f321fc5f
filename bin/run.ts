/** An error a command throws to end with a message and an exit code (1 error, 2 usage). */
export class CliError extends Error {
  constructor(
    message: string,
    readonly exitCode = 1,
  ) {
    super(message);
  }
}

/** The exit code the last action asked for; cli.ts reads it after parsing. */
export const exitState = { code: 0 };

/** Wrap a command action: its returned number (if any) becomes the exit code. */
export function action<A extends unknown[]>(fn: (...args: A) => Promise<number | void> | number | void) {
  return async (...args: A) => {
    const code = await fn(...args);
    if (typeof code === 'number') exitState.code = code;
  };
}
