import type { Settings } from '#shared/schemas/settings.ts';
import { Card } from '../../../components/ui/card.tsx';
import { formatNumber, formatSignificant } from '../../../lib/format.ts';
import { useSettings } from '../api/get-settings.ts';
import { settingGroups, unitOf, type SettingField } from '../utils/setting-fields.ts';

function displayValue(field: SettingField, settings: Settings): string {
  const value = settings[field.key];
  if (Array.isArray(value)) return value.length === 0 ? 'none beside the subscribed users' : value.join(', ');
  if (typeof value === 'number') {
    if (field.key === 'confidence') return `${formatNumber(value, 4)} (${formatNumber(value * 100, 2)} %)`;
    return formatSignificant(value, 4);
  }
  return value;
}

/** The settings, read-only, for the roles that may read but not change them. */
export function SettingsSummary() {
  const settings = useSettings();
  return (
    <div className="space-y-6">
      {settingGroups.map((group) => (
        <Card key={group.title} title={group.title} description={group.description}>
          <dl className="grid gap-x-6 gap-y-4 md:grid-cols-2">
            {group.fields.map((field) => {
              const unit = unitOf(field, settings);
              return (
                <div key={field.key} className={field.kind === 'emails' ? 'md:col-span-2' : undefined}>
                  <dt className="text-sm font-bold text-basin-800">{field.label}</dt>
                  <dd className="mt-0.5 text-basin-900">
                    <span className="tabular-nums">{displayValue(field, settings)}</span>
                    {/* A real space, so the value and its unit also read apart when copied or spoken. */}
                    {unit && (
                      <>
                        {' '}
                        <span className="text-sm text-basin-600">{unit}</span>
                      </>
                    )}
                  </dd>
                  {field.kind !== 'emails' && <dd className="mt-0.5 text-xs text-basin-600">{field.hint}</dd>}
                </div>
              );
            })}
          </dl>
        </Card>
      ))}
    </div>
  );
}
