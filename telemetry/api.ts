import { z } from 'zod';
import type { Priority } from './alarms/machine';
import { roleSchema } from './roles';

/** Request and response bodies of the REST API, shared by server and app. */

/** An e-mail address as the people table holds it: at most 254 characters (RFC 5321 path limit). */
export const emailSchema = z.string().trim().toLowerCase().max(254, 'At most 254 characters').email('Enter a valid e-mail address');

// control characters, and the bidirectional overrides and isolates that make text read other than it is stored
const hiddenChars = /[\u0000-\u001f\u007f-\u009f\u200b-\u200f\u202a-\u202e\u2066-\u2069\ufeff]/;
/** Free text that names something (a person, a token): printable characters only. */
export const nameSchema = z.string().trim().min(1, 'Enter a name').max(120).refine((v) => !hiddenChars.test(v), 'No control or hidden direction characters');

/** A numeric id in a path: digits only (" 1" or "0x10" are not ids). */
export const idSchema = z.string().regex(/^[1-9][0-9]{0,9}$/, 'An id is a whole number written in digits').transform(Number);

export const signInBodySchema = z.object({
  email: emailSchema,
  password: z.string().min(1, 'Enter your password').max(200),
});
export type SignInBody = z.infer<typeof signInBodySchema>;

export const personSchema = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  active: z.boolean(),
});
export type Person = z.infer<typeof personSchema>;

export const powerSources = ['utility', 'solar', 'generator'] as const;
export const services = ['fm', 'tv', 'microwave', 'satellite'] as const;
export const protections = ['heater', 'radome', 'blanket', 'gas-heater'] as const;

export const antennaSchema = z.object({
  id: z.number().int(),
  siteId: z.number().int(),
  name: z.string(),
  service: z.enum(services),
  protection: z.enum(protections),
  heaterKw: z.number().nullable(),
});
export type Antenna = z.infer<typeof antennaSchema>;

export const siteSchema = z.object({
  id: z.number().int(),
  code: z.string(),
  name: z.string(),
  region: z.string(),
  latitude: z.number(),
  longitude: z.number(),
  elevationM: z.number(),
  towerHeightM: z.number(),
  powerSource: z.enum(powerSources),
  batteryKwh: z.number().nullable(),
  antennas: z.array(antennaSchema),
});
export type Site = z.infer<typeof siteSchema>;

export const idParamsSchema = z.object({ id: idSchema });

/** A named API token for scripts: its name is asked for, the token shown once. */
export const apiTokenBodySchema = z.object({ name: nameSchema.pipe(z.string().max(80)) });
export const apiTokenParamsSchema = z.object({ id: z.string().regex(/^[A-Za-z0-9_-]{12}$/, 'Not a token id') });

export const personCreateSchema = z.object({
  email: emailSchema,
  name: nameSchema,
  role: roleSchema,
  password: z.string().min(10, 'At least 10 characters').max(200),
});
export const personUpdateSchema = z
  .object({ name: nameSchema, role: roleSchema, active: z.boolean() })
  .partial()
  .refine((v) => Object.keys(v).length > 0, 'Nothing to change');

export type ApiError = { error: { code: string; message: string; details?: unknown } };

export const controllerKinds = ['heater', 'blanket', 'gas-heater', 'radome-sensor'] as const;
export const controllerStatuses = ['waiting', 'online', 'silent', 'decommissioned'] as const;

export const calibrationSchema = z.object({
  forwardScale: z.number().positive().max(1000),
  reflectedScale: z.number().positive().max(1000),
  lineLossDb: z.number().min(0).max(20),
});
export type Calibration = z.infer<typeof calibrationSchema>;

export const controllerCreateSchema = z.object({
  // serials are canonical in upper case everywhere (enrolment, broker sign-in, topics)
  serial: z.string().trim().regex(/^[A-Za-z0-9][A-Za-z0-9_-]{2,63}$/, '3–64 letters, digits, _ or -').transform((s) => s.toUpperCase()),
  siteId: z.number().int().positive(),
  antennaId: z.number().int().positive().nullable().default(null),
  kind: z.enum(controllerKinds),
  intervalS: z.number().int().min(1).max(3600).default(10),
  calibration: calibrationSchema.default({ forwardScale: 1, reflectedScale: 1, lineLossDb: 0 }),
});
export type ControllerCreate = z.infer<typeof controllerCreateSchema>;

export const controllerSchema = z.object({
  id: z.number().int(),
  serial: z.string(),
  siteId: z.number().int(),
  antennaId: z.number().int().nullable(),
  kind: z.enum(controllerKinds),
  intervalS: z.number().int(),
  calibration: calibrationSchema,
  status: z.enum(controllerStatuses),
  firstSeenAt: z.string().nullable(),
  lastSeenAt: z.string().nullable(),
  accepted: z.number(),
  rejected: z.number(),
  /** readings whose boot and seq were stored before with other content */
  conflicts: z.number(),
  /** the device's current boot id, and how far its clock runs ahead (+) or behind (−) the server's */
  boot: z.string().nullable(),
  clockSkewS: z.number().nullable(),
});
export type Controller = z.infer<typeof controllerSchema>;

export type ControllerCredentials = {
  id: number;
  serial: string;
  mqtt: { url: string; username: string; password: string; topics: { telemetry: string; status: string; command: string; result: string } };
};

export const readingsQuerySchema = z.object({
  from: z.iso.datetime({ offset: true }).optional(),
  to: z.iso.datetime({ offset: true }).optional(),
  points: z.coerce.number().int().min(10).max(5000).default(1000),
});

export type ReadingPoint = {
  ts: string; vswr: number | null; vswrMin: number | null; vswrMax: number | null; forwardW: number | null; reflectedW: number | null;
  reflectedMaxW: number | null; airTempC: number | null; humidityPct: number | null; moisture: boolean | null; heaterOn: boolean | null;
  heaterDuty: number | null; heaterCurrentA: number | null; batteryPct: number | null;
};

export const alarmListQuerySchema = z.object({
  state: z.string().regex(/^[a-z-]+(,[a-z-]+)*$/).optional(),
  site: idSchema.optional(),
  priority: z.enum(['critical', 'high', 'medium', 'low']).optional(),
  open: z.enum(['0', '1']).optional(),
  limit: z.coerce.number().int().min(1).max(1000).default(200),
});

export const shelveBodySchema = z.object({
  reason: z.string().trim().min(3, 'Give a reason').max(500),
  until: z.iso.datetime({ offset: true }),
});

export const ackBodySchema = z.object({ note: z.string().trim().max(1000).optional() });

export const serviceBodySchema = z.object({ outOfService: z.boolean(), reason: z.string().trim().min(3).max(500) });

export const heaterCommandSchema = z.object({
  mode: z.enum(['auto', 'forced-on', 'forced-off']),
  untilMinutes: z.number().int().min(1).max(7 * 24 * 60).optional(),
  reason: z.string().trim().min(3, 'Give a reason').max(500),
  confirm: z.boolean().optional(),
});

export type AlarmView = {
  id: number; kind: string; priority: Priority; state: string; siteId: number; controllerId: number; raisedAt: string; value: number | null;
  message: string; ackedAt: string | null; ackNote: string | null; clearedAt: string | null; closedAt: string | null; shelvedUntil: string | null;
};

export const inviteBodySchema = z.object({
  email: emailSchema,
  name: nameSchema,
  role: roleSchema,
});
export const resetRequestSchema = z.object({ email: emailSchema });
export const acceptInviteSchema = z.object({ token: z.string().min(20).max(200), password: z.string().min(10, 'At least 10 characters').max(200) });
export const onCallBodySchema = z.object({ personIds: z.array(z.number().int().positive()).max(20) });
export const notificationPrefsSchema = z.object({ critical: z.boolean(), high: z.boolean(), medium: z.boolean(), low: z.boolean() });
export type NotificationPrefs = z.infer<typeof notificationPrefsSchema>;

/** Longest range a report covers: beyond a year, ask for several reports. */
export const maxReportDays = 400;
const withinReportRange = (v: { from: string; to: string }) => Date.parse(v.to) - Date.parse(v.from) <= maxReportDays * 86_400_000;

export const reportRangeSchema = z.object({
  site: idSchema,
  from: z.iso.datetime({ offset: true }),
  to: z.iso.datetime({ offset: true }),
}).refine((v) => Date.parse(v.to) > Date.parse(v.from), 'The end must come after the start').refine(withinReportRange, `At most ${maxReportDays} days`);

export const healthRangeSchema = z.object({
  from: z.iso.datetime({ offset: true }),
  to: z.iso.datetime({ offset: true }),
}).refine((v) => Date.parse(v.to) > Date.parse(v.from), 'The end must come after the start').refine(withinReportRange, `At most ${maxReportDays} days`);

/** What a technician confirms before going on site while ice may fall. */
export const safetyChecklistItems = {
  hardHat: 'I am wearing a hard hat',
  plan: 'I have a plan for where to stand, and I keep outside the marked radius unless I must go in',
  cover: 'I know where to take cover under something sturdy (a vehicle roof is not enough)',
  told: 'Master control knows I am here and when I expect to leave',
} as const;
export const checkInBodySchema = z.object({
  checklist: z.object({ hardHat: z.boolean(), plan: z.boolean(), cover: z.boolean(), told: z.boolean() }).partial().optional(),
  note: z.string().trim().max(1000).optional(),
});

export const exportQuerySchema = z.object({
  controller: idSchema.optional(),
  site: idSchema.optional(),
  from: z.iso.datetime({ offset: true }),
  to: z.iso.datetime({ offset: true }),
});

/** Site-wide choices an administrator makes. */
export const settingsSchema = z.object({ operatorsMayCommandHeaters: z.boolean() });
export type Settings = z.infer<typeof settingsSchema>;
export const defaultSettings: Settings = { operatorsMayCommandHeaters: false };
