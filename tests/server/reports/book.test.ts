// The workbook writer's own rules (server/reports/book.ts): text stays text and fits a cell, totals are
// formulas with their cached result, dates are the plant's wall clock across a daylight-saving change.
import { PassThrough } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { Book, Formula, SiteClock, cellTextLimit, columnLetter, sheetRef, sumOf } from '#server/reports/book.ts';
import { cellElement, openWorkbook, sheetXml } from '../../setup/spreadsheet.ts';

async function written(fill: (book: Book) => Promise<void>): Promise<Buffer> {
  const out = new PassThrough();
  const chunks: Buffer[] = [];
  out.on('data', (c: Buffer) => chunks.push(c));
  const book = await Book.open(out, 'America/Denver', new Date('2025-03-10T12:00:00Z'));
  await fill(book);
  await book.close();
  return Buffer.concat(chunks);
}

describe('SiteClock', () => {
  // America/Denver: UTC−7 in winter, UTC−6 from 02:00 local on the second Sunday of March (US Energy Policy
  // Act of 2005 §110, as the tz database has it): 2025-03-09 08:59 UTC is 01:59 MST, 09:00 UTC is 03:00 MDT.
  it.each([
    ['2025-03-09T08:59:00Z', '2025-03-09T01:59:00.000Z'],
    ['2025-03-09T09:00:00Z', '2025-03-09T03:00:00.000Z'],
    ['2025-01-15T12:00:00Z', '2025-01-15T05:00:00.000Z'],
    ['2025-07-01T00:30:00Z', '2025-06-30T18:30:00.000Z'],
    // The first Sunday of November at 02:00 MDT the clock goes back to 01:00 MST: 07:59 UTC is 01:59 MDT, 08:00 UTC is 01:00 MST.
    ['2025-11-02T07:59:00Z', '2025-11-02T01:59:00.000Z'],
    ['2025-11-02T08:00:00Z', '2025-11-02T01:00:00.000Z'],
  ])('writes %s as the wall-clock time %s', (instant, wall) => {
    expect(new SiteClock('America/Denver').wall(new Date(instant)).toISOString()).toBe(wall);
  });

  it('agrees minute by minute across both changes with Intl.DateTimeFormat (the runtime’s tz database)', () => {
    const clock = new SiteClock('America/Denver');
    const parts = new Intl.DateTimeFormat('en-CA', { timeZone: 'America/Denver', hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit' });
    for (const start of [Date.UTC(2025, 2, 8), Date.UTC(2025, 10, 1)]) {
      for (let ms = start; ms < start + 2 * 86_400_000; ms += 60_000) {
        const p = Object.fromEntries(parts.formatToParts(ms).map((x) => [x.type, x.value]));
        expect(clock.wall(new Date(ms)).toISOString().slice(0, 16)).toBe(`${p.year}-${p.month}-${p.day}T${p.hour}:${p.minute}`);
      }
    }
  });
});

describe('Book', () => {
  it('names columns and references as a spreadsheet does', () => {
    expect([1, 26, 27, 52, 53, 702, 703].map(columnLetter)).toEqual(['A', 'Z', 'AA', 'AZ', 'BA', 'ZZ', 'AAA']);
    expect(sheetRef("Crew's sheet", 7, 14)).toBe("'Crew''s sheet'!G14");
    expect(sumOf(3, 2, 9)).toBe('SUM(C2:C9)');
    expect(sumOf(3, 2, 1)).toBe('0');
  });

  it('writes text as string cells, cuts it at a cell’s 32,767 characters, and formulas with their cached result', async () => {
    const data = await written(async (book) => {
      const sheet = book.sheet('T', { table: true, columns: [{ header: 'Text', kind: 'text', width: 10 }, { header: 'Cost (EUR)', kind: 'money', width: 10 }] });
      await sheet.row(['=1+1', 2]);
      await sheet.row(['x'.repeat(40_000), 3]);
      await sheet.row(['Total', new Formula('SUM(B2:B3)', 5)], 'total');
      book.done(sheet);
    });
    const wb = await openWorkbook(data);
    const ws = wb.getWorksheet('T')!;
    expect(ws.getCell('A2').value).toBe('=1+1');
    expect(String(ws.getCell('A3').value)).toHaveLength(cellTextLimit);
    expect(ws.getCell('B4').value).toEqual({ formula: 'SUM(B2:B3)', result: 5 });
    expect(ws.getCell('B2').numFmt).toBe('#,##0.00');
    const { xml } = await sheetXml(data, 'T');
    expect(cellElement(xml, 'A2')).toMatch(/t="str"/);
    expect(cellElement(xml, 'A2')).not.toContain('<f>');
    expect(cellElement(xml, 'B4')).toContain('<f>SUM(B2:B3)</f>');
  });

  it('refuses a sheet name a spreadsheet would refuse', async () => {
    await written(async (book) => {
      expect(() => book.sheet('a/b', { table: false, columns: [] })).toThrow(/not valid/);
      expect(() => book.sheet('x'.repeat(32), { table: false, columns: [] })).toThrow(/not valid/);
    });
  });
});
