import Table from 'cli-table3';

/** A plain-text table for a terminal or a log: header row, then rows; numbers right-aligned. */
export function formatTable(head: string[], rows: (string | number | null | undefined)[][]): string {
  const table = new Table({
    head,
    style: { head: [], border: [] },
    colAligns: head.map((_, i) => (rows.some((r) => typeof r[i] === 'number') ? 'right' : 'left')),
  });
  for (const row of rows) table.push(row.map((c) => (c === null || c === undefined ? '—' : typeof c === 'number' ? formatNumber(c) : c)));
  return table.toString();
}

export function formatNumber(n: number, digits = 2): string {
  if (!Number.isFinite(n)) return '—';
  if (Number.isInteger(n)) return n.toLocaleString('en-US');
  return n.toLocaleString('en-US', { maximumFractionDigits: digits, minimumFractionDigits: Math.min(digits, 1) });
}

export function formatJson(value: unknown): string {
  return JSON.stringify(value, null, 2);
}

/** Where a command writes: kept as a parameter so formatters and commands are testable. */
export interface Output {
  out: (text: string) => void;
  err: (text: string) => void;
}

export const stdio: Output = {
  out: (text) => process.stdout.write(text.endsWith('\n') ? text : text + '\n'),
  err: (text) => process.stderr.write(text.endsWith('\n') ? text : text + '\n'),
};
