// CSV records as every download writes them (server/csv.ts). The neutralised characters and the fix — a
// leading single quote on a field that starts with =, +, -, @, tab or carriage return, the field quoted —
// are the OWASP "CSV Injection" guidance; quoting and doubled quotes are RFC 4180 §2.6–2.7.
import { describe, expect, it } from 'vitest';
import { csvRecord } from '#server/csv.ts';

describe('csvRecord', () => {
  it.each([
    ['=1+1', `"'=1+1"`],
    ['+1+1', `"'+1+1"`],
    ['-2+3', `"'-2+3"`],
    ['@SUM(1)', `"'@SUM(1)"`],
    ['\t=1', `"'\t=1"`],
    ['\r=1', `"'\r=1"`],
    ['=HYPERLINK("http://example.invalid","x")', `"'=HYPERLINK(""http://example.invalid"",""x"")"`],
  ])('neutralises a field starting %j (OWASP CSV Injection)', (field, written) => {
    expect(csvRecord([field])).toBe(`${written}\r\n`);
  });

  it('neutralises a formula field that spans lines, which papaparse’s own pattern misses', () => {
    expect(csvRecord(['=1\n2'])).toBe(`"'=1\n2"\r\n`);
  });

  it('quotes text, doubles its quotes, leaves numbers and plain text as they are (RFC 4180 §2.6–2.7)', () => {
    expect(csvRecord([3, 'unknown asset "NOPE"', 'a,b', null, -4.5])).toBe(`3,"unknown asset ""NOPE""","a,b",,-4.5\r\n`);
    expect(csvRecord(['x=1', ' -1'])).toBe(`"x=1"," -1"\r\n`);
  });
});
