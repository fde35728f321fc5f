import { useId } from 'react';
import { maintenanceCautions } from '#shared/cautions.ts';
import { cn } from '../../lib/cn.ts';

export interface SafetyNoteProps {
  /**
   * The cautions that fit the work the page leads to (shared/cautions.ts: maintenanceCautions,
   * cleaningCautions, vesselWorkCautions). Defaults to the full list.
   */
  cautions?: readonly string[];
  className?: string;
}

/**
 * The safety note beside anything that leads to work on the plant (docs/design.md §9). It has no close
 * button and no collapsed state on purpose: the cautions must stay on screen with the advice.
 */
export function SafetyNote({ cautions = maintenanceCautions, className }: SafetyNoteProps) {
  const headingId = useId();
  return (
    <aside
      aria-labelledby={headingId}
      className={cn('rounded-lg border border-sand-200 border-l-4 border-l-sand-500 bg-sand-50 px-4 py-3 text-sm text-sand-800', className)}
    >
      <h2 id={headingId} className="flex items-center gap-2 font-bold">
        <svg viewBox="0 0 24 24" className="size-5 shrink-0" fill="none" stroke="currentColor" strokeWidth="2" strokeLinejoin="round" aria-hidden="true">
          <path d="M12 3 2.5 20h19z" />
          <path d="M12 10v4.5m0 2.5h.01" strokeLinecap="round" />
        </svg>
        Safety before any work on the plant
      </h2>
      <ul className="mt-2 list-disc space-y-1 pl-6">
        {cautions.map((text) => (
          <li key={text}>{text}</li>
        ))}
      </ul>
    </aside>
  );
}
