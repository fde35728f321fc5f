import { describe, expect, it } from 'vitest';

import { nullReasonMessages, nullReasons } from '#shared/kpi/stats.ts';

describe('null reasons', () => {
  it('every reason code has a sentence', () => {
    for (const code of nullReasons) expect(nullReasonMessages[code]).toMatch(/\.$/);
  });
});
