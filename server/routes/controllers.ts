import { Router } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { calibrationSchema, controllerCreateSchema, heaterCommandSchema, idParamsSchema, readingsQuerySchema, serviceBodySchema, idSchema } from '../../telemetry/api';
import type { AlarmsService } from '../services/alarms';
import type { CommandsService } from '../services/commands';
import { allow, allowHeaterCommand } from '../auth';
import { AppError } from '../errors';
import type { ControllersService } from '../services/controllers';
import type { ReadingsService } from '../services/readings';
import { readUpload } from '../uploads';
import { validate } from '../validate';

const upload = readUpload(multer({ storage: multer.memoryStorage(), limits: { fileSize: 1024 * 1024, files: 1 } }), 'file');
const listQuerySchema = z.object({ site: idSchema.optional() });

export function controllersRouter(controllers: ControllersService, readings: ReadingsService, commands: CommandsService, alarms: AlarmsService, operatorsMayCommand: () => Promise<boolean>): Router {
  const r = Router();
  r.get('/', allow('controllers.read'), validate({ query: listQuerySchema }), async (req, res) => {
    const q = req.query as z.infer<typeof listQuerySchema>;
    res.json({ controllers: await controllers.list(req.user!, q.site) });
  });
  r.post('/', allow('controllers.enrol'), validate({ body: controllerCreateSchema }), async (req, res) => {
    res.status(201).json(await controllers.enrol(req.user!, req.body));
  });
  r.post('/bulk', allow('controllers.enrol'), upload, async (req, res) => {
    if (!req.file) throw new AppError('bad_request', 'Attach a CSV file as "file"');
    res.json(await controllers.enrolCsv(req.user!, req.file.buffer.toString('utf8')));
  });
  r.get('/:id', allow('controllers.read'), validate({ params: idParamsSchema }), async (req, res) => {
    res.json({ controller: await controllers.detail(req.user!, Number(req.params.id)) });
  });
  r.post('/:id/password', allow('controllers.enrol'), validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await controllers.rotatePassword(req.user!, Number(req.params.id)));
  });
  r.post('/:id/decommission', allow('controllers.enrol'), validate({ params: idParamsSchema }), async (req, res) => {
    res.json({ controller: await controllers.decommission(req.user!, Number(req.params.id)) });
  });
  r.put('/:id/calibration', allow('controllers.calibrate'), validate({ params: idParamsSchema, body: calibrationSchema }), async (req, res) => {
    res.json({ controller: await controllers.calibrate(req.user!, Number(req.params.id), req.body) });
  });
  r.get('/:id/readings', allow('readings.read'), validate({ params: idParamsSchema, query: readingsQuerySchema }), async (req, res) => {
    res.json(await readings.history(req.user!, Number(req.params.id), req.query as unknown as z.infer<typeof readingsQuerySchema>));
  });
  r.post('/:id/heater', allowHeaterCommand(operatorsMayCommand), validate({ params: idParamsSchema, body: heaterCommandSchema }), async (req, res) => {
    res.status(202).json({ command: await commands.heater(req.user!, Number(req.params.id), req.body) });
  });
  r.get('/:id/commands', allow('controllers.read'), validate({ params: idParamsSchema }), async (req, res) => {
    res.json({ commands: await commands.list(req.user!, Number(req.params.id)) });
  });
  r.post('/:id/service', allow('alarms.service'), validate({ params: idParamsSchema, body: serviceBodySchema }), async (req, res) => {
    await alarms.setOutOfService(req.user!, Number(req.params.id), req.body.outOfService, req.body.reason);
    res.status(204).end();
  });
  return r;
}
