import type { z } from 'zod';

import { ApiFailure, describeError } from '@/components/data/api-client';

/** Field errors from the client's own check or from the server's answer, by field name. */
export function fieldErrors(e: z.ZodError | unknown): Record<string, string> {
  if (e && typeof e === 'object' && 'issues' in e) {
    const out: Record<string, string> = {};
    for (const i of (e as z.ZodError).issues) out[String(i.path[0] ?? '')] ??= i.message;
    return out;
  }
  if (e instanceof ApiFailure && Array.isArray(e.details)) {
    const out: Record<string, string> = {};
    for (const d of e.details as { path: string; message: string }[]) out[d.path.split('.')[0]] ??= d.message;
    if (Object.keys(out).length) return out;
  }
  return { '': describeError(e) };
}

/** "" is nothing entered; otherwise the number typed (a comma taken as the decimal sign). */
export const numberOrNull = (v: string) => (v.trim() === '' ? null : Number(v.trim().replace(',', '.')));
export const numberOrNaN = (v: string) => (v.trim() === '' ? Number.NaN : Number(v.trim().replace(',', '.')));
export const text = (v: number | null | undefined) => (v == null ? '' : String(v));
