import { doc } from '../http/meta';
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
  r.get('/', allow('rules.read'), doc('Every alarm rule'), async (_req, res) => {
    res.json({ rules: await rules.list() });
  });
  // the limits in force are part of every chart: whoever may read a controller's readings sees them
  r.get('/effective', allow('readings.read'), validate({ query: effectiveQuery }), doc('The rules in force for a controller (for chart limit lines)'), async (req, res) => {
    res.json({ effective: await rules.effective(req.user!, (req.query as unknown as z.infer<typeof effectiveQuery>).controller) });
  });
  r.post('/preview', allow('rules.write'), validate({ body: previewBody }), doc('Replays a rule over stored readings: what it would have raised'), async (req, res) => {
    const { kind, controllerId, days, ...body } = req.body as z.infer<typeof previewBody>;
    res.json(await rules.preview(controllerId, kind, body, days));
  });
  r.post('/', allow('rules.write'), validate({ body: createBody }), doc('Creates an alarm rule'), async (req, res) => {
    const { kind, scope, scopeId, ...body } = req.body as z.infer<typeof createBody>;
    res.status(201).json({ rule: await rules.createOverride(req.user!, kind, scope, scopeId, body) });
  });
  r.put('/:id', allow('rules.write'), validate({ params: idParamsSchema, body: ruleBodySchema }), doc('Changes an alarm rule'), async (req, res) => {
    res.json({ rule: await rules.update(req.user!, Number(req.params.id), req.body) });
  });
  r.delete('/:id', allow('rules.write'), validate({ params: idParamsSchema }), doc('Removes an alarm rule'), async (req, res) => {
    await rules.remove(req.user!, Number(req.params.id));
    res.status(204).end();
  });
  return r;
}
