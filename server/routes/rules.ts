import { Router } from 'express';
import { z } from 'zod';
import { idParamsSchema, idSchema } from '../../telemetry/api';
import { ruleBodySchema, ruleKinds } from '../../telemetry/alarms/rules';
import { allow } from '../auth';
import type { RulesService } from '../services/rules';
import { validate } from '../validate';

const effectiveQuery = z.object({ controller: idSchema });
const createBody = ruleBodySchema.extend({ kind: z.enum(ruleKinds), scope: z.enum(['site', 'antenna', 'controller']), scopeId: z.number().int().positive() });
const previewBody = ruleBodySchema.extend({ kind: z.enum(ruleKinds), controllerId: z.number().int().positive(), days: z.union([z.literal(1), z.literal(7), z.literal(30)]) });

export function rulesRouter(rules: RulesService): Router {
  const r = Router();
  r.get('/', allow('rules.read'), async (_req, res) => {
    res.json({ rules: await rules.list() });
  });
  // the limits in force are part of every chart: whoever may read a controller's readings sees them
  r.get('/effective', allow('readings.read'), validate({ query: effectiveQuery }), async (req, res) => {
    res.json({ effective: await rules.effective(req.user!, (req.query as unknown as z.infer<typeof effectiveQuery>).controller) });
  });
  r.post('/preview', allow('rules.write'), validate({ body: previewBody }), async (req, res) => {
    const { kind, controllerId, days, ...body } = req.body as z.infer<typeof previewBody>;
    res.json(await rules.preview(controllerId, kind, body, days));
  });
  r.post('/', allow('rules.write'), validate({ body: createBody }), async (req, res) => {
    const { kind, scope, scopeId, ...body } = req.body as z.infer<typeof createBody>;
    res.status(201).json({ rule: await rules.createOverride(req.user!, kind, scope, scopeId, body) });
  });
  r.put('/:id', allow('rules.write'), validate({ params: idParamsSchema, body: ruleBodySchema }), async (req, res) => {
    res.json({ rule: await rules.update(req.user!, Number(req.params.id), req.body) });
  });
  r.delete('/:id', allow('rules.write'), validate({ params: idParamsSchema }), async (req, res) => {
    await rules.remove(req.user!, Number(req.params.id));
    res.status(204).end();
  });
  return r;
}
