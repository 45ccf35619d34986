import type { RequestHandler } from 'express';
import type { z } from 'zod';

import { tagged } from './http/meta';

type Schemas = { body?: z.ZodType; query?: z.ZodType; params?: z.ZodType };

/** Parses a request with the shared schemas; the parsed values replace the raw ones. */
export function validate(schemas: Schemas): RequestHandler {
  return tagged((req, _res, next) => {
    if (schemas.params) req.params = schemas.params.parse(req.params) as typeof req.params;
    if (schemas.body) req.body = schemas.body.parse(req.body ?? {});
    // Express 5 makes req.query a getter; keep the parsed copy beside it
    if (schemas.query) Object.defineProperty(req, 'query', { value: schemas.query.parse(req.query), writable: true });
    next();
  }, schemas);
}
