import { Router } from 'express';
import { rateLimit } from 'express-rate-limit';
import { acceptInviteSchema, signInBodySchema } from '../../telemetry/api';
import type { TeamService } from '../services/invites';
import { sessionCookie, signedIn } from '../auth';
import type { AuthService } from '../services/auth';
import { validate } from '../validate';

export function authRouter(auth: AuthService, team: TeamService, opts: { secureCookie: boolean; signInLimit: number }): Router {
  const r = Router();
  const limiter = rateLimit({
    windowMs: 15 * 60_000,
    limit: opts.signInLimit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, res) => {
      res.status(429).json({ error: { code: 'rate_limited', message: 'Too many sign-in attempts; wait a few minutes' } });
    },
  });
  r.post('/sign-in', limiter, validate({ body: signInBodySchema }), async (req, res) => {
    const { token, person, expiresAt } = await auth.signIn(req.body.email, req.body.password);
    res.cookie(sessionCookie, token, { httpOnly: true, sameSite: 'lax', secure: opts.secureCookie, expires: expiresAt, path: '/' });
    res.json({ person, token });
  });
  r.post('/accept-invite', limiter, validate({ body: acceptInviteSchema }), async (req, res) => {
    res.json(await team.accept(req.body.token, req.body.password));
  });
  r.post('/sign-out', signedIn(), async (req, res) => {
    await auth.signOut(req.sessionToken!);
    res.clearCookie(sessionCookie, { path: '/' });
    res.status(204).end();
  });
  r.get('/me', signedIn(), (req, res) => {
    res.json({ person: req.user });
  });
  return r;
}
