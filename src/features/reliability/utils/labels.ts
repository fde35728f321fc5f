import type { ReliabilityReport } from '#shared/schemas/reliability.ts';

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

/**
 * A confidence interval on MTBF too wide to read as a range of likely values: from two failures or
 * fewer, or with an upper bound more than ten times the lower. Few failures say little about MTBF;
 * the chi-square upper bound then grows fast (one failure at 90 %: about 20 × the estimate).
 */
export function wideMtbfInterval(g: Pick<ReliabilityFigures, 'failures' | 'mtbfLowerHours' | 'mtbfUpperHours'>): boolean {
  if (g.mtbfLowerHours === null || g.mtbfUpperHours === null) return false;
  return g.failures <= 2 || (g.mtbfLowerHours > 0 && g.mtbfUpperHours / g.mtbfLowerHours > 10);
}

/** The sentence under a table or figure that marks wide intervals. */
export const wideIntervalExplanation =
  'Wide: with two failures or fewer, or an upper bound more than ten times the lower, the data say little about the MTBF. ' +
  'The upper bound is what these few failures cannot rule out, not a life to plan on.';
