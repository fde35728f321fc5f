// Workbook benchmark: a 200,000-row engineer workbook (rows of the Element register made in memory)
// written by Osmia's writer (server/reports: cover, register with its notes and cautions, the other sheets
// empty), side by side with exceljs's streaming writer writing the same rows with no Osmia code around
// it — same columns, widths, number formats, strings inline — each in a process of its own, so each peak
// RSS is its own; rounds alternate which goes first. Both run from one esbuild bundle of this file, as
// bin/osmia runs the CLI (tsx would add the memory of compiling Osmia's modules to Osmia's side only).
//   npm run bench:report                              (200,000 rows, 3 rounds)
//   npm run bench:report -- --rows 50000 --rounds 5   (medians of the rounds)
// Prints time and peak RSS of both and the ratio of the times; writes bench/out/report.json.
import { spawnSync } from 'node:child_process';
import { once } from 'node:events';
import { createWriteStream, mkdirSync, mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { EngineerContent, RegisterRow } from '#server/reports/engineer.ts';

const arg = (name: string, fallback: number) => {
  const i = process.argv.indexOf(name);
  return i > 0 ? Number(process.argv[i + 1]) : fallback;
};
const rows = arg('--rows', 200_000);
const rounds = arg('--rounds', 3);
const DAY = 86_400_000;

/** The register rows of an invented plant, the same every run (a small LCG, not Math.random). */
function registerRows(n: number): RegisterRow[] {
  let seed = 7;
  const rand = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
  const models = ['Model 8-400', 'Model 8-400 LF', 'Model 8-370'];
  const reasons = ['failed', 'performance', 'damaged', 'planned', 'relocated', 'sampled'];
  const end = Date.UTC(2026, 0, 1);
  const out: RegisterRow[] = [];
  for (let i = 0; i < n; i++) {
    const train = `T${1 + (i % 8)}`;
    const stage = `${train}-S${1 + ((i >> 3) % 2)}`;
    const vessel = `${stage}-V${String(1 + ((i >> 4) % 64)).padStart(2, '0')}`;
    const installedAt = new Date(end - Math.floor(rand() * 3650) * DAY - Math.floor(rand() * DAY));
    const removed = rand() < 0.4;
    const removedAt = removed ? new Date(Math.min(end - DAY, installedAt.getTime() + Math.floor(rand() * 2000) * DAY)) : null;
    const reason = removed ? reasons[Math.floor(rand() * reasons.length)]! : null;
    out.push({
      serial: `EL${String(i).padStart(7, '0')}`,
      model: models[i % models.length]!,
      train,
      stage,
      vessel,
      position: 1 + (i % 7),
      installedAt,
      removedAt,
      reason,
      lifeEnding: reason === 'failed' || reason === 'performance' || reason === 'damaged',
      inService: !removed,
      ageDays: ((removedAt ?? new Date(end)).getTime() - installedAt.getTime()) / DAY,
      risk: removed ? null : rand(),
    });
  }
  return out;
}

type Writer = (path: string, register: RegisterRow[]) => Promise<void>;

/** Osmia's writer: the engineer workbook of server/reports, its content made in memory. */
async function osmia(): Promise<Writer> {
  const { writeWorkbook } = await import('#server/reports/index.ts');
  const { engineerWorkbook } = await import('#server/reports/catalog.ts');
  // exceljs loads with the first workbook: load it here, so only the writing is timed, as for the bare writer.
  await import('exceljs');
  return async (path, register) => {
    const at = new Date(Date.UTC(2026, 0, 1));
    const content: EngineerContent = {
      cover: {
        title: 'Engineer workbook',
        about: 'Benchmark content made in memory.',
        site: { code: 'BENCH', name: 'Bench plant', timeZone: 'America/Denver' },
        window: { fromDay: '2025-01-01', toDay: '2026-01-01', from: new Date(Date.UTC(2025, 0, 1, 7)), to: new Date(Date.UTC(2026, 0, 1, 7)) },
        generatedAt: at,
        currency: 'EUR',
        freshness: { dataAsOf: { newestSampleAt: null, newestWorkOrderAt: null }, derivedUpToDate: true, warnings: [] },
        contents: [{ sheet: 'Element register', holds: 'Every element install.' }],
      },
      currency: 'EUR',
      register,
      riskNotes: ['Risk: benchmark values.'],
      cautions: ['Benchmark caution.'],
      failures: [],
      imports: [],
      rejects: [],
      rejectsTotal: 0,
    };
    await writeWorkbook(engineerWorkbook, content, createWriteStream(path), 'America/Denver', at);
  };
}

/** exceljs alone: the same sheet, columns, formats and rows, with the streaming writer and nothing else. */
async function bare(): Promise<Writer> {
  const { default: Excel } = await import('exceljs');
  return async (path, register) => {
    const out = createWriteStream(path);
    const wb = new Excel.stream.xlsx.WorkbookWriter({ stream: out, useStyles: true, useSharedStrings: false });
    const ws = wb.addWorksheet('Element register', { views: [{ state: 'frozen', ySplit: 1 }] });
    const f = (numFmt: string, width: number) => ({ width, style: { numFmt } });
    ws.columns = [
      f('@', 16),
      f('@', 14),
      f('@', 8),
      f('@', 10),
      f('@', 14),
      f('#,##0', 9),
      f('yyyy-mm-dd hh:mm', 17),
      f('yyyy-mm-dd hh:mm', 17),
      f('@', 13),
      f('@', 10),
      f('@', 11),
      f('#,##0.0', 10),
      f('0.00%', 12),
    ];
    ws.addRow(['Serial', 'Model', 'Train', 'Stage', 'Vessel', 'Position', 'Installed', 'Removed', 'Removal reason', 'Life-ending', 'In service', 'Age (days)', 'Risk']).commit();
    for (const r of register) {
      ws.addRow([r.serial, r.model, r.train, r.stage, r.vessel, r.position, r.installedAt, r.removedAt, r.reason, r.lifeEnding ? 'yes' : 'no', r.inService ? 'yes' : 'no', r.ageDays, r.risk]).commit();
    }
    ws.autoFilter = `A1:M${register.length + 1}`;
    ws.commit();
    await wb.commit();
    if (!out.writableFinished) await once(out, 'finish');
  };
}

const child = process.argv.indexOf('--child');
if (child > 0) {
  // One writer in this process: its modules loaded and the rows made first (not timed), then the workbook written (timed).
  const which = process.argv[child + 1];
  const path = process.argv[process.argv.indexOf('--out') + 1]!;
  const write = await (which === 'osmia' ? osmia() : bare());
  const register = registerRows(rows);
  const t0 = performance.now();
  await write(path, register);
  const ms = performance.now() - t0;
  process.stdout.write(JSON.stringify({ which, ms, peakRssMb: process.resourceUsage().maxRSS / 1024, bytes: statSync(path).size }) + '\n');
} else {
  const root = join(import.meta.dirname, '..');
  const dir = mkdtempSync(join(tmpdir(), 'osmia-bench-report-'));
  // Inside the checkout (bench/out/ is git-ignored), so the bundle finds exceljs in node_modules.
  mkdirSync(join(root, 'bench', 'out'), { recursive: true });
  const bundle = join(root, 'bench', 'out', 'report-bench.mjs');
  const built = spawnSync(
    join(root, 'node_modules', '.bin', 'esbuild'),
    [join(root, 'bench', 'report.ts'), '--bundle', '--platform=node', '--format=esm', '--target=node20', '--packages=external', '--log-level=error', `--outfile=${bundle}`],
    { cwd: root, encoding: 'utf8' },
  );
  if (built.status !== 0) throw new Error(`esbuild failed: ${built.stderr}`);
  type Result = { which: string; ms: number; peakRssMb: number; bytes: number };
  const results: Record<'osmia' | 'bare', Result[]> = { osmia: [], bare: [] };
  try {
    for (let round = 0; round < rounds; round++) {
      const order: ('osmia' | 'bare')[] = round % 2 === 0 ? ['bare', 'osmia'] : ['osmia', 'bare'];
      for (const which of order) {
        const r = spawnSync(process.execPath, [bundle, '--child', which, '--rows', String(rows), '--out', join(dir, `${which}.xlsx`)], {
          cwd: root,
          encoding: 'utf8',
          maxBuffer: 1 << 24,
        });
        if (r.status !== 0) throw new Error(`${which} failed (${r.status}): ${r.stderr.slice(-2000)}`);
        const result = JSON.parse(r.stdout.trim().split('\n').at(-1)!) as Result;
        results[which].push(result);
        process.stderr.write(`round ${round + 1} ${which}: ${(result.ms / 1000).toFixed(2)} s, peak RSS ${result.peakRssMb.toFixed(0)} MB, ${(result.bytes / 1e6).toFixed(1)} MB\n`);
      }
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
  const summary = (which: 'osmia' | 'bare') => ({
    seconds: median(results[which].map((r) => r.ms)) / 1000,
    peakRssMb: median(results[which].map((r) => r.peakRssMb)),
    fileMb: median(results[which].map((r) => r.bytes)) / 1e6,
    rounds: results[which].map((r) => ({ seconds: r.ms / 1000, peakRssMb: r.peakRssMb })),
  });
  const report = { rows, rounds, date: new Date().toISOString(), osmia: summary('osmia'), bare: summary('bare') };
  const ratio = report.osmia.seconds / report.bare.seconds;
  process.stdout.write(
    [
      `${rows.toLocaleString('en-US')}-row engineer workbook, medians of ${rounds} rounds:`,
      `  exceljs streaming writer alone: ${report.bare.seconds.toFixed(2)} s, peak RSS ${report.bare.peakRssMb.toFixed(0)} MB, ${report.bare.fileMb.toFixed(1)} MB file`,
      `  Osmia's engineer workbook:      ${report.osmia.seconds.toFixed(2)} s, peak RSS ${report.osmia.peakRssMb.toFixed(0)} MB, ${report.osmia.fileMb.toFixed(1)} MB file`,
      `  time ratio Osmia / bare: ${ratio.toFixed(2)} (target ≤ 1.5); Osmia peak RSS target < 300 MB (goal 200 MB)`,
      '',
    ].join('\n'),
  );
  writeFileSync(join(root, 'bench', 'out', 'report.json'), JSON.stringify({ ...report, ratio }, null, 2) + '\n');
}
