import { useId, useState, type FormEvent, type ReactNode } from 'react';
import { formatNumber } from '../lib/format.ts';
import { useKpiWindow, type KpiWindow } from '../lib/kpi-window.ts';
import { Button } from './ui/button.tsx';
import { Input } from './ui/input.tsx';
import { Select } from './ui/select.tsx';

export interface WindowFilterBarProps {
  /** Show the asset code field (pages about one asset and what is below it). */
  asset?: boolean;
  /** Show the confidence select (pages with interval estimates); `defaultConfidence` is the plant's setting. */
  confidence?: boolean;
  defaultConfidence?: number;
  /** A line under the fields, such as the window the figures below were computed for. */
  note?: ReactNode;
}

const commonLevels = [0.8, 0.9, 0.95, 0.99];

interface Draft {
  site: string;
  asset: string;
  from: string;
  to: string;
  confidence: string;
}

function toDraft(w: KpiWindow, defaultConfidence: number | undefined): Draft {
  return {
    site: w.site ?? '',
    asset: w.asset ?? '',
    from: w.from ?? '',
    to: w.to ?? '',
    confidence: String(w.confidence ?? defaultConfidence ?? 0.9),
  };
}

function FilterForm({ asset, confidence, defaultConfidence, note, current, apply }: WindowFilterBarProps & { current: KpiWindow; apply: (next: Partial<Record<string, string | number | undefined>>) => void }) {
  const [draft, setDraft] = useState(() => toDraft(current, defaultConfidence));
  const [error, setError] = useState<string>();
  const hintId = useId();
  const set = (field: keyof Draft) => (value: string) => setDraft((d) => ({ ...d, [field]: value }));

  const levels = [...new Set([...commonLevels, Number(draft.confidence), ...(defaultConfidence ? [defaultConfidence] : [])])]
    .filter((c) => c > 0 && c < 1)
    .sort((a, b) => a - b);

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    if (draft.from && draft.to && draft.from >= draft.to) {
      setError('“From” must be before “Until”: the window runs from the start of From to the start of Until.');
      return;
    }
    setError(undefined);
    const level = Number(draft.confidence);
    apply({
      site: draft.site.trim() || undefined,
      asset: asset ? draft.asset.trim() || undefined : undefined,
      from: draft.from || undefined,
      to: draft.to || undefined,
      // The plant's own level stays out of the address, so a link follows a later change of the setting.
      confidence: confidence && level !== defaultConfidence ? level : undefined,
    });
  };

  const reset = () => {
    setError(undefined);
    setDraft(toDraft({}, defaultConfidence));
    apply({ site: undefined, asset: undefined, from: undefined, to: undefined, confidence: undefined });
  };

  return (
    <form onSubmit={submit} noValidate aria-label="Window and filters" aria-describedby={hintId} className="mb-6 rounded-lg border border-basin-200 bg-white px-4 py-3 shadow-sm">
      <div className="flex flex-wrap items-end gap-x-4 gap-y-3">
        <Input label="From" type="date" className="w-36" value={draft.from} max={draft.to || undefined} onChange={(e) => set('from')(e.target.value)} />
        <Input label="Until" type="date" className="w-36" value={draft.to} min={draft.from || undefined} onChange={(e) => set('to')(e.target.value)} />
        {asset && (
          <Input label="Asset code" className="w-32" placeholder="whole site" value={draft.asset} autoComplete="off" spellCheck={false} onChange={(e) => set('asset')(e.target.value)} />
        )}
        <Input label="Site code" className="w-28" placeholder="only site" value={draft.site} autoComplete="off" spellCheck={false} onChange={(e) => set('site')(e.target.value)} />
        {confidence && (
          <Select
            label="Confidence"
            className="w-36"
            value={draft.confidence}
            onChange={(e) => set('confidence')(e.target.value)}
            options={levels.map((c) => ({ value: String(c), label: `${formatNumber(c * 100, 1)} %${c === defaultConfidence ? ' (plant)' : ''}` }))}
          />
        )}
        <div className="flex gap-1 pb-px">
          <Button type="submit">Apply</Button>
          <Button variant="ghost" onClick={reset}>
            Whole range
          </Button>
        </div>
      </div>
      {error && (
        <p role="alert" className="mt-2 text-sm text-ember-700">
          {error}
        </p>
      )}
      <p id={hintId} className="mt-2 text-xs text-basin-600">
        Dates are days in the site’s time zone; the window runs from the start of From to the start of Until (that day not included). Empty
        dates take the whole range of the data.
      </p>
      {note && <div className="mt-1 text-xs text-basin-700">{note}</div>}
    </form>
  );
}

/**
 * The window and filters of a KPI page, kept in the address: From/Until dates, the site code (needed
 * only when the server holds several sites), an asset code and the confidence level where they apply.
 */
export function WindowFilterBar(props: WindowFilterBarProps) {
  const [current, apply] = useKpiWindow();
  // A new address (back, forward, a link) starts the fields over from it.
  const key = JSON.stringify(current);
  return <FilterForm key={key} {...props} current={current} apply={apply} />;
}
