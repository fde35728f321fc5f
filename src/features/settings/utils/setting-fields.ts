import { settingsSchema, type SettingKey, type Settings } from '#shared/schemas/settings.ts';

export type SettingKind = 'text' | 'number' | 'emails';

export interface SettingField {
  key: SettingKey;
  label: string;
  kind: SettingKind;
  /** The unit after the value; a function when it names the plant's currency. */
  unit?: string | ((s: Settings) => string);
  hint: string;
  /** What a valid value is, said when the value is refused. */
  rule: string;
  step?: string;
}

export interface SettingGroup {
  title: string;
  description: string;
  fields: SettingField[];
}

export const settingGroups: SettingGroup[] = [
  {
    title: 'Costs and crew',
    description: 'Prices that turn lost production and element replacements into money, and the crew’s capacity.',
    fields: [
      { key: 'currency', label: 'Currency', kind: 'text', hint: 'Code shown beside every amount, such as EUR or USD.', rule: 'Enter 1 to 8 characters.' },
      {
        key: 'waterValuePerM3',
        label: 'Water value',
        kind: 'number',
        unit: (s) => `${s.currency} per m³`,
        step: 'any',
        hint: 'What one cubic metre of permeate not produced costs the plant; prices downtime.',
        rule: 'Enter 0 or more.',
      },
      {
        key: 'elementUnitCost',
        label: 'Element unit cost',
        kind: 'number',
        unit: (s) => `${s.currency} per element`,
        step: 'any',
        hint: 'Price of one membrane element, for the replacement forecast and budget.',
        rule: 'Enter 0 or more.',
      },
      {
        key: 'crewHoursPerWeek',
        label: 'Crew hours',
        kind: 'number',
        unit: 'h per week',
        step: 'any',
        hint: 'Hours the maintenance crew can work in a week, for the backlog in weeks.',
        rule: 'Enter a number above 0.',
      },
    ],
  },
  {
    title: 'Statistics',
    description: 'Confidence of the bounds on MTBF and of the element survival curves.',
    fields: [
      {
        key: 'confidence',
        label: 'Confidence level',
        kind: 'number',
        step: 'any',
        hint: 'As a fraction: 0.9 gives two-sided 90 % bounds.',
        rule: 'Enter a fraction above 0.5 and below 1, such as 0.9.',
      },
    ],
  },
  {
    title: 'Normalization constants',
    description: 'Used to normalize membrane performance (ASTM D4516). The defaults are common practice.',
    fields: [
      {
        key: 'tdsPerMicroSiemens',
        label: 'TDS per conductivity',
        kind: 'number',
        unit: 'mg/L per µS/cm',
        step: 'any',
        hint: 'TDS = this factor × conductivity.',
        rule: 'Enter a number above 0.',
      },
      {
        key: 'osmoticBarPerMgL',
        label: 'Osmotic pressure per TDS',
        kind: 'number',
        unit: 'bar per mg/L',
        step: 'any',
        hint: '0.000689 bar per mg/L is 1 psi per 100 mg/L.',
        rule: 'Enter a number above 0.',
      },
      {
        key: 'tcfUBelow25K',
        label: 'Temperature constant U, below 25 °C',
        kind: 'number',
        unit: 'K',
        step: 'any',
        hint: 'TCF = exp(U × (1/(273 + T) − 1/298)), T in °C.',
        rule: 'Enter a number above 0.',
      },
      {
        key: 'tcfUAbove25K',
        label: 'Temperature constant U, 25 °C and above',
        kind: 'number',
        unit: 'K',
        step: 'any',
        hint: 'The same formula above 25 °C.',
        rule: 'Enter a number above 0.',
      },
    ],
  },
  {
    title: 'Performance alerts',
    description: 'Change from the baseline at which normalized performance raises an alert.',
    fields: [
      {
        key: 'alertFlowDropPct',
        label: 'Normalized permeate flow drop',
        kind: 'number',
        unit: '%',
        step: 'any',
        hint: 'Alert when the flow is this much below the baseline.',
        rule: 'Enter a number above 0 and at most 100.',
      },
      {
        key: 'alertDpRisePct',
        label: 'Normalized differential pressure rise',
        kind: 'number',
        unit: '%',
        step: 'any',
        hint: 'Alert when the pressure drop is this much above the baseline.',
        rule: 'Enter a number above 0 and at most 500.',
      },
      {
        key: 'alertSaltPassageRisePct',
        label: 'Normalized salt passage rise',
        kind: 'number',
        unit: '%',
        step: 'any',
        hint: 'Alert when the salt passage is this much above the baseline.',
        rule: 'Enter a number above 0 and at most 500.',
      },
      {
        key: 'baselineChangeOutSharePct',
        label: 'Element change-out that resets the baseline',
        kind: 'number',
        unit: '% of the stage',
        step: 'any',
        hint: 'A new baseline follows a cleaning, or element replacements of at least this share of the stage’s positions…',
        rule: 'Enter a number above 0 and at most 100.',
      },
      {
        key: 'baselineChangeOutDays',
        label: 'Change-out period',
        kind: 'number',
        unit: 'days',
        step: 'any',
        hint: '…done within this many days. Single element swaps do not reset it.',
        rule: 'Enter a number above 0 and at most 365.',
      },
    ],
  },
  {
    title: 'Nightly digest',
    description: 'Users subscribe themselves above (or an administrator does it on the Users page). Addresses listed here receive the digest too, with what a manager reads.',
    fields: [
      {
        key: 'digestRecipients',
        label: 'Digest recipients',
        kind: 'emails',
        hint: 'One e-mail address per line. An address that belongs to a user is left to that user’s own choice.',
        rule: 'Enter one valid e-mail address per line.',
      },
    ],
  },
];

export const settingFields: SettingField[] = settingGroups.flatMap((g) => g.fields);

export function unitOf(field: SettingField, settings: Settings): string | undefined {
  return typeof field.unit === 'function' ? field.unit(settings) : field.unit;
}

export type SettingsDraft = Record<SettingKey, string>;

/** The settings as the texts of the form's fields. */
export function toDraft(settings: Settings): SettingsDraft {
  const draft = {} as SettingsDraft;
  for (const field of settingFields) {
    const value = settings[field.key];
    draft[field.key] = Array.isArray(value) ? value.join('\n') : String(value);
  }
  return draft;
}

function parseNumber(text: string): number | null {
  const trimmed = text.trim();
  // A decimal comma ("0,85") is read as a point; a number never has thousands separators here.
  const normalized = /^[-+]?\d+,\d+$/.test(trimmed) ? trimmed.replace(',', '.') : trimmed;
  if (normalized === '') return null;
  const n = Number(normalized);
  return Number.isFinite(n) ? n : null;
}

export type DraftResult = { ok: true; settings: Settings } | { ok: false; errors: Partial<Record<SettingKey, string>> };

/** Reads and checks every field against the shared settings schema; each refusal says the rule. */
export function parseDraft(draft: SettingsDraft): DraftResult {
  const values: Record<string, unknown> = {};
  const errors: Partial<Record<SettingKey, string>> = {};
  for (const field of settingFields) {
    const text = draft[field.key];
    let value: unknown;
    if (field.kind === 'number') {
      value = parseNumber(text);
      if (value === null) {
        errors[field.key] = text.trim() === '' ? `Required. ${field.rule}` : `Not a number. ${field.rule}`;
        continue;
      }
    } else if (field.kind === 'emails') {
      value = text
        .split(/[\s,;]+/)
        .map((s) => s.trim())
        .filter(Boolean);
    } else {
      value = text.trim();
    }
    const checked = settingsSchema.shape[field.key].safeParse(value);
    if (!checked.success) {
      const badIndex = checked.error.issues[0]?.path[0];
      errors[field.key] =
        field.kind === 'emails' && typeof badIndex === 'number' ? `Not an e-mail address: ${(value as string[])[badIndex]}` : field.rule;
      continue;
    }
    values[field.key] = checked.data;
  }
  if (Object.keys(errors).length > 0) return { ok: false, errors };
  return { ok: true, settings: settingsSchema.parse(values) };
}
