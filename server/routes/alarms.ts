import fs from 'node:fs';
import { doc } from '../http/meta';
import { Router } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { ackBodySchema, alarmListQuerySchema, idParamsSchema, shelveBodySchema } from '../../telemetry/api';
import { allow } from '../auth';
import type { AlarmsService } from '../services/alarms';
import { readUpload } from '../uploads';
import { validate } from '../validate';

export function alarmsRouter(alarms: AlarmsService, uploadsDir: string): Router {
  fs.mkdirSync(uploadsDir, { recursive: true });
  // held in memory and written only once every check has passed: a refused upload leaves no file
  const upload = readUpload(multer({ storage: multer.memoryStorage(), limits: { fileSize: 5 * 1024 * 1024, files: 1, fields: 5, fieldSize: 8 * 1024 } }), 'photo');
  const r = Router();
  r.get('/', allow('alarms.read'), validate({ query: alarmListQuerySchema }), doc('Alarms in scope, filtered by state, site, priority; newest first'), async (req, res) => {
    res.json({ alarms: await alarms.list(req.user!, req.query as unknown as z.infer<typeof alarmListQuerySchema>) });
  });
  r.get('/attachments/:id', allow('alarms.read'), validate({ params: idParamsSchema }), doc('A photo attached to an acknowledgement'), async (req, res) => {
    const a = await alarms.attachment(req.user!, Number(req.params.id));
    res.type(a.mime).setHeader('Cache-Control', 'private, max-age=3600');
    res.setHeader('Content-Disposition', `inline; filename="alarm-photo-${Number(req.params.id)}.${a.mime === 'image/png' ? 'png' : 'jpg'}"`);
    res.sendFile(a.file, { dotfiles: 'allow' });
  });
  r.get('/:id', allow('alarms.read'), validate({ params: idParamsSchema }), doc('One alarm with its history of transitions'), async (req, res) => {
    res.json({ alarm: await alarms.detail(req.user!, Number(req.params.id)) });
  });
  r.post('/:id/ack', allow('alarms.ack'), upload, validate({ params: idParamsSchema, body: ackBodySchema }), doc('Acknowledges an alarm, with an optional note and photo (multipart field "photo")'), async (req, res) => {
    res.json({ alarm: await alarms.acknowledge(req.user!, Number(req.params.id), req.body.note || null, req.file?.buffer) });
  });
  r.post('/:id/shelve', allow('alarms.shelve'), validate({ params: idParamsSchema, body: shelveBodySchema }), doc('Shelves an alarm until a time, with a reason'), async (req, res) => {
    res.json({ alarm: await alarms.shelve(req.user!, Number(req.params.id), req.body.reason, req.body.until) });
  });
  r.post('/:id/unshelve', allow('alarms.shelve'), validate({ params: idParamsSchema }), doc('Unshelves an alarm'), async (req, res) => {
    res.json({ alarm: await alarms.unshelve(req.user!, Number(req.params.id)) });
  });
  return r;
}
