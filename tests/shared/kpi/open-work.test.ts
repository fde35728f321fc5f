// shared/kpi/open-work.ts: open at an instant, overdue by priority age limits, order and edges. Hand-worked.
import { describe, expect, it } from 'vitest';
import { openWork, type OpenWorkInput } from '#shared/kpi/open-work.ts';

const at = new Date('2025-03-01T00:00:00Z');
const order = (o: Partial<OpenWorkInput> & Pick<OpenWorkInput, 'woNumber' | 'reportedAt'>): OpenWorkInput => ({
  asset: 'P1',
  type: 'corrective',
  priority: 'medium',
  status: 'open',
  description: '',
  completedAt: null,
  labourHours: 1,
  ...o,
});

describe('openWork', () => {
  it('gives zeros and an empty list without orders', () => {
    expect(openWork([], at)).toEqual({ total: 0, overdue: 0, hours: 0, withoutEstimate: 0, orders: [] });
  });

  it('is overdue only past the age limit of its priority (high: 7 d)', () => {
    const r = openWork(
      [
        order({ woNumber: 'A', priority: 'high', reportedAt: new Date('2025-02-22T00:00:00Z') }), // exactly 7 d
        order({ woNumber: 'B', priority: 'high', reportedAt: new Date('2025-02-21T23:00:00Z') }), // 7 d 1 h
      ],
      at,
    );
    expect(r.orders.map((o) => [o.woNumber, o.overdue])).toEqual([
      ['B', true],
      ['A', false],
    ]);
    expect(r.orders[1].ageDays).toBe(7);
  });

  it('leaves out cancelled orders, orders completed before the instant and orders reported at or after it', () => {
    const r = openWork(
      [
        order({ woNumber: 'C', status: 'cancelled', reportedAt: new Date('2025-01-01T00:00:00Z') }),
        order({ woNumber: 'D', status: 'closed', reportedAt: new Date('2025-01-01T00:00:00Z'), completedAt: new Date('2025-02-28T00:00:00Z') }),
        order({ woNumber: 'E', reportedAt: at }),
        order({ woNumber: 'F', status: 'closed', reportedAt: new Date('2025-02-27T00:00:00Z'), completedAt: at, labourHours: 0 }),
      ],
      at,
    );
    expect(r.orders.map((o) => o.woNumber)).toEqual(['F']);
    expect(r).toMatchObject({ total: 1, overdue: 0, hours: 0, withoutEstimate: 1 });
  });
});
