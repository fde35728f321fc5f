import type { NightlyRunOutcome } from '#shared/schemas/enums.ts';
import type { NightlyFileOutcome, NightlyRun } from '#shared/schemas/nightly.ts';
import type { BadgeTone } from '../../../components/ui/badge.tsx';

export const outcomeLabels: Record<NightlyRunOutcome | 'running', string> = {
  running: 'running',
  ok: 'ok',
  partial: 'partial',
  failed: 'failed',
  skipped: 'skipped',
};

export const outcomeTones: Record<NightlyRunOutcome | 'running', BadgeTone> = {
  running: 'brand',
  ok: 'ok',
  partial: 'warning',
  failed: 'fault',
  skipped: 'neutral',
};

export const fileOutcomeLabels: Record<NightlyFileOutcome, string> = {
  completed: 'imported',
  partial: 'partly imported',
  duplicate: 'duplicate',
  'already-imported': 'already imported',
  failed: 'not imported',
  'left-in-inbox': 'left in the inbox',
};

export const fileOutcomeTones: Record<NightlyFileOutcome, BadgeTone> = {
  completed: 'ok',
  partial: 'warning',
  duplicate: 'neutral',
  'already-imported': 'neutral',
  failed: 'fault',
  'left-in-inbox': 'warning',
};

/** "4 imported, 1 not imported" (outcomes in the order of the labels), or "inbox empty". */
export function filesSummary(run: NightlyRun): string {
  if (run.outcome === 'skipped') return '—';
  if (run.files.length === 0) return 'inbox empty';
  const counts = new Map<NightlyFileOutcome, number>();
  for (const f of run.files) counts.set(f.outcome, (counts.get(f.outcome) ?? 0) + 1);
  return (Object.keys(fileOutcomeLabels) as NightlyFileOutcome[])
    .filter((o) => counts.has(o))
    .map((o) => `${counts.get(o)} ${fileOutcomeLabels[o]}`)
    .join(', ');
}

/** "3 sent", "2 sent, 1 waiting", or "—" for a run that did not get to its mail. */
export function mailSummary(run: NightlyRun): string {
  if (!run.mail) return '—';
  const parts = [`${run.mail.sent} sent`];
  if (run.mail.waiting > 0) parts.push(`${run.mail.waiting} waiting`);
  return parts.join(', ');
}
