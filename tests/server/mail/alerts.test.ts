// A membrane alert is mailed when its threshold is first crossed, not every night after; it clears when the
// stage's latest day no longer crosses, and a new crossing is mailed again (docs/design.md §6, alerts).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { settingsDefaults } from '#shared/schemas/settings.ts';
import { listSites } from '#server/db/queries/sites.ts';
import { insertNightlyRun } from '#server/db/queries/nightly-runs.ts';
import { createUser } from '#server/services/users.ts';
import { recordMembraneAlerts } from '#server/mail/alerts.ts';
import { siteReport } from '#server/mail/figures.ts';
import { mailRecipients } from '#server/jobs/nightly.ts';
import { seedOpsPlant } from '../../fixtures/ops-plant.ts';
import { createTestDatabase, type TestDatabase } from '../../setup/db.ts';

let t: TestDatabase;
let runId: number;
beforeAll(async () => {
  t = await createTestDatabase();
  await seedOpsPlant(t.db);
  runId = await insertNightlyRun(t.db.$client, { trigger: 'cli', host: 'test', pid: 1, inbox: '/tmp/inbox', reportDate: '2025-01-08' });
  await createUser(t.db, { email: 'manager@osmia.test', name: 'M', role: 'manager', password: 'manager-password', digest: true }, 4);
  await createUser(t.db, { email: 'finance@osmia.test', name: 'F', role: 'finance', password: 'finance-password', digest: true }, 4);
  await createUser(t.db, { email: 'engineer@osmia.test', name: 'E', role: 'engineer', password: 'engineer-password', digest: false }, 4);
});
afterAll(() => t.close());

const outboxAlerts = async () => (await t.db.$client.query(`select to_address from outbox where kind = 'membrane-alert' order by id`)).rows.map((r) => r.to_address);
const openAlerts = async () => (await t.db.$client.query(`select stage, kind from membrane_alerts where cleared_at is null`)).rows;

describe('mail recipients', () => {
  it('are the enabled subscribers, then the digestRecipients addresses that are no user’s, read as a manager', async () => {
    const recipients = await mailRecipients(t.db, ['Ops@Osmia.test', 'engineer@osmia.test', 'ops@osmia.test']);
    expect(recipients.map((r) => [r.email, r.role, r.userId === null])).toEqual([
      ['finance@osmia.test', 'finance', false],
      ['manager@osmia.test', 'manager', false],
      // The engineer is a user who did not subscribe: the setting does not override their choice.
      ['ops@osmia.test', 'manager', true],
    ]);
  });
});

describe('membrane alert state', () => {
  it('opens the alert and queues its mail once, for the readers of membrane performance only', async () => {
    const [site] = await listSites(t.db.$client);
    const recipients = await mailRecipients(t.db, []);
    const report = await siteReport(t.db, site, '2025-01-08', settingsDefaults);
    // tests/fixtures/ops-plant.ts: TR1-S2 permeate flow 10 → 8.8 m³/h from Jan 6 at the same conditions, −12 %,
    // past the −10 % trigger (common practice cleaning trigger, docs/design.md §6).
    expect(report.alerts.map((a) => [a.stage, a.kind])).toEqual([['TR1-S2', 'permeate-flow-drop']]);
    expect(await recordMembraneAlerts(t.db, report, runId, recipients, 'http://osmia.test')).toMatchObject({ queued: 1 });
    expect(await outboxAlerts()).toEqual(['manager@osmia.test']);
    // The next night sees the same crossing: nothing new is opened or mailed.
    const again = await siteReport(t.db, site, '2025-01-08', settingsDefaults);
    expect(await recordMembraneAlerts(t.db, again, runId, recipients, 'http://osmia.test')).toEqual({ opened: [], queued: 0 });
    expect(await outboxAlerts()).toEqual(['manager@osmia.test']);
    expect(await openAlerts()).toEqual([{ stage: 'TR1-S2', kind: 'permeate-flow-drop' }]);
  });

  it('clears the alert when the stage’s latest day no longer crosses, and mails a new crossing again', async () => {
    const [site] = await listSites(t.db.$client);
    const recipients = await mailRecipients(t.db, []);
    // After the clean-in-place that ends Jan 8 12:00 the baseline restarts (docs/design.md §6, baseline):
    // the latest day of the week to Jan 11 is at its own baseline, no alert.
    const later = await siteReport(t.db, site, '2025-01-11', settingsDefaults);
    expect(later.alerts).toEqual([]);
    expect(later.stagesWithLatest.has('TR1-S2')).toBe(true);
    await recordMembraneAlerts(t.db, later, runId, recipients, 'http://osmia.test');
    expect(await openAlerts()).toEqual([]);
    const crossedAgain = await siteReport(t.db, site, '2025-01-08', settingsDefaults);
    expect((await recordMembraneAlerts(t.db, crossedAgain, runId, recipients, 'http://osmia.test')).queued).toBe(1);
    expect(await outboxAlerts()).toEqual(['manager@osmia.test', 'manager@osmia.test']);
  });

  it('leaves the alerts alone when the performance answer failed (no data to say they cleared)', async () => {
    const [site] = await listSites(t.db.$client);
    const before = await openAlerts();
    const report = { ...(await siteReport(t.db, site, '2025-01-11', settingsDefaults)), performanceAnswered: false };
    expect(await recordMembraneAlerts(t.db, report, runId, [], 'http://osmia.test')).toEqual({ opened: [], queued: 0 });
    expect(await openAlerts()).toEqual(before);
  });
});
