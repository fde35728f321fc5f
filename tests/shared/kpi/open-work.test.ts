// shared/kpi/open-work.ts: open at an instant, overdue by priority age limits, order and edges. Hand-worked.
import { describe, expect, it } from 'vitest';
import { buildOpenWorkOrders, openWork, overdueAfterDays, type OpenWorkInput } from '#shared/kpi/open-work.ts';
import { openWorkOrdersSchema } from '#shared/schemas/work-orders.ts';

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

describe('buildOpenWorkOrders', () => {
  const orders = [
    order({ woNumber: 'G', priority: 'low', reportedAt: new Date('2025-02-27T00:00:00Z'), labourHours: 2 }), // 2 d, not overdue
    order({ woNumber: 'H', priority: 'emergency', reportedAt: new Date('2025-02-26T00:00:00Z'), labourHours: 3 }), // 3 d > 1 d: overdue
    order({ woNumber: 'I', priority: 'medium', reportedAt: new Date('2025-02-28T00:00:00Z'), labourHours: 0 }), // 1 d, no estimate
  ];

  it('lists the most pressing orders up to the limit, and counts every open one', () => {
    const r = buildOpenWorkOrders({ site: 'PLANT', asset: 'P1', workOrders: orders }, { asOf: at, limit: 2 });
    // Exactly the schema's answer: parsing (which drops undeclared keys) changes nothing.
    expect(openWorkOrdersSchema.parse(r)).toEqual(r);
    // Overdue first (H), then by priority: medium (I) before low (G); 2 + 3 + 0 = 5 h, one without an estimate.
    expect(r).toMatchObject({ site: 'PLANT', asset: 'P1', asOf: '2025-03-01T00:00:00.000Z', total: 3, overdue: 1, hours: 5, withoutEstimate: 1, overdueAfterDays });
    expect(r.workOrders.map((o) => [o.woNumber, o.reportedAt, o.ageDays, o.overdue])).toEqual([
      ['H', '2025-02-26T00:00:00.000Z', 3, true],
      ['I', '2025-02-28T00:00:00.000Z', 1, false],
    ]);
  });

  it('names no asset for the whole site, and gives zeros without orders', () => {
    const r = buildOpenWorkOrders({ site: 'PLANT', asset: null, workOrders: [] }, { asOf: at, limit: 10 });
    expect(openWorkOrdersSchema.parse(r)).toEqual(r);
    expect(r).not.toHaveProperty('asset');
    expect(r).toMatchObject({ total: 0, overdue: 0, hours: 0, withoutEstimate: 0, workOrders: [] });
  });
});
