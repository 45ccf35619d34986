import { type RequestHandler, Router } from 'express';

import { allow, signedIn } from '@/server/auth';
import { AppError } from '@/server/errors';
import { doc, tagged } from '@/server/http/meta';
import { typed } from '@/server/http/route';
import type { TeamService } from '@/server/services/invites';
import type { peopleService } from '@/server/services/people';
import {
  idParamsSchema,
  inviteBodySchema,
  notificationPrefsSchema,
  personCreateSchema,
  personUpdateSchema,
} from '@/telemetry/api';
import { roles } from '@/telemetry/roles';

export function peopleRouter(people: ReturnType<typeof peopleService>, team: TeamService): Router {
  const r = Router();
  r.get('/me/notifications', signedIn(), doc('Which alarm priorities e-mail this person'), async (req, res) => {
    res.json({ prefs: await team.prefs(req.user!.id) });
  });
  const notViewOnly: RequestHandler = tagged(
    (req, _res, next) => {
      if (req.user!.role === 'kiosk') throw new AppError('forbidden', 'A wall-screen sign-in is view-only');
      next();
    },
    { roles: roles.filter((r) => r !== 'kiosk') },
  );
  r.put(
    '/me/notifications',
    signedIn(),
    notViewOnly,
    doc('Sets which alarm priorities e-mail this person'),
    ...typed({ body: notificationPrefsSchema }, async ({ body, user, res }) => {
      res.json({ prefs: await team.setPrefs(user.id, body) });
    }),
  );
  r.post(
    '/invite',
    allow('people.write'),
    doc('Invites a person by e-mail'),
    ...typed({ body: inviteBodySchema }, async ({ body, user, res }) => {
      res.status(201).json({ person: await team.invite(user, body) });
    }),
  );
  r.get('/', allow('people.read'), doc('Everyone with a sign-in'), async (_req, res) => {
    res.json({ people: await people.list() });
  });
  r.post(
    '/',
    allow('people.write'),
    doc('Creates a person with a password'),
    ...typed({ body: personCreateSchema }, async ({ body, user, res }) => {
      res.status(201).json({ person: await people.create(user, body) });
    }),
  );
  r.post(
    '/:id/reset',
    allow('people.write'),
    doc('Sends a person a password reset link'),
    ...typed({ params: idParamsSchema }, async ({ params, user, res }) => {
      const p = await people.byId(params.id);
      await team.sendReset(p.email, user);
      res.status(202).json({ message: `A reset link was e-mailed to ${p.email}` });
    }),
  );
  r.patch(
    '/:id',
    allow('people.write'),
    doc("Changes a person's name, role or whether they may sign in"),
    ...typed({ params: idParamsSchema, body: personUpdateSchema }, async ({ params, body, user, res }) => {
      res.json({ person: await people.update(user, params.id, body) });
    }),
  );
  return r;
}
