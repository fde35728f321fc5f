import type { ReportName } from '#shared/schemas/reports.ts';

/** Who each workbook is written for, for its card. */
export const readerOf: Record<ReportName, string> = {
  finance: 'For finance',
  manager: 'For plant managers',
  engineer: 'For maintenance engineers',
};

