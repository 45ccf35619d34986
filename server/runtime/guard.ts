import type { Logger } from 'pino';

import { redactDbError } from '@/server/errors';

/**
 * The one wrapper for callbacks that Node or a library calls with nobody to answer
 * a failure (upgrade and broker hooks, ingest events, timers): a throw or a rejected
 * promise is logged (never a statement's values), and the process keeps serving.
 */
export type Guard = <A extends unknown[]>(what: string, fn: (...args: A) => unknown) => (...args: A) => void;

export function makeGuard(log: Logger): Guard {
  const fail = (what: string, err: unknown) =>
    log.error({ err: redactDbError(err), where: what }, `${what} failed; still serving`);
  return (what, fn) =>
    (...args) => {
      try {
        const r = fn(...args);
        if (r && typeof (r as Promise<unknown>).then === 'function')
          (r as Promise<unknown>).catch((err) => fail(what, err));
      } catch (err) {
        fail(what, err);
      }
    };
}

/** The path of a request target, or null when it is not a valid URL path. */
export function pathOf(target: string | undefined): string | null {
  if (!target || !target.startsWith('/')) return null;
  try {
    return new URL(target, 'http://localhost').pathname;
  } catch {
    return null;
  }
}
