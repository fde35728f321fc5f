import { Suspense, type ReactNode } from 'react';
import { Spinner } from '../ui/spinner.tsx';

export interface ChartFrameProps {
  /** What the chart shows, for screen readers (the figures are also in a table on the page). */
  label: string;
  /** Height of the drawing in pixels; the width follows the container. */
  height: number;
  /** A caption under the chart: units, method, what the marks mean. */
  caption?: ReactNode;
  children: ReactNode;
}

/**
 * The box a chart is drawn in. Charts are loaded on demand (nivo stays out of the main bundle), so the
 * box keeps its height while the code arrives and the page does not jump.
 */
export function ChartFrame({ label, height, caption, children }: ChartFrameProps) {
  return (
    <figure className="min-w-0">
      <div role="img" aria-label={label} style={{ height }} className="relative w-full">
        <Suspense
          fallback={
            <div className="flex h-full items-center justify-center">
              <Spinner label="Loading the chart…" />
            </div>
          }
        >
          {children}
        </Suspense>
      </div>
      {caption && <figcaption className="mt-2 text-xs text-basin-600">{caption}</figcaption>}
    </figure>
  );
}

/** The box nivo's tooltips are drawn in. */
export function ChartTooltip({ title, rows }: { title: string; rows: readonly (readonly [string, string])[] }) {
  return (
    <div className="rounded-md border border-basin-200 bg-white px-3 py-2 text-xs text-basin-900 shadow-lg">
      <p className="font-bold">{title}</p>
      <dl className="mt-1 grid grid-cols-[auto_auto] gap-x-3 gap-y-0.5">
        {rows.map(([name, value]) => (
          <div key={name} className="contents">
            <dt className="text-basin-600">{name}</dt>
            <dd className="text-right tabular-nums">{value}</dd>
          </div>
        ))}
      </dl>
    </div>
  );
}
