import type { ElementLifeReport } from '#shared/schemas/element-life.ts';
import { Table, type Column } from '../../../components/ui/table.tsx';
import { formatDays, formatNumber } from '../../../lib/format.ts';
import { nullReasonText } from '../../../lib/null-reason.ts';
import { daysToYears, groupKeyLabel } from '../utils/params.ts';

type Group = ElementLifeReport['groups'][number];

function Life({ days, reason }: { days: number | null | undefined; reason?: string }) {
  if (days === null || days === undefined) {
    return (
      <span className="text-basin-600" title={reason}>
        —{reason && <span className="sr-only"> ({reason})</span>}
      </span>
    );
  }
  return (
    <span className="whitespace-nowrap">
      {formatDays(days)} <span className="text-xs text-basin-600">({formatNumber(daysToYears(days), 1)} y)</span>
    </span>
  );
}

function Interval({ lower, upper, unit }: { lower: number | null | undefined; upper: number | null | undefined; unit: string }) {
  if (lower === null || lower === undefined) return null;
  return (
    <span className="block text-xs whitespace-nowrap text-basin-600">
      {formatNumber(lower, unit === 'd' ? 0 : 2)} – {upper === null || upper === undefined ? '∞' : formatNumber(upper, unit === 'd' ? 0 : 2)}
      {unit === 'd' ? ' d' : ''}
    </span>
  );
}

/** The Weibull fit of each group beside its Kaplan–Meier median: what a life model says and what the data say. */
export function WeibullTable({ groups, confidenceLabel }: { groups: readonly Group[]; confidenceLabel: string }) {
  const reason = (g: Group, key: string) => nullReasonText(g.reasons?.[key] ?? g.reasons?.weibull);
  const columns: Column<Group>[] = [
    { id: 'group', header: 'Group', sortValue: (g) => g.key, cell: (g) => <span className="font-bold whitespace-nowrap text-basin-900">{groupKeyLabel(g.key)}</span> },
    { id: 'n', header: 'Lives', align: 'right', sortValue: (g) => g.n, cell: (g) => formatNumber(g.n, 0) },
    { id: 'events', header: 'Ended (events)', wrapHeader: true, align: 'right', sortValue: (g) => g.events, cell: (g) => formatNumber(g.events, 0) },
    {
      id: 'shape',
      header: 'Shape β',
      align: 'right',
      sortValue: (g) => g.weibull?.shape,
      cell: (g) =>
        g.weibull ? (
          <>
            {formatNumber(g.weibull.shape, 2)}
            <Interval lower={g.weibull.shapeLower} upper={g.weibull.shapeUpper} unit="" />
          </>
        ) : (
          <Life days={null} reason={reason(g, 'weibull')} />
        ),
    },
    {
      id: 'scale',
      header: 'Scale η',
      align: 'right',
      sortValue: (g) => g.weibull?.scaleDays,
      cell: (g) =>
        g.weibull ? (
          <>
            {formatDays(g.weibull.scaleDays)}
            <Interval lower={g.weibull.scaleLowerDays} upper={g.weibull.scaleUpperDays} unit="d" />
          </>
        ) : (
          <Life days={null} reason={reason(g, 'weibull')} />
        ),
    },
    { id: 'b10', header: 'B10 life', align: 'right', sortValue: (g) => g.b10Days, cell: (g) => <Life days={g.b10Days} reason={reason(g, 'b10Days')} /> },
    { id: 'median', header: 'Median life', align: 'right', sortValue: (g) => g.medianDays, cell: (g) => <Life days={g.medianDays} reason={reason(g, 'medianDays')} /> },
    { id: 'mean', header: 'Mean life', align: 'right', sortValue: (g) => g.meanDays, cell: (g) => <Life days={g.meanDays} reason={reason(g, 'meanDays')} /> },
    {
      id: 'km',
      header: 'KM median',
      align: 'right',
      sortValue: (g) => g.kmMedianDays,
      cell: (g) => (
        <>
          <Life days={g.kmMedianDays} reason={nullReasonText(g.reasons?.kmMedianDays)} />
          <Interval lower={g.kmMedianLowerDays} upper={g.kmMedianUpperDays} unit="d" />
        </>
      ),
    },
  ];
  return (
    <Table
      caption={`Weibull fit (maximum likelihood, right-censored; lives begun before the window enter at their age then) with ${confidenceLabel} likelihood-ratio intervals under the estimates; KM median read from the Kaplan–Meier curve`}
      columns={columns}
      dense
      rows={groups}
      rowKey={(g) => g.key}
      empty={<p className="text-center text-basin-600">No element lives in this window.</p>}
    />
  );
}
