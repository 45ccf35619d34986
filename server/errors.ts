import type { ErrorRequestHandler } from 'express';
import type { Logger } from 'pino';
import { ZodError } from 'zod';

export type ErrorCode =
  | 'bad_request'
  | 'unauthenticated'
  | 'forbidden'
  | 'not_found'
  | 'conflict'
  | 'rate_limited'
  | 'unavailable'
  | 'internal';

const statusOf: Record<ErrorCode, number> = {
  bad_request: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  rate_limited: 429,
  unavailable: 503,
  internal: 500,
};

export class AppError extends Error {
  readonly status: number;
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.status = statusOf[code];
  }
}

export const notFound = (what: string) => new AppError('not_found', `${what} not found`);

const unavailableCodes = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EHOSTUNREACH',
  'EPIPE',
  'PROTOCOL_CONNECTION_LOST',
  'ER_SERVER_SHUTDOWN',
  'ER_CON_COUNT_ERROR',
  'ER_LOCK_WAIT_TIMEOUT',
  'ER_QUERY_INTERRUPTED',
]);

/** True when the database could not be reached or is shutting down (not a bad query). */
export function isDbUnavailable(err: unknown): boolean {
  const e = err as { code?: string; name?: string; fatal?: boolean } | null;
  if (!e) return false;
  return (e.code !== undefined && unavailableCodes.has(e.code)) || e.name === 'KnexTimeoutError' || e.fatal === true;
}

/** What of a database error may be logged: codes, never the statement or its values. */
export function redactDbError(err: unknown): unknown {
  const e = err as {
    code?: string;
    errno?: number;
    sqlState?: string;
    sql?: string;
    name?: string;
    stack?: string;
  } | null;
  if (!e || typeof e !== 'object' || (!('sql' in e) && !('sqlMessage' in e))) return err;
  return {
    name: e.name,
    code: e.code,
    errno: e.errno,
    sqlState: e.sqlState,
    stack: e.stack?.split('\n').slice(1, 6).join('\n'),
  };
}

export function errorHandler(log: Logger): ErrorRequestHandler {
  return (err, _req, res, _next) => {
    // a download already under way (a CSV export) cannot become an error page: it ends where it failed
    if (res.headersSent) {
      log.warn({ err: redactDbError(err) }, 'a response failed after it had begun; the connection is closed');
      if (!res.destroyed) res.destroy();
      return;
    }
    if (err instanceof ZodError) {
      res.status(400).json({
        error: {
          code: 'bad_request',
          message: 'The request is not valid',
          details: err.issues.map((i) => ({ path: i.path.join('.'), message: i.message })),
        },
      });
      return;
    }
    if (err instanceof AppError) {
      res.status(err.status).json({ error: { code: err.code, message: err.message, details: err.details } });
      return;
    }
    // upload limits (multer): too large, too many files or fields, an unexpected field
    if ((err as { name?: string })?.name === 'MulterError') {
      const tooLarge = (err as { code?: string }).code === 'LIMIT_FILE_SIZE';
      res.status(tooLarge ? 413 : 400).json({
        error: {
          code: 'bad_request',
          message: tooLarge ? 'The file is too large' : `The upload is not valid: ${String((err as Error).message)}`,
        },
      });
      return;
    }
    // body-parser errors carry a status of their own
    const status = typeof err?.status === 'number' ? err.status : 500;
    if (status >= 400 && status < 500) {
      res.status(status).json({
        error: { code: 'bad_request', message: err.expose ? String(err.message) : 'The request is not valid' },
      });
      return;
    }
    const code = (err as { code?: string })?.code;
    if (isDbUnavailable(err)) {
      res.status(503).json({
        error: { code: 'unavailable', message: 'The database cannot be reached just now; try again shortly' },
      });
      return;
    }
    // two identical creates at once: the unique key answers, not a check before the insert
    if (code === 'ER_DUP_ENTRY') {
      res.status(409).json({ error: { code: 'conflict', message: 'That already exists' } });
      return;
    }
    if (code === 'ER_DATA_TOO_LONG' || code === 'ER_TRUNCATED_WRONG_VALUE' || code === 'ER_WARN_DATA_OUT_OF_RANGE') {
      res.status(400).json({ error: { code: 'bad_request', message: 'A value is too long or out of range' } });
      return;
    }
    log.error({ err: redactDbError(err) }, 'unhandled error');
    res.status(500).json({ error: { code: 'internal', message: 'Something went wrong on the server' } });
  };
}
