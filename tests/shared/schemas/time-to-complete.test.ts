import { describe, expect, it } from 'vitest';

import { buildTimeToCompleteReport } from '#shared/kpi/time-to-complete-report.ts';
import { timeToCompleteQuerySchema, timeToCompleteReportSchema } from '#shared/schemas/time-to-complete.ts';
import { freshAnswer } from '../../fixtures/freshness.ts';

describe('time-to-complete query', () => {
  it('time-to-complete: optional groupBy', () => {
    expect(timeToCompleteQuerySchema.parse({ groupBy: 'crew' }).groupBy).toBe('crew');
  });
});

describe('time-to-complete answers follow docs/design.md §7', () => {
  it('time-to-complete: quantileMethod, groups and jobs with ISO times', () => {
    const job = { woNumber: 'WO-7', type: 'corrective', crew: null, assetKind: 'pump', guided: true, steps: 2 };
    const result = buildTimeToCompleteReport(
      { site: 'PLANT', timeZone: 'UTC', workOrderExtent: { from: null, to: null }, jobs: [{ ...job, startedAt: new Date('2025-03-01T08:00:00Z'), completedAt: new Date('2025-03-01T11:00:00Z') }] },
      { from: null, to: null },
    );
    const answer = { ...freshAnswer, ...result };
    const parsed = timeToCompleteReportSchema.parse(answer);
    expect(parsed.jobs[0]).toMatchObject({ woNumber: 'WO-7', startedAt: '2025-03-01T08:00:00.000Z', hours: 3, guided: true });
    expect(timeToCompleteReportSchema.safeParse({ ...answer, quantileMethod: 'type 6' }).success).toBe(false);
  });

});
