import { Router } from 'express';
import { z } from 'zod';

import { allow } from '@/server/auth';
import { notFound } from '@/server/errors';
import { doc } from '@/server/http/meta';
import { typed } from '@/server/http/route';
import type { SitesRepository } from '@/server/repositories/sites';
import type { boardService } from '@/server/services/board';
import type { HazardService } from '@/server/services/hazard';
import type { TeamService } from '@/server/services/invites';
import type { NetworkService } from '@/server/services/network';
import type { SiteScope } from '@/server/services/scope';
import {
  antennaInputSchema,
  antennaParamsSchema,
  antennaPatchSchema,
  antennaSchema,
  archiveBodySchema,
  idParamsSchema,
  onCallBodySchema,
  regionRenameSchema,
  siteInputSchema,
  siteListQuerySchema,
  sitePatchSchema,
  siteSchema,
} from '@/telemetry/api';

const siteBody = z.object({ site: siteSchema });
const antennaBody = z.object({ antenna: antennaSchema });
const siteCreateSchema = siteInputSchema.extend({ antennas: z.array(antennaInputSchema).max(50).optional() });

export function sitesRouter(deps: {
  sites: SitesRepository;
  network: NetworkService;
  board: ReturnType<typeof boardService>;
  team: TeamService;
  scopeOf: SiteScope;
  hazard: HazardService;
}): Router {
  const { network, board, team, scopeOf, hazard } = deps;
  const r = Router();
  r.get(
    '/board',
    allow('sites.read'),
    doc('The Board: every site in scope with its latest values and open alarms'),
    async (req, res) => {
      const scope = await scopeOf(req.user!);
      res.json({ sites: (await board.snapshot()).filter((s) => !scope || scope.has(s.siteId)) });
    },
  );
  r.get('/regions', allow('sites.read'), doc('Regions in use, with how many sites each has'), async (req, res) => {
    res.json({ regions: await network.regions(req.user!) });
  });
  r.post(
    '/regions/rename',
    allow('sites.write'),
    doc('Renames a region on every site in it'),
    ...typed({ body: regionRenameSchema }, async ({ body, user, res }) => {
      res.json({ region: await network.renameRegion(user, body.from, body.to) });
    }),
  );
  r.get(
    '/',
    allow('sites.read'),
    doc('Sites in scope with their antennas; archived ones with archived=1', {
      response: z.object({ sites: z.array(siteSchema) }),
    }),
    ...typed({ query: siteListQuerySchema }, async ({ query: q, user, res }) => {
      res.json({ sites: await network.list(user, { archived: q.archived === '1' }) });
    }),
  );
  r.post(
    '/',
    allow('sites.write'),
    doc('Creates a site, with its antennas if given', { response: siteBody, status: 201 }),
    ...typed({ body: siteCreateSchema }, async ({ body, user, res }) => {
      res.status(201).json({ site: await network.createSite(user, body) });
    }),
  );
  r.get(
    '/:id',
    allow('sites.read'),
    doc('One site with every antenna it has had', { response: siteBody }),
    ...typed({ params: idParamsSchema }, async ({ params, user, res }) => {
      res.json({ site: await network.detail(user, params.id) });
    }),
  );
  r.patch(
    '/:id',
    allow('sites.write'),
    doc('Changes the fields given', { response: siteBody }),
    ...typed({ params: idParamsSchema, body: sitePatchSchema }, async ({ params, body, user, res }) => {
      res.json({ site: await network.updateSite(user, params.id, body) });
    }),
  );
  r.post(
    '/:id/archive',
    allow('sites.write'),
    doc('Archives a site: off the Board and the lists, its history kept', { response: siteBody }),
    ...typed({ params: idParamsSchema, body: archiveBodySchema }, async ({ params, body, user, res }) => {
      res.json({ site: await network.archiveSite(user, params.id, body.reason) });
    }),
  );
  r.post(
    '/:id/restore',
    allow('sites.write'),
    doc('Brings an archived site back', { response: siteBody }),
    ...typed({ params: idParamsSchema }, async ({ params, user, res }) => {
      res.json({ site: await network.restoreSite(user, params.id) });
    }),
  );
  r.delete(
    '/:id',
    allow('sites.write'),
    doc('Deletes a site nothing ever hung on (409 otherwise: archive it)', { status: 204 }),
    ...typed({ params: idParamsSchema }, async ({ params, user, res }) => {
      await network.deleteSite(user, params.id);
      res.status(204).end();
    }),
  );
  r.post(
    '/:id/antennas',
    allow('sites.write'),
    doc('Adds an antenna to a site', { response: antennaBody, status: 201 }),
    ...typed({ params: idParamsSchema, body: antennaInputSchema }, async ({ params, body, user, res }) => {
      res.status(201).json({ antenna: await network.addAntenna(user, params.id, body) });
    }),
  );
  r.patch(
    '/:id/antennas/:antennaId',
    allow('sites.write'),
    doc('Changes an antenna', { response: antennaBody }),
    ...typed({ params: antennaParamsSchema, body: antennaPatchSchema }, async ({ params, body, user, res }) => {
      const p = params;
      res.json({ antenna: await network.updateAntenna(user, p.id, p.antennaId, body) });
    }),
  );
  r.post(
    '/:id/antennas/:antennaId/archive',
    allow('sites.write'),
    doc('Archives an antenna', { response: antennaBody }),
    ...typed({ params: antennaParamsSchema, body: archiveBodySchema }, async ({ params, body, user, res }) => {
      const p = params;
      res.json({ antenna: await network.archiveAntenna(user, p.id, p.antennaId, body.reason) });
    }),
  );
  r.delete(
    '/:id/antennas/:antennaId',
    allow('sites.write'),
    doc('Deletes an antenna no controller ever watched', { status: 204 }),
    ...typed({ params: antennaParamsSchema }, async ({ params, user, res }) => {
      const p = params;
      await network.deleteAntenna(user, p.id, p.antennaId);
      res.status(204).end();
    }),
  );
  r.get(
    '/:id/former-controllers',
    allow('sites.read'),
    doc('Controllers that were at this site before, with when'),
    ...typed({ params: idParamsSchema }, async ({ params, user, res }) => {
      const site = await network.detail(user, params.id);
      res.json({ controllers: await deps.sites.formerControllers(site.id) });
    }),
  );
  // the one falling-ice hazard, for the Site screen, the check-in and the wall alike
  r.get(
    '/:id/hazard',
    allow('sites.read'),
    doc('The falling-ice hazard at a site now, with its radius and assumptions'),
    ...typed({ params: idParamsSchema }, async ({ params, user, res }) => {
      const scope = await scopeOf(user);
      if (scope && !scope.has(params.id)) throw notFound('Site');
      res.json({ hazard: await hazard.forSite(params.id) });
    }),
  );
  r.get(
    '/:id/on-call',
    allow('sites.read'),
    doc('Who is on call for a site, in order'),
    ...typed({ params: idParamsSchema }, async ({ params, user, res }) => {
      res.json({ onCall: await team.onCall(user, params.id) });
    }),
  );
  r.put(
    '/:id/on-call',
    allow('people.write'),
    doc('Sets who is on call for a site, in order'),
    ...typed({ params: idParamsSchema, body: onCallBodySchema }, async ({ params, body, user, res }) => {
      res.json({ onCall: await team.setOnCall(user, params.id, body.personIds) });
    }),
  );
  return r;
}
