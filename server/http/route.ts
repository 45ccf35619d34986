import type { Request, RequestHandler, Response } from 'express';
import type { z } from 'zod';

import { validate } from '@/server/validate';
import type { Person } from '@/telemetry/api';

type Parsed<S> = S extends z.ZodType ? z.output<S> : Record<string, never>;

/** What a typed handler receives: parsed, typed values and the signed-in person (set by `allow`). */
export type Input<P, Q, B> = {
  params: Parsed<P>;
  query: Parsed<Q>;
  body: Parsed<B>;
  user: Person;
  req: Request;
  res: Response;
};

/**
 * The one request path: params, query and body parsed with the shared zod schemas
 * (a bad one is a 400 naming each field), then handed to the handler typed.
 * Spread it after the guard and the summary:
 * `r.get('/:id', allow('sites.read'), doc('…'), ...typed({ params: idParamsSchema }, async ({ params, user, res }) => …))`.
 */
export function typed<
  P extends z.ZodType | undefined = undefined,
  Q extends z.ZodType | undefined = undefined,
  B extends z.ZodType | undefined = undefined,
>(
  schemas: { params?: P; query?: Q; body?: B },
  handler: (input: Input<P, Q, B>) => Promise<void> | void,
): RequestHandler[] {
  const run: RequestHandler = async (req, res) => {
    await handler({
      params: req.params as Parsed<P>,
      query: req.query as Parsed<Q>,
      body: req.body as Parsed<B>,
      user: req.user!,
      req,
      res,
    });
  };
  return [validate(schemas as { params?: z.ZodType; query?: z.ZodType; body?: z.ZodType }), run];
}
