import { nightlyRunListQuerySchema, nightlyRunListSchema } from '#shared/schemas/nightly.ts';
import type { AppDeps } from '../deps.ts';
import { nightlyRunPage } from '../services/nightly-runs.ts';
import type { RouteRegistry } from './registry.ts';

// The nightly runs are the imports' log: the same two roles as the Imports page (server/routes/imports.ts).
const readers = ['admin', 'engineer'] as const;

export function nightlyRoutes(r: RouteRegistry, { db }: AppDeps) {
  r.get(
    '/api/nightly-runs',
    { access: readers, summary: 'Nightly runs, newest first: files, steps, digest figures, mail', query: nightlyRunListQuerySchema, response: nightlyRunListSchema },
    async (req, res) => {
      const page = nightlyRunListQuerySchema.parse(req.query);
      res.json(await nightlyRunPage(db, page));
    },
  );
}
