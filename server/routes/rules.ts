import { Router } from 'express';
import { z } from 'zod';

import { allow } from '@/server/auth';
import { doc } from '@/server/http/meta';
import { typed } from '@/server/http/route';
import type { RulesService } from '@/server/services/rules';
import { ruleBodySchema, ruleKinds } from '@/telemetry/alarms/rules';
import { idParamsSchema, idSchema } from '@/telemetry/api';

const effectiveQuery = z.object({ controller: idSchema });
const createBody = ruleBodySchema.extend({
  kind: z.enum(ruleKinds),
  scope: z.enum(['site', 'antenna', 'controller']),
  scopeId: z.number().int().positive(),
});
const previewBody = ruleBodySchema.extend({
  kind: z.enum(ruleKinds),
  controllerId: z.number().int().positive(),
  days: z.union([z.literal(1), z.literal(7), z.literal(30)]),
});

export function rulesRouter(rules: RulesService): Router {
  const r = Router();
  r.get('/', allow('rules.read'), doc('Every alarm rule'), async (_req, res) => {
    res.json({ rules: await rules.list() });
  });
  // the limits in force are part of every chart: whoever may read a controller's readings sees them
  r.get(
    '/effective',
    allow('readings.read'),
    doc('The rules in force for a controller (for chart limit lines)'),
    ...typed({ query: effectiveQuery }, async ({ query, user, res }) => {
      res.json({ effective: await rules.effective(user, query.controller) });
    }),
  );
  r.post(
    '/preview',
    allow('rules.write'),
    doc('Replays a rule over stored readings: what it would have raised'),
    ...typed({ body: previewBody }, async ({ body, res }) => {
      const { kind, controllerId, days, ...rule } = body;
      res.json(await rules.preview(controllerId, kind, rule, days));
    }),
  );
  r.post(
    '/',
    allow('rules.write'),
    doc('Creates an alarm rule'),
    ...typed({ body: createBody }, async ({ body, user, res }) => {
      const { kind, scope, scopeId, ...rule } = body;
      res.status(201).json({ rule: await rules.createOverride(user, kind, scope, scopeId, rule) });
    }),
  );
  r.put(
    '/:id',
    allow('rules.write'),
    doc('Changes an alarm rule'),
    ...typed({ params: idParamsSchema, body: ruleBodySchema }, async ({ params, body, user, res }) => {
      res.json({ rule: await rules.update(user, params.id, body) });
    }),
  );
  r.delete(
    '/:id',
    allow('rules.write'),
    doc('Removes an alarm rule'),
    ...typed({ params: idParamsSchema }, async ({ params, user, res }) => {
      await rules.remove(user, params.id);
      res.status(204).end();
    }),
  );
  return r;
}
