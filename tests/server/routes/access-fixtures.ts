import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { insertMailMessage } from '#server/db/queries/mail-messages.ts';
import type { TestApp } from '../../setup/app.ts';
import { importText } from '../importers/helpers.ts';

/** One valid request per route, used by the route × role table. */
export interface Fixture {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  url: string;
  body?: unknown;
  fields?: Record<string, string>;
  attach?: { name: string; content: string };
  /** For requests that must differ on each call (e.g. a new user's e-mail). */
  build?: () => Fixture;
  /** The request ends the caller's sessions (sign-out): the table signs the role in again after it. */
  endsSession?: boolean;
}

let counter = 0;

export async function accessFixtures(t: TestApp): Promise<Record<string, Fixture>> {
  const users = await t.db.query.users.findMany();
  const manager = users.find((u) => u.role === 'manager')!;
  const record = await importText(t.db, 'assets', 'code,name,kind,parent,rated_permeate_m3h,element_capacity,rack_row,rack_col\nT1,Train,train,,10,,,\nbad,,,,,,,\n', { site: 'ACC' });
  // A stored workbook every role may download (the manager's), where the nightly run would have put it.
  mkdirSync(join(t.env.REPORTS_DIR!, '2025-02-01'), { recursive: true });
  writeFileSync(join(t.env.REPORTS_DIR!, '2025-02-01', 'manager-ACC-2025-01-01-2025-02-01.xlsx'), 'a stored workbook');
  const reportWindow = 'site=ACC&from=2025-01-01&to=2025-02-01';
  const messageId = await insertMailMessage(t.db.$client, {
    envelopeFrom: 'osmia@osmia.test',
    envelopeTo: ['manager@osmia.test'],
    from: 'Osmia <osmia@osmia.test>',
    to: 'manager@osmia.test',
    subject: 'A received message',
    messageId: null,
    text: 'Text part',
    html: '<p>HTML part</p>',
    attachments: [],
    size: 100,
  });
  return {
    'GET /api/health': { method: 'get', url: '/api/health' },
    'GET /api/openapi.json': { method: 'get', url: '/api/openapi.json' },
    'POST /api/auth/login': { method: 'post', url: '/api/auth/login', body: { email: 'admin@test.example', password: 'admin-password-1' } },
    'POST /api/auth/logout': { method: 'post', url: '/api/auth/logout', endsSession: true },
    'GET /api/auth/me': { method: 'get', url: '/api/auth/me' },
    'PATCH /api/auth/me': { method: 'patch', url: '/api/auth/me', body: { digest: true } },
    'GET /api/users': { method: 'get', url: '/api/users' },
    'POST /api/users': {
      method: 'post',
      url: '/api/users',
      build: () => ({
        method: 'post',
        url: '/api/users',
        body: { email: `new-${++counter}@test.example`, role: 'finance', password: 'a-long-password' },
      }),
    },
    'PATCH /api/users/:id': { method: 'patch', url: `/api/users/${manager.id}`, body: { name: 'Manager' } },
    'GET /api/settings': { method: 'get', url: '/api/settings' },
    'PUT /api/settings': { method: 'put', url: '/api/settings', body: { currency: 'EUR' } },
    'POST /api/imports': {
      method: 'post',
      url: '/api/imports',
      build: () => ({
        method: 'post',
        url: '/api/imports',
        fields: { kind: 'assets', site: 'ACC' },
        attach: { name: `assets-${++counter}.csv`, content: `code,name,kind,parent,rated_permeate_m3h,element_capacity,rack_row,rack_col\nP${counter},Pump,pump,T1,,,,\n` },
      }),
    },
    'GET /api/sites': { method: 'get', url: '/api/sites' },
    'GET /api/imports': { method: 'get', url: '/api/imports' },
    'GET /api/imports/:id': { method: 'get', url: `/api/imports/${record.id}` },
    'GET /api/imports/:id/rejects.csv': { method: 'get', url: `/api/imports/${record.id}/rejects.csv` },
    'GET /api/kpi/element-life': { method: 'get', url: '/api/kpi/element-life?site=ACC&groupBy=position' },
    'GET /api/kpi/forecast': { method: 'get', url: '/api/kpi/forecast?site=ACC' },
    'GET /api/kpi/time-to-complete': { method: 'get', url: '/api/kpi/time-to-complete?site=ACC' },
    'GET /api/kpi/maintenance-mix': { method: 'get', url: '/api/kpi/maintenance-mix?site=ACC' },
    'GET /api/kpi/reliability': { method: 'get', url: '/api/kpi/reliability?site=ACC&groupBy=asset' },
    'GET /api/kpi/downtime': { method: 'get', url: '/api/kpi/downtime?site=ACC' },
    'GET /api/kpi/performance': { method: 'get', url: '/api/kpi/performance?site=ACC' },
    'GET /api/work-orders/open': { method: 'get', url: '/api/work-orders/open?site=ACC' },
    'GET /api/reports': { method: 'get', url: '/api/reports' },
    'GET /api/reports/finance.xlsx': { method: 'get', url: `/api/reports/finance.xlsx?${reportWindow}` },
    'GET /api/reports/manager.xlsx': { method: 'get', url: `/api/reports/manager.xlsx?${reportWindow}` },
    'GET /api/reports/engineer.xlsx': { method: 'get', url: `/api/reports/engineer.xlsx?${reportWindow}` },
    'GET /api/reports/stored/:date/:file': { method: 'get', url: '/api/reports/stored/2025-02-01/manager-ACC-2025-01-01-2025-02-01.xlsx' },
    'GET /api/nightly-runs': { method: 'get', url: '/api/nightly-runs?limit=5' },
    'GET /api/mail': { method: 'get', url: '/api/mail?limit=5&offset=0' },
    'GET /api/mail/:id': { method: 'get', url: `/api/mail/${messageId}` },
  };
}
