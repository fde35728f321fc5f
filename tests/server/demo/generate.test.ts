import { createHash } from 'node:crypto';
import { mkdtemp, readFile, readdir, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

import { afterAll, beforeAll, describe, expect, it } from 'vitest';

import { type DemoManifest, generateDemoPlant } from '#server/demo/generate.ts';
import { demoPlant } from '#server/demo/plant.ts';

// Headers copied from docs/design.md §5 (canonical import formats), not from the generator, so a drift fails.
const canonicalHeaders: Record<string, string> = {
  assets: 'code,name,kind,parent,rated_permeate_m3h,element_capacity,rack_row,rack_col',
  tags: 'tag,asset,quantity,unit',
  elements: 'serial,model,vessel,position,installed_at,removed_at,removal_reason',
  'work-orders':
    'wo_number,asset,type,priority,status,failure_code,description,reported_at,started_at,completed_at,out_of_service_from,out_of_service_to,labour_hours,labour_cost,parts_cost,crew',
  'job-steps': 'wo_number,step,name,started_at,completed_at,guided,technician',
  historian: 'timestamp,tag,value,quality',
};

const isoWithOffset = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(Z|[+-]\d{2}:\d{2})$/;
const ms = (iso: string) => Date.parse(iso);
const options = { years: 1, stepMinutes: 60, seed: 'test-seed' } as const;

type Row = Record<string, string>;

/** Split one CSV line (RFC 4180 quoting; the demo files hold no line breaks inside fields). */
function splitCsvLine(line: string): string[] {
  const fields: string[] = [];
  let field = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const c = line[i];
    if (quoted) {
      if (c === '"' && line[i + 1] === '"') {
        field += '"';
        i++;
      } else if (c === '"') quoted = false;
      else field += c;
    } else if (c === '"') quoted = true;
    else if (c === ',') {
      fields.push(field);
      field = '';
    } else field += c;
  }
  fields.push(field);
  return fields;
}

const readCsv = async (dir: string, file: string): Promise<Row[]> => {
  const [header, ...lines] = (await readFile(join(dir, file), 'utf8')).split('\n').filter((l) => l !== '');
  const names = splitCsvLine(header);
  return lines.map((line) => {
    const fields = splitCsvLine(line);
    expect(fields, `${file}: ${line}`).toHaveLength(names.length);
    return Object.fromEntries(names.map((n, i) => [n, fields[i]]));
  });
};
const sha256 = async (path: string) => createHash('sha256').update(await readFile(path)).digest('hex');

let dirA: string;
let dirB: string;
let dirC: string;
let manifest: DemoManifest;

beforeAll(async () => {
  dirA = await mkdtemp(join(tmpdir(), 'osmia-demo-a-'));
  dirB = await mkdtemp(join(tmpdir(), 'osmia-demo-b-'));
  dirC = await mkdtemp(join(tmpdir(), 'osmia-demo-c-'));
  manifest = await generateDemoPlant({ ...options, outDir: dirA });
  await generateDemoPlant({ ...options, outDir: dirB });
  await generateDemoPlant({ ...options, seed: 'another-seed', outDir: dirC });
}, 120_000);

afterAll(async () => {
  for (const dir of [dirA, dirB, dirC]) if (dir) await rm(dir, { recursive: true, force: true });
});

describe('generateDemoPlant', () => {
  it('writes byte-identical files for the same seed and options', async () => {
    const names = (await readdir(dirA)).sort();
    expect(names).toEqual((await readdir(dirB)).sort());
    expect(names).toContain('manifest.json');
    for (const name of names) expect(await sha256(join(dirB, name)), name).toBe(await sha256(join(dirA, name)));
  });

  it('writes different data for another seed', async () => {
    expect(await sha256(join(dirC, 'elements.csv'))).not.toBe(await sha256(join(dirA, 'elements.csv')));
    expect(await sha256(join(dirC, 'historian-2026.csv'))).not.toBe(await sha256(join(dirA, 'historian-2026.csv')));
  });

  it('lists every file with its true row count, size and sha256, in import order', async () => {
    const onDisk = (await readdir(dirA)).filter((n) => n !== 'manifest.json').sort();
    expect(manifest.files.map((f) => f.file).sort()).toEqual(onDisk);
    expect(manifest.files[0].kind).toBe('assets');
    for (const f of manifest.files) {
      const bytes = await readFile(join(dirA, f.file));
      expect(f.bytes).toBe(bytes.length);
      expect(f.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
      const lines = bytes.toString('utf8').split('\n').filter((l) => l.length > 0);
      expect(f.rows, f.file).toBe(lines.length - 1);
    }
    const written = JSON.parse(await readFile(join(dirA, 'manifest.json'), 'utf8')) as DemoManifest;
    expect(written).toEqual(manifest);
  });

  it('starts every file with the canonical header of its kind', async () => {
    for (const f of manifest.files) {
      const text = await readFile(join(dirA, f.file), 'utf8');
      expect(text.slice(0, text.indexOf('\n')), f.file).toBe(canonicalHeaders[f.kind]);
    }
  });

  it('records the site, time zone and every planted parameter in the manifest', () => {
    expect(manifest.site.code).toBe(demoPlant.site.code);
    expect(Intl.supportedValuesOf('timeZone')).toContain(manifest.site.timeZone);
    expect(manifest.options).toMatchObject({ seed: 'test-seed', years: 1, stepMinutes: 60, end: '2026-10-01T00:00:00Z', start: '2025-10-01T00:00:00Z' });
    for (const stage of demoPlant.stages) {
      expect(manifest.planted.elementLife.byStage[String(stage.index)]).toMatchObject({
        shape: stage.elementLife.shape,
        scaleDays: stage.elementLife.scaleDays,
      });
    }
    const pumps = demoPlant.trains.flatMap((t) => t.pumps.map((p) => [`${t.code}-${p.suffix}`, p.mtbfHours] as const));
    expect(manifest.planted.pumps.map((p) => [p.asset, p.mtbfHours])).toEqual(pumps);
    for (const p of manifest.planted.pumps) expect(p.failureRatePerHour).toBeCloseTo(1 / p.mtbfHours, 12);
    expect(manifest.planted.jobs.guidedFactor).toBe(demoPlant.jobs.guidedFactor);
    expect(manifest.planted.jobs.learningJobs).toBe(demoPlant.jobs.learningJobs);
    expect(manifest.realized.pumps).toHaveLength(4);
  });

  it('builds the asset tree site → train → stage → vessel with 4 × 4 racks of 16 vessels per train', async () => {
    const assets = await readCsv(dirA, 'assets.csv');
    const byCode = new Map(assets.map((a) => [a.code, a]));
    const trains = assets.filter((a) => a.kind === 'train');
    expect(trains.length).toBeGreaterThanOrEqual(2);
    for (const train of trains) {
      expect(train.parent).toBe('');
      expect(Number(train.rated_permeate_m3h)).toBeGreaterThan(0);
      const stages = assets.filter((a) => a.kind === 'stage' && a.parent === train.code);
      expect(stages).toHaveLength(2);
      const vessels = assets.filter((a) => a.kind === 'vessel' && stages.some((s) => s.code === a.parent));
      expect(vessels).toHaveLength(16);
      const slots = new Set(vessels.map((v) => `${v.rack_row}/${v.rack_col}`));
      expect(slots.size).toBe(16);
      for (const v of vessels) {
        expect(Number(v.rack_row)).toBeGreaterThanOrEqual(1);
        expect(Number(v.rack_row)).toBeLessThanOrEqual(4);
        expect(Number(v.rack_col)).toBeGreaterThanOrEqual(1);
        expect(Number(v.rack_col)).toBeLessThanOrEqual(4);
        expect([6, 7]).toContain(Number(v.element_capacity));
      }
      const pumps = assets.filter((a) => a.kind === 'pump' && a.parent === train.code);
      expect(pumps.map((p) => p.code).sort()).toEqual([`${train.code}-HPP`, `${train.code}-IBP`]);
      expect(assets.some((a) => a.kind === 'filter' && a.parent === train.code)).toBe(true);
      expect(assets.some((a) => a.kind === 'instrument' && a.parent === train.code)).toBe(true);
    }
    for (const a of assets) if (a.parent) expect(byCode.has(a.parent), a.code).toBe(true);
  });

  it('maps every tag to an existing asset with a known quantity and unit, mixing units', async () => {
    const assets = new Set((await readCsv(dirA, 'assets.csv')).map((a) => a.code));
    const tags = await readCsv(dirA, 'tags.csv');
    const units = new Set(['', 'bar', 'psi', 'kPa', 'MPa', 'm3/h', 'gpm', 'L/s', 'uS/cm', 'mS/cm', 'degC', 'degF']);
    for (const t of tags) {
      expect(assets.has(t.asset), t.tag).toBe(true);
      expect(units.has(t.unit), t.tag).toBe(true);
      expect(t.quantity === 'run_status').toBe(t.unit === '');
    }
    for (const unit of ['psi', 'gpm', 'mS/cm', 'degF', 'bar', 'm3/h', 'uS/cm', 'degC']) expect(tags.some((t) => t.unit === unit), unit).toBe(true);
    for (const pump of ['T1-HPP', 'T1-IBP', 'T2-HPP', 'T2-IBP']) expect(tags.some((t) => t.asset === pump && t.quantity === 'run_status')).toBe(true);
  });

  it('never has two elements in one position at once, and fills every position at the history start', async () => {
    const assets = await readCsv(dirA, 'assets.csv');
    const capacity = new Map(assets.filter((a) => a.kind === 'vessel').map((a) => [a.code, Number(a.element_capacity)]));
    const elements = await readCsv(dirA, 'elements.csv');
    const end = ms(manifest.options.end);
    const start = ms(manifest.options.start);
    const byPosition = new Map<string, Row[]>();
    const serials = new Set<string>();
    for (const e of elements) {
      expect(serials.has(e.serial), e.serial).toBe(false);
      serials.add(e.serial);
      expect(capacity.has(e.vessel), e.vessel).toBe(true);
      expect(Number(e.position)).toBeGreaterThanOrEqual(1);
      expect(Number(e.position)).toBeLessThanOrEqual(capacity.get(e.vessel)!);
      expect(e.installed_at).toMatch(isoWithOffset);
      if (e.removed_at) {
        expect(e.removed_at).toMatch(isoWithOffset);
        expect(ms(e.removed_at)).toBeGreaterThan(ms(e.installed_at));
        expect(['failed', 'performance', 'damaged', 'planned', 'relocated', 'sampled']).toContain(e.removal_reason);
      } else {
        expect(['', 'in service']).toContain(e.removal_reason);
      }
      const key = `${e.vessel}/${e.position}`;
      byPosition.set(key, [...(byPosition.get(key) ?? []), e]);
    }
    expect(new Set(elements.map((e) => e.model)).size).toBe(2);
    let inPlaceAtStart = 0;
    for (const [key, lives] of byPosition) {
      lives.sort((a, b) => ms(a.installed_at) - ms(b.installed_at));
      for (let i = 0; i + 1 < lives.length; i++) {
        expect(lives[i].removed_at, key).not.toBe('');
        expect(ms(lives[i].removed_at), key).toBeLessThanOrEqual(ms(lives[i + 1].installed_at));
      }
      expect(lives[lives.length - 1].removed_at, `${key} ends in service`).toBe('');
      const atStart = lives.filter((e) => ms(e.installed_at) <= start && (e.removed_at === '' || ms(e.removed_at) > start));
      expect(atStart, key).toHaveLength(1);
      expect(ms(lives[0].installed_at)).toBeLessThan(start - 365 * 86_400_000);
      inPlaceAtStart += atStart.length;
      expect(ms(lives[lives.length - 1].installed_at)).toBeLessThan(end);
    }
    expect(inPlaceAtStart).toBe([...capacity.values()].reduce((s, c) => s + c, 0));
  });

  it('keeps every work order in order: reported ≤ started ≤ completed, out-of-service from ≤ to', async () => {
    const orders = await readCsv(dirA, 'work-orders.csv');
    const assets = new Set((await readCsv(dirA, 'assets.csv')).map((a) => a.code));
    const numbers = new Set<string>();
    for (const w of orders) {
      expect(numbers.has(w.wo_number)).toBe(false);
      numbers.add(w.wo_number);
      expect(assets.has(w.asset), w.wo_number).toBe(true);
      expect(w.reported_at).toMatch(isoWithOffset);
      if (w.started_at) expect(ms(w.started_at), w.wo_number).toBeGreaterThanOrEqual(ms(w.reported_at));
      if (w.completed_at) {
        expect(w.started_at, w.wo_number).not.toBe('');
        expect(ms(w.completed_at), w.wo_number).toBeGreaterThanOrEqual(ms(w.started_at));
      }
      if (w.out_of_service_from && w.out_of_service_to) {
        expect(ms(w.out_of_service_to), w.wo_number).toBeGreaterThanOrEqual(ms(w.out_of_service_from));
      }
      if (w.status === 'closed') expect(w.completed_at, w.wo_number).not.toBe('');
      if (w.status === 'open') expect(w.started_at, w.wo_number).toBe('');
      if (w.status === 'in_progress') expect([w.started_at !== '', w.completed_at]).toEqual([true, '']);
      for (const money of [w.labour_hours, w.labour_cost, w.parts_cost]) if (money) expect(Number(money)).toBeGreaterThanOrEqual(0);
    }
    expect(new Set(orders.map((w) => w.type))).toEqual(new Set(['corrective', 'preventive', 'predictive', 'inspection', 'improvement']));
    expect(new Set(orders.map((w) => w.status))).toEqual(new Set(['open', 'in_progress', 'closed', 'cancelled']));
    expect(new Set(orders.map((w) => w.priority))).toEqual(new Set(['low', 'medium', 'high', 'emergency']));
    const pumpFailures = orders.filter((w) => w.type === 'corrective' && w.failure_code && w.asset.endsWith('HPP'));
    expect(pumpFailures.length).toBeGreaterThan(0);
    const codes = new Set(orders.map((w) => w.failure_code).filter(Boolean));
    for (const code of ['SEAL-LEAK', 'ELEM-BREACH', 'INST-DRIFT']) expect(codes.has(code), code).toBe(true);
  });

  it('gives every element-replacement work order its job steps, in order and inside the work order', async () => {
    const orders = await readCsv(dirA, 'work-orders.csv');
    const steps = await readCsv(dirA, 'job-steps.csv');
    const elements = await readCsv(dirA, 'elements.csv');
    const start = ms(manifest.options.start);
    const end = ms(manifest.options.end);
    const byWo = new Map<string, Row[]>();
    for (const s of steps) byWo.set(s.wo_number, [...(byWo.get(s.wo_number) ?? []), s]);
    const replacements = orders.filter((w) => /element/i.test(w.description) && /-V\d\d$/.test(w.asset) && w.status === 'closed');
    const removalsInWindow = elements.filter((e) => e.removed_at && ms(e.removed_at) >= start && ms(e.removed_at) < end);
    expect(replacements.length).toBe(removalsInWindow.length);
    expect(new Set(byWo.keys())).toEqual(new Set(replacements.map((w) => w.wo_number)));
    const technicians = new Set<string>();
    for (const wo of replacements) {
      const list = byWo.get(wo.wo_number)!.sort((a, b) => Number(a.step) - Number(b.step));
      expect(list.length).toBeGreaterThanOrEqual(8);
      expect(list.map((s) => Number(s.step))).toEqual(list.map((_, i) => i + 1));
      for (let i = 0; i < list.length; i++) {
        expect(ms(list[i].completed_at)).toBeGreaterThan(ms(list[i].started_at));
        if (i > 0) expect(ms(list[i].started_at)).toBeGreaterThanOrEqual(ms(list[i - 1].completed_at));
        expect(['yes', 'no']).toContain(list[i].guided);
        technicians.add(list[i].technician);
      }
      expect(ms(list[0].started_at)).toBe(ms(wo.started_at));
      expect(ms(list[list.length - 1].completed_at)).toBe(ms(wo.completed_at));
      // The removal in the element register falls inside the job.
      const removal = removalsInWindow.filter((e) => e.vessel === wo.asset && ms(e.removed_at) >= ms(wo.started_at) && ms(e.removed_at) <= ms(wo.completed_at));
      expect(removal.length, wo.wo_number).toBeGreaterThanOrEqual(1);
    }
    expect(steps.some((s) => s.guided === 'yes')).toBe(true);
    expect(steps.some((s) => s.guided === 'no')).toBe(true);
    for (const t of technicians) expect(t).toMatch(/^tech-\d\d$/);
  });

  it('shows each out-of-service window in the historian: train stopped, except for instrument work', async () => {
    const assets = await readCsv(dirA, 'assets.csv');
    const byCode = new Map(assets.map((a) => [a.code, a]));
    const trainOf = (code: string): string => (byCode.get(code)!.parent ? trainOf(byCode.get(code)!.parent) : code);
    const run = new Map<string, Map<number, string>>();
    const tagNames = new Set((await readCsv(dirA, 'tags.csv')).map((t) => t.tag));
    const allowedQuality = new Set(['good', 'uncertain', 'bad']);
    let rows = 0;
    for (const f of manifest.files.filter((x) => x.kind === 'historian')) {
      const text = await readFile(join(dirA, f.file), 'utf8');
      const lines = text.split('\n');
      for (let i = 1; i < lines.length; i++) {
        if (lines[i] === '') continue;
        rows++;
        const [timestamp, tag, value, quality] = lines[i].split(',');
        if (i < 2000) {
          expect(timestamp).toMatch(isoWithOffset);
          expect(tagNames.has(tag)).toBe(true);
          expect(Number.isFinite(Number(value))).toBe(true);
        }
        const q = Number(quality);
        expect(allowedQuality.has(quality) || (Number.isInteger(q) && q >= 0 && q <= 255)).toBe(true);
        const good = quality === 'good' || (Number.isInteger(q) && (q & 0xc0) === 0xc0);
        if (good && /^T\d\.RUN$/.test(tag)) {
          const train = tag.slice(0, 2);
          if (!run.has(train)) run.set(train, new Map());
          run.get(train)!.set(ms(timestamp), value);
        }
      }
    }
    expect(rows).toBe(manifest.historian.tags * manifest.historian.samplesPerTag);
    const orders = await readCsv(dirA, 'work-orders.csv');
    let checked = 0;
    for (const w of orders.filter((x) => x.out_of_service_from)) {
      const from = ms(w.out_of_service_from);
      const to = w.out_of_service_to ? ms(w.out_of_service_to) : Infinity;
      const instrument = byCode.get(w.asset)!.kind === 'instrument';
      for (const [t, value] of run.get(trainOf(w.asset))!) {
        if (t >= from && t < to) {
          expect(value, `${w.wo_number} ${w.asset} at ${new Date(t).toISOString()}`).toBe(instrument ? '1' : '0');
          checked++;
        }
      }
    }
    expect(checked).toBeGreaterThan(100);
  });

  it('splits the historian by quarter when asked', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'osmia-demo-q-'));
    try {
      const m = await generateDemoPlant({ outDir: dir, years: 0.5, stepMinutes: 360, historianSplit: 'quarter' });
      const files = m.files.filter((f) => f.kind === 'historian').map((f) => f.file);
      expect(files).toEqual(['historian-2026-q2.csv', 'historian-2026-q3.csv']);
      expect(m.historian.rows).toBe(m.historian.tags * m.historian.samplesPerTag);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });

  it('refuses bad options with a clear message', async () => {
    const outDir = join(tmpdir(), 'osmia-demo-never-written');
    await expect(generateDemoPlant({ outDir, stepMinutes: 7 })).rejects.toThrow(/stepMinutes must divide 1440/);
    await expect(generateDemoPlant({ outDir, end: '2026-10-01T00:00:00' })).rejects.toThrow(/with offset/);
    await expect(generateDemoPlant({ outDir, years: 0 })).rejects.toThrow(/years must be positive/);
    await expect(generateDemoPlant({ outDir, years: 12, end: '2020-01-01T00:00:00Z' })).rejects.toThrow(/commissioned/);
  });
});
