import type { RequestHandler } from 'express';

import type { Person } from '@/telemetry/api';
import { type Action, can } from '@/telemetry/roles';

import { AppError } from './errors';
import { tagged } from './http/meta';
import type { AuthService } from './services/auth';

declare global {
  namespace Express {
    interface Request {
      user?: Person;
      sessionToken?: string;
    }
  }
}

export const sessionCookie = 'thawline_session';

/**
 * Resolves the session, if any; never rejects a request by itself. Browsers sign in
 * with the HttpOnly cookie only; scripts with a named API token as a Bearer header
 * only. A browser session token sent as Bearer, or an API token as cookie, is nobody.
 */
export function authenticate(auth: AuthService): RequestHandler {
  return async (req, _res, next) => {
    const header = req.header('authorization');
    const bearer = header?.startsWith('Bearer ') ? header.slice(7) : undefined;
    const cookie = (req.cookies as Record<string, string> | undefined)?.[sessionCookie];
    if (bearer) {
      const person = await auth.personForApiToken(bearer);
      if (person) req.user = person;
    } else if (cookie) {
      const person = await auth.personForToken(cookie);
      if (person) {
        req.user = person;
        req.sessionToken = cookie;
      }
    }
    next();
  };
}

/** The one permission check: signed in, and the role may take the action. */
export function allow(action: Action): RequestHandler {
  return tagged(
    (req, _res, next) => {
      if (!req.user) throw new AppError('unauthenticated', 'Sign in first');
      if (!can(req.user.role, action)) throw new AppError('forbidden', 'Your role may not do this');
      next();
    },
    { access: action },
  );
}

export function signedIn(): RequestHandler {
  return tagged(
    (req, _res, next) => {
      if (!req.user) throw new AppError('unauthenticated', 'Sign in first');
      next();
    },
    { access: 'signed-in' },
  );
}

/**
 * Heater overrides: the roles of the table, and operators too when an administrator
 * has allowed it. Still the one place that decides.
 */
export function allowHeaterCommand(operatorsMay: () => Promise<boolean>): RequestHandler {
  return tagged(
    async (req, _res, next) => {
      if (!req.user) throw new AppError('unauthenticated', 'Sign in first');
      if (can(req.user.role, 'heater.command') || (req.user.role === 'operator' && (await operatorsMay())))
        return next();
      throw new AppError('forbidden', 'Your role may not do this');
    },
    { access: 'heater.command' },
  );
}
