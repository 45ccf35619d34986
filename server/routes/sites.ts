import { Router } from 'express';
import { z } from 'zod';
import {
  antennaInputSchema, antennaParamsSchema, antennaPatchSchema, antennaSchema, archiveBodySchema, idParamsSchema, onCallBodySchema,
  regionRenameSchema, siteInputSchema, siteListQuerySchema, sitePatchSchema, siteSchema,
} from '../../telemetry/api';
import type { TeamService } from '../services/invites';
import type { HazardService } from '../services/hazard';
import type { SiteScope } from '../services/scope';
import type { NetworkService } from '../services/network';
import type { SitesRepository } from '../repositories/sites';
import { allow } from '../auth';
import { notFound } from '../errors';
import { doc } from '../http/meta';
import type { boardService } from '../services/board';
import { validate } from '../validate';

const siteBody = z.object({ site: siteSchema });
const antennaBody = z.object({ antenna: antennaSchema });
const siteCreateSchema = siteInputSchema.extend({ antennas: z.array(antennaInputSchema).max(50).optional() });

export function sitesRouter(deps: { sites: SitesRepository; network: NetworkService; board: ReturnType<typeof boardService>; team: TeamService; scopeOf: SiteScope; hazard: HazardService }): Router {
  const { network, board, team, scopeOf, hazard } = deps;
  const r = Router();
  r.get('/board', allow('sites.read'), doc('The Board: every site in scope with its latest values and open alarms'), async (req, res) => {
    const scope = await scopeOf(req.user!);
    res.json({ sites: (await board.snapshot()).filter((s) => !scope || scope.has(s.siteId)) });
  });
  r.get('/regions', allow('sites.read'), doc('Regions in use, with how many sites each has'), async (_req, res) => {
    res.json({ regions: await network.regions() });
  });
  r.post('/regions/rename', allow('sites.write'), validate({ body: regionRenameSchema }), doc('Renames a region on every site in it'), async (req, res) => {
    res.json({ region: await network.renameRegion(req.user!, req.body.from, req.body.to) });
  });
  r.get('/', allow('sites.read'), validate({ query: siteListQuerySchema }), doc('Sites in scope with their antennas; archived ones with archived=1', { response: z.object({ sites: z.array(siteSchema) }) }), async (req, res) => {
    const q = req.query as z.infer<typeof siteListQuerySchema>;
    res.json({ sites: await network.list(req.user!, { archived: q.archived === '1' }) });
  });
  r.post('/', allow('sites.write'), validate({ body: siteCreateSchema }), doc('Creates a site, with its antennas if given', { response: siteBody, status: 201 }), async (req, res) => {
    res.status(201).json({ site: await network.createSite(req.user!, req.body) });
  });
  r.get('/:id', allow('sites.read'), validate({ params: idParamsSchema }), doc('One site with every antenna it has had', { response: siteBody }), async (req, res) => {
    res.json({ site: await network.detail(req.user!, Number(req.params.id)) });
  });
  r.patch('/:id', allow('sites.write'), validate({ params: idParamsSchema, body: sitePatchSchema }), doc('Changes the fields given', { response: siteBody }), async (req, res) => {
    res.json({ site: await network.updateSite(req.user!, Number(req.params.id), req.body) });
  });
  r.post('/:id/archive', allow('sites.write'), validate({ params: idParamsSchema, body: archiveBodySchema }), doc('Archives a site: off the Board and the lists, its history kept', { response: siteBody }), async (req, res) => {
    res.json({ site: await network.archiveSite(req.user!, Number(req.params.id), req.body.reason) });
  });
  r.post('/:id/restore', allow('sites.write'), validate({ params: idParamsSchema }), doc('Brings an archived site back', { response: siteBody }), async (req, res) => {
    res.json({ site: await network.restoreSite(req.user!, Number(req.params.id)) });
  });
  r.delete('/:id', allow('sites.write'), validate({ params: idParamsSchema }), doc('Deletes a site nothing ever hung on (409 otherwise: archive it)', { status: 204 }), async (req, res) => {
    await network.deleteSite(req.user!, Number(req.params.id));
    res.status(204).end();
  });
  r.post('/:id/antennas', allow('sites.write'), validate({ params: idParamsSchema, body: antennaInputSchema }), doc('Adds an antenna to a site', { response: antennaBody, status: 201 }), async (req, res) => {
    res.status(201).json({ antenna: await network.addAntenna(req.user!, Number(req.params.id), req.body) });
  });
  r.patch('/:id/antennas/:antennaId', allow('sites.write'), validate({ params: antennaParamsSchema, body: antennaPatchSchema }), doc('Changes an antenna', { response: antennaBody }), async (req, res) => {
    const p = req.params as unknown as z.infer<typeof antennaParamsSchema>;
    res.json({ antenna: await network.updateAntenna(req.user!, p.id, p.antennaId, req.body) });
  });
  r.post('/:id/antennas/:antennaId/archive', allow('sites.write'), validate({ params: antennaParamsSchema, body: archiveBodySchema }), doc('Archives an antenna', { response: antennaBody }), async (req, res) => {
    const p = req.params as unknown as z.infer<typeof antennaParamsSchema>;
    res.json({ antenna: await network.archiveAntenna(req.user!, p.id, p.antennaId, req.body.reason) });
  });
  r.delete('/:id/antennas/:antennaId', allow('sites.write'), validate({ params: antennaParamsSchema }), doc('Deletes an antenna no controller ever watched', { status: 204 }), async (req, res) => {
    const p = req.params as unknown as z.infer<typeof antennaParamsSchema>;
    await network.deleteAntenna(req.user!, p.id, p.antennaId);
    res.status(204).end();
  });
  r.get('/:id/former-controllers', allow('sites.read'), validate({ params: idParamsSchema }), doc('Controllers that were at this site before, with when'), async (req, res) => {
    const site = await network.detail(req.user!, Number(req.params.id));
    res.json({ controllers: await deps.sites.formerControllers(site.id) });
  });
  // the one falling-ice hazard, for the Site screen, the check-in and the wall alike
  r.get('/:id/hazard', allow('sites.read'), validate({ params: idParamsSchema }), doc('The falling-ice hazard at a site now, with its radius and assumptions'), async (req, res) => {
    const scope = await scopeOf(req.user!);
    if (scope && !scope.has(Number(req.params.id))) throw notFound('Site');
    res.json({ hazard: await hazard.forSite(Number(req.params.id)) });
  });
  r.get('/:id/on-call', allow('sites.read'), validate({ params: idParamsSchema }), doc('Who is on call for a site, in order'), async (req, res) => {
    res.json({ onCall: await team.onCall(req.user!, Number(req.params.id)) });
  });
  r.put('/:id/on-call', allow('people.write'), validate({ params: idParamsSchema, body: onCallBodySchema }), doc('Sets who is on call for a site, in order'), async (req, res) => {
    res.json({ onCall: await team.setOnCall(req.user!, Number(req.params.id), req.body.personIds) });
  });
  return r;
}
