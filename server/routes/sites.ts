import { Router } from 'express';
import { idParamsSchema, onCallBodySchema } from '../../telemetry/api';
import type { TeamService } from '../services/invites';
import type { HazardService } from '../services/hazard';
import type { SiteScope } from '../services/scope';
import { allow } from '../auth';
import { notFound } from '../errors';
import type { sitesRepository } from '../repositories/sites';
import type { boardService } from '../services/board';
import { validate } from '../validate';

export function sitesRouter(sites: ReturnType<typeof sitesRepository>, board: ReturnType<typeof boardService>, team: TeamService, scopeOf: SiteScope, hazard: HazardService): Router {
  const r = Router();
  r.get('/board', allow('sites.read'), async (req, res) => {
    const scope = await scopeOf(req.user!);
    res.json({ sites: (await board.snapshot()).filter((s) => !scope || scope.has(s.siteId)) });
  });
  r.get('/', allow('sites.read'), async (req, res) => {
    const scope = await scopeOf(req.user!);
    res.json({ sites: (await sites.list()).filter((s) => !scope || scope.has(s.id)) });
  });
  r.get('/:id', allow('sites.read'), validate({ params: idParamsSchema }), async (req, res) => {
    const site = await sites.byId(Number(req.params.id));
    const scope = await scopeOf(req.user!);
    if (!site || (scope && !scope.has(site.id))) throw notFound('Site');
    res.json({ site });
  });
  // the one falling-ice hazard, for the Site screen, the check-in and the wall alike
  r.get('/:id/hazard', allow('sites.read'), validate({ params: idParamsSchema }), async (req, res) => {
    const scope = await scopeOf(req.user!);
    if (scope && !scope.has(Number(req.params.id))) throw notFound('Site');
    res.json({ hazard: await hazard.forSite(Number(req.params.id)) });
  });
  r.get('/:id/on-call', allow('sites.read'), validate({ params: idParamsSchema }), async (req, res) => {
    res.json({ onCall: await team.onCall(req.user!, Number(req.params.id)) });
  });
  r.put('/:id/on-call', allow('people.write'), validate({ params: idParamsSchema, body: onCallBodySchema }), async (req, res) => {
    res.json({ onCall: await team.setOnCall(req.user!, Number(req.params.id), req.body.personIds) });
  });
  return r;
}
