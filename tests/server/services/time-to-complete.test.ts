// Time to complete through the importers and the service: ten jobs whose step logs give known
// durations, type-7 quantiles worked by hand, groups, the window rule and the learning curve.
import { beforeFreshnessSchema } from '#shared/schemas/common.ts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { vesselWorkCautions } from '#shared/cautions.ts';
import { quantileMethodType7, timeToCompleteQuerySchema, timeToCompleteReportSchema } from '#shared/schemas/time-to-complete.ts';
import { getTimeToComplete, type TimeToCompleteAnswer } from '#server/services/time-to-complete.ts';
import { refresh } from '#server/jobs/refresh.ts';
import { createTestDatabase, type TestDatabase } from '../../setup/db.ts';
import { importText } from '../importers/helpers.ts';

let t: TestDatabase;

const assets = [
  'code,name,kind,parent,rated_permeate_m3h,element_capacity,rack_row,rack_col',
  'T1,Train 1,train,,100,,,',
  'T1-S1,Train 1 stage 1,stage,T1,,,,',
  'T1-S1-V01,Vessel 1,vessel,T1-S1,,6,1,1',
  'T1-HPP,High-pressure pump,pump,T1,,,,',
].join('\n');

const wo = (n: string, asset: string, type: string, crew: string, reported: string) =>
  `${n},${asset},${type},medium,closed,,job ${n},${reported},${reported},${reported.slice(0, 10)} 23:59,,,1,50,0,${crew}`;

/** Site time zone Europe/Berlin; times below are naive local times, read in that zone by the importer. */
const workOrders = [
  'wo_number,asset,type,priority,status,failure_code,description,reported_at,started_at,completed_at,out_of_service_from,out_of_service_to,labour_hours,labour_cost,parts_cost,crew',
  wo('WO-01', 'T1-S1-V01', 'preventive', 'crew-a', '2021-01-04 07:00'),
  wo('WO-02', 'T1-S1-V01', 'preventive', 'crew-a', '2021-02-01 05:00'),
  wo('WO-03', 'T1-S1-V01', 'corrective', 'crew-b', '2021-04-05 07:00'),
  'WO-04,T1-HPP,corrective,high,closed,SEAL,job WO-04,2021-03-27 11:00,2021-03-27 11:00,2021-03-28 20:00,,,30,1500,0,crew-b',
  wo('WO-05', 'T1-S1-V01', 'preventive', 'crew-a', '2021-05-03 07:00'),
  wo('WO-06', 'T1-S1-V01', 'preventive', 'crew-b', '2021-07-05 07:00'),
  wo('WO-07', 'T1-HPP', 'corrective', 'crew-a', '2021-07-12 05:00'),
  wo('WO-08', 'T1-S1-V01', 'preventive', 'crew-b', '2021-10-04 06:00'),
  wo('WO-09', 'T1-S1-V01', 'inspection', 'crew-a', '2021-10-11 07:00'),
  wo('WO-10', 'T1-S1-V01', 'preventive', 'crew-b', '2021-11-08 07:00'),
].join('\n');

/**
 * Job durations (first step start → last step end): 4.5, 12, 2.5, 30, 6, 3, 16, 7.5, 4, 8 h — the
 * invented job set of reference/checks.json ("quantile.definitions").
 */
const jobSteps = [
  'wo_number,step,name,started_at,completed_at,guided,technician',
  'WO-01,1,Isolate and depressurize,2021-01-04 08:00,2021-01-04 10:00,yes,tech-01', // two steps with a gap:
  'WO-01,2,Swap elements,2021-01-04 11:00,2021-01-04 12:30,no,tech-01', //         08:00 → 12:30 = 4.5 h, guided
  'WO-02,1,Swap elements,2021-02-01 06:00,2021-02-01 18:00,no,tech-02', // 12 h
  'WO-03,1,Swap elements,2021-04-05 08:00,2021-04-05 10:30,yes,tech-03', // 2.5 h
  // 31 h on the wall clock, but summer time starts at 02:00 on 28 March 2021: 30 h of real time.
  'WO-04,1,Replace seal,2021-03-27 12:00,2021-03-28 19:00,no,tech-04',
  'WO-05,1,Swap elements,2021-05-03 08:00,2021-05-03 14:00,yes,tech-01', // 6 h
  'WO-06,1,Swap elements,2021-07-05 08:00,2021-07-05 11:00,true,tech-03', // 3 h
  'WO-07,1,Repair pump,2021-07-12 06:00,2021-07-12 22:00,0,tech-04', // 16 h
  'WO-08,1,Swap elements,2021-10-04 07:00,2021-10-04 14:30,1,tech-02', // 7.5 h
  'WO-09,1,Probe vessel,2021-10-11 08:00,2021-10-11 12:00,no,tech-01', // 4 h
  'WO-10,1,Swap elements,2021-11-08 08:00,2021-11-08 16:00,yes,tech-02', // 8 h
].join('\n');

beforeAll(async () => {
  t = await createTestDatabase();
  expect((await importText(t.db, 'assets', assets, { site: 'TTC', tz: 'Europe/Berlin' })).status).toBe('completed');
  const w = await importText(t.db, 'work-orders', workOrders, { site: 'TTC' });
  expect(w.rejects).toEqual([]);
  const s = await importText(t.db, 'job-steps', jobSteps, { site: 'TTC' });
  expect(s.rejects).toEqual([]);
  expect((await importText(t.db, 'assets', assets, { site: 'NOJOBS', tz: 'UTC', fileName: 'nojobs.csv' })).status).toBe('completed');
  // OPEN: a work order still open, whose steps were logged two days after it was reported.
  expect((await importText(t.db, 'assets', assets, { site: 'OPEN', tz: 'UTC', fileName: 'open.csv' })).status).toBe('completed');
  const header = workOrders.split('\n')[0];
  await importText(t.db, 'work-orders', `${header}\nO-1,T1-S1-V01,corrective,high,in_progress,,Open job,2021-01-01 08:00,2021-01-01 09:00,,,,3,0,0,crew-c`, { site: 'OPEN' });
  const open = await importText(t.db, 'job-steps', 'wo_number,step,name,started_at,completed_at,guided,technician\nO-1,1,Swap elements,2021-01-03 08:00,2021-01-03 10:00,yes,tech-9', { site: 'OPEN', fileName: 'open-steps.csv' });
  expect(open.rejects).toEqual([]);
});
afterAll(() => t.close());

async function ttc(query: Record<string, unknown>): Promise<TimeToCompleteAnswer> {
  const answer = await getTimeToComplete(t.db, timeToCompleteQuerySchema.parse(query));
  beforeFreshnessSchema(timeToCompleteReportSchema).parse(answer);
  return answer;
}

const figures = (r: TimeToCompleteAnswer) => Object.fromEntries(r.groups.map((g) => [g.key, [g.n, g.meanHours, g.medianHours, g.p90Hours]]));
const close = (values: (number | null)[]) => values.map((v) => (v === null ? null : expect.closeTo(v, 9)));

describe('time to complete', () => {
  it('measures each job from its first step start to its last step end in real elapsed hours', async () => {
    const r = await ttc({ site: 'TTC' });
    expect(r.jobs.map((j) => [j.woNumber, j.hours, j.guided, j.steps])).toEqual([
      ['WO-01', 4.5, true, 2],
      ['WO-02', 12, false, 1],
      ['WO-04', 30, false, 1],
      ['WO-03', 2.5, true, 1],
      ['WO-05', 6, true, 1],
      ['WO-06', 3, true, 1],
      ['WO-07', 16, false, 1],
      ['WO-08', 7.5, true, 1],
      ['WO-09', 4, false, 1],
      ['WO-10', 8, true, 1],
    ]);
    expect(r.jobs[0]).toMatchObject({ startedAt: '2021-01-04T07:00:00.000Z', completedAt: '2021-01-04T11:30:00.000Z', crew: 'crew-a' });
  });

  it('gives n, mean, median and p90 by type 7 (Hyndman & Fan 1996), all worked by hand', async () => {
    const r = await ttc({ site: 'TTC' });
    expect(r.quantileMethod).toBe(quantileMethodType7);
    const f = figures(r);
    // reference/checks.json "quantile.definitions": type 7 on these ten durations — median 6.75, p90 17.4
    // (numpy.quantile and simple-statistics ≥ 7.9.0 agree); mean 9.35, sample sd 8.389974176.
    expect(f['all']).toEqual(close([10, 9.35, 6.75, 17.4]));
    expect(r.groups[0]!.sdHours).toBeCloseTo(8.389974176, 8);
    // guided: 2.5 3 4.5 6 7.5 8 → mean 31.5/6; h = 5·0.5 = 2.5 → 4.5 + 0.5·1.5 = 5.25; h = 4.5 → 7.5 + 0.5·0.5 = 7.75.
    expect(f['guided=yes']).toEqual(close([6, 5.25, 5.25, 7.75]));
    // unguided: 4 12 16 30 → mean 15.5; h = 1.5 → 14; h = 2.7 → 16 + 0.7·14 = 25.8.
    expect(f['guided=no']).toEqual(close([4, 15.5, 14, 25.8]));
    // crew-a: 4 4.5 6 12 16 → mean 8.5; median 6; h = 3.6 → 12 + 0.6·4 = 14.4.
    expect(f['crew=crew-a']).toEqual(close([5, 8.5, 6, 14.4]));
    // crew-b: 2.5 3 7.5 8 30 → mean 10.2; median 7.5; h = 3.6 → 8 + 0.6·22 = 21.2.
    expect(f['crew=crew-b']).toEqual(close([5, 10.2, 7.5, 21.2]));
    // element replacement (vessel, not inspection): 2.5 3 4.5 6 7.5 8 12 → mean 43.5/7; median 6; h = 5.4 → 8 + 0.4·4 = 9.6.
    expect(f['procedure=element replacement']).toEqual(close([7, 43.5 / 7, 6, 9.6]));
    // pump corrective: 16 30 → mean 23, median 23, h = 0.9 → 16 + 0.9·14 = 28.6.
    expect(f['procedure=pump corrective']).toEqual(close([2, 23, 23, 28.6]));
    expect(f['procedure=vessel inspection']).toEqual(close([1, 4, 4, 4]));
  });

  it('draws the learning curve by calendar quarter in the site zone', async () => {
    const r = await ttc({ site: 'TTC' });
    const q = r.learningCurve!.byPeriod;
    // Q1: 4.5 12 30; Q2: 2.5 6; Q3: 3 16; Q4: 7.5 4 8 (by first step start).
    expect(q.map((b) => [b.label, b.n, b.medianHours, b.meanHours])).toEqual([
      ['2021-Q1', 3, 12, 15.5],
      ['2021-Q2', 2, 4.25, 4.25],
      ['2021-Q3', 2, 9.5, 9.5],
      ['2021-Q4', 3, 7.5, expect.closeTo(6.5, 12)],
    ]);
    expect([q[0]!.start, q[0]!.end]).toEqual(['2020-12-31T23:00:00.000Z', '2021-03-31T22:00:00.000Z']);
    expect(r.learningCurve!.bySequence.map((b) => [b.label, b.n])).toEqual([['jobs 1–10', 10]]);
  });

  it('keeps a job whole by its first step start: WO-04 began on 27 March, so a window from 28 March leaves it out', async () => {
    const r = await ttc({ site: 'TTC', from: '2021-03-28', to: '2021-07-01' });
    expect(r.jobs.map((j) => j.woNumber)).toEqual(['WO-03', 'WO-05']);
    expect(r.provenance!.workOrders).toEqual(['WO-03', 'WO-05']);
    expect(r.provenance!.windows[0]).toMatchObject({ from: '2021-03-27T23:00:00.000Z', to: '2021-06-30T22:00:00.000Z' });
  });

  it('the default window takes in steps logged after every other date of the site (an open work order)', async () => {
    const r = await ttc({ site: 'OPEN' });
    expect(r.jobs.map((j) => [j.woNumber, j.hours])).toEqual([['O-1', 2]]);
    expect([r.from, r.to]).toEqual(['2021-01-01T08:00:00.000Z', '2021-01-03T08:00:01.000Z']);
  });

  it('scopes to the work orders of an asset and what is below it', async () => {
    const r = await ttc({ site: 'TTC', asset: 'T1-HPP' });
    expect(r.jobs.map((j) => j.woNumber)).toEqual(['WO-04', 'WO-07']);
  });

  it('groupBy keeps the all group and one kind of group', async () => {
    expect((await ttc({ site: 'TTC', groupBy: 'guided' })).groups.map((g) => g.key)).toEqual(['all', 'guided=yes', 'guided=no']);
    expect((await ttc({ site: 'TTC', groupBy: 'crew' })).groups.map((g) => g.key)).toEqual(['all', 'crew=crew-a', 'crew=crew-b']);
    expect((await ttc({ site: 'TTC', groupBy: 'all' })).groups.map((g) => g.key)).toEqual(['all']);
  });

  it('carries the cautions for vessel work and the procedure rule', async () => {
    const r = await ttc({ site: 'TTC' });
    expect(r.cautions).toEqual(vesselWorkCautions);
    expect(r.procedureDefinition).toMatch(/element replacement/);
  });

  it('no jobs, or an empty window: n = 0 groups with null figures and the reason', async () => {
    for (const r of [await ttc({ site: 'NOJOBS' }), await ttc({ site: 'TTC', from: '2025-01-01', to: '2025-02-01' })]) {
      expect(r.jobs).toEqual([]);
      expect(r.groups).toEqual([
        expect.objectContaining({ key: 'all', n: 0, meanHours: null, medianHours: null, p90Hours: null, reason: 'no-jobs' }),
        expect.objectContaining({ key: 'guided=yes', n: 0, reason: 'no-jobs' }),
        expect.objectContaining({ key: 'guided=no', n: 0, reason: 'no-jobs' }),
      ]);
      expect(r.learningCurve).toEqual({ byPeriod: [], bySequence: [] });
    }
  });
});

describe('job spans follow the step log', () => {
  it('a re-imported step with new times changes its job, and a full refresh rebuilds every span from the steps', async () => {
    const hoursOf = async (wo: string) => (await ttc({ site: 'OPEN' })).jobs!.find((j) => j.woNumber === wo)!.hours;
    expect(await hoursOf('O-1')).toBeCloseTo(2, 9);
    // A second step two hours after the first ends: the job now runs 08:00 → 14:00.
    const step2 = 'wo_number,step,name,started_at,completed_at,guided,technician\nO-1,2,Close vessel,2021-01-03 12:00,2021-01-03 14:00,no,tech-9';
    expect((await importText(t.db, 'job-steps', step2, { site: 'OPEN', fileName: 'open-steps-2.csv' })).rejects).toEqual([]);
    expect(await hoursOf('O-1')).toBeCloseTo(6, 9);
    const before = await ttc({ site: 'TTC' });
    await t.db.$client.query('delete from job_spans');
    expect((await ttc({ site: 'TTC' })).jobs).toEqual([]);
    const result = await refresh(t.db, { full: true });
    expect(result.jobSpansRebuilt).toBe(10 + 1); // TTC’s ten jobs and OPEN’s one
    expect(figures(await ttc({ site: 'TTC' }))).toEqual(figures(before));
  });
});
