import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importRecordSchema } from '#shared/schemas/imports.ts';
import { createTestDatabase, type TestDatabase } from '../../setup/db.ts';
import { counts, fileWith, importText, seedPlant } from './helpers.ts';
import { runImport } from '#server/importers/run.ts';

let t: TestDatabase;
beforeAll(async () => {
  t = await createTestDatabase();
  await seedPlant(t.db);
});
afterAll(() => t.close());

const wo = (rows: string[]) =>
  [
    'wo_number,asset,type,priority,status,failure_code,description,reported_at,started_at,completed_at,out_of_service_from,out_of_service_to,labour_hours,labour_cost,parts_cost,crew',
    ...rows,
  ].join('\n');

describe('historian import', () => {
  it('converts units on import (psi → bar, gpm → m³/h, mS/cm → µS/cm, °F → °C) and reads OPC quality bytes', async () => {
    const rec = await importText(t.db, 'historian', [
      'timestamp,tag,value,quality',
      '2026-01-05T00:00:00Z,TR1.PF,100,good',
      '2026-01-05T00:00:00Z,TR1.QP,100,192',
      '2026-01-05T00:00:00Z,TR1.CF,2.5,0xC0',
      '2026-01-05T00:00:00Z,TR1.TF,77,uncertain',
      '2026-01-05T00:00:00Z,TR1.RUN,running,64',
      '2026-01-05T00:05:00Z,TR1.RUN,0,0',
    ].join('\n'));
    expect(rec.status).toBe('completed');
    expect(rec.rowsInserted).toBe(6);
    const { rows } = await t.db.$client.query(`select t.name, s.value, s.quality from samples s join tags t on t.id = s.tag_id where s.ts = '2026-01-05T00:00:00Z' order by t.name`);
    const byTag = Object.fromEntries(rows.map((r) => [r.name, r]));
    // 1 psi = 0.0689475729 bar (NIST SP 811); 1 US gpm = 0.2271247 m³/h; (77 − 32) × 5/9 = 25 °C.
    expect(byTag['TR1.PF'].value).toBeCloseTo(6.89475729, 8);
    expect(byTag['TR1.QP'].value).toBeCloseTo(22.71247, 4);
    expect(byTag['TR1.CF'].value).toBe(2500);
    expect(byTag['TR1.TF'].value).toBeCloseTo(25, 10);
    expect(byTag['TR1.TF'].quality).toBe(64);
    expect(byTag['TR1.RUN'].value).toBe(1);
  });

  it('reads the wide layout and skips empty cells', async () => {
    const rec = await importText(t.db, 'historian', ['timestamp,TR1.PF,TR1.PP', '2026-01-06T00:00:00Z,10,1', '2026-01-06T00:05:00Z,,1.1'].join('\n'));
    expect(rec.status).toBe('completed');
    expect(rec.notes.layout).toBe('wide');
    expect(rec.rowsInserted).toBe(3);
  });

  it('reads semicolon files with decimal commas and a BOM', async () => {
    const rec = await importText(t.db, 'historian', '\uFEFFtimestamp;tag;value;quality\n2026-01-07T00:00:00+01:00;TR1.PP;1,25;good\n');
    expect(rec.status).toBe('completed');
    const { rows } = await t.db.$client.query(`select value from samples where ts = '2026-01-06T23:00:00Z'`);
    expect(rows[0].value).toBe(1.25);
  });

  it('reads naive local times in the site zone, moving a spring-forward gap and resolving the repeated autumn hour', async () => {
    // Europe/Berlin: 2026-03-29 02:00 → 03:00 (CET → CEST); 2026-10-25 03:00 → 02:00 (common practice: EU summer time rules).
    const rec = await importText(t.db, 'historian', [
      'timestamp,tag,value',
      '2026-03-29 01:30,TR1.PP,1',
      '2026-03-29 02:30,TR1.PP,2',
      '2026-03-29 03:45,TR1.PP,3',
      '2026-10-25 02:30,TR1.PP,4',
      '2026-10-25 02:45,TR1.PP,5',
      '2026-10-25 02:30,TR1.PP,6',
      '2026-10-25 03:30,TR1.PP,7',
    ].join('\n'));
    expect(rec.status).toBe('completed');
    expect(rec.notes.dstGapShifted).toBe(1);
    expect(rec.notes.dstRepeatResolved).toBe(3);
    const { rows } = await t.db.$client.query(`select value, ts from samples s join tags t on t.id = s.tag_id where t.name = 'TR1.PP' and value between 1 and 7 and ts > '2026-03-01' order by ts`);
    expect(rows.map((r) => [r.value, r.ts.toISOString()])).toEqual([
      [1, '2026-03-29T00:30:00.000Z'],
      [2, '2026-03-29T01:30:00.000Z'], // 02:30 does not exist: moved forward to 03:30 CEST
      [3, '2026-03-29T01:45:00.000Z'],
      [4, '2026-10-25T00:30:00.000Z'], // first 02:30 (CEST)
      [5, '2026-10-25T00:45:00.000Z'],
      [6, '2026-10-25T01:30:00.000Z'], // second 02:30 (CET)
      [7, '2026-10-25T02:30:00.000Z'],
    ]);
  });

  it('does not duplicate samples from overlapping exports, nor from a file repeating itself', async () => {
    const a = ['timestamp,tag,value', '2026-02-01T00:00:00Z,TR1.PP,1', '2026-02-01T00:05:00Z,TR1.PP,2', '2026-02-01T00:10:00Z,TR1.PP,3'];
    const b = ['timestamp,tag,value', '2026-02-01T00:05:00Z,TR1.PP,20', '2026-02-01T00:10:00Z,TR1.PP,30', '2026-02-01T00:15:00Z,TR1.PP,4', '2026-02-01T00:15:00Z,TR1.PP,4'];
    const ra = await importText(t.db, 'historian', a.join('\n'));
    const rb = await importText(t.db, 'historian', b.join('\n'));
    expect([ra.rowsInserted, ra.rowsUnchanged]).toEqual([3, 0]);
    expect([rb.rowsInserted, rb.rowsUnchanged]).toEqual([1, 3]);
    const { rows } = await t.db.$client.query(`select value from samples where ts >= '2026-02-01' and ts < '2026-02-02' order by ts`);
    expect(rows.map((r) => r.value)).toEqual([1, 2, 3, 4]);
  });

  it('records a second import of the same file as a duplicate that changes nothing', async () => {
    const content = 'timestamp,tag,value\n2026-02-02T00:00:00Z,TR1.PP,9\n';
    const first = await importText(t.db, 'historian', content);
    const before = await counts(t.db);
    const second = await importText(t.db, 'historian', content);
    expect(first.status).toBe('completed');
    expect(second.status).toBe('duplicate');
    expect(await counts(t.db)).toEqual(before);
    expect(importRecordSchema.safeParse(second).success).toBe(true);
  });

  it('--strict refuses the whole file when one row is bad; without it the good rows go in', async () => {
    const content = ['timestamp,tag,value', '2026-02-03T00:00:00Z,TR1.PP,1', '2026-02-03T00:05:00Z,TR1.PP,abc', '2026-02-03T00:10:00Z,TR1.PP,3'].join('\n');
    const before = await counts(t.db);
    const strict = await importText(t.db, 'historian', content, { strict: true });
    expect(strict.status).toBe('failed');
    expect(strict.error).toMatch(/--strict/);
    expect(strict.rejects).toEqual([{ line: 3, reason: 'value "abc" is not a number' }]);
    expect(await counts(t.db)).toEqual(before);
    const lenient = await importText(t.db, 'historian', content);
    expect(lenient.status).toBe('partial');
    expect([lenient.rowsInserted, lenient.rowsRejected]).toEqual([2, 1]);
  });

  it('a dry run checks everything and keeps nothing', async () => {
    const before = await counts(t.db);
    const rec = await importText(t.db, 'historian', 'timestamp,tag,value\n2026-02-04T00:00:00Z,TR1.PP,1\n', { dryRun: true });
    expect(rec).toMatchObject({ status: 'completed', id: null, dryRun: true, rowsInserted: 1 });
    expect(await counts(t.db)).toEqual(before);
  });
});

describe('registers', () => {
  it('imports work orders, then a re-export with one status change updates only that one', async () => {
    const rows = [
      'WO-1,TR1-HPP,corrective,high,closed,SEAL-LEAK,Seal leak,2026-01-10 08:00,2026-01-10 09:00,2026-01-10 15:00,2026-01-10 08:30,2026-01-10 15:30,6,300,120,crew-a',
      'WO-2,TR1,preventive,,open,,Quarterly check,2026-01-11 08:00,,,,,0,0,0,',
    ];
    const first = await importText(t.db, 'work-orders', wo(rows));
    expect(first).toMatchObject({ status: 'completed', rowsInserted: 2 });
    const second = await importText(t.db, 'work-orders', wo([rows[0], rows[1].replace(',open,', ',cancelled,')]));
    expect(second).toMatchObject({ status: 'completed', rowsInserted: 0, rowsUpdated: 1, rowsUnchanged: 1 });
  });

  it('reads work orders from an XLSX workbook (first sheet), dates as local time', async () => {
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('export');
    ws.addRow(['wo_number', 'asset', 'type', 'priority', 'status', 'failure_code', 'description', 'reported_at', 'started_at', 'completed_at', 'out_of_service_from', 'out_of_service_to', 'labour_hours', 'labour_cost', 'parts_cost', 'crew']);
    ws.addRow(['WO-X1', 'TR1-HPP', 'corrective', 'medium', 'closed', 'BRG-WEAR', '=HYPERLINK("x")', new Date(Date.UTC(2026, 0, 12, 8)), new Date(Date.UTC(2026, 0, 12, 9)), new Date(Date.UTC(2026, 0, 12, 11)), null, null, 2, 100, 0, 'crew-b']);
    wb.addWorksheet('ignored').addRow(['nothing']);
    const path = fileWith(Buffer.from(await wb.xlsx.writeBuffer()), 'orders.xlsx');
    const rec = await runImport(t.db, { kind: 'work-orders', path, actor: 'test' });
    expect(rec).toMatchObject({ status: 'completed', rowsInserted: 1 });
    expect(rec.notes.format).toBe('xlsx');
    expect(rec.notes.formulaLikeText).toBe(1);
    const { rows } = await t.db.$client.query(`select reported_at, description from work_orders where wo_number = 'WO-X1'`);
    expect(rows[0].reported_at.toISOString()).toBe('2026-01-12T07:00:00.000Z'); // 08:00 in Berlin (CET)
    expect(rows[0].description).toBe('=HYPERLINK("x")');
  });

  it('imports an element register and refuses two elements in one position at once', async () => {
    const rec = await importText(t.db, 'elements', [
      'serial,model,vessel,position,installed_at,removed_at,removal_reason',
      'E-1,MX-400,TR1-S1-V01,1,2024-01-01,2025-06-01,failed',
      'E-2,MX-400,TR1-S1-V01,1,2025-06-01,,',
      'E-3,MX-400,TR1-S1-V01,1,2025-07-01,,in service',
    ].join('\n'));
    expect(rec.status).toBe('partial');
    expect(rec.rejects).toEqual([{ line: 4, reason: 'position 1 of vessel TR1-S1-V01 already holds element E-2 then (line 3)' }]);
  });

  it('imports job steps of known work orders', async () => {
    const rec = await importText(t.db, 'job-steps', [
      'wo_number,step,name,started_at,completed_at,guided,technician',
      'WO-1,1,Isolate and depressurize,2026-01-10 09:00,2026-01-10 09:30,yes,tech-01',
      'WO-1,2,Replace seal,2026-01-10 09:30,2026-01-10 14:00,no,tech-01',
    ].join('\n'));
    expect(rec).toMatchObject({ status: 'completed', rowsInserted: 2 });
  });
});
