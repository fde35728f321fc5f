// `osmia nightly`: what the run did with each file, each step's result, and the mail.
import type { NightlyRun } from '#shared/schemas/nightly.ts';
import { formatTable } from '../output.ts';

export function formatNightlyRun(run: NightlyRun): string {
  const lines = [`Nightly run ${run.id} (${run.trigger}): ${run.outcome ?? 'running'}${run.error && run.outcome === 'skipped' ? ` — ${run.error}` : ''}`];
  if (run.outcome === 'skipped') return lines.join('\n');
  lines.push(`inbox ${run.inbox}; digest up to ${run.reportDate}`);
  if (run.files.length) {
    lines.push(formatTable(['file', 'kind', 'outcome', 'import', 'rows', 'rejected', 'moved to'], run.files.map((f) => [f.file, f.kind ?? '?', f.outcome, f.importId, f.rowsRead, f.rowsRejected, f.movedTo ?? '(left in the inbox)'])));
    for (const f of run.files) if ((f.outcome === 'failed' || f.outcome === 'left-in-inbox') && f.reason) lines.push(`${f.file}: ${f.reason}`);
  } else lines.push('The inbox was empty.');
  lines.push(formatTable(['step', 'status', 'seconds', 'what'], run.steps.map((s) => [s.name, s.status, Math.round(s.durationMs / 100) / 10, s.error ?? s.detail ?? ''])));
  if (run.mail) lines.push(`Mail: ${run.mail.queued} queued, ${run.mail.sent} sent, ${run.mail.waiting} waiting in the outbox${run.mail.relay ? ` (via ${run.mail.relay})` : ''}.`);
  return lines.join('\n');
}

/** Exit code of a run: 0 ok or skipped (another run is doing the work), 3 partial, 1 failed. */
export function nightlyExitCode(run: NightlyRun): number {
  return run.outcome === 'failed' ? 1 : run.outcome === 'partial' ? 3 : 0;
}
