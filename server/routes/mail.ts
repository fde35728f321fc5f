import { mailIdParamsSchema, mailListQuerySchema, mailListSchema, mailMessageSchema } from '#shared/schemas/mail.ts';
import type { AppDeps } from '../deps.ts';
import { mailMessage, mailPage } from '../services/mail.ts';
import type { RouteRegistry } from './registry.ts';

// Received mail holds every recipient's digest: administrators only.
const readers = ['admin'] as const;

export function mailRoutes(r: RouteRegistry, { db, env }: AppDeps) {
  r.get(
    '/api/mail',
    { access: readers, summary: 'Mail the development mail server received, newest first, and the outbox', query: mailListQuerySchema, response: mailListSchema },
    async (req, res) => {
      const page = mailListQuerySchema.parse(req.query);
      res.json(await mailPage(db, page, env.SMTP_URL));
    },
  );

  r.get('/api/mail/:id', { access: readers, summary: 'One received message: headers, text and HTML parts', params: mailIdParamsSchema, response: mailMessageSchema }, async (req, res) => {
    const { id } = mailIdParamsSchema.parse(req.params);
    res.json(await mailMessage(db, id));
  });
}
