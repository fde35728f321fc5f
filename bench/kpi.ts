// KPI benchmark: every /api/kpi/* endpoint on a database of ~20 M samples and 50,000 work orders.
//   npm run bench:kpi                     (defaults: 4.6 years at 5-minute steps ≈ 20 M samples)
//   npm run bench:kpi -- --years 1        (a quick run)
//   DATABASE_URL=… npm run bench:kpi -- --keep          (leave the seeded database on that server)
//   DATABASE_URL=… npm run bench:kpi -- --reuse <name>  (endpoints only, on a database kept before)
//   npm run bench:kpi -- --only element-life,forecast   (some endpoints only)
// For each endpoint: the cold answer time (cache invalidated before each request) against the
// hand-written SQL aggregate that is the floor for the same question, and p95 latency with 20
// concurrent clients (autocannon, loopback). Also `refresh` after one more day of samples against a
// full rebuild. Writes bench/out/kpi.json and prints a table for the README.
import { mkdirSync, readFileSync, writeFileSync, createWriteStream } from 'node:fs';
import http from 'node:http';
import { join } from 'node:path';
import autocannon from 'autocannon';
import { closeDb, createDb } from '#server/db/client.ts';
import { openBenchDatabase } from './database.ts';
import { kpiFloors } from './kpi-floors.ts';
import type { DemoManifest } from '#server/demo/generate.ts';
import { getSettings } from '#server/services/settings.ts';
import { migrateDb } from '#server/db/migrate.ts';
import { seedDemo } from '#server/demo/seed.ts';
import { seedDemoUsers } from '#server/demo/users.ts';
import { loadEnv } from '#server/env.ts';
import { runImport } from '#server/importers/run.ts';
import { refresh } from '#server/jobs/refresh.ts';
import { startServer } from '#server/index.ts';

const root = join(import.meta.dirname, '..');
const out = join(root, 'bench', 'out');
const arg = (name: string, fallback: number) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? Number(process.argv[i + 1]) : fallback;
};
const years = arg('years', 4.6);
const extraWorkOrders = arg('work-orders', 50_000);
const seconds = arg('seconds', 10);
const reuseAt = process.argv.indexOf('--reuse');
const reuse = reuseAt > 0 ? process.argv[reuseAt + 1] : undefined;
const onlyAt = process.argv.indexOf('--only');
const only = onlyAt > 0 ? new Set(process.argv[onlyAt + 1]!.split(',')) : null;
const log = (s: string) => process.stderr.write(s + '\n');

mkdirSync(out, { recursive: true });
const demoDir = join(out, 'kpi-demo');
const bench = await openBenchDatabase('osmia_kpibench', log, { keep: process.argv.includes('--keep'), reuse });
const url = bench.url;
const db = createDb(url);

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
async function time(fn: () => Promise<unknown>, n = 5): Promise<number> {
  const ms: number[] = [];
  for (let i = 0; i < n; i++) {
    const t0 = performance.now();
    await fn();
    ms.push(performance.now() - t0);
  }
  return median(ms);
}

/** The demo plant over `years`, 50,000 more work orders, a full refresh, then three more days one by one. */
async function seedAndRefresh(): Promise<{ manifest: DemoManifest; refresh: { fullMs: number; oneDayMs: number; dayTimes: number[] } }> {
  await migrateDb(db);
  await seedDemoUsers(db, 4);
  const seeded = await seedDemo(db, { outDir: demoDir, years, stepMinutes: 5, log });
  const site = seeded.manifest.site;

  // 50,000 more work orders on the demo's pumps, filters and vessels, spread over the historian window.
  const assets = (await db.$client.query<{ code: string; kind: string }>(`select code, kind from assets where kind in ('pump', 'filter', 'vessel', 'instrument')`)).rows;
  const woFile = join(out, 'kpi-work-orders.csv');
  const ws = createWriteStream(woFile);
  ws.write('wo_number,asset,type,priority,status,failure_code,description,reported_at,started_at,completed_at,out_of_service_from,out_of_service_to,labour_hours,labour_cost,parts_cost,crew\n');
  const start = Date.parse(seeded.manifest.historian.start);
  const span = Date.parse(seeded.manifest.historian.end) - start - 86_400_000;
  const types = ['corrective', 'preventive', 'predictive', 'inspection', 'improvement'];
  const codes = ['SEAL-LEAK', 'BRG-WEAR', 'ORING', 'INST-DRIFT', 'FILTER-DP'];
  for (let i = 0; i < extraWorkOrders; i++) {
    const a = assets[(i * 7919) % assets.length];
    const type = types[i % types.length];
    const reported = start + ((i * 104_729) % span);
    const iso = (ms: number) => new Date(ms).toISOString();
    const code = type === 'corrective' ? codes[i % codes.length] : '';
    ws.write(`BW-${i},${a.code},${type},medium,closed,${code},bench order ${i},${iso(reported)},${iso(reported + 3_600_000)},${iso(reported + 4 * 3_600_000)},,,3,150,${i % 300},crew-${i % 6}\n`);
  }
  await new Promise<void>((r) => ws.end(r));
  const wo = await runImport(db, { kind: 'work-orders', path: woFile, site: site.code, actor: 'bench' });
  log(`work orders: ${wo.status}, ${wo.rowsInserted} inserted`);

  // Planner statistics for the fresh 20 M rows (autovacuum would get there later). No VACUUM: refresh
  // summarizes the BRIN ranges imports filled, which is what keeps its range scans short.
  await db.$client.query('analyze');

  // Refresh: full rebuild, then three more days of samples, each imported and refreshed on its own.
  const full = await refresh(db, { full: true });
  const end = seeded.manifest.historian.end;
  // Values leave the database in canonical units, so the extra days carry only tags exported in them.
  const canonical = new Set((await db.$client.query<{ name: string }>(`select name from tags where source_unit in ('', 'bar', 'm3/h', 'uS/cm', 'degC')`)).rows.map((r) => r.name));
  const dayTimes: number[] = [];
  let daySamples = 0;
  for (let d = 1; d <= 3; d++) {
    const dayFile = join(out, `kpi-next-day-${d}.csv`);
    const { rows: lastDay } = await db.$client.query<{ line: string }>(
      `select concat_ws(',', to_char((s.ts + $2::int * interval '1 day') at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"'), t.name, s.value, s.quality) as line
       from samples s join tags t on t.id = s.tag_id where s.ts >= $1::timestamptz - interval '1 day' and s.ts < $1::timestamptz order by s.ts`,
      [end, d],
    );
    writeFileSync(dayFile, 'timestamp,tag,value,quality\n' + lastDay.map((r) => r.line).filter((l) => canonical.has(l.split(',')[1])).join('\n') + '\n');
    const day = await runImport(db, { kind: 'historian', path: dayFile, site: site.code, actor: 'bench' });
    daySamples = day.rowsInserted;
    dayTimes.push((await refresh(db)).durationMs);
  }
  log(`refresh: full ${full.durationMs} ms, one more day (${daySamples} samples) ${dayTimes.join(' / ')} ms`);
  return { manifest: seeded.manifest, refresh: { fullMs: full.durationMs, oneDayMs: median(dayTimes), dayTimes } };
}

try {
  let manifest: DemoManifest;
  let refreshFigures: { fullMs: number; oneDayMs: number; dayTimes: number[] } | null = null;
  if (reuse) {
    manifest = JSON.parse(readFileSync(join(demoDir, 'manifest.json'), 'utf8')) as DemoManifest;
    log(`reusing ${reuse}: no seeding, no refresh figures`);
  } else {
    const seeded = await seedAndRefresh();
    manifest = seeded.manifest;
    refreshFigures = seeded.refresh;
  }
  const counts = (await db.$client.query<{ samples: number; work_orders: number }>(`select (select count(*) from samples)::int as samples, (select count(*) from work_orders)::int as work_orders`)).rows[0];
  if (process.argv.includes('--refresh-only')) {
    console.log(JSON.stringify({ samples: counts.samples, refreshFullMs: refreshFigures?.fullMs, refreshOneDayMs: refreshFigures?.dayTimes }));
  } else {

  // The server, in this process, on a free port.
  // KPI_WARM_SECONDS 0: a cold answer must be computed by the request measured, not beforehand in the background.
  const env = loadEnv({ NODE_ENV: 'production', DATABASE_URL: url, JWT_SECRET: 'bench-secret-bench-secret-bench-secret-1', PORT: '0', LOGIN_RATE_LIMIT: '1000', KPI_WARM_SECONDS: '0' });
  const server = await startServer(env);
  const login = await fetch(`${server.url}/api/auth/login`, { method: 'post', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'admin@osmia.example', password: 'demo-admin-pass' }) });
  const cookie = login.headers.get('set-cookie')!.split(';')[0];
  // Time to the last byte of the response, as a load tester (autocannon) measures it: the body is
  // read, not un-gzipped (undici's JavaScript inflate of a 50 kB answer alone took ~10 ms here).
  const agent = new http.Agent({ keepAlive: true });
  const get = (path: string) =>
    new Promise<number>((resolve, reject) => {
      http
        .get(server.url + path, { agent, headers: { cookie, 'accept-encoding': 'gzip' } }, (res) => {
          let bytes = 0;
          res.on('data', (chunk: Buffer) => (bytes += chunk.length));
          res.on('end', () => (res.statusCode === 200 ? resolve(bytes) : reject(new Error(`${path}: ${res.statusCode}`))));
        })
        .on('error', reject);
    });
  const invalidate = () =>
    fetch(`${server.url}/api/settings`, { method: 'put', headers: { cookie, 'content-type': 'application/json' }, body: JSON.stringify({ currency: 'EUR' }) });

  const site = (await db.$client.query<{ id: number; time_zone: string }>(`select id, time_zone from sites where code = $1`, [manifest.site.code])).rows[0];
  const settings = await getSettings(db);
  // The floor of each question: bench/kpi-floors.ts.
  const floors = kpiFloors({ siteId: site.id, timeZone: site.time_zone, stepMinutes: manifest.historian.stepMinutes, elementUnitCost: settings.elementUnitCost });

  const results = [];
  for (const [name, sql] of Object.entries(floors)) {
    if (only && !only.has(name)) continue;
    const path = `/api/kpi/${name}`;
    await get(path); // warm the connection pool and code paths
    const floorMs = await time(() => db.$client.query(sql), 7);
    // Cold: the first request after the data version changed (a settings write), on a quiet system
    // (100 ms after the write, as the floor query runs on one).
    const coldRuns: number[] = [];
    for (let i = 0; i < 7; i++) {
      await invalidate();
      await new Promise((r) => setTimeout(r, 100));
      const t0 = performance.now();
      await get(path);
      coldRuns.push(performance.now() - t0);
    }
    const coldMs = median(coldRuns);
    const warmMs = await time(() => get(path), 10);
    const latencies: number[] = [];
    await new Promise<void>((resolve, reject) => {
      const instance = autocannon({ url: server.url + path, connections: 20, duration: seconds, headers: { cookie, 'accept-encoding': 'gzip' } }, (err) =>
        err ? reject(err) : resolve(),
      );
      instance.on('response', (_client: unknown, status: number, _bytes: number, responseTime: number) => {
        if (status !== 200) reject(new Error(`${path} answered ${status} under load`));
        latencies.push(responseTime);
      });
    });
    latencies.sort((a, b) => a - b);
    const p95 = latencies[Math.floor(latencies.length * 0.95)];
    const row = {
      endpoint: path,
      floorSqlMs: Math.round(floorMs * 10) / 10,
      coldMs: Math.round(coldMs * 10) / 10,
      ratio: Math.round((coldMs / floorMs) * 100) / 100,
      warmMs: Math.round(warmMs * 10) / 10,
      p95Ms20Clients: Math.round(p95 * 10) / 10,
      requests: latencies.length,
    };
    log(JSON.stringify(row));
    results.push(row);
  }
  agent.destroy();
  await server.close();

  const summary = {
    date: new Date().toISOString(),
    samples: counts.samples,
    workOrders: counts.work_orders,
    refreshFullMs: refreshFigures?.fullMs ?? null,
    refreshOneDayMs: refreshFigures?.oneDayMs ?? null,
    refreshShare: refreshFigures ? Math.round((refreshFigures.oneDayMs / refreshFigures.fullMs) * 10000) / 100 : null,
    endpoints: results,
  };
  writeFileSync(join(out, 'kpi.json'), JSON.stringify(summary, null, 2) + '\n');
  console.log(JSON.stringify(summary, null, 2));
  console.log(
    `\n${counts.samples.toLocaleString('en-US')} samples, ${counts.work_orders.toLocaleString('en-US')} work orders\n\n` +
      `| endpoint | floor SQL | cold answer | ratio | cached answer | p95, 20 clients |\n|---|---|---|---|---|---|\n` +
      results.map((r) => `| ${r.endpoint} | ${r.floorSqlMs} ms | ${r.coldMs} ms | ${r.ratio} | ${r.warmMs} ms | ${r.p95Ms20Clients} ms |`).join('\n') +
      (refreshFigures
        ? `\n\nrefresh: full rebuild ${(refreshFigures.fullMs / 1000).toFixed(1)} s; after one more day of samples ${(refreshFigures.oneDayMs / 1000).toFixed(2)} s (${summary.refreshShare} % of full)`
        : ''),
  );
  }
} finally {
  await closeDb(db);
  await bench.dispose();
}
