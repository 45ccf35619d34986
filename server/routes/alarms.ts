import fs from 'node:fs';

import { Router } from 'express';
import multer from 'multer';
import { z } from 'zod';

import { allow } from '@/server/auth';
import { doc } from '@/server/http/meta';
import { typed } from '@/server/http/route';
import type { AlarmsService } from '@/server/services/alarms';
import { readUpload } from '@/server/uploads';
import {
  ackBodySchema,
  ackManyBodySchema,
  ackManyResultSchema,
  alarmDetailSchema,
  alarmListQuerySchema,
  alarmViewSchema,
  idParamsSchema,
  shelveBodySchema,
} from '@/telemetry/api';

export function alarmsRouter(alarms: AlarmsService, uploadsDir: string): Router {
  fs.mkdirSync(uploadsDir, { recursive: true });
  // held in memory and written only once every check has passed: a refused upload leaves no file
  const upload = readUpload(
    multer({
      storage: multer.memoryStorage(),
      limits: { fileSize: 5 * 1024 * 1024, files: 1, fields: 5, fieldSize: 8 * 1024 },
    }),
    'photo',
  );
  const r = Router();
  r.get(
    '/',
    allow('alarms.read'),
    doc('Alarms in scope, filtered by state, site, priority; newest first', {
      response: z.object({ alarms: z.array(alarmViewSchema) }),
    }),
    ...typed({ query: alarmListQuerySchema }, async ({ query, user, res }) => {
      res.json({ alarms: await alarms.list(user, query) });
    }),
  );
  r.get(
    '/attachments/:id',
    allow('alarms.read'),
    doc('A photo attached to an acknowledgement'),
    ...typed({ params: idParamsSchema }, async ({ params, user, res }) => {
      const a = await alarms.attachment(user, params.id);
      res.type(a.mime).setHeader('Cache-Control', 'private, max-age=3600');
      res.setHeader(
        'Content-Disposition',
        `inline; filename="alarm-photo-${params.id}.${a.mime === 'image/png' ? 'png' : 'jpg'}"`,
      );
      res.sendFile(a.file, { dotfiles: 'allow' });
    }),
  );
  r.get(
    '/:id',
    allow('alarms.read'),
    doc('One alarm with its history of transitions', { response: z.object({ alarm: alarmDetailSchema }) }),
    ...typed({ params: idParamsSchema }, async ({ params, user, res }) => {
      res.json({ alarm: await alarms.detail(user, params.id) });
    }),
  );
  r.post(
    '/ack',
    allow('alarms.ack'),
    doc('Acknowledges several alarms with one note; those already acknowledged or closed are listed as skipped', {
      response: ackManyResultSchema,
    }),
    ...typed({ body: ackManyBodySchema }, async ({ body, user, res }) => {
      res.json(await alarms.acknowledgeMany(user, body.ids, body.note || null));
    }),
  );
  r.post(
    '/:id/ack',
    allow('alarms.ack'),
    upload,
    doc('Acknowledges an alarm, with an optional note and photo (multipart field "photo")'),
    ...typed({ params: idParamsSchema, body: ackBodySchema }, async ({ params, body, user, req, res }) => {
      res.json({ alarm: await alarms.acknowledge(user, params.id, body.note || null, req.file?.buffer) });
    }),
  );
  r.post(
    '/:id/shelve',
    allow('alarms.shelve'),
    doc('Shelves an alarm until a time, with a reason'),
    ...typed({ params: idParamsSchema, body: shelveBodySchema }, async ({ params, body, user, res }) => {
      res.json({ alarm: await alarms.shelve(user, params.id, body.reason, body.until) });
    }),
  );
  r.post(
    '/:id/unshelve',
    allow('alarms.shelve'),
    doc('Unshelves an alarm'),
    ...typed({ params: idParamsSchema }, async ({ params, user, res }) => {
      res.json({ alarm: await alarms.unshelve(user, params.id) });
    }),
  );
  return r;
}
