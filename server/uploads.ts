import type { RequestHandler } from 'express';
import type multer from 'multer';

import { AppError } from './errors';
import { tagged } from './http/meta';

/**
 * One file field of a multipart body. Limits keep their own errors (413 for size);
 * a body that cannot be read as multipart at all (no boundary, cut short, a bad
 * part header) is the sender's fault: 400, never 500.
 */
export function readUpload(m: multer.Multer, field: string): RequestHandler {
  const single = m.single(field);
  return tagged(
    (req, res, next) => {
      single(req, res, (err?: unknown) => {
        if (!err || (err as { name?: string }).name === 'MulterError') return next(err);
        next(
          new AppError(
            'bad_request',
            `The upload could not be read: ${err instanceof Error ? err.message : 'malformed multipart body'}`,
          ),
        );
      });
    },
    { upload: field },
  );
}
