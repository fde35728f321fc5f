import { addDays, addMonths, addYears, startOfDay, startOfMonth, startOfYear } from 'date-fns';

// Tick values and label format of a time axis, from the room the axis has and the span it covers.
// nivo's own choices ('every 3 months', one format for every window) do not know how wide the
// chart is drawn: on a narrow chart over three years the labels run into one another.

/** Least horizontal room per label, px: the widest label ("Sept 26", "30 Sept") at 11 px plus a gap. */
export const minPxPerTick = 70;

type Unit = 'day' | 'month' | 'year';

/** Candidate steps between ticks, smallest first. */
const steps: readonly { unit: Unit; n: number }[] = [
  { unit: 'day', n: 1 },
  { unit: 'day', n: 2 },
  { unit: 'day', n: 7 },
  { unit: 'day', n: 14 },
  { unit: 'month', n: 1 },
  { unit: 'month', n: 2 },
  { unit: 'month', n: 3 },
  { unit: 'month', n: 6 },
  { unit: 'year', n: 1 },
  { unit: 'year', n: 2 },
  { unit: 'year', n: 5 },
  { unit: 'year', n: 10 },
];

/** Labels by the unit of the step, in the reader's locale (as lib/format.ts): days "3 Mar", months "Mar 26", years "2026". */
const labelFormats: Record<Unit, Intl.DateTimeFormat> = {
  day: new Intl.DateTimeFormat(undefined, { day: 'numeric', month: 'short' }),
  month: new Intl.DateTimeFormat(undefined, { month: 'short', year: '2-digit' }),
  year: new Intl.DateTimeFormat(undefined, { year: 'numeric' }),
};

/** The ticks of one step between `from` and `to` (inclusive), on calendar boundaries of the step. */
function ticksOf(from: Date, to: Date, step: { unit: Unit; n: number }): Date[] {
  const out: Date[] = [];
  let t: Date;
  if (step.unit === 'day') {
    t = startOfDay(from);
    if (t < from) t = addDays(t, 1);
  } else if (step.unit === 'month') {
    t = startOfMonth(from);
    if (t < from) t = addMonths(t, 1);
    // Quarters and halves start in January, April, July, October.
    while (t.getMonth() % step.n !== 0) t = addMonths(t, 1);
  } else {
    t = startOfYear(from);
    if (t < from) t = addYears(t, 1);
    while (t.getFullYear() % step.n !== 0) t = addYears(t, 1);
  }
  const next = (d: Date) => (step.unit === 'day' ? addDays(d, step.n) : step.unit === 'month' ? addMonths(d, step.n) : addYears(d, step.n));
  for (; t <= to; t = next(t)) out.push(t);
  return out;
}

export interface TimeAxis {
  tickValues: Date[];
  format: (value: Date | number | string) => string;
}

/**
 * Ticks for a time axis `innerWidth` px wide over [from, to]: the smallest calendar step that leaves
 * at least `minPxPerTick` px per label (at least one label), labelled by the step's unit. Dates are
 * read in the browser's time zone, as the chart's scale reads them (useUTC: false).
 */
export function timeAxis(from: Date, to: Date, innerWidth: number): TimeAxis {
  const maxTicks = Math.max(1, Math.floor(innerWidth / minPxPerTick));
  let chosen = steps[steps.length - 1];
  let ticks: Date[] = [];
  for (const step of steps) {
    const candidate = ticksOf(from, to, step);
    if (candidate.length <= maxTicks) {
      chosen = step;
      ticks = candidate;
      break;
    }
  }
  if (ticks.length === 0) ticks = ticksOf(from, to, chosen);
  // A window shorter than one step still gets a label: its first day.
  if (ticks.length === 0) ticks = [from];
  const labels = labelFormats[chosen.unit];
  return { tickValues: ticks, format: (value) => labels.format(new Date(value)) };
}
