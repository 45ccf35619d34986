import { z } from 'zod';

import type { Priority } from './alarms/machine';
import { roleSchema } from './roles';

/** Request and response bodies of the REST API, shared by server and app. */

/** An e-mail address as the people table holds it: at most 254 characters (RFC 5321 path limit). */
export const emailSchema = z
  .string()
  .trim()
  .toLowerCase()
  .max(254, 'At most 254 characters')
  .email('Enter a valid e-mail address');

// control characters, and the bidirectional overrides and isolates that make text read other than it is stored
const hiddenChars = /[\u0000-\u001f\u007f-\u009f\u200b-\u200f\u202a-\u202e\u2066-\u2069\ufeff]/;
/** Free text that names something (a person, a token): printable characters only. */
export const nameSchema = z
  .string()
  .trim()
  .min(1, 'Enter a name')
  .max(120)
  .refine((v) => !hiddenChars.test(v), 'No control or hidden direction characters');

/** A numeric id in a path: digits only (" 1" or "0x10" are not ids). */
export const idSchema = z
  .string()
  .regex(/^[1-9][0-9]{0,9}$/, 'An id is a whole number written in digits')
  .transform(Number);

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
  /** 1: single-phase (P = V·I); 3: balanced three-phase on line-to-line volts (P = √3·V·I) */
  heaterPhases: z.union([z.literal(1), z.literal(3)]),
  heightM: z.number().nullable(),
  feedLossDb: z.number().nullable(),
  archivedAt: z.string().nullable(),
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
  pvKwp: z.number().nullable(),
  /** IANA zone: the site's days, storm windows and times on its screens are in it */
  timeZone: z.string(),
  archivedAt: z.string().nullable(),
  antennas: z.array(antennaSchema),
});
export type Site = z.infer<typeof siteSchema>;

/** True for a time zone name the runtime knows (IANA names such as "America/Anchorage", or "UTC"). */
export function knownTimeZone(name: string): string | null {
  if (!/^[A-Za-z][A-Za-z0-9_+\-/]{0,63}$/.test(name)) return null;
  try {
    return new Intl.DateTimeFormat('en-GB', { timeZone: name }).resolvedOptions().timeZone;
  } catch {
    return null;
  }
}
export const timeZoneSchema = z
  .string()
  .trim()
  .transform((v, ctx) => {
    const zone = knownTimeZone(v);
    if (!zone) {
      ctx.addIssue({
        code: 'custom',
        message: 'Not a known time zone: use an IANA name such as Europe/Oslo or America/Anchorage',
      });
      return z.NEVER;
    }
    return zone;
  });

const optionalNumber = (min: number, max: number, unit: string) =>
  z
    .number({ error: `A number in ${unit}` })
    .min(min, `At least ${min} ${unit}`)
    .max(max, `At most ${max} ${unit}`)
    .nullable();
/** Fields left out of a new thing are empty; left out of a patch, unchanged (so no defaults in patches). */
const withDefaults = <T extends z.ZodRawShape>(shape: T, optional: (keyof T)[]) =>
  Object.fromEntries(
    Object.entries(shape).map(([k, v]) => [k, optional.includes(k) ? (v as z.ZodType).default(null as never) : v]),
  ) as T;

const siteFields = {
  code: z
    .string()
    .trim()
    .regex(/^[A-Za-z0-9][A-Za-z0-9-]{1,15}$/, '2–16 letters, digits or -')
    .transform((v) => v.toUpperCase()),
  name: nameSchema,
  region: nameSchema.pipe(z.string().max(80, 'At most 80 characters')),
  latitude: z.number({ error: 'Latitude in degrees' }).min(-90, 'Between −90 and 90').max(90, 'Between −90 and 90'),
  longitude: z
    .number({ error: 'Longitude in degrees' })
    .min(-180, 'Between −180 and 180')
    .max(180, 'Between −180 and 180'),
  elevationM: z.number({ error: 'Elevation in metres' }).min(-450, 'At least −450 m').max(8900, 'At most 8900 m'),
  towerHeightM: z.number({ error: 'Tower height in metres' }).min(0, 'At least 0 m').max(700, 'At most 700 m'),
  powerSource: z.enum(powerSources, { error: `One of ${powerSources.join(', ')}` }),
  batteryKwh: optionalNumber(0, 100000, 'kWh'),
  pvKwp: optionalNumber(0, 10000, 'kWp'),
  timeZone: timeZoneSchema,
};
/** What an engineer enters for a site; the server keeps the code in upper case. */
export const siteInputSchema = z.object(withDefaults(siteFields, ['batteryKwh', 'pvKwp']));
export type SiteInput = z.infer<typeof siteInputSchema>;
export const sitePatchSchema = z
  .object(siteFields)
  .partial()
  .refine((v) => Object.keys(v).length > 0, 'Nothing to change');

/** Electric heaters and blankets have a rating; a radome or a gas heater has no electric rating here. */
const ratedProtections: readonly string[] = ['heater', 'blanket'];
const antennaFields = {
  name: nameSchema,
  service: z.enum(services, { error: `One of ${services.join(', ')}` }),
  protection: z.enum(protections, { error: `One of ${protections.join(', ')}` }),
  heaterKw: optionalNumber(0.01, 500, 'kW'),
  heaterPhases: z.union([z.literal(1), z.literal(3)], { error: 'Single-phase (1) or three-phase (3)' }),
  heightM: optionalNumber(0, 700, 'm'),
  feedLossDb: optionalNumber(0, 30, 'dB'),
};
export const antennaInputSchema = z
  .object({
    ...withDefaults(antennaFields, ['heaterKw', 'heightM', 'feedLossDb']),
    heaterPhases: antennaFields.heaterPhases.default(1),
  })
  .superRefine((v, ctx) => {
    if (ratedProtections.includes(v.protection) && v.heaterKw == null)
      ctx.addIssue({ code: 'custom', path: ['heaterKw'], message: 'Give the heater rating in kW' });
    if (!ratedProtections.includes(v.protection) && v.heaterKw != null)
      ctx.addIssue({ code: 'custom', path: ['heaterKw'], message: `A ${v.protection} has no electric rating here` });
  });
export type AntennaInput = z.infer<typeof antennaInputSchema>;
export const antennaPatchSchema = z
  .object(antennaFields)
  .partial()
  .refine((v) => Object.keys(v).length > 0, 'Nothing to change');

export const archiveBodySchema = z.object({ reason: z.string().trim().min(3, 'Give a reason').max(500) });
export const siteListQuerySchema = z.object({ archived: z.enum(['0', '1']).default('0') });
export const antennaParamsSchema = z.object({ id: idSchema, antennaId: idSchema });
export const regionRenameSchema = z.object({
  from: nameSchema,
  to: nameSchema.pipe(z.string().max(80, 'At most 80 characters')),
});

/** Moving a controller to another antenna or site; its readings stay its own and the move is kept. */
export const controllerMoveSchema = z.object({
  siteId: z.number().int().positive(),
  antennaId: z.number().int().positive().nullable(),
  note: z.string().trim().max(500).optional(),
});
export const placementSchema = z.object({
  siteId: z.number().int(),
  site: z.string(),
  antennaId: z.number().int().nullable(),
  antenna: z.string().nullable(),
  from: z.string().nullable(),
  to: z.string().nullable(),
  movedBy: z.string().nullable(),
});
export type Placement = z.infer<typeof placementSchema>;

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
  serial: z
    .string()
    .trim()
    .regex(/^[A-Za-z0-9][A-Za-z0-9_-]{2,63}$/, '3–64 letters, digits, _ or -')
    .transform((s) => s.toUpperCase()),
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
  mqtt: {
    url: string;
    username: string;
    password: string;
    topics: { telemetry: string; status: string; command: string; result: string };
  };
};

export const readingsQuerySchema = z.object({
  from: z.iso.datetime({ offset: true }).optional(),
  to: z.iso.datetime({ offset: true }).optional(),
  points: z.coerce.number().int().min(10).max(5000).default(1000),
});

export type ReadingPoint = {
  ts: string;
  vswr: number | null;
  vswrMin: number | null;
  vswrMax: number | null;
  forwardW: number | null;
  reflectedW: number | null;
  reflectedMaxW: number | null;
  airTempC: number | null;
  humidityPct: number | null;
  moisture: boolean | null;
  heaterOn: boolean | null;
  heaterDuty: number | null;
  heaterCurrentA: number | null;
  batteryPct: number | null;
};

export const energyQuerySchema = z
  .object({
    from: z.iso.datetime({ offset: true }),
    to: z.iso.datetime({ offset: true }),
  })
  .refine((v) => Date.parse(v.to) > Date.parse(v.from), 'The end must come after the start')
  .refine((v) => Date.parse(v.to) - Date.parse(v.from) <= 400 * 86_400_000, 'At most 400 days');
export const heaterEnergySchema = z.object({
  kwh: z.number(),
  measuredKwh: z.number(),
  estimatedKwh: z.number(),
  basis: z.enum(['measured', 'estimated', 'mixed', 'none']),
  onHours: z.number(),
  coveredHours: z.number(),
  gaps: z.number().int(),
  gapHours: z.number(),
});

export const alarmListQuerySchema = z.object({
  state: z
    .string()
    .regex(/^[a-z-]+(,[a-z-]+)*$/)
    .optional(),
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

/** Several alarms acknowledged at once, one note for all (a flood during a storm). */
export const ackManyBodySchema = z.object({
  ids: z.array(z.number().int().min(1)).min(1, 'Choose at least one alarm').max(200, 'At most 200 alarms at once'),
  note: z.string().trim().max(1000).optional(),
});
export const ackManyResultSchema = z.object({
  acknowledged: z.array(z.number().int()),
  skipped: z.array(z.object({ id: z.number().int(), reason: z.string() })),
});
export type AckManyResult = z.infer<typeof ackManyResultSchema>;

export const serviceBodySchema = z.object({ outOfService: z.boolean(), reason: z.string().trim().min(3).max(500) });

export const heaterCommandSchema = z.object({
  mode: z.enum(['auto', 'forced-on', 'forced-off']),
  untilMinutes: z
    .number()
    .int()
    .min(1)
    .max(7 * 24 * 60)
    .optional(),
  reason: z.string().trim().min(3, 'Give a reason').max(500),
  confirm: z.boolean().optional(),
});

export const alarmViewSchema = z.object({
  id: z.number().int(),
  kind: z.string(),
  priority: z.enum(['critical', 'high', 'medium', 'low']),
  state: z.string(),
  siteId: z.number().int(),
  controllerId: z.number().int(),
  raisedAt: z.string(),
  value: z.number().nullable(),
  message: z.string(),
  ackedAt: z.string().nullable(),
  ackNote: z.string().nullable(),
  clearedAt: z.string().nullable(),
  closedAt: z.string().nullable(),
  shelvedUntil: z.string().nullable(),
});
export type AlarmView = z.infer<typeof alarmViewSchema> & { priority: Priority };

/** One alarm with its transitions and photos: what GET /api/alarms/:id answers. */
export const alarmDetailSchema = alarmViewSchema.extend({
  events: z.array(
    z.object({
      at: z.string(),
      transition: z.string(),
      state: z.string(),
      note: z.string().nullable(),
      person: z.string().nullable(),
    }),
  ),
  attachments: z.array(z.object({ id: z.number().int(), mime: z.string(), bytes: z.number().int(), at: z.string() })),
  /** the response guidance of the rule that raised it (or of that kind's global rule) */
  guidance: z.string().nullable(),
  /** the VSWR warning and trip levels in force for its controller */
  limits: z.object({ warning: z.number().nullable(), trip: z.number().nullable() }),
});
export type AlarmDetail = z.infer<typeof alarmDetailSchema>;

export const inviteBodySchema = z.object({
  email: emailSchema,
  name: nameSchema,
  role: roleSchema,
});
export const resetRequestSchema = z.object({ email: emailSchema });
export const acceptInviteSchema = z.object({
  token: z.string().min(20).max(200),
  password: z.string().min(10, 'At least 10 characters').max(200),
});
export const onCallBodySchema = z.object({ personIds: z.array(z.number().int().positive()).max(20) });
export const notificationPrefsSchema = z.object({
  critical: z.boolean(),
  high: z.boolean(),
  medium: z.boolean(),
  low: z.boolean(),
});
export type NotificationPrefs = z.infer<typeof notificationPrefsSchema>;

/** Longest range a report covers: beyond a year, ask for several reports. */
export const maxReportDays = 400;
const withinReportRange = (v: { from: string; to: string }) =>
  Date.parse(v.to) - Date.parse(v.from) <= maxReportDays * 86_400_000;

export const reportRangeSchema = z
  .object({
    site: idSchema,
    from: z.iso.datetime({ offset: true }),
    to: z.iso.datetime({ offset: true }),
  })
  .refine((v) => Date.parse(v.to) > Date.parse(v.from), 'The end must come after the start')
  .refine(withinReportRange, `At most ${maxReportDays} days`);

export const healthRangeSchema = z
  .object({
    from: z.iso.datetime({ offset: true }),
    to: z.iso.datetime({ offset: true }),
  })
  .refine((v) => Date.parse(v.to) > Date.parse(v.from), 'The end must come after the start')
  .refine(withinReportRange, `At most ${maxReportDays} days`);

/** What a technician confirms before going on site while ice may fall. */
export const safetyChecklistItems = {
  hardHat: 'I am wearing a hard hat',
  plan: 'I have a plan for where to stand, and I keep outside the marked radius unless I must go in',
  cover: 'I know where to take cover under something sturdy (a vehicle roof is not enough)',
  told: 'Master control knows I am here and when I expect to leave',
} as const;
export const checkInBodySchema = z.object({
  checklist: z
    .object({ hardHat: z.boolean(), plan: z.boolean(), cover: z.boolean(), told: z.boolean() })
    .partial()
    .optional(),
  note: z.string().trim().max(1000).optional(),
  /** how long the person expects to stay; master control sees when they are due to leave */
  stayMinutes: z
    .number()
    .int('Give whole minutes')
    .min(15, 'Stay at least 15 minutes')
    .max(24 * 60, 'At most 24 hours: check in again for longer')
    .optional(),
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
