// The workbooks Osmia writes, in one list: name, who may have it, and how it is loaded and written. The
// API's routes (server/routes/reports.ts), `osmia report` (bin/commands/report.ts) and the nightly run
// all take them from here.
import type { Role } from '#shared/schemas/enums.ts';
import type { ReportName } from '#shared/schemas/reports.ts';
import type { Book } from './book.ts';
import type { ReportContext } from './context.ts';
import { loadEngineer, writeEngineer } from './engineer.ts';
import { loadFinance, writeFinance } from './finance.ts';
import { loadManager, writeManager } from './manager.ts';

export interface WorkbookDefinition<Content = unknown> {
  name: ReportName;
  title: string;
  description: string;
  /** Roles that may build and download it (GET /api/reports/<name>.xlsx, stored copies). */
  access: readonly Role[];
  /** Whether one of its KPIs reads the tables derived from samples (then a small refresh backlog is caught up first). */
  readsDerived: boolean;
  /** Every figure it shows: KPI answers for the window and the rows under them. Throws before anything is written. */
  load: (ctx: ReportContext) => Promise<Content>;
  write: (book: Book, content: Content) => Promise<void>;
}

function define<Content>(d: WorkbookDefinition<Content>): WorkbookDefinition<Content> {
  return d;
}

// finance gets finance and manager; manager gets manager; engineer gets engineer and manager; admin all.
export const financeWorkbook = define({
  name: 'finance',
  title: 'Finance',
  description: 'Maintenance cost by month, asset and work-order type, cost per m³, downtime cost, element replacements and the 12-month replacement budget.',
  access: ['admin', 'finance'],
  readsDerived: true,
  load: loadFinance,
  write: writeFinance,
});

export const managerWorkbook = define({
  name: 'manager',
  title: 'Manager',
  description: 'Availability, MTBF with bounds, MTTR, downtime by cause, time to complete, membrane alerts, and what each KPI means.',
  access: ['admin', 'manager', 'finance', 'engineer'],
  readsDerived: true,
  load: loadManager,
  write: writeManager,
});

export const engineerWorkbook = define({
  name: 'engineer',
  title: 'Engineer',
  description: 'Element register with ages and risk, the failure list, and the import history with its rejected rows.',
  access: ['admin', 'engineer'],
  readsDerived: true,
  load: loadEngineer,
  write: writeEngineer,
});

export const workbooks: readonly WorkbookDefinition[] = [financeWorkbook, managerWorkbook, engineerWorkbook] as WorkbookDefinition[];

export function workbookNamed(name: ReportName): WorkbookDefinition {
  return workbooks.find((w) => w.name === name)!;
}

/** The workbooks a role may have. */
export function workbooksFor(role: Role): WorkbookDefinition[] {
  return workbooks.filter((w) => w.access.includes(role));
}
