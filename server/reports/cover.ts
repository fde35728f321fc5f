// The first sheet of every workbook: what it is about (site, window), when it was made, how current its
// data is (the KPI answers' dataAsOf), what a reader must know first (their warnings), and its sheets.
import type { Freshness } from '#shared/schemas/common.ts';
import type { SiteRow } from '../db/queries/sites.ts';
import type { Book } from './book.ts';
import type { ReportContext } from './context.ts';
import type { ReportWindow } from './window.ts';

export interface CoverContent {
  title: string;
  /** One sentence: who the workbook is for and what it holds. */
  about: string;
  site: Pick<SiteRow, 'code' | 'name' | 'timeZone'>;
  window: ReportWindow;
  generatedAt: Date;
  currency: string;
  freshness: Freshness;
  /** Each sheet after the cover and what it holds. */
  contents: { sheet: string; holds: string }[];
}

export function coverOf(ctx: ReportContext, parts: Pick<CoverContent, 'title' | 'about' | 'freshness' | 'contents'>): CoverContent {
  return {
    ...parts,
    site: { code: ctx.site.code, name: ctx.site.name, timeZone: ctx.site.timeZone },
    window: ctx.window,
    generatedAt: ctx.generatedAt,
    currency: ctx.settings.currency,
  };
}

/** `2025-01-31 18:00 America/Denver (2025-02-01T01:00:00.000Z)`: the plant's clock first, the instant after. */
function instantText(book: Book, iso: string | Date | null, zone: string): string {
  if (iso === null) return 'none';
  const at = typeof iso === 'string' ? new Date(iso) : iso;
  const local = book.clock.wall(at).toISOString().slice(0, 16).replace('T', ' ');
  return `${local} ${zone} (${at.toISOString()})`;
}

export async function writeCover(book: Book, cover: CoverContent): Promise<void> {
  const sheet = book.sheet('Cover', {
    table: false,
    columns: [
      { header: 'Item', kind: 'text', width: 30 },
      { header: 'Value', kind: 'text', width: 90 },
    ],
  });
  const zone = cover.site.timeZone;
  const site = cover.site.name === cover.site.code ? cover.site.code : `${cover.site.code} — ${cover.site.name}`;
  sheet.title(`${cover.title} — ${site}`);
  sheet.note(cover.about);
  sheet.blank();
  const items: [string, string][] = [
    ['Site', site],
    ['Time zone', `${zone} (every date and time in this workbook is the plant's local clock)`],
    ['Window from', `${cover.window.fromDay} 00:00 (${cover.window.from.toISOString()}), included`],
    ['Window to', `${cover.window.toDay} 00:00 (${cover.window.to.toISOString()}), not included`],
    ['Generated at', instantText(book, cover.generatedAt, zone)],
    ['Newest sample used', instantText(book, cover.freshness.dataAsOf.newestSampleAt, zone)],
    ['Newest work order used', instantText(book, cover.freshness.dataAsOf.newestWorkOrderAt, zone)],
    ['Derived data up to date', cover.freshness.derivedUpToDate ? 'yes' : 'no: run "bin/osmia refresh" and build the workbook again'],
    ['Currency', cover.currency],
  ];
  for (const [item, value] of items) await sheet.row([item, value]);
  sheet.blank();
  await sheet.row(['Warnings', cover.freshness.warnings.length === 0 ? 'none' : `${cover.freshness.warnings.length}, listed below`], 'heading');
  for (const w of cover.freshness.warnings) await sheet.row(['', w]);
  sheet.blank();
  await sheet.row(['Sheet', 'What it holds'], 'heading');
  for (const c of cover.contents) await sheet.row([c.sheet, c.holds]);
  sheet.blank();
  sheet.note('Figures are those of the Osmia API (GET /api/kpi/…) for the same site and window; totals are spreadsheet formulas over the rows above them.');
  book.done(sheet);
}
