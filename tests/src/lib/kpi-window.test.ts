// The window of the KPI pages read from the address (src/lib/kpi-window.ts): what the API would refuse is
// left out, with the API's own schemas (shared/schemas/common.ts) as the judge.
import { describe, expect, it } from 'vitest';
import { readKpiWindow, toSearch, windowQuery } from '#src/lib/kpi-window.ts';

const read = (search: string) => readKpiWindow(new URLSearchParams(search));

describe('readKpiWindow', () => {
  it('keeps calendar dates, codes and a confidence the API accepts', () => {
    expect(read('?from=2026-01-01&to=2026-07-01&asset=%20T1%20&site=TFD&confidence=0.95')).toEqual({
      site: 'TFD',
      asset: 'T1',
      from: '2026-01-01',
      to: '2026-07-01',
      confidence: 0.95,
    });
  });

  it.each([
    ['a date that does not exist', '?from=2026-02-30', { from: undefined }],
    ['a date-time where a day is expected', '?to=2026-07-01T06:00', { to: undefined }],
    ['a confidence below the API’s bound (0.5)', '?confidence=0.3', { confidence: undefined }],
    ['a confidence of 1', '?confidence=1', { confidence: undefined }],
    ['an empty confidence', '?confidence=', { confidence: undefined }],
    ['text as confidence', '?confidence=high', { confidence: undefined }],
  ])('leaves out %s', (_what, search, expected) => {
    expect(read(search)).toMatchObject(expected);
  });
});

describe('toSearch and windowQuery', () => {
  it('give equal strings for equal windows, whatever the order, and leave out what is unset', () => {
    const a = toSearch(windowQuery({ to: '2026-07-01', from: '2026-01-01', asset: undefined }));
    const b = toSearch(windowQuery({ from: '2026-01-01', to: '2026-07-01' }));
    expect(a).toBe('?from=2026-01-01&to=2026-07-01');
    expect(b).toBe(a);
    expect(toSearch({})).toBe('');
  });
});
