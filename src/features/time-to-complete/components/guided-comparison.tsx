import type { TimeToCompleteReport } from '#shared/schemas/time-to-complete.ts';
import { Card } from '../../../components/ui/card.tsx';
import { formatHours, formatHoursOrMinutes, formatNumber } from '../../../lib/format.ts';

type Group = TimeToCompleteReport['groups'][number];

function Column({ title, group }: { title: string; group: Group | undefined }) {
  return (
    <div className="rounded-md border border-basin-200 p-4">
      <h3 className="text-sm font-bold text-basin-800">{title}</h3>
      <p className="mt-1 text-3xl font-bold text-basin-950 tabular-nums">{formatHours(group?.medianHours, 2)}</p>
      <p className="text-xs text-basin-600">median duration</p>
      <dl className="mt-3 grid grid-cols-3 gap-2 text-sm">
        <div>
          <dt className="text-basin-600">Jobs</dt>
          <dd className="font-bold tabular-nums">{formatNumber(group?.n ?? 0, 0)}</dd>
        </div>
        <div>
          <dt className="text-basin-600">Mean</dt>
          <dd className="font-bold tabular-nums">{formatHours(group?.meanHours, 2)}</dd>
        </div>
        <div>
          <dt className="text-basin-600">90th pct.</dt>
          <dd className="font-bold tabular-nums">{formatHours(group?.p90Hours, 2)}</dd>
        </div>
      </dl>
    </div>
  );
}

/**
 * Jobs done with the written procedure open against the others: medians side by side and their
 * difference. A plain comparison of two samples, not a test: the sentence says how many jobs it rests on.
 */
export function GuidedComparison({ groups }: { groups: readonly Group[] }) {
  const guided = groups.find((g) => g.key === 'guided=yes');
  const unguided = groups.find((g) => g.key === 'guided=no');
  const a = guided?.medianHours ?? null;
  const b = unguided?.medianHours ?? null;
  let sentence = 'Both groups need jobs before their medians can be compared.';
  if (a !== null && b !== null && b > 0) {
    const diff = a - b;
    const pct = (Math.abs(diff) / b) * 100;
    sentence =
      Math.abs(diff) < 1e-9
        ? `Guided and unguided jobs have the same median (${guided!.n} and ${unguided!.n} jobs).`
        : `With the procedure open, the median job took ${formatHoursOrMinutes(Math.abs(diff))} (${formatNumber(pct, 0)} %) ${diff < 0 ? 'less' : 'more'} than without (${guided!.n} and ${unguided!.n} jobs; a comparison of medians, not a significance test).`;
  }
  return (
    <Card title="Guided vs unguided" description="A job counts as guided when any of its steps was done with the written procedure open.">
      <div className="grid gap-4 sm:grid-cols-2">
        <Column title="Procedure followed" group={guided} />
        <Column title="Procedure not followed" group={unguided} />
      </div>
      <p className="mt-4 text-sm text-basin-800">{sentence}</p>
    </Card>
  );
}
