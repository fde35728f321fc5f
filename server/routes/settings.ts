import { roles } from '#shared/schemas/enums.ts';
import { settingsSchema, settingsUpdateBodySchema } from '#shared/schemas/settings.ts';
import { currentUser } from '../auth/middleware.ts';
import type { AppDeps } from '../deps.ts';
import { getSettings, updateSettings } from '../services/settings.ts';
import type { RouteRegistry } from './registry.ts';

export function settingsRoutes(r: RouteRegistry, { db }: AppDeps) {
  r.get('/api/settings', { access: roles, summary: 'Plant settings (cost rates, thresholds, recipients)', response: settingsSchema }, async (_req, res) => {
    res.json(await getSettings(db));
  });

  r.put(
    '/api/settings',
    { access: ['admin'], summary: 'Change some settings', body: settingsUpdateBodySchema, response: settingsSchema },
    async (req, res) => {
      const body = settingsUpdateBodySchema.parse(req.body);
      res.json(await updateSettings(db, body, currentUser(res).email));
    },
  );
}
