import { Router } from 'express';
import { z } from 'zod';
import { calibrationSchema, energyQuerySchema, heaterEnergySchema, controllerCreateSchema, controllerMoveSchema, controllerSchema, heaterCommandSchema, idParamsSchema, placementSchema, readingsQuerySchema, serviceBodySchema, idSchema } from '../../telemetry/api';
import { doc } from '../http/meta';
import type { AlarmsService } from '../services/alarms';
import type { CommandsService } from '../services/commands';
import { allow, allowHeaterCommand } from '../auth';
import type { ControllersService } from '../services/controllers';
import type { ReadingsService } from '../services/readings';
import { validate } from '../validate';

const controllerBody = z.object({ controller: controllerSchema });
const listQuerySchema = z.object({ site: idSchema.optional() });

export function controllersRouter(controllers: ControllersService, readings: ReadingsService, commands: CommandsService, alarms: AlarmsService, operatorsMayCommand: () => Promise<boolean>): Router {
  const r = Router();
  r.get('/', allow('controllers.read'), doc('Controllers in scope, optionally of one site', { response: z.object({ controllers: z.array(controllerSchema) }) }), validate({ query: listQuerySchema }), async (req, res) => {
    const q = req.query as z.infer<typeof listQuerySchema>;
    res.json({ controllers: await controllers.list(req.user!, q.site) });
  });
  r.post('/', allow('controllers.enrol'), doc('Enrols a controller; its MQTT password is in the answer, once', { status: 201 }), validate({ body: controllerCreateSchema }), async (req, res) => {
    res.status(201).json(await controllers.enrol(req.user!, req.body));
  });
  r.get('/:id', allow('controllers.read'), doc('One controller with its last refused readings'), validate({ params: idParamsSchema }), async (req, res) => {
    res.json({ controller: await controllers.detail(req.user!, Number(req.params.id)) });
  });
  r.post('/:id/password', allow('controllers.enrol'), doc('Gives a controller a new password (shown once); the old one stops working at once'), validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await controllers.rotatePassword(req.user!, Number(req.params.id)));
  });
  r.post('/:id/decommission', allow('controllers.enrol'), doc('Decommissions a controller: refused at the broker, its alarms closed', { response: controllerBody }), validate({ params: idParamsSchema }), async (req, res) => {
    res.json({ controller: await controllers.decommission(req.user!, Number(req.params.id)) });
  });
  r.post('/:id/move', allow('controllers.move'), validate({ params: idParamsSchema, body: controllerMoveSchema }), doc('Moves a controller to another antenna or site; its history stays with it', { response: controllerBody }), async (req, res) => {
    res.json({ controller: await controllers.move(req.user!, Number(req.params.id), req.body) });
  });
  r.get('/:id/placements', allow('controllers.read'), validate({ params: idParamsSchema }), doc('Where a controller has been, newest first', { response: z.object({ placements: z.array(placementSchema) }) }), async (req, res) => {
    res.json({ placements: await controllers.placements(req.user!, Number(req.params.id)) });
  });
  r.put('/:id/calibration', allow('controllers.calibrate'), doc('Sets the forward and reflected scales and the line loss', { response: controllerBody }), validate({ params: idParamsSchema, body: calibrationSchema }), async (req, res) => {
    res.json({ controller: await controllers.calibrate(req.user!, Number(req.params.id), req.body) });
  });
  r.get('/:id/readings', allow('readings.read'), doc('Readings of a controller over a range, at most `points` points (min and max kept)'), validate({ params: idParamsSchema, query: readingsQuerySchema }), async (req, res) => {
    res.json(await readings.history(req.user!, Number(req.params.id), req.query as unknown as z.infer<typeof readingsQuerySchema>));
  });
  r.get('/:id/energy', allow('readings.read'), validate({ params: idParamsSchema, query: energyQuerySchema }), doc('Heater energy over a window: measured from volts and amps, estimated from the rating where not measured', { response: z.object({ energy: heaterEnergySchema.nullable() }) }), async (req, res) => {
    res.json({ energy: await readings.energy(req.user!, Number(req.params.id), req.query as unknown as z.infer<typeof energyQuerySchema>) });
  });
  r.post('/:id/heater', allowHeaterCommand(operatorsMayCommand), doc('Sends a heater mode change to the controller', { status: 202 }), validate({ params: idParamsSchema, body: heaterCommandSchema }), async (req, res) => {
    res.status(202).json({ command: await commands.heater(req.user!, Number(req.params.id), req.body) });
  });
  r.get('/:id/commands', allow('controllers.read'), doc('Commands sent to a controller and their results'), validate({ params: idParamsSchema }), async (req, res) => {
    res.json({ commands: await commands.list(req.user!, Number(req.params.id)) });
  });
  r.post('/:id/service', allow('alarms.service'), doc('Takes a controller out of service (its alarms suppressed) or back', { status: 204 }), validate({ params: idParamsSchema, body: serviceBodySchema }), async (req, res) => {
    await alarms.setOutOfService(req.user!, Number(req.params.id), req.body.outOfService, req.body.reason);
    res.status(204).end();
  });
  return r;
}
