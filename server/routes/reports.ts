import { createReadStream } from 'node:fs';
import { pipeline } from 'node:stream/promises';
import { roles } from '#shared/schemas/enums.ts';
import { reportListSchema, reportQuerySchema, storedReportParamsSchema, type ReportList } from '#shared/schemas/reports.ts';
import { currentUser } from '../auth/middleware.ts';
import type { AppDeps } from '../deps.ts';
import { workbooks, workbooksFor } from '../reports/catalog.ts';
import { prepareReport } from '../reports/index.ts';
import { defaultReportsDir, listStoredReports, storedReportPath } from '../reports/stored.ts';
import type { RouteRegistry } from './registry.ts';

const xlsxType = 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet';

/**
 * GET /api/reports (what the caller may build, and the stored workbooks it may download),
 * GET /api/reports/<name>.xlsx (built for the query's site and window, streamed as it is written) and
 * GET /api/reports/stored/:date/:file. Each workbook's route admits the roles of its entry in
 * server/reports/catalog.ts; a stored copy is refused to the roles its workbook's route refuses.
 */
export function reportRoutes(r: RouteRegistry, { db, env }: AppDeps) {
  const dir = env.REPORTS_DIR ?? defaultReportsDir;

  r.get('/api/reports', { access: roles, summary: 'Workbooks the caller may build, and the stored ones it may download', response: reportListSchema }, async (_req, res) => {
    const role = currentUser(res).role;
    const body: ReportList = {
      workbooks: workbooksFor(role).map((w) => ({ name: w.name, title: w.title, description: w.description, url: `/api/reports/${w.name}.xlsx` })),
      stored: await listStoredReports(dir, role),
    };
    res.json(body);
  });

  for (const workbook of workbooks) {
    r.get(
      `/api/reports/${workbook.name}.xlsx`,
      { access: workbook.access, summary: `The ${workbook.title.toLowerCase()} workbook for a site and window (XLSX, streamed)`, query: reportQuerySchema, produces: xlsxType },
      async (req, res) => {
        const query = reportQuerySchema.parse(req.query);
        // Every figure is read before the first byte: a bad site or window is still a JSON error.
        const prepared = await prepareReport(db, { ...query, name: workbook.name });
        res.setHeader('Content-Type', xlsxType);
        res.setHeader('Content-Disposition', `attachment; filename="${prepared.fileName}"`);
        res.setHeader('Cache-Control', 'no-store');
        try {
          await prepared.write(res);
        } catch (err) {
          res.destroy(err as Error);
          throw err;
        }
      },
    );
  }

  r.get(
    '/api/reports/stored/:date/:file',
    { access: roles, summary: 'A stored workbook (reports/<date>/<file>)', params: storedReportParamsSchema, produces: xlsxType },
    async (req, res) => {
      const { date, file } = storedReportParamsSchema.parse(req.params);
      const path = await storedReportPath(dir, date, file, currentUser(res).role);
      res.setHeader('Content-Type', xlsxType);
      res.setHeader('Content-Disposition', `attachment; filename="${file}"`);
      res.setHeader('Cache-Control', 'no-store');
      await pipeline(createReadStream(path), res);
    },
  );
}
