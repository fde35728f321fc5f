import { useCallback, useMemo } from 'react';
import { useSearchParams } from 'react-router-dom';
import { confidenceSchema, isoDateSchema } from '#shared/schemas/common.ts';

// The window and filters of the KPI pages live in the address (?from=2026-01-01&to=2026-07-01&asset=T1),
// so a view can be bookmarked or sent to a colleague and opens the same figures. Loaders read them
// from the request URL, components from useSearchParams: both through readKpiWindow.

/** What the filter bar sets. Dates are calendar days, read by the server in the site's time zone. */
export interface KpiWindow {
  site?: string;
  asset?: string;
  /** First day of the window (inclusive), YYYY-MM-DD. */
  from?: string;
  /** Day after the last day of the window (the window is half-open), YYYY-MM-DD. */
  to?: string;
  /** Confidence level of interval estimates, 0–1; unset means the plant's setting. */
  confidence?: number;
}

export const windowParams = ['site', 'asset', 'from', 'to', 'confidence'] as const;


function text(params: URLSearchParams, name: string): string | undefined {
  const value = params.get(name)?.trim();
  return value ? value : undefined;
}

/**
 * The window in a URL's search parameters, checked with the API's own schemas (shared/schemas/common.ts):
 * a date that is not a calendar date (YYYY-MM-DD) and a confidence the API would refuse are left out
 * rather than sent, since the address may have been typed by hand.
 */
export function readKpiWindow(params: URLSearchParams): KpiWindow {
  const day = (name: string) => {
    const value = text(params, name);
    return value !== undefined && isoDateSchema.safeParse(value).success ? value : undefined;
  };
  const confidence = params.has('confidence') ? confidenceSchema.safeParse(params.get('confidence')) : null;
  return {
    site: text(params, 'site'),
    asset: text(params, 'asset'),
    from: day('from'),
    to: day('to'),
    confidence: confidence?.success ? confidence.data : undefined,
  };
}

/** One more parameter of a page beyond the window (groupBy…), read with a fallback and a list of allowed values. */
export function readChoice<T extends string>(params: URLSearchParams, name: string, allowed: readonly T[], fallback: T): T {
  const value = params.get(name);
  return value !== null && (allowed as readonly string[]).includes(value) ? (value as T) : fallback;
}

export type QueryValue = string | number | boolean | null | undefined;

/** "?a=1&b=x" from the set values, in a stable order (so equal queries give equal strings); "" when none is set. */
export function toSearch(query: Record<string, QueryValue>): string {
  const params = new URLSearchParams();
  for (const key of Object.keys(query).sort()) {
    const value = query[key];
    if (value === undefined || value === null || value === '') continue;
    params.set(key, String(value));
  }
  const search = params.toString();
  return search ? `?${search}` : '';
}

/** The query parameters of a window, without the unset ones (as a query key and as the request's search). */
export function windowQuery(filters: KpiWindow): Record<string, string | number> {
  const out: Record<string, string | number> = {};
  for (const name of windowParams) {
    const value = filters[name];
    if (value !== undefined) out[name] = value;
  }
  return out;
}

/**
 * The page's window from the address, and a setter that writes changes back to it (keeping the page's
 * other parameters). Setting a field to undefined removes it from the address.
 */
export function useKpiWindow(): [KpiWindow, (next: Partial<Record<string, string | number | undefined>>) => void] {
  const [params, setParams] = useSearchParams();
  const current = useMemo(() => readKpiWindow(params), [params]);
  const update = useCallback(
    (next: Partial<Record<string, string | number | undefined>>) =>
      setParams(
        (previous) => {
          const out = new URLSearchParams(previous);
          for (const [key, value] of Object.entries(next)) {
            if (value === undefined || value === '') out.delete(key);
            else out.set(key, String(value));
          }
          return out;
        },
        { preventScrollReset: true },
      ),
    [setParams],
  );
  return [current, update];
}
