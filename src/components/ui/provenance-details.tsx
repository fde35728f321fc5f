import type { Provenance } from '#shared/schemas/answer.ts';
import { formatDateTime, formatNumber } from '../../lib/format.ts';

function CodeList({ title, items, total = items.length }: { title: string; items: readonly (string | number)[]; total?: number }) {
  if (items.length === 0) return null;
  return (
    <div>
      <h3 className="text-xs font-bold tracking-wide text-basin-700 uppercase">
        {title}{' '}
        <span className="font-normal normal-case">({total > items.length ? `the first ${items.length} of ${total}` : items.length})</span>
      </h3>
      <ul className="mt-1 flex max-h-40 flex-wrap gap-1 overflow-y-auto">
        {items.map((item) => (
          <li key={String(item)} className="rounded bg-basin-100 px-1.5 py-0.5 font-mono text-xs text-basin-800">
            {item}
          </li>
        ))}
      </ul>
    </div>
  );
}

/**
 * What a KPI answer was computed from (work orders, tags, windows, elements, imports), folded away
 * under a summary line: every figure on the page can be traced back to these inputs.
 */
export function ProvenanceDetails({ provenance, className }: { provenance: Provenance | undefined; className?: string }) {
  if (!provenance) return null;
  const { workOrders, tags, windows, elements = [], imports = [] } = provenance;
  // Long lists are capped by the server; the counts say how many there were.
  const workOrderCount = Math.max(provenance.workOrderCount ?? 0, workOrders.length);
  const elementCount = Math.max(provenance.elementCount ?? 0, elements.length);
  const counts = [
    [workOrderCount, 'work order', 'work orders'],
    [tags.length, 'tag', 'tags'],
    [elementCount, 'element', 'elements'],
    [windows.length, 'time window', 'time windows'],
  ] as const;
  const summary = counts
    .filter(([n]) => n > 0)
    .map(([n, one, many]) => `${formatNumber(n, 0)} ${n === 1 ? one : many}`)
    .join(', ');
  return (
    <details className={className}>
      <summary className="cursor-pointer text-sm font-bold text-tide-700 hover:text-tide-800">
        Computed from {summary || 'no recorded inputs'}
      </summary>
      <div className="mt-3 space-y-3 rounded-md border border-basin-200 bg-basin-50 p-3">
        <CodeList title="Work orders" items={workOrders} total={workOrderCount} />
        <CodeList title="Historian tags" items={tags} />
        <CodeList title="Elements" items={elements} total={elementCount} />
        {provenance.trains && <CodeList title="Trains" items={provenance.trains} />}
        <CodeList title="Imports" items={imports} />
        {windows.length > 0 && (
          <div>
            <h3 className="text-xs font-bold tracking-wide text-basin-700 uppercase">
              Time windows <span className="font-normal normal-case">({windows.length})</span>
            </h3>
            <ul className="mt-1 max-h-48 space-y-0.5 overflow-y-auto text-xs text-basin-800">
              {windows.map((w, i) => (
                <li key={`${w.from}-${w.to}-${i}`}>
                  <span className="tabular-nums">
                    {formatDateTime(w.from)} – {formatDateTime(w.to)}
                  </span>
                  {w.what && <span className="text-basin-600"> · {w.what}</span>}
                </li>
              ))}
            </ul>
          </div>
        )}
      </div>
    </details>
  );
}
