import type { ApiError } from '@/telemetry/api';

/** Same origin on the web; a native build sets EXPO_PUBLIC_API_URL. */
const base = process.env.EXPO_PUBLIC_API_URL ?? '';

export class ApiFailure extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
  }
}

export async function api<T>(
  path: string,
  init: { method?: string; body?: unknown; form?: FormData } = {},
): Promise<T> {
  let res: Response;
  try {
    res = await fetch(`${base}/api${path}`, {
      method: init.method ?? (init.body || init.form ? 'POST' : 'GET'),
      credentials: 'include',
      headers: init.body ? { 'content-type': 'application/json' } : undefined,
      body: init.form ?? (init.body ? JSON.stringify(init.body) : undefined),
    });
  } catch {
    throw new ApiFailure(0, 'offline', 'The server cannot be reached');
  }
  if (res.status === 204) return undefined as T;
  const json = (await res.json().catch(() => null)) as unknown;
  if (!res.ok) {
    const err = (json as ApiError | null)?.error;
    throw new ApiFailure(res.status, err?.code ?? 'internal', err?.message ?? res.statusText, err?.details);
  }
  return json as T;
}

/** Words for error codes: the client never matches on message text. */
export const errorWords: Record<string, string> = {
  offline: 'The server cannot be reached. Check the connection and try again.',
  unauthenticated: 'Please sign in again.',
  forbidden: 'Your role does not allow this.',
  not_found: 'That item no longer exists.',
  conflict: 'That conflicts with something that already exists.',
  rate_limited: 'Too many attempts. Wait a few minutes and try again.',
  bad_request: 'Some of the values are not valid.',
  internal: 'Something went wrong on the server.',
};

export function describeError(e: unknown): string {
  if (e instanceof ApiFailure) {
    if (e.code === 'unauthenticated' || e.code === 'bad_request' || e.code === 'conflict')
      return e.message || errorWords[e.code];
    return errorWords[e.code] ?? errorWords.internal;
  }
  return errorWords.internal;
}
