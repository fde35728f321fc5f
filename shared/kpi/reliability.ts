// Repairable-asset reliability: MTBF with chi-square bounds, mean time to restoration, mean active
// repair time and availability. Operating time itself is computed in operating-time.ts; this file
// takes it as a number of hours.
import {
  assertFinite,
  assertProbability,
  chiSquareQuantile,
  mean,
  nullBecause,
  type NullReason,
  ratio,
  type Ratio,
} from './stats.ts';

/**
 * How the observation period ended: 'time' = at the end of the window (the usual case for plant
 * records), 'failure' = at the r-th failure (a test run until a set number of failures).
 */
export type Termination = 'time' | 'failure';

/**
 * 'two-sided': a (lower, upper) interval with α/2 in each tail — docs/design.md §6's default.
 * 'one-sided-lower': a lower bound alone with all of α in one tail ("MTBF is at least … with
 * confidence C"); the upper bound is then null. NIST §8.4.5.1: "replace α/2 by α".
 */
export type Sides = 'two-sided' | 'one-sided-lower';

export interface MtbfInput {
  /** Total operating (up) time T in hours, ≥ 0. */
  operatingHours: number;
  /** Number of failures r, a whole number ≥ 0. */
  failures: number;
  /** Confidence level C = 1 − α, in (0, 1). docs/design.md §6 default 0.9. */
  confidence: number;
  terminated: Termination;
  /** Default 'two-sided'. */
  sides?: Sides;
}

export interface MtbfResult {
  mtbfHours: number | null;
  lowerHours: number | null;
  upperHours: number | null;
  confidence: number;
  sides: Sides;
  terminated: Termination;
  /** Why mtbfHours is null (and with it, when the upper bound is null). */
  reason?: NullReason;
}

/**
 * MTBF point estimate and chi-square confidence bounds under a constant failure rate
 * (homogeneous Poisson process), NIST/SEMATECH e-Handbook of Statistical Methods §8.4.5.1.
 *
 * - Point: MTBF = T / r, hours.
 * - With α = 1 − confidence and χ²_p(ν) the lower-tail p-quantile:
 *   time-terminated, two-sided: lower 2T/χ²_{1−α/2}(2r+2), upper 2T/χ²_{α/2}(2r);
 *   failure-terminated, two-sided: lower 2T/χ²_{1−α/2}(2r), upper 2T/χ²_{α/2}(2r);
 *   one-sided lower bound: the same lower formula with α in place of α/2, no upper bound.
 * - r = 0 (time-terminated only): MTBF is null ('no-failures'), there is no upper bound, and the
 *   lower formula gives 2T/χ²_{1−α/2}(2) = T/(−ln(α/2)) two-sided — the handbook's zero-failure
 *   bound at one-sided confidence 1 − α/2 — or 2T/χ²_{1−α}(2) = T/(−ln α) with
 *   sides 'one-sided-lower' (the handbook's "T/(−ln α)" at confidence 1 − α).
 * - T = 0: everything null ('no-operating-time').
 * Throws on negative or non-finite T, a non-integer or negative r, confidence outside (0, 1), and on
 * r = 0 with terminated 'failure' (a failure-terminated record ends at a failure, so r ≥ 1).
 */
export function mtbfWithBounds(input: MtbfInput): MtbfResult {
  const { operatingHours: T, failures: r, confidence, terminated } = input;
  const sides: Sides = input.sides ?? 'two-sided';
  assertFinite(T, 'operatingHours');
  if (T < 0) throw new RangeError(`operatingHours must be ≥ 0, got ${T}.`);
  if (!Number.isInteger(r) || r < 0) throw new RangeError(`failures must be a whole number ≥ 0, got ${r}.`);
  assertProbability(confidence, 'confidence', { open: true });
  if (terminated !== 'time' && terminated !== 'failure')
    throw new RangeError(`terminated must be 'time' or 'failure'.`);
  if (sides !== 'two-sided' && sides !== 'one-sided-lower')
    throw new RangeError(`sides must be 'two-sided' or 'one-sided-lower'.`);
  if (terminated === 'failure' && r === 0) {
    throw new RangeError('A failure-terminated record ends at a failure: failures must be ≥ 1.');
  }
  const base = { confidence, sides, terminated };
  if (T === 0) {
    return { ...base, mtbfHours: null, lowerHours: null, upperHours: null, reason: 'no-operating-time' };
  }
  const alpha = 1 - confidence;
  const tail = sides === 'two-sided' ? alpha / 2 : alpha;
  const lowerDof = terminated === 'time' ? 2 * r + 2 : 2 * r;
  const lowerHours = (2 * T) / chiSquareQuantile(1 - tail, lowerDof);
  if (r === 0) {
    return { ...base, mtbfHours: null, lowerHours, upperHours: null, reason: 'no-failures' };
  }
  const upperHours = sides === 'two-sided' ? (2 * T) / chiSquareQuantile(tail, 2 * r) : null;
  return { ...base, mtbfHours: T / r, lowerHours, upperHours };
}

function assertHours(values: readonly number[], what: string): void {
  values.forEach((h, i) => {
    assertFinite(h, `${what}[${i}]`);
    if (h < 0) throw new RangeError(`${what}[${i}] must be ≥ 0 hours, got ${h}.`);
  });
}

/**
 * Mean time to restoration (MTTR), hours: total out-of-service time of the failures divided by the
 * number of failures r, one entry per failure (0 for a failure restored without an outage). MTTR
 * counts the whole time from failure to return to service — detection, waiting, logistics and
 * active repair (ISO/TR 12489:2013 definition; IEC 60050-192 term "mean time to restoration").
 * Null ('no-failures') for no failures; throws on a negative or non-finite duration.
 */
export function mttrHours(outOfServiceHours: readonly number[]): Ratio {
  assertHours(outOfServiceHours, 'outOfServiceHours');
  if (outOfServiceHours.length === 0) return nullBecause('no-failures');
  return mean(outOfServiceHours);
}

export interface RepairJob {
  startedAt: Date;
  completedAt: Date;
}

/**
 * Mean active repair time, hours: the mean over repair jobs of (completed − started), in real
 * elapsed time (Date differences, so a daylight-saving change neither adds nor removes an hour).
 * Narrower than MTTR: it leaves out detection and waiting (IEC 60050-192 "mean active corrective
 * maintenance time"). Null ('no-repairs') for no jobs; throws on an invalid Date or a job that
 * completes before it starts.
 */
export function meanActiveRepairHours(jobs: readonly RepairJob[]): Ratio {
  if (jobs.length === 0) return nullBecause('no-repairs');
  const hours = jobs.map((job, i) => {
    const ms = job.completedAt.getTime() - job.startedAt.getTime();
    if (!Number.isFinite(ms)) throw new RangeError(`jobs[${i}] has an invalid date.`);
    if (ms < 0) throw new RangeError(`jobs[${i}] completes before it starts.`);
    return ms / 3_600_000;
  });
  return mean(hours);
}

/**
 * Inherent availability A_i = MTBF / (MTBF + MTTR), a ratio 0–1 counting corrective down time only
 * (EN 13306 availability; steady-state relation of IEC 61703). Both in the same unit (hours).
 * Null with the input's reason when MTBF or MTTR is null (e.g. 'no-failures' when r = 0), and
 * 'no-time' when both are 0. Throws on a negative or non-finite number.
 */
export function inherentAvailability(mtbf: Ratio | number | null, mttr: Ratio | number | null): Ratio {
  const up = asRatio(mtbf);
  const down = asRatio(mttr);
  if (up.value === null) return up;
  if (down.value === null) return down;
  assertHours([up.value, down.value], 'mtbf, mttr');
  return ratio(up.value, up.value + down.value, 'no-time');
}

function asRatio(x: Ratio | number | null): Ratio {
  if (x === null) return nullBecause('no-failures');
  if (typeof x === 'number') return { value: x };
  return x;
}

/**
 * Operational availability = up time / (up time + down time), a ratio 0–1, where down time is all
 * of it: corrective and preventive (cleaning, inspection) alike (EN 15341 style). Hours in, hours
 * out. Null ('no-time') when both are 0; throws on negative or non-finite input.
 */
export function operationalAvailability(uptimeHours: number, downtimeHours: number): Ratio {
  assertHours([uptimeHours, downtimeHours], 'uptime, downtime');
  return ratio(uptimeHours, uptimeHours + downtimeHours, 'no-time');
}
