import express, { type Request, Router } from 'express';
import multer from 'multer';
import { z } from 'zod';

import { allow } from '@/server/auth';
import { AppError } from '@/server/errors';
import { doc } from '@/server/http/meta';
import { typed } from '@/server/http/route';
import { controllerTemplate, type ImportsService, networkTemplate } from '@/server/services/imports';
import { readUpload } from '@/server/uploads';

const maxBytes = 2 * 1024 * 1024;
const upload = readUpload(
  multer({ storage: multer.memoryStorage(), limits: { fileSize: maxBytes, files: 1 } }),
  'file',
);
const csvBody = express.text({ type: 'text/csv', limit: maxBytes });
const applyQuerySchema = z.object({ apply: z.enum(['0', '1']).default('0') });

/** A CSV as a multipart "file" field (the screens) or as the whole body with Content-Type text/csv (scripts). */
function csvOf(req: Request): string {
  if (req.file) return req.file.buffer.toString('utf8');
  if (typeof req.body === 'string' && req.body.length) return req.body;
  throw new AppError('bad_request', 'Attach a CSV file as "file", or send it as the body with Content-Type text/csv');
}

/**
 * Files of sites and antennas, and of controllers. Without apply=1 a dry run:
 * every row with what would be created or changed, and every error with its line
 * and column. With apply=1 all of it in one transaction, or nothing when any row is wrong.
 */
export function importsRouter(imports: ImportsService): Router {
  const r = Router();
  r.get(
    '/network/template',
    allow('sites.write'),
    doc('A CSV template for sites and antennas', { contentType: 'text/csv' }),
    (_req, res) => {
      res.type('text/csv').attachment('thawline-sites-template.csv').send(networkTemplate);
    },
  );
  r.post(
    '/network',
    allow('sites.write'),
    csvBody,
    upload,
    doc('Dry run (or with apply=1, applies) a CSV of sites and antennas'),
    ...typed({ query: applyQuerySchema }, async ({ query, user, req, res }) => {
      const apply = query.apply === '1';
      const plan = await imports.network(user, csvOf(req), apply);
      res.status(apply && !plan.applied ? 422 : 200).json(plan);
    }),
  );
  r.get(
    '/controllers/template',
    allow('controllers.enrol'),
    doc('A CSV template for enrolling controllers', { contentType: 'text/csv' }),
    (_req, res) => {
      res.type('text/csv').attachment('thawline-controllers-template.csv').send(controllerTemplate);
    },
  );
  r.post(
    '/controllers',
    allow('controllers.enrol'),
    csvBody,
    upload,
    doc('Dry run (or with apply=1, enrols) a CSV of controllers; passwords are shown once'),
    ...typed({ query: applyQuerySchema }, async ({ query, user, req, res }) => {
      const apply = query.apply === '1';
      const plan = await imports.controllers(user, csvOf(req), apply);
      res.status(apply && !plan.applied ? 422 : 200).json(plan);
    }),
  );
  return r;
}
