import { formatHours, formatNumber, formatShare } from '../../../lib/format.ts';
import { nullReasonText } from '../../../lib/null-reason.ts';
import { operatingTimeSourceLabels, wideMtbfInterval, type ReliabilityFigures } from '../utils/labels.ts';

function Figure({ label, value, detail, reason }: { label: string; value: string; detail?: string; reason?: string }) {
  return (
    <div>
      <dt className="text-sm text-basin-600">{label}</dt>
      <dd className="mt-0.5 text-xl font-bold text-basin-950 tabular-nums">{value}</dd>
      {detail && <dd className="text-xs text-basin-600 tabular-nums">{detail}</dd>}
      {reason && <dd className="text-xs text-basin-600">{reason}</dd>}
    </div>
  );
}

/** The headline figures of one reliability answer, with the reason beside any figure that is null. */
export function ReliabilitySummary({ figures, confidence }: { figures: ReliabilityFigures; confidence: number }) {
  const reasons = figures.reasons ?? {};
  const bounds =
    figures.mtbfLowerHours !== null
      ? `${formatShare(confidence, 1)} bounds ${formatNumber(figures.mtbfLowerHours, 0)} – ${figures.mtbfUpperHours === null ? 'no upper bound' : formatHours(figures.mtbfUpperHours, 0)}`
      : undefined;
  return (
    <dl className="grid grid-cols-2 gap-x-6 gap-y-4 sm:grid-cols-3 lg:grid-cols-6">
      <Figure
        label="Operating time"
        value={formatHours(figures.operatingHours, 0)}
        detail={figures.operatingTimeSource ? `from ${operatingTimeSourceLabels[figures.operatingTimeSource]}` : undefined}
      />
      <Figure label="Failures" value={formatNumber(figures.failures, 0)} />
      <Figure
        label="MTBF"
        value={formatHours(figures.mtbfHours, 0)}
        detail={bounds}
        reason={
          figures.mtbfHours === null
            ? nullReasonText(reasons.mtbfHours)
            : wideMtbfInterval(figures)
              ? 'A wide interval: so few failures say little about the MTBF.'
              : undefined
        }
      />
      <Figure
        label="MTTR (restoration)"
        value={formatHours(figures.mttrHours, 1)}
        detail={figures.meanActiveRepairHours != null ? `active repair ${formatHours(figures.meanActiveRepairHours, 1)}` : undefined}
        reason={figures.mttrHours === null ? nullReasonText(reasons.mttrHours) : undefined}
      />
      <Figure
        label="Inherent availability"
        value={formatShare(figures.availability, 2)}
        detail="MTBF / (MTBF + MTTR)"
        reason={figures.availability === null ? nullReasonText(reasons.availability) : undefined}
      />
      <Figure label="Operational availability" value={formatShare(figures.operationalAvailability, 2)} detail="up time / (up + down time)" />
    </dl>
  );
}
