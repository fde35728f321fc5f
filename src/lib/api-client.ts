import type { z, ZodType } from 'zod';
import { errorBodySchema } from '#shared/schemas/error.ts';
import { env } from '../config/env.ts';
import { fieldErrorsFrom } from './form-errors.ts';

/**
 * A non-2xx answer (or no answer at all) from the API. `code` is the server's kebab-case error code
 * (shared/errors.ts) or one of the client's own: `network-error`, `unexpected-response`,
 * `invalid-response`.
 */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = 'ApiError';
  }

  /** Field → first message, from the zod issue list of a 400 `validation-failed` answer. */
  fieldErrors(): Record<string, string> {
    const issues = (this.details as { issues?: unknown } | undefined)?.issues;
    if (!Array.isArray(issues)) return {};
    const valid = issues.filter(
      (i): i is { path: PropertyKey[]; message: string } => Array.isArray(i?.path) && typeof i?.message === 'string',
    );
    return fieldErrorsFrom(valid);
  }
}

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

interface RequestOptions<S extends ZodType | undefined> {
  method?: Method;
  body?: unknown;
  /** Parses the answer; without one the answer is ignored (204 No Content and the like). */
  schema?: S;
  signal?: AbortSignal;
  /** Non-2xx statuses whose body is still an answer of `schema` (GET /api/health says 503 with a body). */
  acceptStatuses?: readonly number[];
}

type Result<S> = S extends ZodType ? z.infer<S> : undefined;

async function readJson(res: Response): Promise<unknown> {
  const text = await res.text();
  if (text === '') return undefined;
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}

/** One request to the Osmia API: same-origin cookies, JSON in and out, errors as ApiError. */
export async function apiRequest<S extends ZodType | undefined = undefined>(
  path: string,
  { method = 'GET', body, schema, signal, acceptStatuses = [] }: RequestOptions<S> = {},
): Promise<Result<S>> {
  let res: Response;
  try {
    res = await fetch(`${env.apiBase}${path}`, {
      method,
      credentials: 'same-origin',
      headers: body === undefined ? { Accept: 'application/json' } : { Accept: 'application/json', 'Content-Type': 'application/json' },
      body: body === undefined ? undefined : JSON.stringify(body),
      signal,
    });
  } catch (err) {
    if (signal?.aborted) throw err;
    throw new ApiError(0, 'network-error', 'The server cannot be reached: check the connection and try again.');
  }

  const payload = await readJson(res);
  if (!res.ok && !acceptStatuses.includes(res.status)) {
    const parsed = errorBodySchema.safeParse(payload);
    if (parsed.success) {
      const { code, message, details } = parsed.data.error;
      throw new ApiError(res.status, code, message, details);
    }
    throw new ApiError(res.status, 'unexpected-response', `The server answered ${res.status}${res.statusText ? ` ${res.statusText}` : ''}.`);
  }
  if (!schema) return undefined as Result<S>;
  const parsed = schema.safeParse(payload);
  if (!parsed.success) {
    throw new ApiError(res.status, 'invalid-response', 'The server sent an answer this page does not understand: reload the page.');
  }
  return parsed.data as Result<S>;
}

/** The sentence to show for anything caught: an ApiError's message, an Error's, or a generic one. */
export function getErrorMessage(error: unknown): string {
  if (error instanceof Error && error.message) return error.message;
  if (typeof error === 'string' && error) return error;
  return 'Something went wrong.';
}

export function isApiError(error: unknown, status?: number): error is ApiError {
  return error instanceof ApiError && (status === undefined || error.status === status);
}
