import { z } from 'zod';

/** Thawline's MQTT wire contract, version 1. Field names are part of the contract. */
export const wireVersion = 1;
export const topicRoot = 'thawline/v1';

export const serialSchema = z
  .string()
  .regex(/^[A-Za-z0-9][A-Za-z0-9_-]{2,63}$/, 'serial: 3–64 letters, digits, _ or -');

export const topics = (serial: string) => ({
  telemetry: `${topicRoot}/${serial}/telemetry`,
  status: `${topicRoot}/${serial}/status`,
  command: `${topicRoot}/${serial}/command`,
  result: `${topicRoot}/${serial}/command/result`,
});

/** Splits a topic into serial and channel, or null when it is not one of ours. */
export function parseTopic(
  topic: string,
): { serial: string; channel: 'telemetry' | 'status' | 'command' | 'result' } | null {
  const m = /^thawline\/v1\/([^/]+)\/(telemetry|status|command|command\/result)$/.exec(topic);
  if (!m) return null;
  return { serial: m[1], channel: m[2] === 'command/result' ? 'result' : (m[2] as 'telemetry' | 'status' | 'command') };
}

export const heaterModes = ['auto', 'forced-on', 'forced-off'] as const;

export const bootSchema = z.string().regex(/^[A-Za-z0-9_.:-]{1,32}$/, 'boot: 1–32 letters, digits or _ . : -');

export const readingSchema = z.object({
  v: z.literal(1),
  seq: z.number().int().min(0).max(4_294_967_295),
  /** new at every device start; seq restarts from 0 with it (required: without it a restart looks like old readings) */
  boot: bootSchema,
  ts: z.iso.datetime({ offset: true }),
  airTempC: z.number().min(-80).max(70),
  humidityPct: z.number().min(0).max(100).nullable(),
  moisture: z.boolean().nullable(),
  forwardW: z.number().min(0).max(2_000_000),
  reflectedW: z.number().min(0).max(2_000_000),
  heater: z.object({
    mode: z.enum(heaterModes),
    on: z.boolean(),
    currentA: z.number().min(0).max(1000).nullable(),
  }),
  supply: z.object({
    volts: z.number().min(0).max(1000).nullable(),
    batteryPct: z.number().min(0).max(100).nullable(),
  }),
  flameProven: z.boolean().nullable(),
});
export type Reading = z.infer<typeof readingSchema>;

/** One reading, or several in one message (cheaper per reading on the broker). */
export const telemetryPayloadSchema = z.union([readingSchema, z.array(readingSchema).min(1).max(1000)]);

export const statusSchema = z.object({
  v: z.literal(1),
  state: z.enum(['online', 'offline']),
  ts: z.iso.datetime({ offset: true }).optional(),
  /** the boot the device announces when it comes online */
  boot: bootSchema.optional(),
});

export const commandSchema = z.discriminatedUnion('type', [
  z.object({
    v: z.literal(1),
    id: z.string().min(1).max(64),
    type: z.literal('heater'),
    mode: z.enum(heaterModes),
    until: z.iso.datetime({ offset: true }).nullable().optional(),
    reason: z.string().min(1).max(500),
  }),
  z.object({
    v: z.literal(1),
    id: z.string().min(1).max(64),
    type: z.literal('replay'),
    fromSeq: z.number().int().min(0),
    toSeq: z.number().int().min(0),
    /** the boot whose readings are wanted; a device holding another boot answers not ok */
    boot: bootSchema.optional(),
  }),
]);
export type Command = z.infer<typeof commandSchema>;

export const commandResultSchema = z.object({
  v: z.literal(1),
  id: z.string().min(1).max(64),
  ok: z.boolean(),
  message: z.string().max(500),
});
export type CommandResult = z.infer<typeof commandResultSchema>;

/** Parses a telemetry payload; the reason names the first fields at fault. */
export function parseTelemetry(
  payload: Buffer | string,
): { ok: true; readings: Reading[] } | { ok: false; reason: string } {
  let json: unknown;
  try {
    json = JSON.parse(typeof payload === 'string' ? payload : payload.toString('utf8'));
  } catch {
    return { ok: false, reason: 'not JSON' };
  }
  const r = telemetryPayloadSchema.safeParse(json);
  if (r.success) return { ok: true, readings: Array.isArray(r.data) ? r.data : [r.data] };
  // report the issues of the single-reading branch, which is what most devices send
  const single = readingSchema.safeParse(
    Array.isArray(json) ? json.find((x) => !readingSchema.safeParse(x).success) : json,
  );
  const issues = single.success ? r.error.issues : single.error.issues;
  return {
    ok: false,
    reason: issues
      .slice(0, 3)
      .map((i) => `${i.path.join('.') || 'payload'}: ${i.message}`)
      .join('; '),
  };
}

/** How far a device clock may run ahead of the server's before its readings are refused. */
export const maxClockAheadMs = 15 * 60_000;

/**
 * Why a reading's time cannot be stored, or null when it can: no more than
 * `maxClockAheadMs` ahead of the server clock, and no older than `maxAgeMs`
 * (the raw-data retention period).
 */
export function readingTimeProblem(tsMs: number, nowMs: number, maxAgeMs: number): string | null {
  const days = (ms: number) => `${(ms / 86_400_000).toFixed(ms < 86_400_000 ? 3 : 0)} days`;
  if (tsMs > nowMs + maxClockAheadMs)
    return `ts: ${days(tsMs - nowMs)} ahead of the server clock (at most ${maxClockAheadMs / 60_000} min allowed); check the device clock`;
  if (tsMs < nowMs - maxAgeMs)
    return `ts: ${days(nowMs - tsMs)} behind the server clock (older than the ${days(maxAgeMs)} kept); check the device clock`;
  return null;
}
