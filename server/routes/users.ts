import {
  userCreateBodySchema,
  userIdParamsSchema,
  userListSchema,
  userSchema,
  userUpdateBodySchema,
} from '#shared/schemas/users.ts';
import { issueSession } from '../auth/cookie.ts';
import { currentUser } from '../auth/middleware.ts';
import { listUsers } from '../db/queries/users.ts';
import type { AppDeps } from '../deps.ts';
import { changeUser, createUser } from '../services/users.ts';
import type { RouteRegistry } from './registry.ts';

export function userRoutes(r: RouteRegistry, { db, env, sessionKey }: AppDeps) {
  r.get('/api/users', { access: ['admin'], summary: 'List users', response: userListSchema }, async (_req, res) => {
    res.json({ users: await listUsers(db) });
  });

  r.post('/api/users', { access: ['admin'], summary: 'Add a user', body: userCreateBodySchema, response: userSchema }, async (req, res) => {
    const body = userCreateBodySchema.parse(req.body);
    res.status(201).json(await createUser(db, body, env.BCRYPT_COST));
  });

  r.patch(
    '/api/users/:id',
    {
      access: ['admin'],
      summary: 'Change a user: name, role, disabled, password',
      params: userIdParamsSchema,
      body: userUpdateBodySchema,
      response: userSchema,
    },
    async (req, res) => {
      const { id } = userIdParamsSchema.parse(req.params);
      const body = userUpdateBodySchema.parse(req.body);
      const actor = currentUser(res);
      const { user, sessionGeneration, sessionsEnded } = await changeUser(db, id, body, env.BCRYPT_COST, actor.id);
      // An admin who changed their own password or role keeps working in this session, on a new token;
      // their other sessions end with the rest.
      if (sessionsEnded && user.id === actor.id) await issueSession(req, res, env, sessionKey, { userId: user.id, role: user.role, generation: sessionGeneration });
      res.json(user);
    },
  );
}
