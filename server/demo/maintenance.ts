import type { ElementInstall, RemovalReason } from './elements.ts';
import {
  type DemoPlant,
  type FailureMode,
  type InstrumentDesign,
  type PumpDesign,
  type StageIndex,
  type TrainCode,
  pumpCode,
  vesselCode,
} from './plant.ts';
import { Rng } from './random.ts';
import { DAY, HOUR, MINUTE, localTimeOnDay, onDayShift, roundToMinute } from './times.ts';

export type WoType = 'corrective' | 'preventive' | 'predictive' | 'inspection' | 'improvement';
export type WoStatus = 'open' | 'in_progress' | 'closed' | 'cancelled';
export type WoPriority = 'low' | 'medium' | 'high' | 'emergency';

export interface WorkOrder {
  /** Internal link between a work order and its job steps until numbers are given. */
  key: number;
  woNumber: string;
  asset: string;
  type: WoType;
  priority: WoPriority;
  status: WoStatus;
  failureCode: string | null;
  description: string;
  reportedAt: number;
  startedAt: number | null;
  completedAt: number | null;
  oosFrom: number | null;
  oosTo: number | null;
  labourHours: number | null;
  labourCost: number | null;
  partsCost: number | null;
  crew: string | null;
}

export interface JobStep {
  woKey: number;
  woNumber: string;
  step: number;
  name: string;
  startedAt: number;
  completedAt: number;
  guided: boolean;
  technician: string;
}

export interface Interval {
  from: number;
  to: number;
}

/** The history window [start, end) in epoch milliseconds. */
export interface HistoryWindow {
  start: number;
  end: number;
}

export type StopCause =
  | 'element-job'
  | 'vessel-oring'
  | 'filter-high-dp'
  | 'pump-failure'
  | 'filter-change'
  | 'pump-service'
  | 'cleaning'
  | 'vessel-inspection'
  | 'trip';

interface Stop extends Interval {
  cause: StopCause;
  movable: boolean;
  /** Movable stops: what to build once the stop has its final place. */
  build?: (stop: Stop) => void;
  nominal: number;
  duration: number;
  /** Movable stops that may only start on the day shift. */
  dayShift: boolean;
  /** Trips are dropped rather than moved when they meet another stop. */
  dropOnConflict: boolean;
  /** What to do when a movable stop cannot be placed before the end. */
  unplaced?: () => void;
}

export interface CleaningEvent {
  at: number;
  foulingRecovered: number;
  dpRiseRecovered: number;
}

export interface SwapEvent {
  at: number;
  stage: StageIndex;
  previousInstalledAt: number;
}

export interface ConductivityEpisode extends Interval {
  stage: StageIndex;
  factor: number;
}

export interface QualityWindow extends Interval {
  quality: 'uncertain' | 'bad';
  /** OPC DA quality byte written by trains that use numeric quality. */
  opc: number;
}

export interface DriftEpisode extends Interval {
  /** Relative reading error per day since `from` (signed). */
  perDay: number;
}

export interface TrainPlan {
  train: TrainCode;
  /** Stops merged into disjoint, sorted intervals clipped to the window. */
  stops: Interval[];
  stopsByCause: Record<StopCause, { count: number; hours: number }>;
  cleanings: CleaningEvent[];
  swaps: SwapEvent[];
  conductivityEpisodes: ConductivityEpisode[];
  runningHours: number;
}

export interface PumpOutcome {
  asset: string;
  mtbfHours: number;
  failures: number;
  operatingHours: number;
}

export interface MaintenancePlan {
  workOrders: WorkOrder[];
  jobSteps: JobStep[];
  trains: TrainPlan[];
  pumps: PumpOutcome[];
  /** Keyed `T1-CIT-P1`: windows of uncertain or bad quality on every tag the instrument feeds. */
  instrumentQuality: Map<string, QualityWindow[]>;
  instrumentDrift: Map<string, DriftEpisode[]>;
  commsOutages: Interval[];
  elementJobs: {
    jobs: number;
    guidedJobs: number;
    meanHoursGuided: number | null;
    meanHoursUnguided: number | null;
    /** Guided jobs past the learning curve: the lead's guided-job count k > 3 × learningJobs. */
    guidedJobsAfterLearning: number;
    meanHoursGuidedAfterLearning: number | null;
  };
}

const stopCauses: readonly StopCause[] = [
  'element-job',
  'vessel-oring',
  'filter-high-dp',
  'pump-failure',
  'filter-change',
  'pump-service',
  'cleaning',
  'vessel-inspection',
  'trip',
];

const elementWork: Record<
  RemovalReason,
  { type: WoType; priority: WoPriority; failureCode: string | null; leadDays: { min: number; max: number }; text: string }
> = {
  failed: {
    type: 'corrective',
    priority: 'high',
    failureCode: 'ELEM-BREACH',
    leadDays: { min: 0.25, max: 2 },
    text: 'Permeate conductivity rise traced to a breached element; replace element',
  },
  damaged: {
    type: 'corrective',
    priority: 'high',
    failureCode: 'ELEM-DAMAGE',
    leadDays: { min: 0.2, max: 1.2 },
    text: 'Telescoped or cracked element found; replace element',
  },
  performance: {
    type: 'preventive',
    priority: 'medium',
    failureCode: null,
    leadDays: { min: 5, max: 20 },
    text: 'Low normalized performance; replace element',
  },
  planned: {
    type: 'preventive',
    priority: 'low',
    failureCode: null,
    leadDays: { min: 10, max: 30 },
    text: 'Planned element exchange',
  },
  sampled: {
    type: 'inspection',
    priority: 'low',
    failureCode: null,
    leadDays: { min: 10, max: 30 },
    text: 'Remove element for a laboratory autopsy sample; fit a new element',
  },
  relocated: {
    type: 'preventive',
    priority: 'low',
    failureCode: null,
    leadDays: { min: 10, max: 30 },
    text: 'Move element to the pilot test rig; fit a new element',
  },
};

const round2 = (x: number) => Math.round(x * 100) / 100;
const quarterHours = (x: number) => Math.max(0.25, Math.round(x * 4) / 4);

/** Merge intervals into disjoint sorted ones. */
export function mergeIntervals(intervals: readonly Interval[]): Interval[] {
  const sorted = [...intervals].sort((a, b) => a.from - b.from || a.to - b.to);
  const merged: Interval[] = [];
  for (const { from, to } of sorted) {
    const last = merged[merged.length - 1];
    if (last && from <= last.to) last.to = Math.max(last.to, to);
    else merged.push({ from, to });
  }
  return merged;
}

/**
 * Plan every maintenance event of the history window [start, end): element jobs at the element
 * register's removal instants, scheduled work moved off each other, pump failures from their
 * planted exponential processes counted in operating hours, instrument work while the train runs.
 * Returns the work orders, job steps, the stops the historian must show, and what was realized.
 */
export function planMaintenance(
  plant: DemoPlant,
  elements: readonly ElementInstall[],
  window: HistoryWindow,
  seed: string,
): MaintenancePlan {
  const rng = new Rng(seed, 'maintenance');
  const { timeZone } = plant.site;
  const { start, end } = window;
  const shift = plant.elements.dayShift;
  const dayShift = (ms: number) => onDayShift(ms, timeZone, shift.fromHour, shift.toHour);
  const workOrders: WorkOrder[] = [];
  const jobSteps: JobStep[] = [];
  let nextKey = 1;

  const crews = plant.crews;
  const mechanicalCrews = Object.keys(crews.mechanical) as (keyof typeof crews.mechanical)[];
  const onCallCrew = (ms: number) => mechanicalCrews[Math.floor((ms + 3 * DAY) / (7 * DAY)) % mechanicalCrews.length];

  const addWorkOrder = (
    wo: Omit<WorkOrder, 'key' | 'woNumber' | 'labourHours' | 'labourCost'> & { crewSize: number; rate: number },
  ): WorkOrder => {
    const { crewSize, rate, ...rest } = wo;
    const order: WorkOrder = {
      ...rest,
      key: nextKey++,
      woNumber: '',
      reportedAt: roundToMinute(rest.reportedAt),
      startedAt: rest.startedAt === null ? null : roundToMinute(rest.startedAt),
      completedAt: rest.completedAt === null ? null : roundToMinute(rest.completedAt),
      oosFrom: rest.oosFrom === null ? null : roundToMinute(rest.oosFrom),
      oosTo: rest.oosTo === null ? null : roundToMinute(rest.oosTo),
      labourHours: null,
      labourCost: null,
    };
    clipToEnd(order, end);
    if (order.status !== 'open' && order.status !== 'cancelled' && order.startedAt !== null) {
      const until = order.completedAt ?? end;
      // A job of a shift or less is worked throughout; a longer one is worked one 8-hour shift per
      // calendar day, not around the clock; one still in progress has had at most five shifts so far
      // (it is worked in between other jobs).
      const elapsedHours = (until - order.startedAt) / HOUR;
      const shifts = Math.ceil(elapsedHours / 24);
      const workedHours = elapsedHours <= 12 ? elapsedHours : (order.completedAt === null ? Math.min(shifts, 5) : shifts) * 8;
      const hours = quarterHours(crewSize * workedHours * rng.between(0.85, 1));
      order.labourHours = hours;
      order.labourCost = round2(hours * rate);
    } else {
      order.partsCost = null;
    }
    if (order.reportedAt < end) workOrders.push(order);
    return order;
  };

  // ---- 1. Element jobs, in time order over both trains (crews, guided share and learning are plant-wide).
  const stopsByTrain = new Map<TrainCode, Stop[]>(plant.trains.map((t) => [t.code, []]));
  const swapsByTrain = new Map<TrainCode, SwapEvent[]>(plant.trains.map((t) => [t.code, []]));
  const episodesByTrain = new Map<TrainCode, ConductivityEpisode[]>(plant.trains.map((t) => [t.code, []]));
  const swaps = elements
    .filter((e) => e.removedAt !== null && e.removedAt >= start && e.removedAt < end)
    .sort((a, b) => (a.removedAt as number) - (b.removedAt as number) || a.vessel.localeCompare(b.vessel) || a.position - b.position);
  const successorPrice = new Map<string, number>();
  for (const e of elements) successorPrice.set(`${e.vessel}/${e.position}/${e.installedAt}`, e.price);

  const { jobs } = plant;
  const guidedCount = new Map<string, number>();
  const busy: { crew: string; from: number; to: number }[] = [];
  const jobHours = { guided: [] as number[], unguided: [] as number[], afterLearning: [] as number[] };
  for (const removal of swaps) {
    const swapAt = removal.removedAt as number;
    const reason = removal.removalReason as RemovalReason;
    const progress = (swapAt - start) / (end - start);
    const guided = rng.chance(jobs.guidedShare.atStart + (jobs.guidedShare.atEnd - jobs.guidedShare.atStart) * progress);
    let crew = onCallCrew(swapAt);
    const members = () => crews.mechanical[crew];
    // A crew busy on another vessel hands the job to the next crew.
    for (let tries = 0; tries < mechanicalCrews.length; tries++) {
      const clash = busy.some((b) => b.crew === crew && b.from < swapAt + 6 * HOUR && b.to > swapAt - 6 * HOUR);
      if (!clash) break;
      crew = mechanicalCrews[(mechanicalCrews.indexOf(crew) + 1) % mechanicalCrews.length];
    }
    const lead = rng.pick(members());
    const partner = rng.pick(members().filter((m) => m !== lead));
    let speed = 1;
    let k = 0;
    if (guided) {
      k = (guidedCount.get(lead) ?? 0) + 1;
      guidedCount.set(lead, k);
      speed = jobs.guidedFactor * (1 + jobs.learningExtra * Math.exp(-(k - 1) / jobs.learningJobs));
    }
    const jobFactor = rng.lognormal(1, jobs.jobSigma);
    const minutes = jobs.steps.map((s) => Math.max(2, Math.round(s.medianMinutes * rng.lognormal(1, jobs.stepSigma) * jobFactor * speed)));
    const gaps = jobs.steps.map(() => rng.int(jobs.gapMinutes.min, jobs.gapMinutes.max));
    const starts = new Array<number>(jobs.steps.length);
    const ends = new Array<number>(jobs.steps.length);
    const pivot = jobs.swapAfterStep;
    ends[pivot] = swapAt;
    starts[pivot] = swapAt - minutes[pivot] * MINUTE;
    for (let i = pivot - 1; i >= 0; i--) {
      ends[i] = starts[i + 1] - gaps[i] * MINUTE;
      starts[i] = ends[i] - minutes[i] * MINUTE;
    }
    for (let i = pivot + 1; i < jobs.steps.length; i++) {
      starts[i] = ends[i - 1] + gaps[i - 1] * MINUTE;
      ends[i] = starts[i] + minutes[i] * MINUTE;
    }
    const oosFrom = starts[0] - rng.int(0, 10) * MINUTE;
    const oosTo = ends[ends.length - 1];
    const work = elementWork[reason];
    const reportedAt = Math.min(oosFrom - rng.between(1, 3) * HOUR, oosFrom - rng.inRange(work.leadDays) * DAY);
    const newPrice = successorPrice.get(`${removal.vessel}/${removal.position}/${swapAt}`) ?? 0;
    const wo = addWorkOrder({
      asset: removal.vessel,
      type: work.type,
      priority: work.priority,
      status: 'closed',
      failureCode: work.failureCode,
      description: `${work.text} at position ${removal.position} (serial ${removal.serial})`,
      reportedAt,
      startedAt: starts[0],
      completedAt: oosTo,
      oosFrom,
      oosTo,
      partsCost: newPrice + plant.elements.sealKitCost,
      crew,
      crewSize: 2,
      rate: crews.mechanicalRatePerHour,
    });
    busy.push({ crew, from: oosFrom, to: oosTo });
    const permitUnguided = guided && rng.chance(jobs.permitStepUnguidedShare);
    jobs.steps.forEach((step, i) => {
      jobSteps.push({
        woKey: wo.key,
        woNumber: '',
        step: i + 1,
        name: step.name,
        startedAt: starts[i],
        completedAt: ends[i],
        guided: guided && !(i === 1 && permitUnguided),
        technician: step.byLead ? lead : partner,
      });
    });
    (guided ? jobHours.guided : jobHours.unguided).push((oosTo - starts[0]) / HOUR);
    if (k > 3 * jobs.learningJobs) jobHours.afterLearning.push((oosTo - starts[0]) / HOUR);
    stopsByTrain.get(removal.train)!.push({
      from: oosFrom,
      to: oosTo,
      cause: 'element-job',
      movable: false,
      nominal: oosFrom,
      duration: oosTo - oosFrom,
      dayShift: false,
      dropOnConflict: false,
    });
    swapsByTrain.get(removal.train)!.push({ at: swapAt, stage: removal.stage, previousInstalledAt: removal.installedAt });
    if (reason === 'failed') {
      const onset = reportedAt - rng.between(4, 24) * HOUR;
      episodesByTrain.get(removal.train)!.push({
        stage: removal.stage,
        from: onset,
        to: oosFrom,
        factor: rng.inRange(plant.vessels.breachConductivityFactor),
      });
    }
  }

  // ---- 2. Scheduled and calendar-time stops of each train, placed so they do not overlap.
  const cleaningsByTrain = new Map<TrainCode, CleaningEvent[]>(plant.trains.map((t) => [t.code, []]));
  const placeBuffer = HOUR;

  const overlapping = (stops: readonly Stop[], from: number, to: number, buffer: number) =>
    stops.find((s) => s.from < to + buffer && s.to + buffer > from);

  /** Put a movable stop at its nominal time or the first free slot after it; false if none before the end. */
  const place = (stops: Stop[], stop: Stop, notBefore: number): boolean => {
    let at = Math.max(stop.nominal, notBefore);
    if (stop.dayShift) at = dayShift(at);
    for (let guard = 0; guard < 10_000; guard++) {
      if (at >= end) return false;
      const clash = overlapping(stops, at, at + stop.duration, placeBuffer);
      if (!clash) {
        stop.from = at;
        stop.to = at + stop.duration;
        stops.push(stop);
        stops.sort((a, b) => a.from - b.from);
        return true;
      }
      if (stop.dropOnConflict) return false;
      at = clash.to + placeBuffer;
      if (stop.dayShift) at = dayShift(at);
    }
    throw new Error('could not place a scheduled stop');
  };

  const movableByTrain = new Map<TrainCode, Stop[]>();
  for (const train of plant.trains) {
    const movable: Stop[] = [];
    const T = train.code;
    const scheduleAt = (offsetDays: number) => localTimeOnDay(start + offsetDays * DAY, timeZone, 0, 7, 30 + rng.int(0, 60));
    const movableStop = (cause: StopCause, at: number, length: number, dayShiftOnly: boolean): Stop => {
      const nominal = roundToMinute(at);
      const duration = Math.max(MINUTE, roundToMinute(length));
      return {
        from: nominal,
        to: nominal + duration,
        cause,
        movable: true,
        nominal,
        duration,
        dayShift: dayShiftOnly,
        dropOnConflict: cause === 'trip',
      };
    };
    const scheduledWork = (
      stop: Stop,
      wo: { asset: string; type: WoType; description: string; partsCost: number; crewSize: number; priority: WoPriority },
    ) => {
      const reportedAt = stop.nominal - rng.between(3, 10) * DAY;
      stop.build = (s) => {
        addWorkOrder({
          ...wo,
          status: 'closed',
          failureCode: null,
          reportedAt,
          startedAt: s.from + rng.int(5, 15) * MINUTE,
          completedAt: s.to - rng.int(5, 15) * MINUTE,
          oosFrom: s.from,
          oosTo: s.to,
          crew: onCallCrew(s.from),
          rate: crews.mechanicalRatePerHour,
        });
      };
      stop.unplaced = () => {
        addWorkOrder({
          ...wo,
          status: 'open',
          failureCode: null,
          reportedAt,
          startedAt: null,
          completedAt: null,
          oosFrom: null,
          oosTo: null,
          crew: onCallCrew(stop.nominal),
          rate: crews.mechanicalRatePerHour,
        });
      };
      movable.push(stop);
    };

    // Cartridge filter changes.
    const f = plant.filters;
    for (let day = rng.between(2, 30); ; day += rng.inRange(f.changeIntervalDays)) {
      const nominal = scheduleAt(day);
      if (nominal - 10 * DAY >= end) break;
      scheduledWork(movableStop('filter-change', nominal, rng.inRange(f.changeHours) * HOUR, true), {
        asset: `${T}-CF`,
        type: 'preventive',
        priority: 'low',
        description: 'Monthly cartridge filter change',
        partsCost: round2(rng.inRange(f.cartridgeSetCost)),
        crewSize: 1,
      });
    }
    // Pump services, six-monthly, the booster offset from the high-pressure pump.
    train.pumps.forEach((pump, i) => {
      for (let day = rng.between(20, 90) + i * 75; ; day += pump.serviceIntervalDays + rng.between(-10, 10)) {
        const nominal = scheduleAt(day);
        if (nominal - 10 * DAY >= end) break;
        const ps = plant.pumpService;
        scheduledWork(movableStop('pump-service', nominal, rng.lognormal(ps.durationMedianHours, ps.durationSigma) * HOUR, true), {
          asset: pumpCode(T, pump.suffix),
          type: 'preventive',
          priority: 'medium',
          description: 'Six-monthly pump service: alignment check, bearing lubrication, seal inspection',
          partsCost: round2(rng.inRange(ps.partsCost)),
          crewSize: 2,
        });
      }
    });
    // Cleanings in place; each one restores part of the fouling (applied when the stop ends).
    const c = plant.cleaning;
    for (let day = rng.between(30, 120); ; day += rng.inRange(c.intervalDays)) {
      const nominal = scheduleAt(day);
      if (nominal - 10 * DAY >= end) break;
      const stop = movableStop('cleaning', nominal, rng.inRange(c.durationHours) * HOUR, true);
      const foulingRecovered = rng.inRange(c.foulingRecovered);
      const dpRiseRecovered = rng.inRange(c.dpRiseRecovered);
      scheduledWork(stop, {
        asset: T,
        type: 'preventive',
        priority: 'medium',
        description: 'Clean in place, stages 1 and 2: alkaline then acid solution',
        partsCost: round2(rng.inRange(c.chemicalCost)),
        crewSize: 2,
      });
      const buildWo = stop.build!;
      stop.build = (s) => {
        buildWo(s);
        if (s.to <= end) cleaningsByTrain.get(T)!.push({ at: s.to, foulingRecovered, dpRiseRecovered });
      };
    }
    // Annual vessel inspection.
    const vi = plant.vesselInspection;
    for (let day = rng.between(100, 300); ; day += vi.intervalDays + rng.between(-20, 20)) {
      const nominal = scheduleAt(day);
      if (nominal - 10 * DAY >= end) break;
      scheduledWork(movableStop('vessel-inspection', nominal, rng.inRange(vi.durationHours) * HOUR, true), {
        asset: T,
        type: 'inspection',
        priority: 'low',
        description: 'Annual vessel inspection: end caps, locking rings, saddles and clamps',
        partsCost: 0,
        crewSize: 2,
      });
    }
    // Interconnector O-ring leaks: calendar-time exponential; the stage's permeate conductivity rises
    // from the leak until the vessel is opened on a day shift.
    const vs = plant.vessels;
    for (let t = start + rng.exponential(vs.oringMeanIntervalDays) * DAY; t < end; t += rng.exponential(vs.oringMeanIntervalDays) * DAY) {
      const stage = plant.stages[rng.int(0, plant.stages.length - 1)];
      const vessel = vesselCode(T, stage.index, rng.int(1, stage.vessels));
      const reportedAt = t + rng.between(6, 30) * HOUR;
      const nominal = reportedAt + rng.between(2, 20) * HOUR;
      const stop = movableStop('vessel-oring', nominal, rng.inRange(vs.oringRepairHours) * HOUR, true);
      const factor = rng.inRange(vs.oringConductivityFactor);
      const crewSize = 2;
      const parts = round2(rng.between(60, 140));
      stop.build = (s) => {
        addWorkOrder({
          asset: vessel,
          type: 'corrective',
          priority: 'high',
          status: 'closed',
          failureCode: 'ORING',
          description: 'Permeate conductivity high on this vessel; interconnector O-rings replaced',
          reportedAt,
          startedAt: s.from + rng.int(5, 10) * MINUTE,
          completedAt: s.to - rng.int(10, 20) * MINUTE,
          oosFrom: s.from,
          oosTo: s.to,
          partsCost: parts,
          crew: onCallCrew(s.from),
          crewSize,
          rate: crews.mechanicalRatePerHour,
        });
        episodesByTrain.get(T)!.push({ stage: stage.index, from: t, to: s.from, factor });
      };
      movable.push(stop);
    }
    // Cartridge filter high differential pressure: calendar-time exponential, immediate short stop.
    for (let t = start + rng.exponential(f.highDpMeanIntervalDays) * DAY; t < end; t += rng.exponential(f.highDpMeanIntervalDays) * DAY) {
      const stop = movableStop('filter-high-dp', t, rng.inRange(f.changeHours) * HOUR, false);
      const parts = round2(rng.inRange(f.cartridgeSetCost));
      stop.build = (s) => {
        const reportedAt = s.from + rng.int(1, 5) * MINUTE;
        addWorkOrder({
          asset: `${T}-CF`,
          type: 'corrective',
          priority: 'medium',
          status: 'closed',
          failureCode: 'FILTER-DP',
          description: 'High differential pressure across the cartridge filter; cartridges changed early',
          reportedAt,
          startedAt: reportedAt + rng.int(5, 15) * MINUTE,
          completedAt: s.to - rng.int(2, 8) * MINUTE,
          oosFrom: s.from,
          oosTo: s.to,
          partsCost: parts,
          crew: onCallCrew(s.from),
          crewSize: 1,
          rate: crews.mechanicalRatePerHour,
        });
      };
      movable.push(stop);
    }
    // Nuisance trips (supply dips): short stops with no work order.
    for (let t = start + rng.exponential(plant.trips.meanIntervalDays) * DAY; t < end; t += rng.exponential(plant.trips.meanIntervalDays) * DAY) {
      movable.push(movableStop('trip', t, rng.inRange(plant.trips.minutes) * MINUTE, false));
    }
    movable.sort((a, b) => a.nominal - b.nominal);
    const stops = stopsByTrain.get(T)!;
    stops.sort((a, b) => a.from - b.from);
    const placedMovable: Stop[] = [];
    for (const stop of movable) {
      if (place(stops, stop, start)) placedMovable.push(stop);
      else stop.unplaced?.();
    }
    movableByTrain.set(T, placedMovable);
  }

  // ---- 3. Pump failures: each pump's clock runs only while its train runs (both pumps run with the train).
  const pumpOutcomes: PumpOutcome[] = [];
  const runningHoursByTrain = new Map<TrainCode, number>();
  for (const train of plant.trains) {
    const T = train.code;
    const stops = stopsByTrain.get(T)!;
    const remaining = train.pumps.map((p) => rng.exponential(p.mtbfHours));
    const failures = train.pumps.map(() => 0);
    let cursor = start;
    while (cursor < end) {
      const inside = stops.find((s) => s.from <= cursor && s.to > cursor);
      if (inside) {
        cursor = inside.to;
        continue;
      }
      const next = stops.find((s) => s.from > cursor);
      const until = Math.min(next ? next.from : end, end);
      const spanHours = (until - cursor) / HOUR;
      let first = 0;
      for (let i = 1; i < remaining.length; i++) if (remaining[i] < remaining[first]) first = i;
      if (remaining[first] >= spanHours) {
        for (let i = 0; i < remaining.length; i++) remaining[i] -= spanHours;
        cursor = until;
        continue;
      }
      const failedAt = Math.min(Math.max(roundToMinute(cursor + remaining[first] * HOUR), cursor), until - MINUTE);
      const ran = (failedAt - cursor) / HOUR;
      for (let i = 0; i < remaining.length; i++) remaining[i] -= ran;
      const pump = train.pumps[first];
      remaining[first] = rng.exponential(pump.mtbfHours);
      failures[first]++;
      const stopTo = pumpFailure(T, pump, failedAt);
      const failureStop: Stop = {
        from: failedAt,
        to: stopTo,
        cause: 'pump-failure',
        movable: false,
        nominal: failedAt,
        duration: stopTo - failedAt,
        dayShift: false,
        dropOnConflict: false,
      };
      // Scheduled work that would have fallen inside the repair waits until the pump is back.
      const displaced = stops.filter((s) => s.movable && s.from > failedAt && s.from < stopTo + placeBuffer);
      for (const s of displaced) stops.splice(stops.indexOf(s), 1);
      stops.push(failureStop);
      stops.sort((a, b) => a.from - b.from);
      const placed = movableByTrain.get(T)!;
      for (const s of displaced) {
        placed.splice(placed.indexOf(s), 1);
        if (place(stops, s, stopTo + placeBuffer)) placed.push(s);
        else s.unplaced?.();
      }
      cursor = failedAt;
    }
    for (const s of movableByTrain.get(T)!) s.build?.(s);
    const merged = mergeIntervals(stops.map((s) => ({ from: Math.max(s.from, start), to: Math.min(s.to, end) })).filter((s) => s.to > s.from));
    const runningHours = (end - start - merged.reduce((sum, s) => sum + (s.to - s.from), 0)) / HOUR;
    runningHoursByTrain.set(T, runningHours);
    train.pumps.forEach((pump, i) => {
      pumpOutcomes.push({ asset: pumpCode(T, pump.suffix), mtbfHours: pump.mtbfHours, failures: failures[i], operatingHours: runningHours });
    });
  }

  function pumpFailure(T: TrainCode, pump: PumpDesign, failedAt: number): number {
    const mode = pickMode(pump.failureModes);
    const pr = plant.pumpsRepair;
    const reportedAt = failedAt + rng.int(2, 15) * MINUTE;
    const startedAt = reportedAt + rng.lognormal(pr.responseMedianHours, pr.responseSigma) * HOUR;
    const completedAt = startedAt + rng.lognormal(mode.repairMedianHours, mode.repairSigma) * HOUR;
    const oosTo = completedAt + rng.inRange(pr.restartMinutes) * MINUTE;
    const asset = pumpCode(T, pump.suffix);
    const crew = onCallCrew(failedAt);
    const original = addWorkOrder({
      asset,
      type: 'corrective',
      priority: pump.suffix === 'HPP' ? 'emergency' : 'high',
      status: 'closed',
      failureCode: mode.code,
      description: mode.description,
      reportedAt,
      startedAt,
      completedAt,
      oosFrom: failedAt,
      oosTo,
      partsCost: round2(rng.inRange(mode.partsCost)),
      crew,
      crewSize: 2,
      rate: crews.mechanicalRatePerHour,
    });
    if (rng.chance(pr.duplicateShare)) {
      addWorkOrder({
        asset,
        type: 'corrective',
        priority: original.priority,
        status: 'cancelled',
        failureCode: null,
        description: 'Duplicate request for the same pump fault; cancelled',
        reportedAt: reportedAt + rng.int(5, 40) * MINUTE,
        startedAt: null,
        completedAt: null,
        oosFrom: null,
        oosTo: null,
        partsCost: null,
        crew: null,
        crewSize: 0,
        rate: 0,
      });
    }
    return Math.round(oosTo / MINUTE) * MINUTE;
  }

  function pickMode(modes: readonly FailureMode[]): FailureMode {
    const code = rng.weighted(Object.fromEntries(modes.map((m) => [m.code, m.share])) as Record<string, number>);
    return modes.find((m) => m.code === code)!;
  }

  // ---- 4. Instruments: calibrations, drifts (found by a cross-check or at calibration) and outright
  // failures, all placed while the train runs so they never overlap a train stop.
  const instrumentQuality = new Map<string, QualityWindow[]>();
  const instrumentDrift = new Map<string, DriftEpisode[]>();
  const im = plant.instrumentsMaintenance;
  const instrumentCrew = Object.keys(crews.instrument)[0];
  for (const train of plant.trains) {
    const T = train.code;
    const trainStops = mergeIntervals(stopsByTrain.get(T)!);
    const clearOfStops = (from: number, to: number) => trainStops.find((s) => s.from < to + 30 * MINUTE && s.to + 30 * MINUTE > from);
    /** First slot at or after `at` (day shift if asked) where [slot, slot + duration) misses every stop. */
    const runningSlot = (at: number, duration: number, onShift: boolean) => {
      let slot = roundToMinute(onShift ? dayShift(at) : at);
      for (let clash = clearOfStops(slot, slot + duration); clash; clash = clearOfStops(slot, slot + duration)) {
        slot = roundToMinute(clash.to + 30 * MINUTE + (onShift ? 0 : rng.between(1, 24) * HOUR));
        if (onShift) slot = dayShift(slot);
      }
      return slot;
    };
    for (const instrument of plant.instruments) {
      const code = `${T}-${instrument.suffix}`;
      const quality: QualityWindow[] = [];
      const drift: DriftEpisode[] = [];
      instrumentQuality.set(code, quality);
      instrumentDrift.set(code, drift);
      const calibrations: number[] = [];
      for (let day = rng.between(10, im.calibrationIntervalDays); ; day += im.calibrationIntervalDays + rng.between(-15, 15)) {
        const nominal = localTimeOnDay(start + day * DAY, timeZone, 0, 8, rng.int(0, 120));
        if (nominal - 14 * DAY >= end) break;
        calibrations.push(nominal);
      }
      const failures = instrumentFailures(instrument, calibrations, runningSlot, code, quality, drift);
      for (const nominal of calibrations) {
        if (failures.consumed.has(nominal)) continue;
        const duration = roundToMinute(rng.inRange(im.calibrationHours) * HOUR);
        const from = runningSlot(nominal, duration, true);
        addWorkOrder({
          asset: code,
          type: 'inspection',
          priority: 'low',
          status: from < end ? 'closed' : 'open',
          failureCode: null,
          description: `Six-monthly calibration of the ${instrument.name}`,
          reportedAt: nominal - rng.between(7, 14) * DAY,
          startedAt: from < end ? from : null,
          completedAt: from < end ? from + duration : null,
          oosFrom: from < end ? from : null,
          oosTo: from < end ? from + duration : null,
          partsCost: 0,
          crew: instrumentCrew,
          crewSize: 1,
          rate: crews.instrumentRatePerHour,
        });
        quality.push({ from, to: from + duration, quality: 'uncertain', opc: 84 });
      }
    }
  }

  function instrumentFailures(
    instrument: InstrumentDesign,
    calibrations: number[],
    runningSlot: (at: number, duration: number, onShift: boolean) => number,
    code: string,
    quality: QualityWindow[],
    drift: DriftEpisode[],
  ): { consumed: Set<number> } {
    const consumed = new Set<number>();
    if (instrument.failure === 'drift') {
      for (let onset = start + rng.exponential(im.driftMeanIntervalDays) * DAY; onset < end; ) {
        let detected = dayShift(onset + rng.inRange(im.driftDetectDays) * DAY);
        const atCalibration = calibrations.find((c) => c > onset && c <= detected && !consumed.has(c));
        if (atCalibration !== undefined) {
          detected = atCalibration;
          consumed.add(atCalibration);
        }
        const magnitude = rng.inRange(im.driftAtDetection) * (rng.chance(0.5) ? 1 : -1);
        const duration = roundToMinute(rng.inRange(im.calibrationHours) * HOUR);
        const from = runningSlot(detected + (atCalibration === undefined ? rng.between(2, 48) * HOUR : 0), duration, true);
        drift.push({ from: onset, to: from + duration, perDay: magnitude / ((detected - onset) / DAY) });
        quality.push({ from, to: from + duration, quality: 'uncertain', opc: 84 });
        addWorkOrder({
          asset: code,
          type: 'corrective',
          priority: 'medium',
          status: 'closed',
          failureCode: 'INST-DRIFT',
          description:
            atCalibration === undefined
              ? `Reading of the ${instrument.name} off against the laboratory check; recalibrated`
              : `Drift of the ${instrument.name} found at calibration; sensor cleaned and recalibrated`,
          reportedAt: Math.min(detected, from),
          startedAt: from,
          completedAt: from + duration,
          oosFrom: from,
          oosTo: from + duration,
          partsCost: 0,
          crew: instrumentCrew,
          crewSize: 1,
          rate: crews.instrumentRatePerHour,
        });
        onset = from + duration + rng.exponential(im.driftMeanIntervalDays) * DAY;
      }
    } else {
      for (let t = start + rng.exponential(im.failMeanIntervalDays) * DAY; t < end; ) {
        const lag = roundToMinute(rng.between(0.2, 2) * HOUR);
        const wait = rng.between(1, 12) * HOUR;
        const repair = roundToMinute(rng.inRange(im.failRepairHours) * HOUR);
        // The whole outage (failure to repair) must fall while the train runs.
        let failedAt = roundToMinute(t);
        let startedAt = 0;
        for (let guard = 0; guard < 1000; guard++) {
          startedAt = roundToMinute(dayShift(failedAt + lag + wait));
          const slot = runningSlot(failedAt, startedAt + repair - failedAt, false);
          if (slot === failedAt) break;
          failedAt = slot;
        }
        quality.push({ from: failedAt, to: startedAt + repair, quality: 'bad', opc: 0 });
        addWorkOrder({
          asset: code,
          type: 'corrective',
          priority: 'high',
          status: 'closed',
          failureCode: 'INST-FAIL',
          description: `Signal lost from the ${instrument.name}; transmitter replaced`,
          reportedAt: failedAt + lag,
          startedAt,
          completedAt: startedAt + repair,
          oosFrom: failedAt,
          oosTo: startedAt + repair,
          partsCost: round2(rng.inRange(im.partsCost)),
          crew: instrumentCrew,
          crewSize: 1,
          rate: crews.instrumentRatePerHour,
        });
        t = startedAt + repair + rng.exponential(im.failMeanIntervalDays) * DAY;
      }
    }
    return { consumed };
  }

  // ---- 5. Predictive rounds on the pumps (no outage) and the improvement list.
  for (const train of plant.trains) {
    for (const pump of train.pumps) {
      for (let day = rng.between(5, plant.predictive.intervalDays); ; day += plant.predictive.intervalDays + rng.between(-7, 7)) {
        const at = localTimeOnDay(start + day * DAY, timeZone, 0, 9, rng.int(0, 240));
        if (at - 5 * DAY >= end) break;
        const rising = rng.chance(0.2);
        addWorkOrder({
          asset: pumpCode(train.code, pump.suffix),
          type: 'predictive',
          priority: 'low',
          status: 'closed',
          failureCode: null,
          description: rising
            ? 'Vibration and oil-sample round: drive-end bearing vibration rising, added to the watch list'
            : 'Vibration and oil-sample round: readings within limits',
          reportedAt: at - rng.between(1, 5) * DAY,
          startedAt: at,
          completedAt: at + rng.inRange(plant.predictive.hours) * HOUR,
          oosFrom: null,
          oosTo: null,
          partsCost: 0,
          crew: onCallCrew(at),
          crewSize: 1,
          rate: crews.mechanicalRatePerHour,
        });
      }
    }
  }
  for (const item of plant.improvements) {
    const reportedAt = localTimeOnDay(start + item.at * (end - start), timeZone, 0, 10, rng.int(0, 180));
    const startedAt =
      item.status === 'closed'
        ? dayShift(reportedAt + rng.between(3, 20) * DAY)
        : item.status === 'in_progress'
          ? Math.max(reportedAt, Math.min(dayShift(reportedAt + rng.between(1, 3) * DAY), end - HOUR))
          : null;
    const completedAt = item.status === 'closed' && startedAt !== null ? startedAt + (item.days - 1) * DAY + rng.between(4, 8) * HOUR : null;
    addWorkOrder({
      asset: item.asset,
      type: 'improvement',
      priority: item.status === 'open' ? 'low' : 'medium',
      status: item.status,
      failureCode: null,
      description: item.description,
      reportedAt,
      startedAt,
      completedAt,
      oosFrom: null,
      oosTo: null,
      partsCost: item.status === 'cancelled' ? null : round2(rng.between(150, 2400)),
      crew: item.status === 'cancelled' ? null : onCallCrew(reportedAt),
      crewSize: 2,
      rate: crews.mechanicalRatePerHour,
    });
  }

  // ---- 6. Site-wide communication outages: every tag bad for a while, no work order.
  const commsOutages: Interval[] = [];
  const co = plant.commsOutages;
  for (let t = start + rng.exponential(co.meanIntervalDays) * DAY; t < end; t += rng.exponential(co.meanIntervalDays) * DAY) {
    commsOutages.push({ from: roundToMinute(t), to: roundToMinute(t + rng.inRange(co.hours) * HOUR) });
  }

  // ---- 7. Numbers in the order the work was reported.
  workOrders.sort((a, b) => a.reportedAt - b.reportedAt || a.asset.localeCompare(b.asset) || a.key - b.key);
  const numberOf = new Map<number, string>();
  workOrders.forEach((wo, i) => {
    wo.woNumber = `WO-${100001 + i}`;
    numberOf.set(wo.key, wo.woNumber);
  });
  const steps = jobSteps.filter((s) => numberOf.has(s.woKey)).map((s) => ({ ...s, woNumber: numberOf.get(s.woKey)! }));
  steps.sort((a, b) => a.woNumber.localeCompare(b.woNumber) || a.step - b.step);

  const trains: TrainPlan[] = plant.trains.map((train) => {
    const stops = stopsByTrain.get(train.code)!;
    const stopsByCause = Object.fromEntries(stopCauses.map((c) => [c, { count: 0, hours: 0 }])) as TrainPlan['stopsByCause'];
    for (const s of stops) {
      const from = Math.max(s.from, start);
      const to = Math.min(s.to, end);
      if (to <= from) continue;
      stopsByCause[s.cause].count++;
      stopsByCause[s.cause].hours = round2(stopsByCause[s.cause].hours + (to - from) / HOUR);
    }
    return {
      train: train.code,
      stops: mergeIntervals(stops.map((s) => ({ from: Math.max(s.from, start), to: Math.min(s.to, end) })).filter((s) => s.to > s.from)),
      stopsByCause,
      cleanings: cleaningsByTrain.get(train.code)!.sort((a, b) => a.at - b.at),
      swaps: swapsByTrain.get(train.code)!,
      conductivityEpisodes: episodesByTrain.get(train.code)!.sort((a, b) => a.from - b.from),
      runningHours: runningHoursByTrain.get(train.code)!,
    };
  });

  const mean = (xs: number[]) => (xs.length === 0 ? null : xs.reduce((s, x) => s + x, 0) / xs.length);
  return {
    workOrders,
    jobSteps: steps,
    trains,
    pumps: pumpOutcomes,
    instrumentQuality,
    instrumentDrift,
    commsOutages,
    elementJobs: {
      jobs: jobHours.guided.length + jobHours.unguided.length,
      guidedJobs: jobHours.guided.length,
      meanHoursGuided: mean(jobHours.guided),
      meanHoursUnguided: mean(jobHours.unguided),
      guidedJobsAfterLearning: jobHours.afterLearning.length,
      meanHoursGuidedAfterLearning: mean(jobHours.afterLearning),
    },
  };
}

/**
 * Work that runs past the end of the history is still open or in progress in the export:
 * not started → open with no times; started but not done → in progress with no completion.
 */
function clipToEnd(wo: WorkOrder, end: number): void {
  if (wo.status === 'cancelled') return;
  if (wo.startedAt !== null && wo.startedAt >= end) {
    // A failure before the end that nobody has started on keeps its out-of-service start.
    wo.status = 'open';
    wo.startedAt = null;
    wo.completedAt = null;
    wo.oosTo = null;
    if (wo.oosFrom !== null && wo.oosFrom >= end) wo.oosFrom = null;
    return;
  }
  if (wo.completedAt !== null && wo.completedAt >= end) {
    wo.status = 'in_progress';
    wo.completedAt = null;
    if (wo.oosTo !== null && wo.oosTo >= end) wo.oosTo = null;
  }
  if (wo.oosFrom !== null && wo.oosFrom >= end) {
    wo.oosFrom = null;
    wo.oosTo = null;
  }
}
