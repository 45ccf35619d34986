import type { Logger } from 'pino';

/**
 * The one wrapper for callbacks that Node or a library calls with nobody to answer
 * a failure (upgrade and broker hooks, ingest events, timers): a throw or a rejected
 * promise is logged and counted, and the process keeps serving.
 */
export type Guard = <A extends unknown[]>(what: string, fn: (...args: A) => unknown) => (...args: A) => void;

export const guardFailures = { count: 0, last: null as null | { what: string; at: string; message: string } };

export function makeGuard(log: Logger): Guard {
  const fail = (what: string, err: unknown) => {
    guardFailures.count++;
    const message = err instanceof Error ? err.message : String(err);
    guardFailures.last = { what, at: new Date().toISOString(), message };
    log.error({ err, where: what }, `${what} failed; still serving`);
  };
  return (what, fn) => (...args) => {
    try {
      const r = fn(...args);
      if (r && typeof (r as Promise<unknown>).then === 'function') (r as Promise<unknown>).catch((err) => fail(what, err));
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
