import { doc, tagged } from '../http/meta';
import { roles } from '../../telemetry/roles';
import { Router, type RequestHandler } from 'express';
import { idParamsSchema, inviteBodySchema, notificationPrefsSchema, personCreateSchema, personUpdateSchema } from '../../telemetry/api';
import { allow, signedIn } from '../auth';
import { AppError } from '../errors';
import type { TeamService } from '../services/invites';
import type { peopleService } from '../services/people';
import { validate } from '../validate';

export function peopleRouter(people: ReturnType<typeof peopleService>, team: TeamService): Router {
  const r = Router();
  r.get('/me/notifications', signedIn(), doc('Which alarm priorities e-mail this person'), async (req, res) => {
    res.json({ prefs: await team.prefs(req.user!.id) });
  });
  const notViewOnly: RequestHandler = tagged((req, _res, next) => {
    if (req.user!.role === 'kiosk') throw new AppError('forbidden', 'A wall-screen sign-in is view-only');
    next();
  }, { roles: roles.filter((r) => r !== 'kiosk') });
  r.put('/me/notifications', signedIn(), notViewOnly, validate({ body: notificationPrefsSchema }), doc('Sets which alarm priorities e-mail this person'), async (req, res) => {
    res.json({ prefs: await team.setPrefs(req.user!.id, req.body) });
  });
  r.post('/invite', allow('people.write'), validate({ body: inviteBodySchema }), doc('Invites a person by e-mail'), async (req, res) => {
    res.status(201).json({ person: await team.invite(req.user!, req.body) });
  });
  r.get('/', allow('people.read'), doc('Everyone with a sign-in'), async (_req, res) => {
    res.json({ people: await people.list() });
  });
  r.post('/', allow('people.write'), validate({ body: personCreateSchema }), doc('Creates a person with a password'), async (req, res) => {
    res.status(201).json({ person: await people.create(req.user!, req.body) });
  });
  r.post('/:id/reset', allow('people.write'), validate({ params: idParamsSchema }), doc('Sends a person a password reset link'), async (req, res) => {
    const p = await people.byId(Number(req.params.id));
    await team.sendReset(p.email, req.user!);
    res.status(202).json({ message: `A reset link was e-mailed to ${p.email}` });
  });
  r.patch('/:id', allow('people.write'), validate({ params: idParamsSchema, body: personUpdateSchema }), doc('Changes a person\'s name, role or whether they may sign in'), async (req, res) => {
    res.json({ person: await people.update(req.user!, Number(req.params.id), req.body) });
  });
  return r;
}
