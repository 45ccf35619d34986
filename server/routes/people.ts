import { Router, type RequestHandler } from 'express';
import { idParamsSchema, inviteBodySchema, notificationPrefsSchema, personCreateSchema, personUpdateSchema } from '../../telemetry/api';
import { allow, signedIn } from '../auth';
import { AppError } from '../errors';
import type { TeamService } from '../services/invites';
import type { peopleService } from '../services/people';
import { validate } from '../validate';

export function peopleRouter(people: ReturnType<typeof peopleService>, team: TeamService): Router {
  const r = Router();
  r.get('/me/notifications', signedIn(), async (req, res) => {
    res.json({ prefs: await team.prefs(req.user!.id) });
  });
  const notViewOnly: RequestHandler = (req, _res, next) => {
    if (req.user!.role === 'kiosk') throw new AppError('forbidden', 'A wall-screen sign-in is view-only');
    next();
  };
  r.put('/me/notifications', signedIn(), notViewOnly, validate({ body: notificationPrefsSchema }), async (req, res) => {
    res.json({ prefs: await team.setPrefs(req.user!.id, req.body) });
  });
  r.post('/invite', allow('people.write'), validate({ body: inviteBodySchema }), async (req, res) => {
    res.status(201).json({ person: await team.invite(req.user!, req.body) });
  });
  r.get('/', allow('people.read'), async (_req, res) => {
    res.json({ people: await people.list() });
  });
  r.post('/', allow('people.write'), validate({ body: personCreateSchema }), async (req, res) => {
    res.status(201).json({ person: await people.create(req.user!, req.body) });
  });
  r.post('/:id/reset', allow('people.write'), validate({ params: idParamsSchema }), async (req, res) => {
    const p = await people.byId(Number(req.params.id));
    await team.sendReset(p.email, req.user!);
    res.status(202).json({ message: `A reset link was e-mailed to ${p.email}` });
  });
  r.patch('/:id', allow('people.write'), validate({ params: idParamsSchema, body: personUpdateSchema }), async (req, res) => {
    res.json({ person: await people.update(req.user!, Number(req.params.id), req.body) });
  });
  return r;
}
