import { describe, expect, it } from 'vitest';

import { windowQuerySchema } from '#shared/schemas/common.ts';

describe('window query', () => {
  it('defaults confidence to 0.9 and keeps dates as the raw strings', () => {
    expect(windowQuerySchema.parse({ from: '2025-01-01', to: '2025-07-01T06:00' })).toEqual({
      from: '2025-01-01',
      to: '2025-07-01T06:00',
      confidence: 0.9,
    });
  });
  it('accepts date-times with Z or an offset and coerces a query-string confidence', () => {
    const q = windowQuerySchema.parse({
      site: 'PLANT1',
      asset: 'P-101',
      from: '2025-01-01T00:00:00Z',
      to: '2025-02-01T00:00:00+01:00',
      confidence: '0.95',
    });
    expect(q.confidence).toBe(0.95);
  });
  it.each([
    [{ from: '2025-13-01' }],
    [{ to: '1 March 2025' }],
    [{ confidence: '1' }],
    [{ confidence: '0' }],
    [{ confidence: 'high' }],
    [{ site: '' }],
  ])('refuses %o', (bad) => {
    expect(windowQuerySchema.safeParse(bad).success).toBe(false);
  });
});
