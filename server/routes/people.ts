import { Router } from 'express';
import { idParamsSchema, personCreateSchema, personUpdateSchema } from '../../telemetry/api';
import { allow } from '../auth';
import type { peopleService } from '../services/people';
import { validate } from '../validate';

export function peopleRouter(people: ReturnType<typeof peopleService>): Router {
  const r = Router();
  r.get('/', allow('people.read'), async (_req, res) => {
    res.json({ people: await people.list() });
  });
  r.post('/', allow('people.write'), validate({ body: personCreateSchema }), async (req, res) => {
    res.status(201).json({ person: await people.create(req.user!, req.body) });
  });
  r.patch('/:id', allow('people.write'), validate({ params: idParamsSchema, body: personUpdateSchema }), async (req, res) => {
    res.json({ person: await people.update(req.user!, Number(req.params.id), req.body) });
  });
  return r;
}
