import crypto from 'node:crypto';
import fs from 'node:fs';
import { Router } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { ackBodySchema, alarmListQuerySchema, idParamsSchema, shelveBodySchema } from '../../telemetry/api';
import { allow } from '../auth';
import { AppError } from '../errors';
import type { AlarmsService } from '../services/alarms';
import { validate } from '../validate';

export function alarmsRouter(alarms: AlarmsService, uploadsDir: string): Router {
  fs.mkdirSync(uploadsDir, { recursive: true });
  const upload = multer({
    storage: multer.diskStorage({
      destination: uploadsDir,
      filename: (_req, file, cb) => cb(null, `${crypto.randomUUID()}.${file.mimetype === 'image/png' ? 'png' : 'jpg'}`),
    }),
    limits: { fileSize: 5 * 1024 * 1024, files: 1, fields: 5 },
    fileFilter: (_req, file, cb) => (['image/jpeg', 'image/png'].includes(file.mimetype) ? cb(null, true) : cb(new AppError('bad_request', 'The photo must be a JPEG or PNG image'))),
  });
  const r = Router();
  r.get('/', allow('alarms.read'), validate({ query: alarmListQuerySchema }), async (req, res) => {
    res.json({ alarms: await alarms.list(req.user!, req.query as unknown as z.infer<typeof alarmListQuerySchema>) });
  });
  r.get('/attachments/:id', allow('alarms.read'), validate({ params: idParamsSchema }), async (req, res) => {
    const a = await alarms.attachment(req.user!, Number(req.params.id));
    res.type(a.mime).setHeader('Cache-Control', 'private, max-age=3600');
    res.sendFile(a.file, { dotfiles: 'allow' });
  });
  r.get('/:id', allow('alarms.read'), validate({ params: idParamsSchema }), async (req, res) => {
    res.json({ alarm: await alarms.detail(req.user!, Number(req.params.id)) });
  });
  r.post('/:id/ack', allow('alarms.ack'), upload.single('photo'), validate({ params: idParamsSchema, body: ackBodySchema }), async (req, res) => {
    const f = req.file;
    res.json({ alarm: await alarms.acknowledge(req.user!, Number(req.params.id), req.body.note || null, f ? { path: f.path, mimetype: f.mimetype, size: f.size } : undefined) });
  });
  r.post('/:id/shelve', allow('alarms.shelve'), validate({ params: idParamsSchema, body: shelveBodySchema }), async (req, res) => {
    res.json({ alarm: await alarms.shelve(req.user!, Number(req.params.id), req.body.reason, req.body.until) });
  });
  r.post('/:id/unshelve', allow('alarms.shelve'), validate({ params: idParamsSchema }), async (req, res) => {
    res.json({ alarm: await alarms.unshelve(req.user!, Number(req.params.id)) });
  });
  return r;
}
