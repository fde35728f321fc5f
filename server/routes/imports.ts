import { mkdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import multer from 'multer';
import type { RequestHandler } from 'express';
import {
  importDetailSchema,
  importHistorySchema,
  importIdParamsSchema,
  importListQuerySchema,
  importRecordSchema,
  importUploadFieldsSchema,
} from '#shared/schemas/imports.ts';
import { currentUser } from '../auth/middleware.ts';
import type { AppDeps } from '../deps.ts';
import { HttpError, badRequest } from '../errors.ts';
import { parseColumnMap } from '../importers/column-map.ts';
import { importDetail, importFile, importHistory, rejectsCsv } from '../services/imports.ts';
import type { RouteRegistry } from './registry.ts';

// Imports (upload, history, rejects) are engineering work: the same two roles as the Imports page
// (src/config/navigation.ts) and the README's role table.
const importers = ['admin', 'engineer'] as const;

export function importRoutes(r: RouteRegistry, { db, env }: AppDeps) {
  const uploadDir = join(tmpdir(), 'osmia-uploads');
  mkdirSync(uploadDir, { recursive: true });
  const upload = multer({ dest: uploadDir, limits: { fileSize: Math.round(env.UPLOAD_LIMIT_MB * 1024 * 1024), files: 1, fields: 10 } });
  const receive: RequestHandler = (req, res, next) =>
    upload.single('file')(req, res, (err: unknown) => {
      if (err instanceof multer.MulterError && err.code === 'LIMIT_FILE_SIZE') {
        return next(new HttpError(413, 'file-too-large', `The file is larger than the upload limit of ${env.UPLOAD_LIMIT_MB} MB.`));
      }
      if (err instanceof multer.MulterError) return next(badRequest('bad-request', `Upload refused: ${err.message}`));
      // busboy's own parse errors ("Malformed part header", "Unexpected end of form") carry no code;
      // a failing disk (ENOSPC…) does, and stays a server error.
      if (err instanceof Error && (err as NodeJS.ErrnoException).code === undefined) {
        return next(badRequest('bad-request', `Upload refused: the multipart body is malformed (${err.message}).`));
      }
      next(err);
    });

  r.post(
    '/api/imports',
    { access: importers, summary: 'Upload a file and import it (multipart: file + kind, site, tz, strict, dryRun, map)', response: importRecordSchema },
    receive,
    async (req, res) => {
      const file = req.file;
      try {
        if (!file) throw badRequest('file-missing');
        const fields = importUploadFieldsSchema.parse({ ...(req.body ?? {}), fileName: file.originalname });
        let columnMap;
        try {
          columnMap = fields.map ? parseColumnMap(fields.map) : undefined;
        } catch (err) {
          throw badRequest('validation-failed', (err as Error).message);
        }
        const record = await importFile(db, {
          kind: fields.kind,
          path: file.path,
          fileName: fields.fileName,
          site: fields.site,
          tz: fields.tz,
          strict: fields.strict,
          dryRun: fields.dryRun,
          columnMap,
          actor: currentUser(res).email,
        });
        res.status(record.status === 'failed' ? 422 : record.id === null ? 200 : 201).json(record);
      } finally {
        if (file) rmSync(file.path, { force: true });
      }
    },
  );

  r.get('/api/imports', { access: importers, summary: 'Import history, newest first', query: importListQuerySchema, response: importHistorySchema }, async (req, res) => {
    const query = importListQuerySchema.parse(req.query);
    res.json({ imports: await importHistory(db, query) });
  });

  r.get('/api/imports/:id', { access: importers, summary: 'One import with its first rejects', params: importIdParamsSchema, response: importDetailSchema }, async (req, res) => {
    const { id } = importIdParamsSchema.parse(req.params);
    res.json(await importDetail(db, id));
  });

  r.get(
    '/api/imports/:id/rejects.csv',
    { access: importers, summary: 'All rejected rows of an import as CSV', params: importIdParamsSchema, produces: 'text/csv' },
    async (req, res) => {
      const { id } = importIdParamsSchema.parse(req.params);
      const lines = rejectsCsv(db, id);
      const first = await lines.next(); // throws not-found before any header is sent
      res.setHeader('Content-Type', 'text/csv; charset=utf-8');
      res.setHeader('Content-Disposition', `attachment; filename="import-${id}-rejects.csv"`);
      if (!first.done) res.write(first.value);
      for await (const chunk of lines) res.write(chunk);
      res.end();
    },
  );
}
