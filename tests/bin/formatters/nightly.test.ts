import { describe, expect, it } from 'vitest';
import { nightlyRunSchema, type NightlyRun } from '#shared/schemas/nightly.ts';
import { formatNightlyRun, nightlyExitCode } from '#bin/formatters/nightly.ts';

const run: NightlyRun = nightlyRunSchema.parse({
  id: 7,
  startedAt: '2025-01-08T02:15:00.000Z',
  finishedAt: '2025-01-08T02:15:09.000Z',
  outcome: 'partial',
  trigger: 'cli',
  host: 'plant-server',
  pid: 4242,
  inbox: '/srv/osmia/.osmia/inbox',
  reportDate: '2025-01-08',
  files: [
    { file: 'orders.csv', kind: 'work-orders', outcome: 'completed', importId: 12, rowsRead: 40, rowsRejected: 0, movedTo: 'done/2025-01-08/orders.csv', reason: null },
    { file: 'notes.csv', kind: null, outcome: 'failed', importId: null, rowsRead: 0, rowsRejected: 0, movedTo: 'failed/2025-01-08/notes.csv', reason: 'The header "when,what" is none of the import formats.' },
  ],
  steps: [
    { name: 'imports', status: 'ok', startedAt: '2025-01-08T02:15:00.000Z', durationMs: 1200, detail: '2 files: 1 completed, 1 failed', error: null },
    { name: 'refresh', status: 'ok', startedAt: '2025-01-08T02:15:01.200Z', durationMs: 300, detail: '3 tags', error: null },
    { name: 'mail', status: 'failed', startedAt: '2025-01-08T02:15:01.500Z', durationMs: 7500, detail: null, error: '2 wait in the outbox for the next run' },
  ],
  figures: [],
  mail: { queued: 2, sent: 0, waiting: 2, relay: 'mail.osmia.test:587', error: 'ECONNECTION' },
  error: 'mail: 2 wait in the outbox for the next run',
});

describe('formatNightlyRun', () => {
  it('prints each file with where it went, the reason of a refused one, each step and the mail', () => {
    const text = formatNightlyRun(run);
    expect(text.split('\n')[0]).toBe('Nightly run 7 (cli): partial');
    expect(text).toMatch(/orders\.csv\s*│\s*work-orders\s*│\s*completed\s*│\s*12\s*│\s*40\s*│\s*0\s*│\s*done\/2025-01-08\/orders\.csv/);
    expect(text).toContain('notes.csv: The header "when,what" is none of the import formats.');
    expect(text).toMatch(/mail\s*│\s*failed\s*│\s*7\.5\s*│\s*2 wait in the outbox/);
    expect(text).toContain('Mail: 2 queued, 0 sent, 2 waiting in the outbox (via mail.osmia.test:587).');
  });

  it('prints a skipped run as one line with why', () => {
    const skipped = { ...run, outcome: 'skipped' as const, files: [], steps: [], mail: null, error: 'another nightly run is in progress since 2025-01-08 02:15 (UTC)' };
    expect(formatNightlyRun(skipped)).toBe('Nightly run 7 (cli): skipped — another nightly run is in progress since 2025-01-08 02:15 (UTC)');
  });
});

describe('nightlyExitCode', () => {
  // docs/design.md §7: 0 ok or skipped, 3 partial, 1 failed.
  it.each([
    ['ok', 0],
    ['skipped', 0],
    ['partial', 3],
    ['failed', 1],
  ] as const)('%s → %i', (outcome, code) => expect(nightlyExitCode({ ...run, outcome })).toBe(code));
});
