// Run-status histories from the derived rows (shared/kpi/run-status.ts), hand-worked. Rules: docs/design.md §6
// (Operating time: a state holds from a good sample until the next good sample; time before the first known
// state is unknown) and §3 (stop events and rollups are what refresh derives from the samples).
import { describe, expect, it } from 'vitest';
import { edgeSamples, runStatusDataSpan, runStatusHistory } from '#shared/kpi/run-status.ts';

const t = (iso: string) => new Date(iso);
const window = { from: t('2025-03-01T00:00:00Z'), to: t('2025-03-02T00:00:00Z') };

describe('runStatusDataSpan', () => {
  it('is where coverage and good rollups agree: the later start and the earlier end', () => {
    // Coverage 1 Mar 02:00–20:00; good data from the 01:00 hour to a last good sample at 22:00 → 02:00–20:00.
    const coverage = { from: t('2025-03-01T02:00:00Z'), to: t('2025-03-01T20:00:00Z') };
    expect(runStatusDataSpan(coverage, { firstHour: t('2025-03-01T01:00:00Z'), lastTs: t('2025-03-01T22:00:00Z') })).toEqual({
      from: t('2025-03-01T02:00:00Z'),
      until: t('2025-03-01T20:00:00Z'),
    });
    // Good data inside the coverage → the good data's own span.
    expect(runStatusDataSpan(coverage, { firstHour: t('2025-03-01T03:00:00Z'), lastTs: t('2025-03-01T19:00:00Z') })).toEqual({
      from: t('2025-03-01T03:00:00Z'),
      until: t('2025-03-01T19:00:00Z'),
    });
  });

  it('is null without good data, or when the two do not overlap', () => {
    expect(runStatusDataSpan({ from: window.from, to: window.to }, null)).toBeNull();
    expect(runStatusDataSpan({ from: t('2025-03-01T12:00:00Z'), to: window.to }, { firstHour: window.from, lastTs: t('2025-03-01T06:00:00Z') })).toBeNull();
  });

  it('takes the good data alone when no coverage is recorded', () => {
    expect(runStatusDataSpan(null, { firstHour: window.from, lastTs: t('2025-03-01T06:00:00Z') })).toEqual({ from: window.from, until: t('2025-03-01T06:00:00Z') });
  });
});

describe('edgeSamples', () => {
  const data = { from: t('2025-02-20T00:00:00Z'), until: t('2025-03-05T00:00:00Z') };

  it('turns each stop in the window into a 0 at its start and a 1 at its end', () => {
    const stops = [{ from: t('2025-03-01T06:00:00Z'), to: t('2025-03-01T09:00:00Z') }];
    expect(edgeSamples(stops, data, window, null).samples).toEqual([
      { time: t('2025-03-01T09:00:00Z'), value: 1 },
      { time: t('2025-03-01T06:00:00Z'), value: 0 },
    ]);
  });

  it('carries the state at the window start: the stop under way, else the last restart, else the first sample', () => {
    const under = [{ from: t('2025-02-28T22:00:00Z'), to: t('2025-03-01T02:00:00Z') }];
    expect(edgeSamples(under, data, window, null).priorSample).toEqual({ time: t('2025-02-28T22:00:00Z'), value: 0 });
    expect(edgeSamples([], data, window, t('2025-02-25T00:00:00Z')).priorSample).toEqual({ time: t('2025-02-25T00:00:00Z'), value: 1 });
    expect(edgeSamples([], data, window, null).priorSample).toEqual({ time: data.from, value: 1 });
  });

  it('marks the first instant of data that starts inside the window, and gives nothing outside it', () => {
    const late = { from: t('2025-03-01T04:00:00Z'), until: data.until };
    expect(edgeSamples([], late, window, null)).toEqual({ samples: [{ time: late.from, value: 1 }], priorSample: null });
    expect(edgeSamples([], null, window, null)).toEqual({ samples: [], priorSample: null });
    expect(edgeSamples([], { from: t('2025-02-01T00:00:00Z'), until: t('2025-02-10T00:00:00Z') }, window, null)).toEqual({ samples: [], priorSample: null });
  });
});

describe('runStatusHistory', () => {
  it('gives the span, the edges and the stops, and names a tag without good data', () => {
    const stops = [{ from: t('2025-03-01T06:00:00Z'), to: null }];
    const rows = { coverage: { from: t('2025-02-20T00:00:00Z'), to: t('2025-03-01T12:00:00Z') }, good: { firstHour: t('2025-02-20T00:00:00Z'), lastTs: t('2025-03-01T12:00:00Z') }, stops, lastStopEndBefore: null };
    const { history, note } = runStatusHistory('P.RUN', rows, window);
    expect(note).toBeNull();
    expect(history).toMatchObject({ dataFrom: t('2025-02-20T00:00:00Z'), dataUntil: t('2025-03-01T12:00:00Z'), stops });
    // Still stopped at the end of the data: only its start falls in the window.
    expect(history.samples).toEqual([{ time: t('2025-03-01T06:00:00Z'), value: 0 }]);
    expect(runStatusHistory('P.RUN', { ...rows, good: null }, window)).toMatchObject({
      history: { samples: [], priorSample: null, dataFrom: null, dataUntil: null },
      note: 'P.RUN has no good-quality run-status data.',
    });
  });
});
