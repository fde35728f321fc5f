// A small invented plant for the reliability, downtime and performance tests, loaded through the importers
// and `osmia refresh`. Hourly samples from 2025-01-01T00:00Z to 2025-01-11T00:00Z (241 per tag), site in UTC.
//
// Tree: TR1 (train, 100 m³/h rated) → TR1-S1, TR1-S2 (stages, each one vessel) and TR1-HPP (pump);
//       TR2 (train, 50 m³/h, no run-status tag) → TR2-S1 (stage with one tag only) and TR2-P1 (pump, own run tag).
// Stops (run status 0):  TR1.RUN    Jan 3 06:00–18:00 (12 h), Jan 7 00:00–08:00 (8 h)
//                        TR2-P1.RUN Jan 5 00:00–10:00 (10 h), from Jan 10 20:00 to the end of the data (4 h)
// Stage TR1-S1 runs at constant conditions; TR1-S2's permeate flow drops from 10 to 8.8 m³/h (−12 %) from
// Jan 6 at the same feed flow, pressures, conductivities and temperature; a clean-in-place ends Jan 8 12:00.
import { expect } from 'vitest';
import type { Db } from '#server/db/client.ts';
import { refresh } from '#server/jobs/refresh.ts';
import { importText } from '../importers/helpers.ts';

export const SITE = 'OPS';
const H = 3_600_000;
export const dataStart = Date.UTC(2025, 0, 1);
export const dataHours = 240;
export const at = (iso: string) => new Date(iso);

export const assetsCsv = [
  'code,name,kind,parent,rated_permeate_m3h,element_capacity,rack_row,rack_col',
  'TR1,Train 1,train,,100,,,',
  'TR1-S1,Train 1 stage 1,stage,TR1,,,,',
  'TR1-S1-V01,Vessel 1-1,vessel,TR1-S1,,6,1,1',
  'TR1-S2,Train 1 stage 2,stage,TR1,,,,',
  'TR1-S2-V01,Vessel 2-1,vessel,TR1-S2,,6,2,1',
  'TR1-HPP,High-pressure pump 1,pump,TR1,,,,',
  'TR2,Train 2,train,,50,,,',
  'TR2-S1,Train 2 stage 1,stage,TR2,,,,',
  'TR2-P1,Feed pump 2,pump,TR2,,,,',
].join('\n');

/** Constant operating point of both TR1 stages (canonical units). */
export const stageBase = { pf: 12, pc: 11, pp: 0.5, qf: 40, qp: 10, qc: 30, cf: 1000, cp: 10, tempC: 20 };

const stageQuantities = [
  ['PF', 'feed_pressure', 'bar', 'pf'],
  ['PC', 'concentrate_pressure', 'bar', 'pc'],
  ['PP', 'permeate_pressure', 'bar', 'pp'],
  ['QF', 'feed_flow', 'm3/h', 'qf'],
  ['QP', 'permeate_flow', 'm3/h', 'qp'],
  ['CF', 'feed_conductivity', 'uS/cm', 'cf'],
  ['CP', 'permeate_conductivity', 'uS/cm', 'cp'],
  ['TF', 'feed_temperature', 'degC', 'tempC'],
] as const;

export const tagsCsv = [
  'tag,asset,quantity,unit',
  'TR1.RUN,TR1,run_status,',
  'TR2-P1.RUN,TR2-P1,run_status,',
  ...stageQuantities.map(([t, q, u]) => `S1.${t},TR1-S1,${q},${u}`),
  'S1.QC,TR1-S1,concentrate_flow,m3/h',
  ...stageQuantities.map(([t, q, u]) => `S2.${t},TR1-S2,${q},${u}`),
  'T2S1.PF,TR2-S1,feed_pressure,bar',
].join('\n');

const inHours = (ms: number, fromIso: string, toIso: string) => ms >= Date.parse(fromIso) && ms < Date.parse(toIso);

function tr1Running(ms: number): boolean {
  return !inHours(ms, '2025-01-03T06:00:00Z', '2025-01-03T18:00:00Z') && !inHours(ms, '2025-01-07T00:00:00Z', '2025-01-07T08:00:00Z');
}

function tr2pRunning(ms: number): boolean {
  return !inHours(ms, '2025-01-05T00:00:00Z', '2025-01-05T10:00:00Z') && ms < Date.parse('2025-01-10T20:00:00Z');
}

export function historianCsv(): string {
  const lines = ['timestamp,tag,value,quality'];
  for (let i = 0; i <= dataHours; i++) {
    const ms = dataStart + i * H;
    const ts = new Date(ms).toISOString();
    const running = tr1Running(ms);
    lines.push(`${ts},TR1.RUN,${running ? 1 : 0},good`, `${ts},TR2-P1.RUN,${tr2pRunning(ms) ? 1 : 0},good`, `${ts},T2S1.PF,10,good`);
    // While the train is stopped the process readings collapse: only running hours may enter the means.
    for (const [prefix, drop] of [['S1', false], ['S2', ms >= Date.parse('2025-01-06T00:00:00Z')]] as const) {
      const values = running ? { ...stageBase, qp: drop ? 8.8 : stageBase.qp } : { pf: 0.2, pc: 0.2, pp: 0, qf: 0, qp: 0, qc: 0, cf: 1000, cp: 900, tempC: 20 };
      for (const [t, , , key] of stageQuantities) lines.push(`${ts},${prefix}.${t},${values[key]},good`);
      if (prefix === 'S1') lines.push(`${ts},S1.QC,${values.qc},good`);
    }
  }
  // A bad-quality spike: it must not reach the hourly means.
  lines.push('2025-01-02T12:30:00Z,S1.QP,999,bad');
  return lines.join('\n') + '\n';
}

export const workOrdersCsv = [
  'wo_number,asset,type,priority,status,failure_code,description,reported_at,started_at,completed_at,out_of_service_from,out_of_service_to,labour_hours,labour_cost,parts_cost,crew',
  'WO-1,TR1-HPP,corrective,high,closed,SEAL-LEAK,Seal leak on the high-pressure pump,2025-01-03T06:00:00Z,2025-01-03T07:00:00Z,2025-01-03T15:00:00Z,2025-01-03T06:00:00Z,2025-01-03T18:00:00Z,8,400,120,Crew A',
  'WO-2,TR1-HPP,corrective,medium,closed,BEARING,Noisy bearing,2025-01-07T00:00:00Z,2025-01-07T02:00:00Z,2025-01-07T06:00:00Z,,,4,200,50,Crew A',
  'WO-3,TR1-HPP,corrective,low,cancelled,SEAL-LEAK,Duplicate report of WO-1,2025-01-03T06:30:00Z,,,,,0,0,0,',
  'WO-4,TR1-S1,preventive,medium,closed,,Stage 1 instrument calibration,2025-01-07T00:00:00Z,2025-01-07T00:00:00Z,2025-01-07T08:00:00Z,2025-01-07T00:00:00Z,2025-01-07T08:00:00Z,6,300,0,Crew B',
  'WO-5,TR1-HPP,corrective,low,open,,Oil top-up,2025-01-08T00:00:00Z,,,,,0,0,0,',
  'WO-6,TR2-P1,corrective,high,closed,MOTOR,Motor trip,2025-01-05T00:00:00Z,2025-01-05T01:00:00Z,2025-01-05T09:00:00Z,2025-01-05T00:00:00Z,2025-01-05T10:00:00Z,8,400,300,Crew B',
  'WO-7,TR2,preventive,medium,closed,,Train 2 valve service,2025-01-05T08:00:00Z,2025-01-05T08:00:00Z,2025-01-05T14:00:00Z,2025-01-05T08:00:00Z,2025-01-05T14:00:00Z,6,300,0,Crew B',
  'WO-8,TR1-S2,preventive,medium,closed,,Clean-in-place of stage 2 (high then low pH),2025-01-08T06:00:00Z,2025-01-08T06:00:00Z,2025-01-08T12:00:00Z,2025-01-08T06:00:00Z,2025-01-08T12:00:00Z,6,300,200,Crew A',
  'WO-9,TR1-HPP,corrective,high,closed,SEAL-LEAK,Earlier seal leak,2024-12-20T00:00:00Z,2024-12-20T01:00:00Z,2024-12-20T05:00:00Z,2024-12-20T00:00:00Z,2024-12-20T06:00:00Z,4,200,100,Crew A',
].join('\n');

// TR1-S1-V01: initial fill before the data, element 1 replaced on Jan 4 10:00. TR1-S2-V01: initial fill on the
// first day of data (02:00), which must not count as an element change.
export const elementsCsv = [
  'serial,model,vessel,position,installed_at,removed_at,removal_reason',
  ...[1, 2, 3, 4, 5, 6].map((p) => `A-00${p},MX-8040,TR1-S1-V01,${p},2024-12-31T12:00:00Z,${p === 1 ? '2025-01-04T10:00:00Z,failed' : ','}`),
  'A-007,MX-8040,TR1-S1-V01,1,2025-01-04T10:00:00Z,,',
  ...[1, 2, 3, 4, 5, 6].map((p) => `B-00${p},MX-8040,TR1-S2-V01,${p},2025-01-01T02:00:00Z,,`),
].join('\n');

/** Loads the plant through the importers and rebuilds the derived tables. */
export async function seedOpsPlant(db: Db): Promise<void> {
  const steps = [
    await importText(db, 'assets', assetsCsv, { site: SITE, tz: 'UTC' }),
    await importText(db, 'tags', tagsCsv, { site: SITE }),
    await importText(db, 'historian', historianCsv(), { site: SITE }),
    await importText(db, 'work-orders', workOrdersCsv, { site: SITE }),
    await importText(db, 'elements', elementsCsv, { site: SITE }),
  ];
  for (const s of steps) expect(s, JSON.stringify(s.rejects)).toMatchObject({ status: 'completed', rowsRejected: 0 });
  await refresh(db);
}

/** A second site with assets only: no data at all. */
export async function seedEmptySite(db: Db): Promise<void> {
  const r = await importText(db, 'assets', 'code,name,kind,parent,rated_permeate_m3h,element_capacity,rack_row,rack_col\nE1,Empty train,train,,10,,,\n', { site: 'EMPTY', tz: 'UTC' });
  expect(r.status).toBe('completed');
}
