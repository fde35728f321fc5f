import { useMutation } from '@tanstack/react-query';
import { errorBodySchema } from '#shared/schemas/error.ts';
import { ApiError } from '../../../lib/api-client.ts';

export interface DownloadInput {
  /** The API path, `/api/reports/finance.xlsx?site=…`, as GET /api/reports gives it. */
  url: string;
  /** The name to save under when the answer does not say one. */
  fallbackName: string;
}

/** The file name of a Content-Disposition header (`attachment; filename="…"`). */
export function fileNameOf(disposition: string | null, fallback: string): string {
  const name = disposition ? /filename="([^"]+)"/.exec(disposition)?.[1] : undefined;
  return name && /^[\w.-]+$/.test(name) ? name : fallback;
}

/**
 * Fetches a workbook and hands it to the browser to save. A fetch rather than a plain link, so that a
 * refused window or site shows as a message on the page instead of a downloaded error. Returns the name
 * it was saved under.
 */
export async function downloadWorkbook({ url, fallbackName }: DownloadInput): Promise<string> {
  let res: Response;
  try {
    res = await fetch(url, { credentials: 'same-origin' });
  } catch {
    throw new ApiError(0, 'network-error', 'The server cannot be reached: check the connection and try again.');
  }
  if (!res.ok) {
    const body = errorBodySchema.safeParse(await res.json().catch(() => undefined));
    if (body.success) throw new ApiError(res.status, body.data.error.code, body.data.error.message, body.data.error.details);
    throw new ApiError(res.status, 'unexpected-response', `The server answered ${res.status}.`);
  }
  const name = fileNameOf(res.headers.get('Content-Disposition'), fallbackName);
  const blob = await res.blob();
  const href = URL.createObjectURL(blob);
  const link = document.createElement('a');
  link.href = href;
  link.download = name;
  document.body.append(link);
  link.click();
  link.remove();
  // The browser has taken the file; the object URL can go once the click has been handled.
  setTimeout(() => URL.revokeObjectURL(href), 10_000);
  return name;
}

/** One download at a time per button: its pending state shows on the button, its error beside it. */
export function useDownloadWorkbook() {
  return useMutation({ mutationFn: downloadWorkbook, meta: { errorTitle: false } });
}
