// Enumerations of docs/design.md §2, §4 and §5, kept in one place for the database checks,
// the import row schemas, the API and the client.

export const roles = ['admin', 'engineer', 'manager', 'finance'] as const;
export type Role = (typeof roles)[number];

export const assetKinds = ['site', 'train', 'stage', 'vessel', 'pump', 'filter', 'instrument', 'other'] as const;
export type AssetKind = (typeof assetKinds)[number];

export const quantities = [
  'run_status',
  'feed_pressure',
  'concentrate_pressure',
  'permeate_pressure',
  'feed_flow',
  'permeate_flow',
  'concentrate_flow',
  'feed_conductivity',
  'permeate_conductivity',
  'feed_temperature',
] as const;
export type Quantity = (typeof quantities)[number];

export const workOrderTypes = ['corrective', 'preventive', 'predictive', 'inspection', 'improvement'] as const;
export type WorkOrderType = (typeof workOrderTypes)[number];

export const workOrderStatuses = ['open', 'in_progress', 'closed', 'cancelled'] as const;
export type WorkOrderStatus = (typeof workOrderStatuses)[number];

export const workOrderPriorities = ['low', 'medium', 'high', 'emergency'] as const;
export type WorkOrderPriority = (typeof workOrderPriorities)[number];

/** failed, performance and damaged end an element's life (an event); the others censor it. */
export const lifeEndingReasons = ['failed', 'performance', 'damaged'] as const;
export const censoringReasons = ['planned', 'relocated', 'sampled'] as const;
export const removalReasons = [...lifeEndingReasons, ...censoringReasons] as const;
export type RemovalReason = (typeof removalReasons)[number];

export const importKinds = ['historian', 'tags', 'assets', 'work-orders', 'elements', 'job-steps'] as const;
export type ImportKind = (typeof importKinds)[number];

export const importStatuses = ['running', 'completed', 'partial', 'failed', 'duplicate'] as const;
export type ImportStatus = (typeof importStatuses)[number];

/** How a nightly run ended (docs/design.md §7): skipped when another run held the lock. */
export const nightlyRunOutcomes = ['ok', 'partial', 'failed', 'skipped'] as const;
export type NightlyRunOutcome = (typeof nightlyRunOutcomes)[number];

/** What started a nightly run: `osmia nightly` (cron, by hand) or `osmia schedule`. */
export const nightlyTriggers = ['cli', 'schedule'] as const;
export type NightlyTrigger = (typeof nightlyTriggers)[number];

/** The mail Osmia sends: the nightly digest, a membrane threshold first crossed, a nightly import that failed. */
export const mailKinds = ['digest', 'membrane-alert', 'import-failure'] as const;
export type MailKind = (typeof mailKinds)[number];

/** The alerts of the performance KPI (shared/schemas/performance.ts, performanceAlertSchema.kind). */
export const membraneAlertKinds = ['permeate-flow-drop', 'differential-pressure-rise', 'salt-passage-rise'] as const;
export type MembraneAlertKind = (typeof membraneAlertKinds)[number];
