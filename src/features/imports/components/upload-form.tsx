import { useId, useRef, useState, type FormEvent } from 'react';
import { importKinds, type ImportKind } from '#shared/schemas/enums.ts';
import type { ImportRecord } from '#shared/schemas/imports.ts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { Checkbox } from '../../../components/ui/checkbox.tsx';
import { Input } from '../../../components/ui/input.tsx';
import { Select } from '../../../components/ui/select.tsx';
import { TextArea } from '../../../components/ui/textarea.tsx';
import { getErrorMessage, isApiError } from '../../../lib/api-client.ts';
import { cn } from '../../../lib/cn.ts';
import { formatBytes } from '../../../lib/format.ts';
import { useUploadImport } from '../api/upload-import.ts';
import { columnsHint, kindLabels } from '../utils/labels.ts';

const timeZones: readonly string[] = typeof Intl.supportedValuesOf === 'function' ? Intl.supportedValuesOf('timeZone') : [];

type Field = 'file' | 'map' | 'tz' | 'site';

/** The column map must be a JSON object of text to text; the server says the same, this says it sooner. */
function checkMap(text: string): string | undefined {
  if (!text.trim()) return undefined;
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    return 'Not valid JSON. Write an object such as {"Time stamp": "timestamp", "Value": "value"}.';
  }
  if (typeof value !== 'object' || value === null || Array.isArray(value)) return 'Write an object: {"their header": "our header", …}.';
  if (!Object.values(value).every((v) => typeof v === 'string')) return 'Every value must be one of our column names, in quotes.';
  return undefined;
}

function UploadProgress({ loaded, total }: { loaded: number; total: number }) {
  const sent = total > 0 ? Math.min(1, loaded / total) : 0;
  const done = sent >= 1;
  return (
    <div className="space-y-1">
      <div
        role="progressbar"
        aria-label="Upload"
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={Math.round(sent * 100)}
        className="h-2 w-full overflow-hidden rounded-full bg-basin-100"
      >
        <div className={cn('h-full bg-tide-600 transition-[width]', done && 'animate-pulse')} style={{ width: `${sent * 100}%` }} />
      </div>
      <p className="text-xs text-basin-700" aria-live="polite">
        {done ? 'File sent; the server is importing it…' : `Sending ${formatBytes(loaded)} of ${formatBytes(total)} (${Math.round(sent * 100)} %)`}
      </p>
    </div>
  );
}

/** Upload one file to import: kind, site, time zone, strict and dry-run, an optional column map. */
export function UploadForm({ onResult }: { onResult: (record: ImportRecord) => void }) {
  const upload = useUploadImport();
  const fileRef = useRef<HTMLInputElement>(null);
  const fileId = useId();
  const zonesId = useId();
  const [kind, setKind] = useState<ImportKind>('historian');
  const [site, setSite] = useState('');
  const [tz, setTz] = useState('');
  const [file, setFile] = useState<File | null>(null);
  const [strict, setStrict] = useState(false);
  const [dryRun, setDryRun] = useState(false);
  const [map, setMap] = useState('');
  const [progress, setProgress] = useState<{ loaded: number; total: number } | null>(null);
  const [errors, setErrors] = useState<Partial<Record<Field, string>>>({});

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const next: Partial<Record<Field, string>> = {};
    if (!file) next.file = 'Choose a CSV file (or an XLSX workbook for registers and work orders).';
    else if (file.size === 0) next.file = 'This file is empty: an import needs at least a header line.';
    const mapError = checkMap(map);
    if (mapError) next.map = mapError;
    if (tz.trim() && timeZones.length > 0 && !timeZones.includes(tz.trim()) && tz.trim() !== 'UTC') next.tz = 'Not a time zone this browser knows: use an IANA name such as Europe/Lisbon.';
    setErrors(next);
    if (Object.keys(next).length > 0 || !file) return;
    setProgress({ loaded: 0, total: file.size });
    upload.mutate(
      {
        file,
        kind,
        site: site.trim() || undefined,
        tz: tz.trim() || undefined,
        strict,
        dryRun,
        map: map.trim() || undefined,
        onProgress: (loaded, total) => setProgress({ loaded, total }),
      },
      {
        onSuccess: (record) => {
          onResult(record);
          setFile(null);
          if (fileRef.current) fileRef.current.value = '';
        },
        onError: (err) => {
          if (isApiError(err, 400)) setErrors(err.fieldErrors() as Partial<Record<Field, string>>);
        },
        onSettled: () => setProgress(null),
      },
    );
  };

  return (
    <Card title="Import a file" description="The same import as the command line: bad rows are listed with their line number, and importing the same file twice changes nothing.">
      <form onSubmit={submit} noValidate className="space-y-4">
        {upload.isError && (
          <Alert tone="error" title="The file was not imported">
            {getErrorMessage(upload.error)}
          </Alert>
        )}
        <div className="grid gap-4 md:grid-cols-3">
          <Select
            label="Kind of file"
            value={kind}
            onChange={(e) => setKind(e.target.value as ImportKind)}
            options={importKinds.map((k) => ({ value: k, label: kindLabels[k] }))}
            hint={`Columns: ${columnsHint(kind)}`}
          />
          <Input
            label="Site code"
            value={site}
            onChange={(e) => setSite(e.target.value)}
            placeholder="only site"
            autoComplete="off"
            spellCheck={false}
            hint="Needed when the server holds several sites; an asset register for a new code creates the site."
            error={errors.site}
          />
          <div>
            <Input
              label="Time zone"
              value={tz}
              onChange={(e) => setTz(e.target.value)}
              list={zonesId}
              placeholder="the site’s"
              autoComplete="off"
              spellCheck={false}
              hint="For timestamps without an offset; daylight-saving gaps and repeats are corrected and reported."
              error={errors.tz}
            />
            <datalist id={zonesId}>
              {timeZones.map((z) => (
                <option key={z} value={z} />
              ))}
            </datalist>
          </div>
        </div>

        <div>
          <label htmlFor={fileId} className="mb-1 block text-sm font-bold text-basin-800">
            File
          </label>
          <input
            ref={fileRef}
            id={fileId}
            type="file"
            accept=".csv,.txt,.tsv,.xlsx,text/csv"
            aria-invalid={errors.file ? true : undefined}
            aria-describedby={errors.file ? `${fileId}-error` : `${fileId}-hint`}
            onChange={(e) => setFile(e.target.files?.[0] ?? null)}
            className="block w-full text-sm text-basin-800 file:mr-3 file:rounded-md file:border file:border-basin-400 file:bg-white file:px-3 file:py-2 file:text-sm file:font-bold file:text-basin-900 hover:file:bg-basin-100"
          />
          {errors.file ? (
            <p id={`${fileId}-error`} className="mt-1 text-sm text-ember-700">
              {errors.file}
            </p>
          ) : (
            <p id={`${fileId}-hint`} className="mt-1 text-xs text-basin-600">
              CSV in UTF-8 (with or without BOM); registers and work orders may also be the first sheet of an XLSX workbook.
              {file && ` Chosen: ${file.name}, ${formatBytes(file.size)}.`}
            </p>
          )}
        </div>

        <div className="grid gap-4 md:grid-cols-2">
          <Checkbox label="Strict" checked={strict} onChange={(e) => setStrict(e.target.checked)} hint="Refuse the whole file if any row is bad, instead of importing the good rows." />
          <Checkbox label="Dry run" checked={dryRun} onChange={(e) => setDryRun(e.target.checked)} hint="Check the file and count what would change, then keep nothing." />
        </div>

        <TextArea
          label="Column map (optional)"
          rows={3}
          value={map}
          onChange={(e) => setMap(e.target.value)}
          placeholder='{"Time stamp": "timestamp", "Point": "tag", "Reading": "value"}'
          hint="JSON: the file’s own headers renamed to Osmia’s columns."
          error={errors.map}
        />

        {progress && <UploadProgress loaded={progress.loaded} total={progress.total} />}

        <Button type="submit" loading={upload.isPending}>
          {dryRun ? 'Check the file' : 'Import'}
        </Button>
      </form>
    </Card>
  );
}
