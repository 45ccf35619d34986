import { Router } from 'express';
import { z } from 'zod';

import { allow, allowHeaterCommand } from '@/server/auth';
import { doc } from '@/server/http/meta';
import { typed } from '@/server/http/route';
import type { AlarmsService } from '@/server/services/alarms';
import type { CommandsService } from '@/server/services/commands';
import type { ControllersService } from '@/server/services/controllers';
import type { ReadingsService } from '@/server/services/readings';
import {
  calibrationSchema,
  controllerCreateSchema,
  controllerMoveSchema,
  controllerSchema,
  energyQuerySchema,
  heaterCommandSchema,
  heaterEnergySchema,
  idParamsSchema,
  idSchema,
  placementSchema,
  readingsQuerySchema,
  serviceBodySchema,
} from '@/telemetry/api';

const controllerBody = z.object({ controller: controllerSchema });
const listQuerySchema = z.object({ site: idSchema.optional() });

export function controllersRouter(
  controllers: ControllersService,
  readings: ReadingsService,
  commands: CommandsService,
  alarms: AlarmsService,
  operatorsMayCommand: () => Promise<boolean>,
): Router {
  const r = Router();
  r.get(
    '/',
    allow('controllers.read'),
    doc('Controllers in scope, optionally of one site', {
      response: z.object({ controllers: z.array(controllerSchema) }),
    }),
    ...typed({ query: listQuerySchema }, async ({ query: q, user, res }) => {
      res.json({ controllers: await controllers.list(user, q.site) });
    }),
  );
  r.post(
    '/',
    allow('controllers.enrol'),
    doc('Enrols a controller; its MQTT password is in the answer, once', { status: 201 }),
    ...typed({ body: controllerCreateSchema }, async ({ body, user, res }) => {
      res.status(201).json(await controllers.enrol(user, body));
    }),
  );
  r.get(
    '/:id',
    allow('controllers.read'),
    doc('One controller with its last refused readings'),
    ...typed({ params: idParamsSchema }, async ({ params, user, res }) => {
      res.json({ controller: await controllers.detail(user, params.id) });
    }),
  );
  r.post(
    '/:id/password',
    allow('controllers.enrol'),
    doc('Gives a controller a new password (shown once); the old one stops working at once'),
    ...typed({ params: idParamsSchema }, async ({ params, user, res }) => {
      res.json(await controllers.rotatePassword(user, params.id));
    }),
  );
  r.post(
    '/:id/decommission',
    allow('controllers.enrol'),
    doc('Decommissions a controller: refused at the broker, its alarms closed', { response: controllerBody }),
    ...typed({ params: idParamsSchema }, async ({ params, user, res }) => {
      res.json({ controller: await controllers.decommission(user, params.id) });
    }),
  );
  r.post(
    '/:id/move',
    allow('controllers.move'),
    doc('Moves a controller to another antenna or site; its history stays with it', { response: controllerBody }),
    ...typed({ params: idParamsSchema, body: controllerMoveSchema }, async ({ params, body, user, res }) => {
      res.json({ controller: await controllers.move(user, params.id, body) });
    }),
  );
  r.get(
    '/:id/placements',
    allow('controllers.read'),
    doc('Where a controller has been, newest first', { response: z.object({ placements: z.array(placementSchema) }) }),
    ...typed({ params: idParamsSchema }, async ({ params, user, res }) => {
      res.json({ placements: await controllers.placements(user, params.id) });
    }),
  );
  r.put(
    '/:id/calibration',
    allow('controllers.calibrate'),
    doc('Sets the forward and reflected scales and the line loss', { response: controllerBody }),
    ...typed({ params: idParamsSchema, body: calibrationSchema }, async ({ params, body, user, res }) => {
      res.json({ controller: await controllers.calibrate(user, params.id, body) });
    }),
  );
  r.get(
    '/:id/readings',
    allow('readings.read'),
    doc('Readings of a controller over a range, at most `points` points (min and max kept)'),
    ...typed({ params: idParamsSchema, query: readingsQuerySchema }, async ({ params, query, user, res }) => {
      res.type('json').send(await readings.history(user, params.id, query));
    }),
  );
  r.get(
    '/:id/energy',
    allow('readings.read'),
    doc('Heater energy over a window: measured from volts and amps, estimated from the rating where not measured', {
      response: z.object({ energy: heaterEnergySchema.nullable() }),
    }),
    ...typed({ params: idParamsSchema, query: energyQuerySchema }, async ({ params, query, user, res }) => {
      res.json({ energy: await readings.energy(user, params.id, query) });
    }),
  );
  r.post(
    '/:id/heater',
    allowHeaterCommand(operatorsMayCommand),
    doc('Sends a heater mode change to the controller', { status: 202 }),
    ...typed({ params: idParamsSchema, body: heaterCommandSchema }, async ({ params, body, user, res }) => {
      res.status(202).json({ command: await commands.heater(user, params.id, body) });
    }),
  );
  r.get(
    '/:id/commands',
    allow('controllers.read'),
    doc('Commands sent to a controller and their results'),
    ...typed({ params: idParamsSchema }, async ({ params, user, res }) => {
      res.json({ commands: await commands.list(user, params.id) });
    }),
  );
  r.post(
    '/:id/service',
    allow('alarms.service'),
    doc('Takes a controller out of service (its alarms suppressed) or back', { status: 204 }),
    ...typed({ params: idParamsSchema, body: serviceBodySchema }, async ({ params, body, user, res }) => {
      await alarms.setOutOfService(user, params.id, body.outOfService, body.reason);
      res.status(204).end();
    }),
  );
  return r;
}
