// What a failed database call means for the answer (the database is away: 503) and what of it may be
// written to the server log (never a query's parameters: they hold password hashes and row values).
import { DrizzleQueryError } from 'drizzle-orm';

/** Socket errors of a server that is down, restarting or unreachable. */
const socketCodes = new Set(['ECONNREFUSED', 'ECONNRESET', 'ECONNABORTED', 'EPIPE', 'ETIMEDOUT', 'EHOSTUNREACH', 'ENETUNREACH', 'ENOTFOUND', 'EAI_AGAIN']);

/**
 * SQLSTATEs of a server that cannot serve this connection (PostgreSQL manual, appendix A "PostgreSQL
 * Error Codes"): 57P01 admin_shutdown, 57P02 crash_shutdown, 57P03 cannot_connect_now (starting up or
 * shutting down), 53300 too_many_connections; and the whole class 08 (connection exception).
 */
const unavailableStates = new Set(['57P01', '57P02', '57P03', '53300']);

/** Errors node-postgres raises itself when a connection is lost or cannot be had in time (pg, pg-pool). */
const clientMessages = [
  /^Connection terminated/,
  /^timeout exceeded when trying to connect/,
  /^Client has encountered a connection error and is not queryable/,
  /^Cannot use a pool after calling end on the pool/,
];

function* chain(err: unknown, depth = 0): Generator<unknown> {
  if (err === null || err === undefined || depth > 5) return;
  yield err;
  if (typeof err !== 'object') return;
  const { cause, errors } = err as { cause?: unknown; errors?: unknown };
  if (cause !== undefined) yield* chain(cause, depth + 1);
  // AggregateError: node's connect tries each address of "localhost" and reports them together.
  if (Array.isArray(errors)) for (const e of errors) yield* chain(e, depth + 1);
}

/** Does this error (or what caused it) say the database cannot be reached right now? */
export function isDatabaseUnavailable(err: unknown): boolean {
  for (const e of chain(err)) {
    if (typeof e !== 'object' || e === null) continue;
    const code = (e as { code?: unknown }).code;
    if (typeof code === 'string' && (socketCodes.has(code) || unavailableStates.has(code) || /^08[0-9A-Z]{3}$/.test(code))) return true;
    const message = (e as { message?: unknown }).message;
    if (typeof message === 'string' && clientMessages.some((m) => m.test(message))) return true;
  }
  return false;
}

/** Fields of a PostgreSQL error worth logging; `detail` is left out: it can quote the failing row. */
const pgFields = ['code', 'severity', 'table', 'column', 'constraint', 'routine'] as const;

function framesOf(err: Error): string {
  const stack = err.stack ?? '';
  const at = stack.indexOf('\n    at ');
  return at >= 0 ? stack.slice(at) : '';
}

/**
 * The error as a log entry: message and stack, PostgreSQL's code and constraint, never the
 * parameters of a query. Drizzle's query errors put every parameter in their message (a user write
 * carries the password hash), so for those only the SQL text and the cause are written.
 */
export function describeErrorForLog(err: unknown, depth = 0): string {
  if (err instanceof DrizzleQueryError) {
    const cause = err.cause === undefined || depth > 3 ? '' : `\ncaused by: ${describeErrorForLog(err.cause, depth + 1)}`;
    return `DrizzleQueryError: Failed query: ${err.query}\n(parameters not logged)${framesOf(err)}${cause}`;
  }
  if (err instanceof Error) {
    const fields = pgFields
      .map((f) => [f, (err as unknown as Record<string, unknown>)[f]] as const)
      .filter(([, v]) => typeof v === 'string' && v !== '')
      .map(([f, v]) => `${f}=${String(v)}`);
    const head = `${err.name}: ${err.message}${fields.length ? ` [${fields.join(' ')}]` : ''}`;
    const cause = err.cause === undefined || depth > 3 ? '' : `\ncaused by: ${describeErrorForLog(err.cause, depth + 1)}`;
    return `${head}${framesOf(err)}${cause}`;
  }
  return String(err);
}
