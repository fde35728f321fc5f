// Import benchmark: the historian importer against `psql \copy` of the same file into an unindexed
// table, side by side in one run, on a throwaway cluster (or DATABASE_URL).
//   npm run bench:import                  (5,000,000 rows)
//   npm run bench:import -- --rows 1000000 --rounds 5   (medians of the rounds; default 3)
// Prints rows/s of both, the ratio, and the importer's peak RSS; writes bench/out/import.json.
import { spawnSync } from 'node:child_process';
import { createWriteStream, existsSync, mkdirSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { openBenchDatabase } from './database.ts';

const root = join(import.meta.dirname, '..');
const out = join(root, 'bench', 'out');
const argRows = process.argv.indexOf('--rows');
const rows = argRows > 0 ? Number(process.argv[argRows + 1]) : 5_000_000;
const argRounds = process.argv.indexOf('--rounds');
/** Rounds of psql then import, each into emptied tables: this machine's timings spread by ±30 % from run to run, medians less. */
const rounds = argRounds > 0 ? Number(process.argv[argRounds + 1]) : 3;
const tagCount = 40;

async function writeHistorian(path: string): Promise<void> {
  const stream = createWriteStream(path);
  const write = (s: string) => (stream.write(s) ? Promise.resolve() : new Promise<void>((r) => stream.once('drain', () => r())));
  await write('timestamp,tag,value,quality\n');
  let t = Date.UTC(2023, 0, 1);
  let n = 0;
  let seed = 42;
  const rand = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
  while (n < rows) {
    const ts = new Date(t).toISOString().replace('.000Z', 'Z');
    let chunk = '';
    for (let k = 0; k < tagCount && n < rows; k++, n++) chunk += `${ts},BENCH.T${k},${(rand() * 100).toFixed(3)},${n % 500 === 0 ? 'uncertain' : 'good'}\n`;
    await write(chunk);
    t += 300_000;
  }
  await new Promise<void>((r) => stream.end(r));
}

function timed(cmd: string, args: string[], env: NodeJS.ProcessEnv): { seconds: number; maxRssMb: number; stdout: string } {
  const r = spawnSync('/usr/bin/time', ['-f', '%e %M', cmd, ...args], { env, encoding: 'utf8', maxBuffer: 1 << 26 });
  if (r.status !== 0) throw new Error(`${cmd} failed (${r.status}): ${r.stderr.slice(-2000)}`);
  const [seconds, kb] = r.stderr.trim().split('\n').at(-1)!.split(' ').map(Number);
  return { seconds, maxRssMb: kb / 1024, stdout: r.stdout };
}

mkdirSync(out, { recursive: true });
const file = join(out, `historian-${rows}.csv`);
if (!existsSync(file)) {
  process.stderr.write(`writing ${rows.toLocaleString('en-US')} rows to ${file} …\n`);
  await writeHistorian(file);
}
const sizeMb = statSync(file).size / 1e6;

const bench = await openBenchDatabase('osmia_bench');
const url = bench.url;
const env = { ...process.env, DATABASE_URL: url };
const osmia = join(root, 'bin', 'osmia');

try {
  // The plant: one train and the 40 tags of the file.
  writeFileSync(join(out, 'assets.csv'), 'code,name,kind,parent,rated_permeate_m3h,element_capacity,rack_row,rack_col\nBENCH,Bench train,train,,100,,,\n');
  writeFileSync(join(out, 'tags.csv'), ['tag,asset,quantity,unit', ...Array.from({ length: tagCount }, (_, k) => `BENCH.T${k},BENCH,feed_pressure,bar`)].join('\n') + '\n');
  for (const [kind, f] of [['assets', 'assets.csv'], ['tags', 'tags.csv']]) {
    const r = spawnSync(osmia, ['import', kind, join(out, f), '--site', 'BENCH', '--json'], { env, encoding: 'utf8' });
    if (r.status !== 0) throw new Error(r.stderr + r.stdout);
  }

  // Floor: psql \copy of the same file into an equivalent table without any index.
  const psqlBin = existsSync('/usr/bin/psql') ? '/usr/bin/psql' : 'psql';
  spawnSync(psqlBin, [url, '-qc', 'create table bench_raw (ts timestamptz, tag text, value double precision, quality text)'], { encoding: 'utf8' });
  const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
  const copies: ReturnType<typeof timed>[] = [];
  const imports: ReturnType<typeof timed>[] = [];
  let record: { status: string; rowsInserted: number; durationMs: number } = { status: '', rowsInserted: 0, durationMs: 0 };
  for (let round = 0; round < rounds; round++) {
    if (round > 0) {
      spawnSync(psqlBin, [url, '-qc', `truncate bench_raw; truncate samples, sample_hourly, dirty_hours, sample_coverage, downtime_events; delete from imports where kind = 'historian'`], { encoding: 'utf8' });
    }
    copies.push(timed(psqlBin, [url, '-qc', `\\copy bench_raw from '${file}' with (format csv, header true)`], env));
    const imp = timed(osmia, ['import', 'historian', file, '--json'], env);
    record = JSON.parse(imp.stdout);
    if (record.status !== 'completed' || record.rowsInserted !== rows) throw new Error(`import did not complete: ${imp.stdout.slice(0, 2000)}`);
    imports.push(imp);
    process.stderr.write(`round ${round + 1}: psql ${copies.at(-1)!.seconds} s, import ${imp.seconds} s\n`);
  }
  const copy = { seconds: median(copies.map((c) => c.seconds)) };
  const imp = { seconds: median(imports.map((c) => c.seconds)), maxRssMb: Math.max(...imports.map((c) => c.maxRssMb)) };
  const again = timed(osmia, ['import', 'historian', file, '--json'], env);

  const result = {
    date: new Date().toISOString(),
    rows,
    fileMb: Math.round(sizeMb),
    psqlCopySeconds: copy.seconds,
    psqlCopyRowsPerSecond: Math.round(rows / copy.seconds),
    importSeconds: imp.seconds,
    importRowsPerSecond: Math.round(rows / imp.seconds),
    ratio: Math.round((imp.seconds / copy.seconds) * 100) / 100,
    importPeakRssMb: Math.round(imp.maxRssMb),
    /** The import's own time as its record gives it (file to commit, and the refresh after it). */
    importRecordMs: record.durationMs,
    rounds,
    psqlCopyRoundsSeconds: copies.map((c) => c.seconds),
    importRoundsSeconds: imports.map((c) => c.seconds),
    duplicateRunSeconds: again.seconds,
    target: 'ratio <= 1.5 and peak RSS < 300 MB',
  };
  writeFileSync(join(out, 'import.json'), JSON.stringify(result, null, 2) + '\n');
  console.log(JSON.stringify(result, null, 2));
  console.log(
    `\n| rows | file | psql \\copy (unindexed) | osmia import historian | ratio | importer peak RSS |\n|---|---|---|---|---|---|\n` +
      `| ${rows.toLocaleString('en-US')} | ${result.fileMb} MB | ${copy.seconds.toFixed(1)} s (${result.psqlCopyRowsPerSecond.toLocaleString('en-US')} rows/s) | ${imp.seconds.toFixed(1)} s (${result.importRowsPerSecond.toLocaleString('en-US')} rows/s) | ${result.ratio} | ${result.importPeakRssMb} MB |`,
  );
} finally {
  await bench.dispose();
}
