import { Router } from 'express';
import { idParamsSchema } from '../../telemetry/api';
import { allow } from '../auth';
import { notFound } from '../errors';
import type { sitesRepository } from '../repositories/sites';
import type { boardService } from '../services/board';
import { validate } from '../validate';

export function sitesRouter(sites: ReturnType<typeof sitesRepository>, board: ReturnType<typeof boardService>): Router {
  const r = Router();
  r.get('/board', allow('sites.read'), async (_req, res) => {
    res.json({ sites: await board.snapshot() });
  });
  r.get('/', allow('sites.read'), async (_req, res) => {
    res.json({ sites: await sites.list() });
  });
  r.get('/:id', allow('sites.read'), validate({ params: idParamsSchema }), async (req, res) => {
    const site = await sites.byId(Number(req.params.id));
    if (!site) throw notFound('Site');
    res.json({ site });
  });
  return r;
}
