import type { ImportKind, ImportStatus } from '#shared/schemas/enums.ts';
import { importColumns, optionalColumns } from '#shared/schemas/imports.ts';
import type { BadgeTone } from '../../../components/ui/badge.tsx';

export const kindLabels: Record<ImportKind, string> = {
  historian: 'Historian samples (long or wide)',
  tags: 'Tag map',
  assets: 'Asset register',
  'work-orders': 'Work orders',
  elements: 'Element register',
  'job-steps': 'Job steps',
};

/** Short names for tables. */
export const kindShortLabels: Record<ImportKind, string> = {
  historian: 'historian',
  tags: 'tag map',
  assets: 'assets',
  'work-orders': 'work orders',
  elements: 'elements',
  'job-steps': 'job steps',
};

export const statusTones: Record<ImportStatus, BadgeTone> = {
  running: 'brand',
  completed: 'ok',
  partial: 'warning',
  failed: 'fault',
  duplicate: 'neutral',
};

export const statusLabels: Record<ImportStatus, string> = {
  running: 'running',
  completed: 'completed',
  partial: 'partial',
  failed: 'failed',
  duplicate: 'duplicate',
};

/** What a status means for the data, said beside an import's record. */
export const statusMeanings: Record<ImportStatus, string> = {
  running: 'The import is still running.',
  completed: 'Every row was read and kept.',
  partial: 'The good rows were kept; the rejected rows are listed with their line number.',
  failed: 'Nothing was kept.',
  duplicate: 'This file was imported before: nothing changed.',
};

/** The canonical header of a kind, optional columns in brackets (docs/design.md §5). */
export function columnsHint(kind: ImportKind): string {
  const optional = new Set(optionalColumns[kind] ?? []);
  const columns = importColumns[kind].map((c) => (optional.has(c) ? `[${c}]` : c)).join(', ');
  return kind === 'historian' ? `${columns}; or wide: timestamp, then one column per tag` : columns;
}

const noteLabels: Record<string, string> = {
  format: 'File format',
  delimiter: 'Delimiter',
  layout: 'Historian layout',
  samplesRead: 'Samples read',
  samplesNotGoodQuality: 'Samples of uncertain or bad quality (left out of calculations)',
  tags: 'Tags in the file',
  from: 'First sample',
  to: 'Last sample',
  dstGapShifted: 'Local times in a daylight-saving gap, moved forward',
  dstRepeatResolved: 'Local times in a daylight-saving repeat, resolved',
  rejectsNotStored: 'Rejects beyond those stored',
  formulaLikeText: 'Cells that look like spreadsheet formulas (stored as text)',
  kinds: 'Assets by kind',
  rowsUpdated: 'Rows updated',
  refreshError: 'The refresh after this import failed (run bin/osmia refresh)',
};

/** A note of the import record as a label and a text: known keys in words, others as they come. */
export function describeNote(key: string, value: unknown): [string, string] {
  const label = noteLabels[key] ?? key;
  if (value === null || value === undefined) return [label, '—'];
  if (typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>);
    return [label, Array.isArray(value) ? value.map(String).join(', ') : entries.map(([k, v]) => `${k}: ${String(v)}`).join(', ')];
  }
  if (key === 'delimiter' && value === '\t') return [label, 'tab'];
  return [label, String(value)];
}

/** How long an import took: "420 ms", "3.2 s", "4 min 10 s". */
export function formatImportDuration(ms: number): string {
  if (!Number.isFinite(ms) || ms < 0) return '—';
  if (ms < 1000) return `${Math.round(ms)} ms`;
  if (ms < 60_000) return `${new Intl.NumberFormat(undefined, { maximumFractionDigits: 1 }).format(ms / 1000)} s`;
  return `${Math.floor(ms / 60_000)} min ${Math.round((ms % 60_000) / 1000)} s`;
}

