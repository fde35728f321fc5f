import { mkdir, readdir, rm, writeFile } from 'node:fs/promises';
import { join } from 'node:path';

import { z } from 'zod';

import { CsvSink, type WrittenFile } from './csv-sink.ts';
import { type ElementInstall, isLifeEnding, simulateElements } from './elements.ts';
import { historianHeader, writeHistorian } from './historian.ts';
import { type MaintenancePlan, type StopCause, type WoStatus, type WoType, planMaintenance } from './maintenance.ts';
import { importColumns } from '#shared/schemas/imports.ts';
import { type DemoPlant, demoPlant, plantAssets, plantTags, stageCode } from './plant.ts';
import { DAY, MINUTE, isoOrEmpty, isoUtc } from './times.ts';

// The canonical headers are the importers' own (docs/design.md §5), so generated files cannot drift from them.
export const assetsHeader = importColumns.assets;
export const tagsHeader = importColumns.tags;
export const workOrdersHeader = importColumns['work-orders'];
export const elementsHeader = importColumns.elements;
export const jobStepsHeader = importColumns['job-steps'];
export { historianHeader };

export const defaultDemoEnd = '2026-10-01T00:00:00Z';

export const demoOptionsSchema = z.object({
  /** Folder the files go to; created when missing. Stale historian-*.csv files in it are removed. */
  outDir: z.string().min(1, { error: 'outDir is required' }),
  seed: z.string().min(1).default('tamsel-flats'),
  /** Length of the historian window, ending at `end`. Whole numbers are calendar years. */
  years: z.number().positive({ error: 'years must be positive' }).max(12, { error: 'years must be at most 12' }).default(3),
  /** Historian step; must divide a day (1, 2, 3, 4, 5, 6, 10, 12, 15, 20, 30, 60, … minutes). */
  stepMinutes: z
    .number()
    .int({ error: 'stepMinutes must be a whole number' })
    .positive({ error: 'stepMinutes must be positive' })
    .refine((m) => 1440 % m === 0, { error: 'stepMinutes must divide 1440 (a day)' })
    .default(5),
  /** End of the history (exclusive), ISO 8601 with offset; never the clock, so output is reproducible. */
  end: z
    .union([z.string(), z.date()])
    .default(defaultDemoEnd)
    .transform((value, ctx) => {
      const ms = value instanceof Date ? value.getTime() : /(Z|[+-]\d\d:?\d\d)$/.test(value) ? Date.parse(value) : Number.NaN;
      if (!Number.isFinite(ms) || ms % MINUTE !== 0) {
        ctx.addIssue({ code: 'custom', message: 'end must be an ISO 8601 date-time with offset on a whole minute' });
        return z.NEVER;
      }
      return ms;
    }),
  /** One historian file per UTC calendar year or per quarter. */
  historianSplit: z.enum(['year', 'quarter']).default('year'),
});

export type DemoOptions = z.input<typeof demoOptionsSchema>;

export type DemoFileKind = 'assets' | 'tags' | 'elements' | 'work-orders' | 'job-steps' | 'historian';

export interface DemoFile extends WrittenFile {
  kind: DemoFileKind;
  file: string;
}

interface LifeCounts {
  installs: number;
  events: number;
  failed: number;
  performance: number;
  damaged: number;
  planned: number;
  sampled: number;
  relocated: number;
  inServiceAtEnd: number;
}

export interface DemoManifest {
  format: 'osmia-demo/1';
  site: { code: string; name: string; utility: string; town: string; timeZone: string };
  options: { seed: string; years: number; stepMinutes: number; start: string; end: string; historianSplit: 'year' | 'quarter' };
  /** In import order: assets first (it creates the site), then tags, registers, work orders, historian. */
  files: DemoFile[];
  historian: {
    start: string;
    end: string;
    stepMinutes: number;
    tags: number;
    samplesPerTag: number;
    rows: number;
    quality: { good: number; uncertain: number; bad: number };
  };
  planted: {
    elementLife: {
      /** Keyed by stage number; applies to the stages listed in `stages`. */
      byStage: Record<string, { shape: number; scaleDays: number; stages: string[] }>;
      lifeEndingReasons: Record<string, number>;
      censoring: { exponentialMeanDays: number; reasons: Record<string, number> };
      removalOnDayShift: { fromHour: number; toHour: number };
      inServiceTailHours: number;
      models: string[];
      modelEffectOnLife: 'none';
      commissioned: Record<string, string>;
    };
    pumps: { asset: string; mtbfHours: number; failureRatePerHour: number; failureModes: { code: string; share: number; repairMedianHours: number; repairSigma: number }[] }[];
    /** Per train, calendar-time exponential processes. */
    vesselOringMeanIntervalDays: number;
    filterHighDpMeanIntervalDays: number;
    tripMeanIntervalDays: number;
    instrumentDriftMeanIntervalDays: number;
    instrumentFailMeanIntervalDays: number;
    commsOutageMeanIntervalDays: number;
    jobs: {
      guidedFactor: number;
      learningExtra: number;
      learningJobs: number;
      stepSigma: number;
      jobSigma: number;
      formula: string;
      guidedShare: { atStart: number; atEnd: number };
      stepMedianMinutes: Record<string, number>;
    };
    performance: {
      temperatureCorrection: string;
      osmoticBarPerUsCm: number;
      stages: Record<string, { foulingPerMonth: { min: number; max: number }; dpRisePerMonth: { min: number; max: number }; irreversibleLossPerYear: number; saltPassageRisePerYear: number; saltPassagePerFouling: number }>;
      cleaning: { intervalDays: { min: number; max: number }; foulingRecovered: { min: number; max: number }; dpRiseRecovered: { min: number; max: number } };
    };
    sampleQuality: { uncertainShare: number; badShare: number };
  };
  realized: {
    elements: { byStage: Record<string, LifeCounts>; byStageAsset: Record<string, LifeCounts> };
    pumps: { asset: string; failures: number; operatingHours: number }[];
    trains: { train: string; runningHours: number; stops: number; stopHours: number; byCause: Record<StopCause, { count: number; hours: number }> }[];
    workOrders: { total: number; byType: Record<WoType, number>; byStatus: Record<WoStatus, number> };
    elementJobs: MaintenancePlan['elementJobs'];
  };
  /** The full plant definition the data was drawn from. */
  plant: DemoPlant;
}

const fixed = (x: number | null, digits: number) => (x === null ? '' : x.toFixed(digits));

/**
 * Write the demo plant's canonical import files into `options.outDir` and return the manifest
 * (also written as manifest.json). Deterministic: the same options give byte-identical files.
 */
export async function generateDemoPlant(options: DemoOptions): Promise<DemoManifest> {
  const parsed = demoOptionsSchema.safeParse(options);
  if (!parsed.success) throw new Error(`Invalid demo options:\n${z.prettifyError(parsed.error)}`);
  const { outDir, seed, years, stepMinutes, end, historianSplit } = parsed.data;
  const plant = demoPlant;
  const start = historyStart(end, years, stepMinutes);
  const latestCommissioning = Math.max(...plant.trains.map((t) => Date.parse(t.commissionedAt)));
  if (start < latestCommissioning + 365 * DAY) {
    throw new Error(`The history must start at least a year after the last train was commissioned (${isoUtc(latestCommissioning)}); got ${isoUtc(start)}`);
  }

  await mkdir(outDir, { recursive: true });
  for (const name of await readdir(outDir)) {
    if (/^historian-.*\.csv$/.test(name)) await rm(join(outDir, name));
  }

  const assets = plantAssets(plant);
  const tags = plantTags(plant);
  const elements = simulateElements(plant, seed, end);
  const plan = planMaintenance(plant, elements, { start, end }, seed);
  const files: DemoFile[] = [];
  const write = async (kind: DemoFileKind, file: string, header: readonly string[], rows: Iterable<readonly (string | number | null)[]>) => {
    const sink = CsvSink.open(join(outDir, file), header);
    try {
      for (const row of rows) await sink.writeRow(row);
      files.push({ kind, file, ...(await sink.close()) });
    } catch (error) {
      sink.destroy();
      throw error;
    }
  };

  await write(
    'assets',
    'assets.csv',
    assetsHeader,
    assets.map((a) => [a.code, a.name, a.kind, a.parent, a.ratedPermeateM3h, a.elementCapacity, a.rackRow, a.rackCol]),
  );
  await write('tags', 'tags.csv', tagsHeader, tags.map((t) => [t.tag, t.asset, t.quantity, t.unit]));
  await write(
    'elements',
    'elements.csv',
    elementsHeader,
    elements.map((e) => [
      e.serial,
      e.model,
      e.vessel,
      e.position,
      isoUtc(e.installedAt),
      isoOrEmpty(e.removedAt),
      // Train 2's register spells out "in service"; train 1's leaves it empty (both are valid).
      e.removalReason ?? (e.train === 'T2' ? 'in service' : ''),
    ]),
  );
  await write(
    'work-orders',
    'work-orders.csv',
    workOrdersHeader,
    plan.workOrders.map((w) => [
      w.woNumber,
      w.asset,
      w.type,
      w.priority,
      w.status,
      w.failureCode,
      w.description,
      isoUtc(w.reportedAt),
      isoOrEmpty(w.startedAt),
      isoOrEmpty(w.completedAt),
      isoOrEmpty(w.oosFrom),
      isoOrEmpty(w.oosTo),
      fixed(w.labourHours, 2),
      fixed(w.labourCost, 2),
      fixed(w.partsCost, 2),
      w.crew,
    ]),
  );
  await write(
    'job-steps',
    'job-steps.csv',
    jobStepsHeader,
    plan.jobSteps.map((s) => [s.woNumber, s.step, s.name, isoUtc(s.startedAt), isoUtc(s.completedAt), s.guided ? 'yes' : 'no', s.technician]),
  );
  const historian = await writeHistorian({ plant, tags, plan, elements, window: { start, end }, stepMinutes, seed, split: historianSplit, outDir });
  for (const f of historian.files) files.push({ kind: 'historian', file: f.file, rows: f.rows, bytes: f.bytes, sha256: f.sha256 });

  const manifest: DemoManifest = {
    format: 'osmia-demo/1',
    site: { ...plant.site },
    options: { seed, years, stepMinutes, start: isoUtc(start), end: isoUtc(end), historianSplit },
    files,
    historian: {
      start: isoUtc(start),
      end: isoUtc(end),
      stepMinutes,
      tags: tags.length,
      samplesPerTag: Math.floor((end - start) / (stepMinutes * MINUTE)),
      rows: historian.rows,
      quality: historian.quality,
    },
    planted: plantedParameters(plant),
    realized: realizedOutcomes(elements, plan),
    plant,
  };
  const json = `${JSON.stringify(manifest, null, 2)}\n`;
  await writeFile(join(outDir, 'manifest.json'), json, 'utf8');
  return manifest;
}

/** Start of the history: whole years back on the calendar, else years × 365.25 days rounded to the step. */
function historyStart(end: number, years: number, stepMinutes: number): number {
  if (Number.isInteger(years)) {
    const d = new Date(end);
    return Date.UTC(d.getUTCFullYear() - years, d.getUTCMonth(), d.getUTCDate(), d.getUTCHours(), d.getUTCMinutes());
  }
  const step = stepMinutes * MINUTE;
  return end - Math.round((years * 365.25 * DAY) / step) * step;
}

function plantedParameters(plant: DemoPlant): DemoManifest['planted'] {
  const { elements, jobs } = plant;
  return {
    elementLife: {
      byStage: Object.fromEntries(
        plant.stages.map((s) => [
          String(s.index),
          { shape: s.elementLife.shape, scaleDays: s.elementLife.scaleDays, stages: plant.trains.map((t) => stageCode(t.code, s.index)) },
        ]),
      ),
      lifeEndingReasons: { ...elements.lifeEndingReasons },
      censoring: { exponentialMeanDays: elements.censorMeanDays, reasons: { ...elements.censorReasons } },
      removalOnDayShift: { ...elements.dayShift },
      inServiceTailHours: elements.inServiceTailHours,
      models: elements.models.map((m) => m.name),
      modelEffectOnLife: 'none',
      commissioned: Object.fromEntries(plant.trains.map((t) => [t.code, t.commissionedAt])),
    },
    pumps: plant.trains.flatMap((t) =>
      t.pumps.map((p) => ({
        asset: `${t.code}-${p.suffix}`,
        mtbfHours: p.mtbfHours,
        failureRatePerHour: 1 / p.mtbfHours,
        failureModes: p.failureModes.map((m) => ({ code: m.code, share: m.share, repairMedianHours: m.repairMedianHours, repairSigma: m.repairSigma })),
      })),
    ),
    vesselOringMeanIntervalDays: plant.vessels.oringMeanIntervalDays,
    filterHighDpMeanIntervalDays: plant.filters.highDpMeanIntervalDays,
    tripMeanIntervalDays: plant.trips.meanIntervalDays,
    instrumentDriftMeanIntervalDays: plant.instrumentsMaintenance.driftMeanIntervalDays,
    instrumentFailMeanIntervalDays: plant.instrumentsMaintenance.failMeanIntervalDays,
    commsOutageMeanIntervalDays: plant.commsOutages.meanIntervalDays,
    jobs: {
      guidedFactor: jobs.guidedFactor,
      learningExtra: jobs.learningExtra,
      learningJobs: jobs.learningJobs,
      stepSigma: jobs.stepSigma,
      jobSigma: jobs.jobSigma,
      formula:
        'step minutes = max(2, round(median × exp(stepSigma·Z) × exp(jobSigma·Zjob) × speed)); speed = 1 unguided, ' +
        'guidedFactor × (1 + learningExtra × exp(−(k − 1) / learningJobs)) guided, where k counts the guided jobs ' +
        'led so far by the technician of step 1 (1 for the first); Z, Zjob standard normal',
      guidedShare: { ...jobs.guidedShare },
      stepMedianMinutes: Object.fromEntries(jobs.steps.map((s) => [s.name, s.medianMinutes])),
    },
    performance: {
      temperatureCorrection: 'TCF = exp(U(1/(273+T) − 1/298)), U = 3020 K below 25 °C, 2640 K at or above; permeate flow = K(1 − fouling − age loss)·NDP / TCF',
      osmoticBarPerUsCm: (0.0689 / 100) * 0.67,
      stages: Object.fromEntries(
        plant.stages.map((s) => [
          String(s.index),
          {
            foulingPerMonth: { ...s.foulingPerMonth },
            dpRisePerMonth: { ...s.dpRisePerMonth },
            irreversibleLossPerYear: s.irreversibleLossPerYear,
            saltPassageRisePerYear: s.saltPassageRisePerYear,
            saltPassagePerFouling: s.saltPassagePerFouling,
          },
        ]),
      ),
      cleaning: {
        intervalDays: { ...plant.cleaning.intervalDays },
        foulingRecovered: { ...plant.cleaning.foulingRecovered },
        dpRiseRecovered: { ...plant.cleaning.dpRiseRecovered },
      },
    },
    sampleQuality: { ...plant.sampleQuality },
  };
}

function realizedOutcomes(elements: readonly ElementInstall[], plan: MaintenancePlan): DemoManifest['realized'] {
  const empty = (): LifeCounts => ({ installs: 0, events: 0, failed: 0, performance: 0, damaged: 0, planned: 0, sampled: 0, relocated: 0, inServiceAtEnd: 0 });
  const byStage: Record<string, LifeCounts> = {};
  const byStageAsset: Record<string, LifeCounts> = {};
  for (const e of elements) {
    for (const counts of [(byStage[String(e.stage)] ??= empty()), (byStageAsset[stageCode(e.train, e.stage)] ??= empty())]) {
      counts.installs++;
      if (isLifeEnding(e.removalReason)) counts.events++;
      if (e.removalReason === null) counts.inServiceAtEnd++;
      else counts[e.removalReason]++;
    }
  }
  const byType: Record<WoType, number> = { corrective: 0, preventive: 0, predictive: 0, inspection: 0, improvement: 0 };
  const byStatus: Record<WoStatus, number> = { open: 0, in_progress: 0, closed: 0, cancelled: 0 };
  for (const w of plan.workOrders) {
    byType[w.type]++;
    byStatus[w.status]++;
  }
  const round = (x: number) => Math.round(x * 1000) / 1000;
  return {
    elements: { byStage, byStageAsset },
    pumps: plan.pumps.map((p) => ({ asset: p.asset, failures: p.failures, operatingHours: round(p.operatingHours) })),
    trains: plan.trains.map((t) => ({
      train: t.train,
      runningHours: round(t.runningHours),
      stops: t.stops.length,
      stopHours: round(t.stops.reduce((s, x) => s + (x.to - x.from), 0) / 3_600_000),
      byCause: t.stopsByCause,
    })),
    workOrders: { total: plan.workOrders.length, byType, byStatus },
    elementJobs: plan.elementJobs,
  };
}
