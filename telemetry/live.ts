import { z } from 'zod';

import { systemHealthSchema } from './health';

/** Messages on the /live WebSocket, server → browser. */
export const liveReadingSchema = z.object({
  controllerId: z.number().int(),
  siteId: z.number().int(),
  ts: z.string(),
  vswr: z.number().nullable(),
  forwardW: z.number(),
  reflectedW: z.number(),
  airTempC: z.number(),
  humidityPct: z.number().nullable(),
  moisture: z.boolean().nullable(),
  heaterOn: z.boolean(),
  heaterMode: z.string(),
  heaterCurrentA: z.number().nullable(),
  /** the heater supply's volts (line-to-line on three-phase), for current against rated */
  supplyVolts: z.number().nullable().default(null),
  batteryPct: z.number().nullable(),
});
export type LiveReading = z.infer<typeof liveReadingSchema>;

export const liveMessageSchema = z.discriminatedUnion('type', [
  z.object({ type: z.literal('hello'), person: z.string() }),
  z.object({ type: z.literal('readings'), items: z.array(liveReadingSchema) }),
  z.object({
    type: z.literal('controller'),
    controllerId: z.number().int(),
    siteId: z.number().int(),
    status: z.enum(['waiting', 'online', 'silent', 'decommissioned']),
  }),
  z.object({ type: z.literal('alarm'), alarmId: z.number().int(), siteId: z.number().int(), state: z.string() }),
  /** the system's own health, sent on connect and whenever it changes */
  z.object({ type: z.literal('system'), health: systemHealthSchema }),
  z.object({
    type: z.literal('visit'),
    visitId: z.number().int(),
    siteId: z.number().int(),
    person: z.string(),
    state: z.enum(['on-site', 'left']),
  }),
  /** a site, antenna or region was created, edited, archived, or a controller moved: lists fetch again */
  z.object({ type: z.literal('network') }),
]);
export type LiveMessage = z.infer<typeof liveMessageSchema>;
