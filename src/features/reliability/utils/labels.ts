import type { ReliabilityReport } from '#shared/schemas/kpi.ts';

export type ReliabilityFigures = Pick<
  ReliabilityReport,
  | 'asset'
  | 'operatingHours'
  | 'failures'
  | 'mtbfHours'
  | 'mtbfLowerHours'
  | 'mtbfUpperHours'
  | 'mttrHours'
  | 'availability'
  | 'operationalAvailability'
  | 'meanActiveRepairHours'
  | 'scope'
  | 'operatingTimeSource'
  | 'reasons'
>;

/** Where operating time came from (docs/design.md §6), in words. */
export const operatingTimeSourceLabels: Record<NonNullable<ReliabilityFigures['operatingTimeSource']>, string> = {
  'run-status': 'own run status',
  'ancestor-run-status': 'parent’s run status',
  'calendar-less-out-of-service': 'calendar less out-of-service',
};

/** A group's name on screen: its asset code, or the key (`kind=vessel` → "vessel"). */
export function groupLabel(group: { key: string; asset: string | null }): string {
  if (group.asset) return group.asset;
  const [, value] = group.key.split('=');
  return value ?? group.key;
}

/**
 * The top-level assets among the per-asset groups (normally the trains): those that lie in no other
 * group's scope. The site answer has no asset tree, so the scopes it lists are what tells the levels apart.
 */
export function topLevelGroups<G extends { asset: string | null; scope?: string[] }>(groups: readonly G[]): G[] {
  return groups.filter((g) => g.asset !== null && !groups.some((other) => other !== g && other.asset !== g.asset && other.scope?.includes(g.asset!)));
}
