// Malformed files, each with the error or reject a person would expect, and the database unchanged
// where the whole file is refused. Line numbers are physical lines, the header being line 1.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ImportKind } from '#shared/schemas/enums.ts';
import { maxLineBytes, openSource } from '#server/importers/source.ts';
import { createTestDatabase, type TestDatabase } from '../../setup/db.ts';
import { counts, fileWith, importText, seedPlant } from './helpers.ts';

let t: TestDatabase;
beforeAll(async () => {
  t = await createTestDatabase();
  await seedPlant(t.db);
  await importText(t.db, 'work-orders', [
    'wo_number,asset,type,priority,status,failure_code,description,reported_at,started_at,completed_at,out_of_service_from,out_of_service_to,labour_hours,labour_cost,parts_cost,crew',
    'WO-9,TR1-S1-V01,corrective,high,closed,ELEM-BREACH,Swap,2026-01-10 08:00,2026-01-10 09:00,2026-01-10 15:00,,,6,300,120,crew-a',
  ].join('\n'));
});
afterAll(() => t.close());

const H = 'timestamp,tag,value,quality';
const WO = 'wo_number,asset,type,priority,status,failure_code,description,reported_at,started_at,completed_at,out_of_service_from,out_of_service_to,labour_hours,labour_cost,parts_cost,crew';
const EL = 'serial,model,vessel,position,installed_at,removed_at,removal_reason';
const JS = 'wo_number,step,name,started_at,completed_at,guided,technician';

interface FileCase {
  name: string;
  kind: ImportKind;
  content: string | Buffer;
  error: RegExp;
}

/** Cases where the whole file is refused: status failed, a message, nothing written. */
const refused: FileCase[] = [
  { name: 'empty file', kind: 'historian', content: '', error: /empty/ },
  { name: 'binary garbage', kind: 'historian', content: Buffer.from([0x00, 0xff, 0x13, 0x37, 0x00, 0x42, 0x99, 0x00]), error: /not text/ },
  { name: 'XLSX that is not a zip (PK header, then garbage)', kind: 'work-orders', content: Buffer.concat([Buffer.from('PK\x03\x04'), Buffer.alloc(200, 7)]), error: /not a readable XLSX/ },
  { name: 'duplicate header', kind: 'historian', content: `timestamp,tag,value,value\n2026-01-01T00:00:00Z,TR1.PP,1,2\n`, error: /"value" appears twice/ },
  { name: 'header not starting with timestamp', kind: 'historian', content: `time,tag,value\n2026-01-01T00:00:00Z,TR1.PP,1\n`, error: /must start with "timestamp"/ },
  { name: 'wrong delimiter (pipes)', kind: 'work-orders', content: `${WO.replaceAll(',', '|')}\nWO-1|TR1|corrective\n`, error: /Missing columns.*delimiter/ },
  { name: 'missing required column', kind: 'elements', content: `serial,model,vessel,installed_at\nE-1,M,TR1-S1-V01,2026-01-01\n`, error: /Missing column: position/ },
  { name: 'unknown tag column in the wide layout', kind: 'historian', content: `timestamp,TR1.PP,NOPE.TAG\n2026-01-01T00:00:00Z,1,2\n`, error: /Unknown tag column: NOPE\.TAG/ },
  { name: 'only a timestamp column', kind: 'historian', content: `timestamp\n2026-01-01T00:00:00Z\n`, error: /only a timestamp column/ },
  { name: 'unknown site', kind: 'tags', content: `tag,asset,quantity,unit\nX,TR1,run_status,\n`, error: /Site "NOWHERE" does not exist/ },
  { name: 'a line longer than 1 MiB', kind: 'historian', content: `${H}\n2026-05-01T00:00:00Z,TR1.PP,1,good\n2026-05-01T00:05:00Z,TR1.PP,${'9'.repeat(3 << 20)},good\n`, error: /^Line 3 is longer than 1 MiB/ },
  { name: 'a header longer than 1 MiB', kind: 'work-orders', content: `${'h,'.repeat(1 << 20)}\nWO-1\n`, error: /^Line 1 is longer than 1 MiB/ },
  { name: 'a long line after CR line ends is numbered by them', kind: 'historian', content: `${H}\r2026-05-02T00:00:00Z,TR1.PP,1,good\r\n${'x'.repeat(2 << 20)}\n`, error: /^Line 3 is longer than 1 MiB/ },
];

/** Cases where the bad rows are rejected with line and reason, and the good rows go in. */
interface RowCase {
  name: string;
  kind: ImportKind;
  content: string;
  rejects: { line: number; reason: RegExp }[];
  inserted: number;
}

const rejected: RowCase[] = [
  { name: 'truncated last line', kind: 'historian', content: `${H}\n2026-03-01T00:00:00Z,TR1.PP,1,good\n2026-03-01T00:05:00Z,TR1.P`, rejects: [{ line: 3, reason: /expected 4 columns, found 2/ }], inserted: 1 },
  { name: 'wrong column count', kind: 'historian', content: `${H}\n2026-03-02T00:00:00Z,TR1.PP,1,good,extra\n2026-03-02T00:05:00Z,TR1.PP,2,good\n`, rejects: [{ line: 2, reason: /found 5/ }], inserted: 1 },
  { name: 'bad date', kind: 'historian', content: `${H}\n2026-02-30T00:00:00Z,TR1.PP,1,good\n2026-03-03T00:00:00Z,TR1.PP,1,good\n`, rejects: [{ line: 2, reason: /not a valid date/ }], inserted: 1 },
  { name: 'date in another format', kind: 'historian', content: `${H}\n03/04/2026 10:00,TR1.PP,1,good\n`, rejects: [{ line: 2, reason: /not an ISO 8601/ }], inserted: 0 },
  { name: 'non-numeric value', kind: 'historian', content: `${H}\n2026-03-05T00:00:00Z,TR1.PP,12.3.4,good\n2026-03-05T00:00:00Z,TR1.PF,N/A,good\n`, rejects: [{ line: 2, reason: /not a number/ }, { line: 3, reason: /not a number/ }], inserted: 0 },
  { name: 'unknown tag', kind: 'historian', content: `${H}\n2026-03-06T00:00:00Z,TR9.XX,1,good\n`, rejects: [{ line: 2, reason: /unknown tag "TR9\.XX"/ }], inserted: 0 },
  { name: 'unknown quality', kind: 'historian', content: `${H}\n2026-03-07T00:00:00Z,TR1.PP,1,excellent\n2026-03-07T00:00:00Z,TR1.PF,1,999\n`, rejects: [{ line: 2, reason: /unknown quality/ }, { line: 3, reason: /0–255/ }], inserted: 0 },
  { name: 'bad run status', kind: 'historian', content: `${H}\n2026-03-08T00:00:00Z,TR1.RUN,maybe,good\n`, rejects: [{ line: 2, reason: /run status/ }], inserted: 0 },
  { name: 'empty value', kind: 'historian', content: `${H}\n2026-03-09T00:00:00Z,TR1.PP,,good\n`, rejects: [{ line: 2, reason: /empty value/ }], inserted: 0 },
  { name: 'a quoted field spanning lines keeps later line numbers right', kind: 'work-orders', content: `${WO}\nWO-20,TR1,inspection,low,open,,"two\nlines",2026-03-01 08:00,,,,,,,,\nWO-21,TR1,inspection,urgent,open,,x,2026-03-01 08:00,,,,,,,,\n`, rejects: [{ line: 4, reason: /unknown priority/ }], inserted: 1 },
  { name: 'control characters in a register cell', kind: 'work-orders', content: `${WO}\nWO-40,TR1,inspection,low,open,,bell\u0007,2026-03-01 08:00,,,,,,,,\nWO-41,TR1,inspection,low,open,,"tab\tand\nline break",2026-03-01 08:00,,,,,,,,\n`, rejects: [{ line: 2, reason: /description.*control characters/ }], inserted: 1 },
  { name: 'a huge line', kind: 'work-orders', content: `${WO}\nWO-22,TR1,inspection,low,open,,${'x'.repeat(200_000)},2026-03-01 08:00,,,,,,,,\nWO-23,TR1,inspection,low,open,,ok,2026-03-01 08:00,,,,,,,,\n`, rejects: [{ line: 2, reason: /longer than/ }], inserted: 1 },
  { name: 'completed before started', kind: 'work-orders', content: `${WO}\nWO-24,TR1-HPP,corrective,high,closed,SEAL-LEAK,x,2026-03-01 08:00,2026-03-01 10:00,2026-03-01 09:00,,,1,1,1,crew-a\n`, rejects: [{ line: 2, reason: /before started_at/ }], inserted: 0 },
  { name: 'negative labour hours', kind: 'work-orders', content: `${WO}\nWO-25,TR1-HPP,corrective,high,open,SEAL-LEAK,x,2026-03-01 08:00,,,,,-2,0,0,\n`, rejects: [{ line: 2, reason: /labour_hours -2 is below 0/ }], inserted: 0 },
  { name: 'unknown enumeration values', kind: 'work-orders', content: `${WO}\nWO-26,TR1-HPP,repair,high,open,,x,2026-03-01 08:00,,,,,,,,\nWO-27,TR1-HPP,corrective,high,done,,x,2026-03-01 08:00,,,,,,,,\n`, rejects: [{ line: 2, reason: /unknown work-order type/ }, { line: 3, reason: /unknown status/ }], inserted: 0 },
  { name: 'unknown asset', kind: 'work-orders', content: `${WO}\nWO-28,TR7,corrective,high,open,,x,2026-03-01 08:00,,,,,,,,\n`, rejects: [{ line: 2, reason: /unknown asset "TR7"/ }], inserted: 0 },
  { name: 'duplicate work-order number in one file', kind: 'work-orders', content: `${WO}\nWO-29,TR1,inspection,low,open,,a,2026-03-01 08:00,,,,,,,,\nWO-29,TR1,inspection,low,open,,b,2026-03-01 08:00,,,,,,,,\n`, rejects: [{ line: 3, reason: /appears again \(first at line 2\)/ }], inserted: 1 },
  { name: 'out-of-service window ends before it starts', kind: 'work-orders', content: `${WO}\nWO-30,TR1,preventive,low,open,,x,2026-03-01 08:00,,,2026-03-02 08:00,2026-03-01 08:00,,,,\n`, rejects: [{ line: 2, reason: /negative duration/ }], inserted: 0 },
  { name: 'formula-looking text is kept as text, a formula in a number column is rejected', kind: 'work-orders', content: `${WO}\nWO-31,TR1,inspection,low,open,,=cmd|' /C calc'!A0,2026-03-01 08:00,,,,,=1+1,,,\nWO-32,TR1,inspection,low,open,,@SUM(A1),2026-03-01 08:00,,,,,,,,\n`, rejects: [{ line: 2, reason: /labour_hours "=1\+1" is not a number/ }], inserted: 1 },
  { name: 'element position beyond the vessel capacity', kind: 'elements', content: `${EL}\nE-10,MX-400,TR1-S1-V01,7,2025-01-01,,\n`, rejects: [{ line: 2, reason: /beyond vessel TR1-S1-V01's capacity of 6/ }], inserted: 0 },
  { name: 'removal before install', kind: 'elements', content: `${EL}\nE-11,MX-400,TR1-S1-V01,2,2025-01-01,2024-01-01,failed\n`, rejects: [{ line: 2, reason: /removal before install/ }], inserted: 0 },
  { name: 'element in an asset that is not a vessel', kind: 'elements', content: `${EL}\nE-12,MX-400,TR1-HPP,1,2025-01-01,,\n`, rejects: [{ line: 2, reason: /is a pump, not a pressure vessel/ }], inserted: 0 },
  { name: 'unknown removal reason', kind: 'elements', content: `${EL}\nE-13,MX-400,TR1-S1-V02,1,2024-01-01,2025-01-01,lost\n`, rejects: [{ line: 2, reason: /unknown removal_reason/ }], inserted: 0 },
  { name: 'job step of an unknown work order', kind: 'job-steps', content: `${JS}\nWO-404,1,Open vessel,2026-01-10 09:00,2026-01-10 10:00,yes,tech-02\n`, rejects: [{ line: 2, reason: /unknown work order "WO-404"/ }], inserted: 0 },
  { name: 'zero and negative step durations', kind: 'job-steps', content: `${JS}\nWO-9,1,Open vessel,2026-01-10 09:00,2026-01-10 09:00,yes,tech-02\nWO-9,2,Close vessel,2026-01-10 11:00,2026-01-10 10:00,yes,tech-02\n`, rejects: [{ line: 2, reason: /zero duration/ }, { line: 3, reason: /negative duration/ }], inserted: 0 },
  { name: 'guided is not a yes/no', kind: 'job-steps', content: `${JS}\nWO-9,3,Lubricate seals,2026-01-10 09:00,2026-01-10 09:20,sometimes,tech-02\n`, rejects: [{ line: 2, reason: /guided: "sometimes"/ }], inserted: 0 },
  { name: 'tag with a unit of the wrong kind', kind: 'tags', content: `tag,asset,quantity,unit\nTR1.BAD,TR1,feed_pressure,gpm\nTR1.BAD2,TR1,feed_flow,furlongs\n`, rejects: [{ line: 2, reason: /not a pressure unit/ }, { line: 3, reason: /unknown unit "furlongs"/ }], inserted: 0 },
  { name: 'asset with an unknown parent and a vessel without capacity', kind: 'assets', content: `code,name,kind,parent,rated_permeate_m3h,element_capacity,rack_row,rack_col\nTR1-S9,Stage 9,stage,TR9,,,,\nTR1-S1-V09,Vessel 9,vessel,TR1-S1,,,,\n`, rejects: [{ line: 2, reason: /parent "TR9" is not in this file/ }, { line: 3, reason: /needs an element_capacity/ }], inserted: 0 },
];

describe('refused files', () => {
  it.each(refused)('$name', async ({ kind, content, error }) => {
    const before = await counts(t.db);
    const rec = await importText(t.db, kind, content, kind === 'tags' ? { site: 'NOWHERE' } : {});
    expect(rec.status).toBe('failed');
    expect(rec.error).toMatch(error);
    expect(await counts(t.db)).toEqual(before);
  });
});

describe('rejected rows', () => {
  it.each(rejected)('$name', async ({ kind, content, rejects, inserted }) => {
    const rec = await importText(t.db, kind, content);
    expect(rec.rejects.map((r) => r.line)).toEqual(rejects.map((r) => r.line));
    rec.rejects.forEach((r, i) => expect(r.reason).toMatch(rejects[i].reason));
    expect(rec.rowsInserted).toBe(inserted);
    // Every case here has rejects, so the file lands as partial whatever else went in (completed would hide them).
    expect(rejects.length).toBeGreaterThan(0);
    expect(rec.status).toBe('partial');
  });

  it('a NUL byte past the first 64 kB rejects its row; the others go in', async () => {
    const good = Array.from({ length: 1200 }, (_, i) => `WO-N${i},TR1,inspection,low,open,,padding text for the first kilobytes,2026-03-01 08:00,,,,,,,,`);
    const rec = await importText(t.db, 'work-orders', [WO, ...good, 'WO-NUL,TR1,inspection,low,open,,nul\u0000byte,2026-03-01 08:00,,,,,,,,', ''].join('\n'));
    expect(rec.status).toBe('partial');
    expect(rec.rowsInserted).toBe(1200);
    expect(rec.rejects).toEqual([{ line: 1202, reason: expect.stringMatching(/control characters/) }]);
  });

  it('a header with no rows is accepted with 0 rows', async () => {
    const rec = await importText(t.db, 'historian', `${H}\n`);
    expect(rec).toMatchObject({ status: 'completed', rowsRead: 0, rowsInserted: 0 });
  });

  it('the rejects are kept with the import record', async () => {
    const rec = await importText(t.db, 'historian', `${H}\n2026-04-01T00:00:00Z,TR1.PP,x,good\n`);
    const { rows } = await t.db.$client.query(`select line, reason, raw from import_rejects where import_id = $1`, [rec.id]);
    expect(rows).toEqual([{ line: 2, reason: 'value "x" is not a number', raw: '2026-04-01T00:00:00Z,TR1.PP,x,good' }]);
  });
});

describe('limits and options checked before anything is written', () => {
  it('a multi-megabyte single line is refused after reading little more than the limit, and nothing is kept', async () => {
    const size = 12 << 20;
    const path = fileWith(`${H}\n2026-06-01T00:00:00Z,TR1.PP,${'7'.repeat(size)},good\n`);
    const source = await openSource(path);
    let rows = 0;
    const reading = (async () => {
      for await (const batch of source.batches) rows += batch.length;
    })();
    await expect(reading).rejects.toThrow(/^Line 2 is longer than 1 MiB/);
    expect(rows).toBe(0);
    // Read up to the limit and a few chunks past it, not the 12 MiB of the line.
    expect(source.bytesRead()).toBeLessThan(2 * maxLineBytes);

    const before = await counts(t.db);
    const imports = (await t.db.$client.query('select count(*)::int as n from imports')).rows[0].n;
    const rec = await importText(t.db, 'historian', `${H}\n2026-06-02T00:00:00Z,TR1.PP,${'7'.repeat(size)},good\n`);
    expect(rec).toMatchObject({ status: 'failed', rowsInserted: 0, rowsRejected: 0 });
    expect(rec.error).toMatch(/^Line 2 is longer than 1 MiB \(1,048,576 bytes\)/);
    expect(await counts(t.db)).toEqual(before);
    // The failed attempt is on record (with its reason), nothing else.
    expect((await t.db.$client.query(`select count(*)::int as n from imports where status = 'failed' and error like 'Line 2 is longer%'`)).rows[0].n).toBe(1);
    expect((await t.db.$client.query('select count(*)::int as n from imports')).rows[0].n).toBe(imports + 1);
  });

  it('an unknown time zone is refused before an import record or a site exists', async () => {
    const before = await counts(t.db);
    const imports = (await t.db.$client.query('select count(*)::int as n from imports')).rows[0].n;
    const rec = await importText(t.db, 'assets', 'code,name,kind\nM1,M,pump\n', { site: 'MARS', tz: 'Mars/Olympus' });
    expect(rec).toMatchObject({ id: null, status: 'failed', error: expect.stringMatching(/Unknown time zone "Mars\/Olympus"/) });
    expect(await counts(t.db)).toEqual(before);
    expect((await t.db.$client.query('select count(*)::int as n from imports')).rows[0].n).toBe(imports);
  });
});
