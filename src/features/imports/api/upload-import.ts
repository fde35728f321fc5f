import { useMutation, useQueryClient } from '@tanstack/react-query';
import { errorBodySchema } from '#shared/schemas/error.ts';
import { importRecordSchema, type ImportRecord } from '#shared/schemas/imports.ts';
import type { ImportKind } from '#shared/schemas/enums.ts';
import { env } from '../../../config/env.ts';
import { ApiError } from '../../../lib/api-client.ts';
import { importsKeys } from './get-imports.ts';

export interface UploadInput {
  file: File;
  kind: ImportKind;
  site?: string;
  tz?: string;
  strict: boolean;
  dryRun: boolean;
  /** Column map as JSON text: {"Their header": "our_header"}. */
  map?: string;
  /** Bytes sent so far and in all; called as the browser sends the file. */
  onProgress?: (loaded: number, total: number) => void;
}

function parseJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}

/**
 * POST /api/imports as multipart form data. XMLHttpRequest rather than fetch: only it reports upload
 * progress. A refused file (422) still answers with its import record (status failed), which is returned.
 */
export function uploadImport({ file, kind, site, tz, strict, dryRun, map, onProgress }: UploadInput): Promise<ImportRecord> {
  const form = new FormData();
  form.set('kind', kind);
  if (site) form.set('site', site);
  if (tz) form.set('tz', tz);
  form.set('strict', String(strict));
  form.set('dryRun', String(dryRun));
  if (map) form.set('map', map);
  // The file goes last: multer reads the fields before it, so they are known when the file arrives.
  form.set('file', file, file.name);

  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', `${env.apiBase}/imports`);
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.upload.onprogress = (event) => onProgress?.(event.loaded, event.lengthComputable ? event.total : file.size);
    xhr.onerror = () => reject(new ApiError(0, 'network-error', 'The server cannot be reached: check the connection and try again.'));
    xhr.onabort = () => reject(new ApiError(0, 'network-error', 'The upload was interrupted.'));
    xhr.onload = () => {
      const payload = parseJson(xhr.responseText);
      if ((xhr.status >= 200 && xhr.status < 300) || xhr.status === 422) {
        const record = importRecordSchema.safeParse(payload);
        if (record.success) return resolve(record.data);
      }
      const error = errorBodySchema.safeParse(payload);
      if (error.success) {
        const { code, message, details } = error.data.error;
        return reject(new ApiError(xhr.status, code, message, details));
      }
      reject(new ApiError(xhr.status, 'unexpected-response', `The server answered ${xhr.status}${xhr.statusText ? ` ${xhr.statusText}` : ''}.`));
    };
    xhr.send(form);
  });
}

/** Uploads a file; afterwards the history and every KPI figure are asked again (the data behind them changed). */
export function useUploadImport() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: uploadImport,
    // The form shows a refusal beside its fields.
    meta: { errorTitle: false },
    onSettled: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: importsKeys.all }),
        queryClient.invalidateQueries({ predicate: (q) => typeof q.queryKey[0] === 'string' && !['auth', 'settings', 'users', 'health', importsKeys.all[0]].includes(q.queryKey[0]) }),
      ]),
  });
}
