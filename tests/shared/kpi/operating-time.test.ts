import { describe, expect, it } from 'vitest';
import {
  mergeIntervals,
  operatingTimeFromCalendar,
  operatingTimeFromRunStatus,
  runStateSpans,
  type RunStatusSample,
} from '#shared/kpi/operating-time.ts';

// All cases are hand-worked. Times are UTC instants; local times are given in comments.
const t = (iso: string) => new Date(iso);
const s = (iso: string, value: number): RunStatusSample => ({ time: t(iso), value });

describe('operating time from run status', () => {
  it('counts real elapsed time on a spring-forward day (Europe/Berlin, 31 March 2024: 23 h)', () => {
    // Local midnight 00:00+01:00 = 2024-03-30T23:00Z; next local midnight 00:00+02:00 = 2024-03-31T22:00Z.
    // Running from before the window; stopped 07:00–11:00 local (05:00Z–09:00Z): 4 h down, 23 − 4 = 19 h up.
    const window = { from: t('2024-03-30T23:00:00Z'), to: t('2024-03-31T22:00:00Z') };
    const result = operatingTimeFromRunStatus([s('2024-03-31T05:00:00Z', 0), s('2024-03-31T09:00:00Z', 1)], window, {
      tag: 'RO1.RUN',
      priorSample: s('2024-03-30T20:00:00Z', 1),
    });
    expect(result.windowHours).toBe(23);
    expect(result.hours).toBe(19);
    expect(result.downtimeHours).toBe(4);
    expect(result.unknownHours).toBe(0);
    expect(result.coverage).toBe(1);
    expect(result.source).toBe('run-status');
    expect(result.tag).toBe('RO1.RUN');
    expect(result.uptime).toEqual([
      { from: '2024-03-30T23:00:00.000Z', to: '2024-03-31T05:00:00.000Z', hours: 6 },
      { from: '2024-03-31T09:00:00.000Z', to: '2024-03-31T22:00:00.000Z', hours: 13 },
    ]);
    expect(result.downtime).toEqual([{ from: '2024-03-31T05:00:00.000Z', to: '2024-03-31T09:00:00.000Z', hours: 4 }]);
  });

  it('counts real elapsed time on a fall-back day (Europe/Berlin, 27 October 2024: 25 h)', () => {
    // 00:00+02:00 = 2024-10-26T22:00Z to 00:00+01:00 = 2024-10-27T23:00Z. Stopped 02:30 CEST → 02:30 CET
    // (00:30Z → 01:30Z): the repeated local hour is one real hour of downtime, not zero.
    const window = { from: t('2024-10-26T22:00:00Z'), to: t('2024-10-27T23:00:00Z') };
    const result = operatingTimeFromRunStatus(
      [s('2024-10-26T22:00:00Z', 1), s('2024-10-27T00:30:00Z', 0), s('2024-10-27T01:30:00Z', 1)],
      window,
    );
    expect(result.windowHours).toBe(25);
    expect(result.downtimeHours).toBe(1);
    expect(result.hours).toBe(24);
  });

  it('leaves the time before the first sample unknown without a prior sample, and says so', () => {
    const window = { from: t('2024-05-01T00:00:00Z'), to: t('2024-05-02T00:00:00Z') };
    const result = operatingTimeFromRunStatus([s('2024-05-01T02:00:00Z', 1), s('2024-05-01T20:00:00Z', 0)], window);
    expect(result.hours).toBe(18);
    expect(result.downtimeHours).toBe(4);
    expect(result.unknownHours).toBe(2);
    expect(result.coverage).toBeCloseTo(22 / 24, 12);
    expect(result.unknown).toEqual([{ from: '2024-05-01T00:00:00.000Z', to: '2024-05-01T02:00:00.000Z', hours: 2 }]);
    expect(result.notes).toEqual([
      'No run-status sample before the window: the first 2 h (until 2024-05-01T02:00:00.000Z) are of unknown state and not counted.',
    ]);
  });

  it('takes the state at the window start from the last sample before it, whether in samples or priorSample', () => {
    const window = { from: t('2024-05-01T00:00:00Z'), to: t('2024-05-01T10:00:00Z') };
    const inSamples = operatingTimeFromRunStatus([s('2024-04-30T22:00:00Z', 1), s('2024-05-01T04:00:00Z', 0)], window);
    expect(inSamples.hours).toBe(4);
    expect(inSamples.unknownHours).toBe(0);
    // The later of the two wins: priorSample (stopped at 23:00) is later than the 22:00 running sample.
    const both = operatingTimeFromRunStatus([s('2024-04-30T22:00:00Z', 1), s('2024-05-01T04:00:00Z', 1)], window, {
      priorSample: s('2024-04-30T23:00:00Z', 0),
    });
    expect(both.hours).toBe(6);
    expect(both.downtimeHours).toBe(4);
  });

  it('reports the ancestor source when the caller uses a parent asset’s tag', () => {
    const window = { from: t('2024-05-01T00:00:00Z'), to: t('2024-05-01T12:00:00Z') };
    const result = operatingTimeFromRunStatus([s('2024-05-01T00:00:00Z', 1)], window, { source: 'ancestor-run-status', tag: 'RO1.RUN' });
    expect(result).toMatchObject({ hours: 12, source: 'ancestor-run-status', tag: 'RO1.RUN' });
  });

  it.each([
    ['no samples at all', [], undefined, 0, 0, 24, 0],
    ['all stopped (prior sample stopped, stays stopped)', [s('2024-05-01T08:00:00Z', 0)], s('2024-04-30T00:00:00Z', 0), 0, 24, 0, 1],
    ['repeated equal samples merge into one span', [s('2024-05-01T00:00:00Z', 1), s('2024-05-01T06:00:00Z', 1), s('2024-05-01T12:00:00Z', 1)], undefined, 24, 0, 0, 1],
    ['samples at or after the window end are ignored', [s('2024-05-01T00:00:00Z', 1), s('2024-05-02T00:00:00Z', 0), s('2024-05-03T00:00:00Z', 0)], undefined, 24, 0, 0, 1],
    ['two samples at one instant: the last given wins', [s('2024-05-01T00:00:00Z', 1), s('2024-05-01T12:00:00Z', 1), s('2024-05-01T12:00:00Z', 0)], undefined, 12, 12, 0, 1],
    ['unsorted input is sorted first', [s('2024-05-01T18:00:00Z', 1), s('2024-05-01T00:00:00Z', 1), s('2024-05-01T06:00:00Z', 0)], undefined, 12, 12, 0, 1],
  ] as const)('%s', (_label, samples, prior, up, down, unknown, coverage) => {
    const window = { from: t('2024-05-01T00:00:00Z'), to: t('2024-05-02T00:00:00Z') };
    const result = operatingTimeFromRunStatus(samples, window, { priorSample: prior });
    expect(result.hours).toBe(up);
    expect(result.downtimeHours).toBe(down);
    expect(result.unknownHours).toBe(unknown);
    expect(result.coverage).toBe(coverage);
  });

  it('notes a window with no data', () => {
    const result = operatingTimeFromRunStatus([], { from: t('2024-05-01T00:00:00Z'), to: t('2024-05-02T00:00:00Z') });
    expect(result.notes).toEqual(['No good run-status sample in or before the window: the state is unknown and no time is counted.']);
  });

  it('answers an empty window with 0 h and a null coverage with its reason', () => {
    const at = t('2024-05-01T00:00:00Z');
    const result = operatingTimeFromRunStatus([s('2024-04-30T00:00:00Z', 1)], { from: at, to: at });
    expect(result.hours).toBe(0);
    expect(result.coverage).toBeNull();
    expect(result.coverageNullReason).toBe('The window is empty (from equals to).');
  });

  it.each([
    ['from after to', [], { from: t('2024-05-02T00:00:00Z'), to: t('2024-05-01T00:00:00Z') }, undefined, /invalid-window/],
    ['an invalid date', [], { from: t('nope'), to: t('2024-05-01T00:00:00Z') }, undefined, /window.from is not a valid date/],
    ['a value other than 0 or 1', [s('2024-05-01T01:00:00Z', 2)], { from: t('2024-05-01T00:00:00Z'), to: t('2024-05-02T00:00:00Z') }, undefined, /samples\[0\]\.value must be 1 \(running\) or 0/],
    ['a prior sample inside the window', [], { from: t('2024-05-01T00:00:00Z'), to: t('2024-05-02T00:00:00Z') }, s('2024-05-01T00:00:00Z', 1), /priorSample must be earlier/],
  ] as const)('refuses %s', (_label, samples, window, prior, message) => {
    expect(() => operatingTimeFromRunStatus(samples, window, { priorSample: prior })).toThrow(message);
  });

  it('splits the window into contiguous spans that add up to it', () => {
    const window = { from: t('2024-05-01T00:00:00Z'), to: t('2024-05-02T00:00:00Z') };
    const { spans, stateBeforeWindow } = runStateSpans([s('2024-05-01T03:00:00Z', 0), s('2024-05-01T05:00:00Z', 1)], window);
    expect(stateBeforeWindow).toBe('unknown');
    expect(spans.map((x) => x.state)).toEqual(['unknown', 'stopped', 'running']);
    expect(spans[0]!.fromMs).toBe(window.from.getTime());
    expect(spans[spans.length - 1]!.toMs).toBe(window.to.getTime());
    for (let i = 1; i < spans.length; i += 1) expect(spans[i]!.fromMs).toBe(spans[i - 1]!.toMs);
  });
});

describe('no run-status tag: operating time from calendar less out-of-service windows', () => {
  // Window: 1–11 May 2024 (240 h). Out-of-service windows (hand-worked):
  //   WO-1 1 May 00:00–12:00 and WO-2 1 May 06:00 – 2 May 00:00 overlap: union 24 h (not 12 + 18 = 30 h);
  //   WO-3 5 May 00:00–06:00: 6 h;  WO-4 30 Apr 20:00 – 1 May 04:00: inside WO-1's union, adds nothing;
  //   WO-5 10 May 18:00 – (no end): runs to the window end, 6 h;  WO-6 in June: outside, ignored.
  // Down = 24 + 6 + 6 = 36 h; operating = 240 − 36 = 204 h.
  const window = { from: t('2024-05-01T00:00:00Z'), to: t('2024-05-11T00:00:00Z') };
  const oos = [
    { from: t('2024-05-01T00:00:00Z'), to: t('2024-05-01T12:00:00Z'), ref: 'WO-1' },
    { from: t('2024-05-01T06:00:00Z'), to: t('2024-05-02T00:00:00Z'), ref: 'WO-2' },
    { from: t('2024-05-05T00:00:00Z'), to: t('2024-05-05T06:00:00Z'), ref: 'WO-3' },
    { from: t('2024-04-30T20:00:00Z'), to: t('2024-05-01T04:00:00Z'), ref: 'WO-4' },
    { from: t('2024-05-10T18:00:00Z'), to: null, ref: 'WO-5' },
    { from: t('2024-06-01T00:00:00Z'), to: t('2024-06-02T00:00:00Z'), ref: 'WO-6' },
  ];

  it('subtracts the union of overlapping windows once', () => {
    const result = operatingTimeFromCalendar(window, oos);
    expect(result.source).toBe('calendar-less-out-of-service');
    expect(result.tag).toBeNull();
    expect(result.windowHours).toBe(240);
    expect(result.downtimeHours).toBe(36);
    expect(result.hours).toBe(204);
    expect(result.downtime).toEqual([
      { from: '2024-05-01T00:00:00.000Z', to: '2024-05-02T00:00:00.000Z', hours: 24 },
      { from: '2024-05-05T00:00:00.000Z', to: '2024-05-05T06:00:00.000Z', hours: 6 },
      { from: '2024-05-10T18:00:00.000Z', to: '2024-05-11T00:00:00.000Z', hours: 6 },
    ]);
    // Up: 2 May 00:00 – 5 May 00:00 (72 h) and 5 May 06:00 – 10 May 18:00 (132 h).
    expect(result.uptime.map((u) => u.hours)).toEqual([72, 132]);
    expect(result.outOfServiceRefs).toEqual(['WO-1', 'WO-2', 'WO-3', 'WO-4', 'WO-5']);
    expect(result.notes).toEqual(['Out-of-service window WO-5 has no end: counted to the window end.']);
  });

  it('gives the whole window when nothing was out of service, and 0 h for an empty window', () => {
    expect(operatingTimeFromCalendar(window, []).hours).toBe(240);
    const empty = operatingTimeFromCalendar({ from: window.from, to: window.from }, oos);
    expect(empty.hours).toBe(0);
    expect(empty.coverage).toBeNull();
  });

  it('refuses a window that ends before it starts', () => {
    expect(() => operatingTimeFromCalendar(window, [{ from: t('2024-05-03T00:00:00Z'), to: t('2024-05-02T00:00:00Z') }])).toThrow(
      /outOfService\[0\] ends/,
    );
  });
});

describe('mergeIntervals', () => {
  it.each([
    ['nothing', [], []],
    ['disjoint stay apart', [[5, 6], [1, 2]], [[1, 2], [5, 6]]],
    ['overlapping merge', [[1, 4], [3, 8], [2, 3]], [[1, 8]]],
    ['touching merge', [[1, 2], [2, 3]], [[1, 3]]],
    ['empty intervals drop', [[4, 4], [1, 2]], [[1, 2]]],
  ] as const)('%s', (_label, input, expected) => {
    const result = mergeIntervals(input.map(([fromMs, toMs]) => ({ fromMs, toMs })));
    expect(result.map((i) => [i.fromMs, i.toMs])).toEqual(expected);
  });
});
