// The nightly run tells a file's kind from its header alone: the canonical headers of docs/design.md §5.
import ExcelJS from 'exceljs';
import { describe, expect, it } from 'vitest';
import { importColumns, optionalColumns } from '#shared/schemas/imports.ts';
import { parseColumnMap } from '#server/importers/column-map.ts';
import { detectKind } from '#server/importers/detect.ts';
import { fileWith } from './helpers.ts';

async function xlsx(rows: (string | number)[][], name = 'sheet.xlsx'): Promise<string> {
  const wb = new ExcelJS.Workbook();
  const sheet = wb.addWorksheet('Export');
  for (const r of rows) sheet.addRow(r);
  return fileWith(Buffer.from(await wb.xlsx.writeBuffer()), name);
}

describe('detectKind', () => {
  // The header rows of docs/design.md §5, written out here (not read from importColumns) so a change
  // to either fails this table.
  const canonical: [string, string][] = [
    ['assets', 'code,name,kind,parent,rated_permeate_m3h,element_capacity,rack_row,rack_col'],
    ['tags', 'tag,asset,quantity,unit'],
    ['work-orders', 'wo_number,asset,type,priority,status,failure_code,description,reported_at,started_at,completed_at,out_of_service_from,out_of_service_to,labour_hours,labour_cost,parts_cost,crew'],
    ['elements', 'serial,model,vessel,position,installed_at,removed_at,removal_reason'],
    ['job-steps', 'wo_number,step,name,started_at,completed_at,guided,technician'],
    ['historian', 'timestamp,tag,value,quality'],
    ['historian', 'timestamp,TR1.PF,TR1.QP'],
  ];
  it.each(canonical)('reads %s from its canonical header %s', async (kind, header) => {
    expect(await detectKind(fileWith(`${header}\n`))).toEqual({ kind, format: 'csv' });
  });

  it('reads each register from its required columns alone, with the optional ones left out', async () => {
    for (const kind of ['assets', 'tags', 'work-orders', 'elements', 'job-steps'] as const) {
      const required = importColumns[kind].filter((c) => !optionalColumns[kind]?.includes(c));
      expect((await detectKind(fileWith(`${required.join(',')}\n`))).kind, kind).toBe(kind);
    }
  });

  it('reads a header with a byte-order mark, semicolons, quotes, other letter case and CRLF line ends', async () => {
    expect(await detectKind(fileWith('\uFEFF"Serial";"Model";Vessel;Position;Installed_At\r\nS-1;M;V1;1;2025-01-01\r\n'))).toEqual({ kind: 'elements', format: 'csv' });
    expect((await detectKind(fileWith('tag\tasset\tquantity\n'))).kind).toBe('tags');
  });

  it('reads registers and work orders from the first sheet of an XLSX workbook, but no historian export', async () => {
    expect(await detectKind(await xlsx([['wo_number', 'asset', 'type', 'status', 'reported_at'], ['WO-1', 'P1', 'corrective', 'open', '2025-01-01']]))).toEqual({ kind: 'work-orders', format: 'xlsx' });
    const historian = await detectKind(await xlsx([['timestamp', 'tag', 'value'], ['2025-01-01T00:00:00Z', 'T', 1]]));
    expect(historian).toMatchObject({ kind: null, reason: expect.stringMatching(/must be CSV/) });
  });

  it('applies a column map before it reads the header', async () => {
    const map = parseColumnMap('Zeitstempel=timestamp\nMessstelle=tag\nWert=value');
    expect((await detectKind(fileWith('Zeitstempel,Messstelle,Wert\n'), map)).kind).toBe('historian');
    expect((await detectKind(fileWith('Zeitstempel,Messstelle,Wert\n'))).kind).toBeNull();
  });

  it('names no kind, with a reason, for a header that is none of the formats, an empty file or binary content', async () => {
    expect(await detectKind(fileWith('when,what\n1,2\n'))).toMatchObject({ kind: null, reason: expect.stringMatching(/"when,what" is none of the import formats/) });
    // One column short of the tag map (quantity missing): not a tag map.
    expect((await detectKind(fileWith('tag,asset,unit\n'))).kind).toBeNull();
    expect(await detectKind(fileWith(''))).toMatchObject({ kind: null, reason: expect.stringMatching(/empty/) });
    expect(await detectKind(fileWith(Buffer.from([0x00, 0x01, 0x02, 0x03])))).toMatchObject({ kind: null, reason: expect.stringMatching(/not text/) });
  });

  it('refuses to guess between two kinds whose columns are all present, equally many of each', async () => {
    // Every required column of the element register and of the job steps (five each), nothing more of either: a tie.
    const header = 'serial,model,vessel,position,installed_at,wo_number,step,name,started_at,completed_at';
    expect(await detectKind(fileWith(`${header}\n`))).toMatchObject({ kind: null, reason: expect.stringMatching(/fits both/) });
  });
});
