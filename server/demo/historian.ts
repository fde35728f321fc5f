import { join } from 'node:path';

import { CsvSink, type WrittenFile } from './csv-sink.ts';
import type { ElementInstall } from './elements.ts';
import type { DriftEpisode, HistoryWindow, MaintenancePlan, QualityWindow, TrainPlan } from './maintenance.ts';
import {
  type DemoPlant,
  type StageDesign,
  type StageQuantity,
  type TagRow,
  type TrainDesign,
  type Unit,
  stageQuantities,
} from './plant.ts';
import { Rng } from './random.ts';
import { DAY, HOUR, MINUTE } from './times.ts';

export const historianHeader = ['timestamp', 'tag', 'value', 'quality'] as const;

export interface HistorianFile extends WrittenFile {
  file: string;
  firstTimestamp: string | null;
  lastTimestamp: string | null;
}

export interface HistorianResult {
  files: HistorianFile[];
  rows: number;
  quality: { good: number; uncertain: number; bad: number };
}

export interface HistorianInput {
  plant: DemoPlant;
  tags: readonly TagRow[];
  plan: MaintenancePlan;
  elements: readonly ElementInstall[];
  window: HistoryWindow;
  stepMinutes: number;
  seed: string;
  split: 'year' | 'quarter';
  outDir: string;
}

/** Osmotic pressure per µS/cm: TDS = 0.67 × conductivity, 0.0689 bar per 100 mg/L (docs/design.md §6 defaults). */
export const osmoticBarPerUsCm = (0.0689 / 100) * 0.67;

/**
 * Temperature correction factor of docs/design.md §6 (common practice): exp(U(1/(273+T) − 1/298)),
 * U = 3020 K below 25 °C, 2640 K at or above. A 25 °C flow is the flow at T times TCF(T).
 */
export function temperatureCorrection(celsius: number): number {
  const u = celsius < 25 ? 3020 : 2640;
  return Math.exp(u * (1 / (273 + celsius) - 1 / 298));
}

/** Log-mean feed-brine concentration at recovery y (ASTM D4516 style). */
function feedBrineAverage(feed: number, recovery: number): number {
  return (feed * Math.log(1 / (1 - recovery))) / recovery;
}

const unitWriting: Record<Unit, { factor: number; offset: number; decimals: number }> = {
  bar: { factor: 1, offset: 0, decimals: 3 },
  psi: { factor: 14.503773773, offset: 0, decimals: 2 },
  kPa: { factor: 100, offset: 0, decimals: 1 },
  'm3/h': { factor: 1, offset: 0, decimals: 2 },
  gpm: { factor: 4.402867539, offset: 0, decimals: 1 },
  'L/s': { factor: 1 / 3.6, offset: 0, decimals: 3 },
  'uS/cm': { factor: 1, offset: 0, decimals: 1 },
  'mS/cm': { factor: 1 / 1000, offset: 0, decimals: 4 },
  degC: { factor: 1, offset: 0, decimals: 2 },
  degF: { factor: 1.8, offset: 32, decimals: 2 },
  '': { factor: 1, offset: 0, decimals: 0 },
};

/** Slots of a train's true values at one instant: run states, then 9 quantities per stage. */
const RUN = 0;
const HPP_RUN = 1;
const IBP_RUN = 2;
const stageSlot = (stage: 1 | 2, quantity: StageQuantity) => 3 + (stage - 1) * stageQuantities.length + stageQuantities.indexOf(quantity);
const slotCount = 3 + 2 * stageQuantities.length;

interface StageState {
  design: StageDesign;
  elements: number;
  /** Mean install instant of the elements in place: their mean age drives the permanent losses. */
  meanInstalledAt: number;
  fouling: number;
  dpRise: number;
  foulingPerDay: number;
  dpRisePerDay: number;
  recovery: number;
  permeateCond: number;
  permeateCondRunning: number;
  concentrateCond: number;
  episodeIndex: number;
}

interface TrainState {
  design: TrainDesign;
  plan: TrainPlan;
  stages: [StageState, StageState];
  stopIndex: number;
  cleaningIndex: number;
  swapIndex: number;
  running: boolean;
  changedAt: number;
  setpointBar: number;
  setpointDay: number;
  values: Float64Array;
}

interface TagState {
  row: TagRow;
  train: number;
  slot: number;
  write: { factor: number; offset: number; decimals: number };
  kind: 'run' | 'pressure' | 'flow' | 'conductivity' | 'temperature';
  quality: QualityWindow[];
  qualityIndex: number;
  drift: DriftEpisode[];
  driftIndex: number;
  prefix: string;
  lastValue: string | null;
}

/** Disjoint windows, each carrying the worst quality of the windows that cover it. */
function flattenQuality(windows: readonly QualityWindow[]): QualityWindow[] {
  if (windows.length === 0) return [];
  const points = [...new Set(windows.flatMap((w) => [w.from, w.to]))].sort((a, b) => a - b);
  const out: QualityWindow[] = [];
  for (let i = 0; i + 1 < points.length; i++) {
    const [a, b] = [points[i], points[i + 1]];
    let worst: QualityWindow | null = null;
    for (const w of windows) {
      if (w.from <= a && w.to >= b && (worst === null || (w.quality === 'bad' && worst.quality !== 'bad'))) worst = w;
    }
    if (worst === null) continue;
    const last = out[out.length - 1];
    if (last && last.to === a && last.quality === worst.quality && last.opc === worst.opc) last.to = b;
    else out.push({ from: a, to: b, quality: worst.quality, opc: worst.opc });
  }
  return out;
}

function periodOf(ms: number, split: 'year' | 'quarter'): { key: string; until: number } {
  const d = new Date(ms);
  const year = d.getUTCFullYear();
  if (split === 'year') return { key: String(year), until: Date.UTC(year + 1, 0, 1) };
  const quarter = Math.floor(d.getUTCMonth() / 3);
  return { key: `${year}-q${quarter + 1}`, until: Date.UTC(year, quarter * 3 + 3, 1) };
}

/**
 * Stream the long-format historian (`timestamp,tag,value,quality`), one file per UTC calendar year
 * or quarter, one row per tag and step. The process model: a seasonal feed temperature and
 * brackish feed conductivity; per stage, permeate flow = K·(1 − fouling − age loss)·NDP / TCF with
 * NDP from the feed pressure, half the differential pressure, the permeate pressure and the
 * log-mean osmotic pressure; salt flux follows the feed-brine concentration, so permeate
 * conductivity = salt passage at design flux × design flow / flow × feed-brine concentration.
 * The feed-pressure setpoint is trimmed once a day towards the design permeate flow.
 */
export async function writeHistorian(input: HistorianInput): Promise<HistorianResult> {
  const { plant, tags, plan, elements, window, stepMinutes, seed, split, outDir } = input;
  const env = new Rng(seed, 'environment');
  const noise = new Rng(seed, 'noise');
  const stateRng = new Rng(seed, 'process-state');
  const stepMs = stepMinutes * MINUTE;
  const stepDays = stepMs / DAY;
  const e = plant.environment;

  const trains: TrainState[] = plant.trains.map((design) => {
    const trainPlan = plan.trains.find((t) => t.train === design.code);
    if (!trainPlan) throw new Error(`no maintenance plan for ${design.code}`);
    const stageState = (stage: StageDesign): StageState => {
      const inPlace = elements.filter(
        (el) =>
          el.train === design.code &&
          el.stage === stage.index &&
          el.installedAt <= window.start &&
          (el.removedAt === null || el.removedAt > window.start),
      );
      const count = stage.vessels * stage.elementsPerVessel;
      if (inPlace.length !== count) throw new Error(`${design.code} stage ${stage.index}: ${inPlace.length} elements in place of ${count}`);
      return {
        design: stage,
        elements: count,
        meanInstalledAt: inPlace.reduce((s, el) => s + el.installedAt, 0) / count,
        fouling: stateRng.between(0, 0.04),
        dpRise: stateRng.between(0, 0.08),
        foulingPerDay: stateRng.inRange(stage.foulingPerMonth) / 30,
        dpRisePerDay: stateRng.inRange(stage.dpRisePerMonth) / 30,
        recovery: stage.designPermeateM3h / stage.designFeedM3h,
        permeateCond: 40,
        permeateCondRunning: 40,
        concentrateCond: 4000,
        episodeIndex: 0,
      };
    };
    return {
      design,
      plan: trainPlan,
      stages: [stageState(plant.stages[0]), stageState(plant.stages[1])],
      stopIndex: 0,
      cleaningIndex: 0,
      swapIndex: 0,
      running: true,
      changedAt: window.start - DAY,
      setpointBar: 0,
      setpointDay: Number.NaN,
      values: new Float64Array(slotCount),
    };
  });

  const commsWindows: QualityWindow[] = plan.commsOutages.map((o) => ({ ...o, quality: 'bad', opc: 24 }));
  const tagStates: TagState[] = tags.map((row) => {
    const trainIndex = plant.trains.findIndex((t) => t.code === row.train);
    const measuredBy = plant.instruments
      .filter((i) => row.stage !== null && (i.measures as readonly string[]).includes(`S${row.stage}.${row.quantity}`))
      .map((i) => `${row.train}-${i.suffix}`);
    const kind: TagState['kind'] =
      row.quantity === 'run_status'
        ? 'run'
        : row.quantity.endsWith('pressure')
          ? 'pressure'
          : row.quantity.endsWith('flow')
            ? 'flow'
            : row.quantity.endsWith('conductivity')
              ? 'conductivity'
              : 'temperature';
    return {
      row,
      train: trainIndex,
      slot:
        row.quantity === 'run_status'
          ? row.pump === 'HPP'
            ? HPP_RUN
            : row.pump === 'IBP'
              ? IBP_RUN
              : RUN
          : stageSlot(row.stage as 1 | 2, row.quantity),
      write: unitWriting[row.unit],
      kind,
      quality: flattenQuality([...commsWindows, ...measuredBy.flatMap((code) => plan.instrumentQuality.get(code) ?? [])]),
      qualityIndex: 0,
      drift: measuredBy.flatMap((code) => plan.instrumentDrift.get(code) ?? []).sort((a, b) => a.from - b.from),
      driftIndex: 0,
      prefix: `,${row.tag},`,
      lastValue: null,
    };
  });

  const qualityText = (style: 'words' | 'opc', quality: 'good' | 'uncertain' | 'bad', opc: number) =>
    style === 'words' ? quality : String(opc);
  const counts = { good: 0, uncertain: 0, bad: 0 };
  const files: HistorianFile[] = [];
  const { badShare, uncertainShare } = plant.sampleQuality;

  let temperatureAnomaly = e.temperatureAnomalyC * env.normal();
  let conductivityAnomaly = e.conductivityAnomalyUsCm * env.normal();
  const rhoT = Math.exp(-stepDays / e.temperatureAnomalyDays);
  const rhoC = Math.exp(-stepDays / e.conductivityAnomalyDays);
  const coldestDay = Date.UTC(2000, 0, e.temperatureColdestDayOfYear) / DAY;
  const peakDay = Date.UTC(2000, 0, e.conductivityPeakDayOfYear) / DAY;
  const yearDays = 365.2425;

  let sink: CsvSink | null = null;
  let current: HistorianFile | null = null;
  let periodUntil = -Infinity;
  const steps = Math.floor((window.end - window.start) / stepMs);

  const closeFile = async () => {
    if (sink && current) {
      Object.assign(current, await sink.close());
      files.push(current);
    }
    sink = null;
    current = null;
  };

  try {
    for (let k = 0; k < steps; k++) {
      const t = window.start + k * stepMs;
      if (t >= periodUntil) {
        await closeFile();
        const period = periodOf(t, split);
        periodUntil = period.until;
        const file = `historian-${period.key}.csv`;
        sink = CsvSink.open(join(outDir, file), historianHeader);
        current = { file, rows: 0, bytes: 0, sha256: '', firstTimestamp: null, lastTimestamp: null };
      }
      const ts = `${new Date(t).toISOString().slice(0, 19)}Z`;

      // Feed water shared by both trains.
      const day = t / DAY;
      temperatureAnomaly = temperatureAnomaly * rhoT + e.temperatureAnomalyC * Math.sqrt(1 - rhoT * rhoT) * env.normal();
      conductivityAnomaly = conductivityAnomaly * rhoC + e.conductivityAnomalyUsCm * Math.sqrt(1 - rhoC * rhoC) * env.normal();
      const hourUtc = (t % DAY) / HOUR;
      const temperature = Math.min(
        29.5,
        Math.max(
          10.5,
          e.temperatureMeanC -
            e.temperatureAmplitudeC * Math.cos((2 * Math.PI * (day - coldestDay)) / yearDays) +
            0.25 * Math.sin((2 * Math.PI * (hourUtc - 15)) / 24) +
            temperatureAnomaly,
        ),
      );
      const feedCond = Math.min(
        e.conductivityLimitsUsCm.max,
        Math.max(
          e.conductivityLimitsUsCm.min,
          e.conductivityMeanUsCm + e.conductivityAmplitudeUsCm * Math.cos((2 * Math.PI * (day - peakDay)) / yearDays) + conductivityAnomaly,
        ),
      );
      const tcf = temperatureCorrection(temperature);

      for (const train of trains) {
        advanceTrain(train, t, stepDays, env);
        computeTrain(train, t, temperature, feedCond, tcf, plant, env);
      }

      let chunk = '';
      for (const tag of tagStates) {
        const train = trains[tag.train];
        let quality: 'good' | 'uncertain' | 'bad' = 'good';
        let opc = 192;
        while (tag.qualityIndex < tag.quality.length && tag.quality[tag.qualityIndex].to <= t) tag.qualityIndex++;
        const window = tag.quality[tag.qualityIndex];
        if (window && window.from <= t) {
          quality = window.quality;
          opc = window.opc;
        } else {
          const u = noise.uniform();
          if (u < badShare) {
            quality = 'bad';
            opc = 0;
          } else if (u < badShare + uncertainShare) {
            quality = 'uncertain';
            opc = 64;
          }
        }
        let text: string;
        if (quality === 'bad' && tag.lastValue !== null) {
          text = tag.lastValue;
        } else if (tag.kind === 'run') {
          text = train.values[tag.slot] >= 0.5 ? '1' : '0';
        } else {
          const truth = train.values[tag.slot];
          while (tag.driftIndex < tag.drift.length && tag.drift[tag.driftIndex].to <= t) tag.driftIndex++;
          const drift = tag.drift[tag.driftIndex];
          const driftFactor = drift && drift.from <= t ? 1 + drift.perDay * ((t - drift.from) / DAY) : 1;
          const sigma =
            tag.kind === 'pressure'
              ? 0.004 * truth + 0.01
              : tag.kind === 'flow'
                ? 0.004 * truth + 0.03
                : tag.kind === 'conductivity'
                  ? 0.004 * truth + 0.2
                  : 0.05;
          let measured = truth * driftFactor + sigma * (quality === 'uncertain' ? 3 : 1) * noise.normal();
          if (tag.kind !== 'temperature') measured = Math.abs(measured);
          text = (measured * tag.write.factor + tag.write.offset).toFixed(tag.write.decimals);
          if (text.startsWith('-0') && Number(text) === 0) text = text.slice(1);
        }
        tag.lastValue = text;
        counts[quality]++;
        chunk += ts + tag.prefix + text + ',' + qualityText(tag.row.qualityStyle, quality, opc) + '\n';
      }
      const active = sink as CsvSink | null;
      const file = current as HistorianFile | null;
      if (!active || !file) throw new Error('historian file not open');
      active.appendLines(chunk, tagStates.length);
      if (file.firstTimestamp === null) file.firstTimestamp = ts;
      file.lastTimestamp = ts;
      await active.flushIfFull();
    }
    await closeFile();
  } catch (error) {
    (sink as CsvSink | null)?.destroy();
    throw error;
  }
  return { files, rows: files.reduce((s, f) => s + f.rows, 0), quality: counts };
}

/** Apply the events due by `t` (stops, cleanings, element swaps) and let fouling grow while running. */
function advanceTrain(train: TrainState, t: number, stepDays: number, env: Rng): void {
  const { stops, cleanings, swaps } = train.plan;
  while (train.stopIndex < stops.length && stops[train.stopIndex].to <= t) train.stopIndex++;
  const stop = stops[train.stopIndex];
  const running = !(stop && stop.from <= t);
  if (running !== train.running) {
    train.running = running;
    train.changedAt = t;
  }
  while (train.cleaningIndex < cleanings.length && cleanings[train.cleaningIndex].at <= t) {
    const cleaning = cleanings[train.cleaningIndex++];
    for (const stage of train.stages) {
      stage.fouling *= 1 - cleaning.foulingRecovered;
      stage.dpRise *= 1 - cleaning.dpRiseRecovered;
      stage.foulingPerDay = env.inRange(stage.design.foulingPerMonth) / 30;
      stage.dpRisePerDay = env.inRange(stage.design.dpRisePerMonth) / 30;
    }
  }
  while (train.swapIndex < swaps.length && swaps[train.swapIndex].at <= t) {
    const swap = swaps[train.swapIndex++];
    const stage = train.stages[swap.stage - 1];
    // The new element is clean and young: its share of fouling and age leaves the stage.
    stage.meanInstalledAt += (swap.at - swap.previousInstalledAt) / stage.elements;
    stage.fouling *= 1 - 1 / stage.elements;
  }
  if (running) {
    for (const stage of train.stages) {
      stage.fouling += stage.foulingPerDay * stepDays;
      stage.dpRise += stage.dpRisePerDay * stepDays;
    }
  }
}

function permanentLoss(stage: StageState, t: number): { loss: number; saltFactor: number } {
  const ageYears = (t - stage.meanInstalledAt) / (365.25 * DAY);
  return {
    loss: stage.design.irreversibleLossPerYear * ageYears,
    saltFactor: (1 + stage.design.saltPassageRisePerYear * ageYears) * (1 + stage.design.saltPassagePerFouling * stage.fouling),
  };
}

/** Solve one stage at feed flow, pressure and conductivity; returns concentrate pressure, flow, conductivity. */
function solveStage(
  stage: StageState,
  t: number,
  feedFlow: number,
  feedPressure: number,
  feedCond: number,
  tcf: number,
  conductivityFactor: number,
  values: Float64Array,
): { concentratePressure: number; concentrateFlow: number; concentrateCond: number } {
  const d = stage.design;
  const { loss, saltFactor } = permanentLoss(stage, t);
  const permeability = ((d.designPermeateM3h / d.designNdpBar) * Math.max(0.3, 1 - stage.fouling - loss)) / tcf;
  const designAverageFlow = d.designFeedM3h - d.designPermeateM3h / 2;
  let recovery = stage.recovery;
  let permeateCond = stage.permeateCondRunning;
  let dp = d.designDpBar;
  for (let i = 0; i < 5; i++) {
    const permeate = recovery * feedFlow;
    dp = d.designDpBar * (1 + stage.dpRise) * Math.pow((feedFlow - permeate / 2) / designAverageFlow, 1.5);
    const brine = feedBrineAverage(feedCond, recovery);
    const ndp = feedPressure - dp / 2 - d.permeatePressureBar - osmoticBarPerUsCm * (brine - permeateCond);
    const next = Math.min(0.9, Math.max(0.05, (permeability * Math.max(ndp, 0.05)) / feedFlow));
    recovery = 0.5 * recovery + 0.5 * next;
    permeateCond = d.designSaltPassage * saltFactor * conductivityFactor * (d.designPermeateM3h / (recovery * feedFlow)) * feedBrineAverage(feedCond, recovery);
  }
  const permeate = recovery * feedFlow;
  const concentrate = feedFlow - permeate;
  const concentrateCond = (feedFlow * feedCond - permeate * permeateCond) / concentrate;
  stage.recovery = recovery;
  stage.permeateCondRunning = permeateCond;
  stage.concentrateCond = concentrateCond;
  const s = d.index;
  values[stageSlot(s, 'feed_pressure')] = feedPressure;
  values[stageSlot(s, 'concentrate_pressure')] = feedPressure - dp;
  values[stageSlot(s, 'permeate_pressure')] = d.permeatePressureBar;
  values[stageSlot(s, 'feed_flow')] = feedFlow;
  values[stageSlot(s, 'permeate_flow')] = permeate;
  values[stageSlot(s, 'concentrate_flow')] = concentrate;
  values[stageSlot(s, 'feed_conductivity')] = feedCond;
  values[stageSlot(s, 'permeate_conductivity')] = permeateCond;
  return { concentratePressure: feedPressure - dp, concentrateFlow: concentrate, concentrateCond };
}

function conductivityFactorAt(train: TrainState, stage: 1 | 2, t: number): number {
  let factor = 1;
  for (const episode of train.plan.conductivityEpisodes) {
    if (episode.from > t) break;
    if (episode.stage === stage && episode.to > t) factor *= episode.factor;
  }
  return factor;
}

function computeTrain(train: TrainState, t: number, temperature: number, feedCond: number, tcf: number, plant: DemoPlant, env: Rng): void {
  const v = train.values;
  const [s1, s2] = train.stages;
  v[stageSlot(1, 'feed_temperature')] = temperature;
  v[stageSlot(2, 'feed_temperature')] = temperature + 0.15;
  if (!train.running) {
    v[RUN] = 0;
    v[HPP_RUN] = 0;
    v[IBP_RUN] = 0;
    const hoursStopped = (t - train.changedAt) / HOUR;
    const stagnation = 1 + 0.6 * (1 - Math.exp(-hoursStopped / 8));
    for (const [stage, state] of [
      [1, s1],
      [2, s2],
    ] as const) {
      v[stageSlot(stage, 'feed_pressure')] = 0.3;
      v[stageSlot(stage, 'concentrate_pressure')] = 0.22;
      v[stageSlot(stage, 'permeate_pressure')] = 0.05;
      v[stageSlot(stage, 'feed_flow')] = 0;
      v[stageSlot(stage, 'permeate_flow')] = 0;
      v[stageSlot(stage, 'concentrate_flow')] = 0;
      v[stageSlot(stage, 'permeate_conductivity')] = state.permeateCondRunning * stagnation;
    }
    v[stageSlot(1, 'feed_conductivity')] = feedCond;
    v[stageSlot(2, 'feed_conductivity')] = s1.concentrateCond;
    return;
  }
  v[RUN] = 1;
  v[HPP_RUN] = 1;
  v[IBP_RUN] = 1;

  // Daily trim of the feed-pressure setpoint towards the pressure the design permeate flow needs.
  const dayIndex = Math.floor(t / DAY);
  if (dayIndex !== train.setpointDay) {
    train.setpointDay = dayIndex;
    const d = s1.design;
    const { loss } = permanentLoss(s1, t);
    const designRecovery = d.designPermeateM3h / d.designFeedM3h;
    const osmotic = (cond: number) => osmoticBarPerUsCm * (feedBrineAverage(cond, designRecovery) - s1.permeateCondRunning);
    const fixed = d.designDpBar / 2 + d.permeatePressureBar;
    const design = d.designNdpBar + fixed + osmotic(plant.environment.conductivityMeanUsCm);
    const needed = (d.designNdpBar * tcf) / Math.max(0.3, 1 - s1.fouling - loss) + (d.designDpBar * s1.dpRise) / 2 + fixed + osmotic(feedCond);
    const limits = plant.control.feedPressureLimitsBar;
    train.setpointBar = Math.min(limits.max, Math.max(limits.min, design + plant.control.pressureTrimGain * (needed - design)));
  }
  const feedFlow = s1.design.designFeedM3h * (1 + 0.003 * env.normal());
  const feedPressure = train.setpointBar + 0.03 * env.normal();
  const flush = 1 + 1.5 * Math.exp(-(t - train.changedAt) / (12 * MINUTE));
  const first = solveStage(s1, t, feedFlow, feedPressure, feedCond, tcf, conductivityFactorAt(train, 1, t), v);
  solveStage(
    s2,
    t,
    first.concentrateFlow,
    first.concentratePressure + train.design.boostBar + 0.02 * env.normal(),
    first.concentrateCond,
    tcf,
    conductivityFactorAt(train, 2, t),
    v,
  );
  v[stageSlot(1, 'permeate_conductivity')] *= flush;
  v[stageSlot(2, 'permeate_conductivity')] *= flush;
}
