import type { ReactNode } from 'react';
import { Card } from '../../../components/ui/card.tsx';
import { formatHours, formatMoney, formatNumber, formatShare } from '../../../lib/format.ts';
import { useMaintenanceMix, type MaintenanceMixParams } from '../api/get-maintenance-mix.ts';
import { FreshnessBanner } from '../../../components/ui/freshness-banner.tsx';

function Figure({ label, value, detail }: { label: string; value: string; detail?: ReactNode }) {
  return (
    <div>
      <dt className="text-sm text-basin-600">{label}</dt>
      <dd className="mt-0.5 text-xl font-bold text-basin-950 tabular-nums">{value}</dd>
      {detail && <dd className="text-xs text-basin-600">{detail}</dd>}
    </div>
  );
}

/** The shares of labour hours as one bar: planned, reactive, improvement. */
function MixBar({ planned, reactive, improvement }: { planned: number; reactive: number; improvement: number }) {
  const parts = [
    { label: 'Planned', share: planned, className: 'bg-tide-600' },
    { label: 'Reactive', share: reactive, className: 'bg-ember-500' },
    { label: 'Improvement', share: improvement, className: 'bg-sand-500' },
  ];
  return (
    <div>
      <div className="flex h-3 w-full overflow-hidden rounded-full bg-basin-100" aria-hidden="true">
        {parts.map((p) => (
          <div key={p.label} className={p.className} style={{ width: `${p.share * 100}%` }} />
        ))}
      </div>
      <ul className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-xs text-basin-700">
        {parts.map((p) => (
          <li key={p.label} className="flex items-center gap-1.5">
            <span className={`inline-block size-2.5 rounded-full ${p.className}`} aria-hidden="true" />
            {p.label} {formatShare(p.share, 0)}
          </li>
        ))}
      </ul>
    </div>
  );
}

/** Planned vs reactive share of labour hours, PM compliance, backlog in weeks and maintenance cost per m³. */
export function MaintenanceMixCard({ params, currency, footer }: { params: MaintenanceMixParams; currency: string; footer?: ReactNode }) {
  const mix = useMaintenanceMix(params);
  const { labour, pmCompliance: pm, backlog, cost } = mix;
  return (
    <Card title="Maintenance mix" description={`${formatHours(labour.totalHours, 0)} of labour on ${formatNumber(labour.workOrders.length, 0)} work orders.`}>
      <FreshnessBanner answer={mix} compact />
      {labour.plannedShare !== null && labour.reactiveShare !== null ? (
        <MixBar planned={labour.plannedShare} reactive={labour.reactiveShare} improvement={labour.improvementShare ?? 0} />
      ) : (
        <p className="text-sm text-basin-600">{labour.reason ?? 'No labour hours recorded.'}</p>
      )}
      <dl className="mt-4 grid grid-cols-2 gap-x-6 gap-y-4">
        <Figure label="Planned share" value={formatShare(labour.plannedShare, 0)} detail={`reactive ${formatShare(labour.reactiveShare, 0)}`} />
        <Figure
          label="PM compliance"
          value={formatShare(pm.compliance, 0)}
          detail={pm.compliance === null ? pm.reason : `${pm.completedInWindow} of ${pm.due} preventive orders done`}
        />
        <Figure
          label="Backlog"
          value={backlog.weeks === null ? '—' : `${formatNumber(backlog.weeks, 1)} weeks`}
          detail={
            backlog.weeks === null
              ? backlog.reason
              : `${formatHours(backlog.hours, 0)} on ${backlog.workOrders} open orders${backlog.withoutEstimate > 0 ? `, ${backlog.withoutEstimate} without an estimate` : ''}`
          }
        />
        <Figure
          label="Maintenance cost per m³"
          value={cost.costPerM3 === null ? '—' : formatMoney(cost.costPerM3, currency, 3)}
          detail={cost.costPerM3 === null ? cost.reason : `${formatMoney(cost.totalCost, currency)} for ${formatNumber(cost.producedM3, 0)} m³ produced`}
        />
      </dl>
      {footer}
    </Card>
  );
}
