import { type Request, type RequestHandler, Router } from 'express';
import { ipKeyGenerator, rateLimit, type Store } from 'express-rate-limit';

import { sessionCookie, signedIn } from '@/server/auth';
import { AppError } from '@/server/errors';
import { doc, tagged } from '@/server/http/meta';
import { typed } from '@/server/http/route';
import type { AuthService } from '@/server/services/auth';
import type { TeamService } from '@/server/services/invites';
import {
  acceptInviteSchema,
  apiTokenBodySchema,
  apiTokenParamsSchema,
  resetRequestSchema,
  signInBodySchema,
} from '@/telemetry/api';
import { roles } from '@/telemetry/roles';

export type AuthRouterOptions = {
  /** Secure cookies: always when PUBLIC_URL is https, else when the request came over https (via a trusted proxy) */
  httpsOnly: boolean;
  /** failed attempts per 15 minutes: per address, and per account (e-mail) */
  failuresPerAddress: number;
  failuresPerAccount: number;
  /** told when sessions end, so live sockets are checked again */
  sessionsChanged: () => void;
  /** where the counts are kept (shared by several instances); default: this process's memory */
  store?: (prefix: string) => Store;
};

const limited = (message: string) => (_req: Request, res: import('express').Response) => {
  res.status(429).json({ error: { code: 'rate_limited', message } });
};

export function authRouter(auth: AuthService, team: TeamService, opts: AuthRouterOptions): Router {
  const r = Router();
  const window = 15 * 60_000;
  // only failures count: a control room behind one address signing in at shift change is not locked out
  const perAddress = rateLimit({
    store: opts.store?.('perAddress'),
    windowMs: window,
    limit: opts.failuresPerAddress,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: limited('Too many failed sign-ins from this address; wait a few minutes'),
  });
  const perAccount = rateLimit({
    store: opts.store?.('perAccount'),
    windowMs: window,
    limit: Math.max(1, Math.floor(opts.failuresPerAccount)),
    skipSuccessfulRequests: true,
    standardHeaders: false,
    legacyHeaders: false,
    keyGenerator: (req) =>
      `account:${String((req.body as { email?: unknown })?.email ?? '')
        .trim()
        .toLowerCase()
        .slice(0, 254)}`,
    handler: limited(
      'Too many failed sign-ins for this account; wait a few minutes or ask an administrator for a reset',
    ),
  });
  const invites = rateLimit({
    store: opts.store?.('invites'),
    windowMs: window,
    limit: opts.failuresPerAddress,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: limited('Too many attempts; wait a few minutes'),
  });
  const cookieOptions = (req: Request) => ({
    httpOnly: true,
    sameSite: 'lax' as const,
    secure: opts.httpsOnly || req.secure,
    path: '/',
  });

  r.post(
    '/sign-in',
    perAddress,
    perAccount,
    doc('Signs in; sets the HttpOnly session cookie'),
    ...typed({ body: signInBodySchema }, async ({ body, req, res }) => {
      // a new session id at every sign-in; the old cookie's session, if any, ends
      const old = (req.cookies as Record<string, string> | undefined)?.[sessionCookie];
      const { token, person, expiresAt } = await auth.signIn(body.email, body.password, req.ip ?? '');
      if (old) await auth.signOut(old);
      res.cookie(sessionCookie, token, { ...cookieOptions(req), expires: expiresAt });
      // the token stays in the HttpOnly cookie: a script in the page never sees it
      res.json({ person });
    }),
  );
  r.post(
    '/accept-invite',
    invites,
    doc('Sets a password from an invitation or reset link and signs in'),
    ...typed({ body: acceptInviteSchema }, async ({ body, res }) => {
      res.json(await team.accept(body.token, body.password));
    }),
  );
  const resets = rateLimit({
    store: opts.store?.('resets'),
    windowMs: window,
    limit: 5,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) =>
      `reset:${ipKeyGenerator(req.ip ?? '')}:${String((req.body as { email?: unknown })?.email ?? '')
        .trim()
        .toLowerCase()
        .slice(0, 254)}`,
    handler: limited('Too many reset requests; wait a few minutes'),
  });
  // the same answer whether or not the address is known
  r.post(
    '/reset-request',
    resets,
    doc('Asks for a password reset e-mail (answers the same whether or not the address is known)'),
    ...typed({ body: resetRequestSchema }, async ({ body, res }) => {
      await team.sendReset(body.email, null);
      res.status(202).json({
        message: 'If that address belongs to an active person, a link to choose a new password is on its way.',
      });
    }),
  );
  r.post('/sign-out', signedIn(), doc('Signs this session out'), async (req, res) => {
    if (req.sessionToken) await auth.signOut(req.sessionToken);
    res.clearCookie(sessionCookie, cookieOptions(req));
    opts.sessionsChanged();
    res.status(204).end();
  });
  r.post(
    '/sign-out-everywhere',
    signedIn(),
    doc('Signs out every browser session of this person'),
    async (req, res) => {
      await auth.signOutEverywhere(req.user!);
      res.clearCookie(sessionCookie, cookieOptions(req));
      opts.sessionsChanged();
      res.status(204).end();
    },
  );
  r.get('/me', signedIn(), doc('Who is signed in, with their role and permissions'), (req, res) => {
    res.json({ person: req.user });
  });

  // named API tokens for scripts, shown once; a view-only wall screen gets none
  const mayHoldTokens: RequestHandler = tagged(
    (req, _res, next) => {
      if (req.user?.role === 'kiosk') throw new AppError('forbidden', 'A wall-screen sign-in cannot hold API tokens');
      next();
    },
    { roles: roles.filter((r) => r !== 'kiosk') },
  );
  r.get('/tokens', signedIn(), doc("This person's named API tokens"), async (req, res) => {
    res.json({ tokens: await auth.apiTokens(req.user!.id) });
  });
  r.post(
    '/tokens',
    signedIn(),
    mayHoldTokens,
    doc('Creates a named API token (shown once)'),
    ...typed({ body: apiTokenBodySchema }, async ({ body, user, res }) => {
      res.status(201).json({ token: await auth.issueApiToken(user, body.name) });
    }),
  );
  r.delete(
    '/tokens/:id',
    signedIn(),
    doc('Revokes an API token'),
    ...typed({ params: apiTokenParamsSchema }, async ({ user, req, res }) => {
      await auth.revokeApiToken(user, String(req.params.id));
      res.status(204).end();
    }),
  );
  return r;
}
