import { z } from 'zod';
import { roleSchema } from './roles';

/** Request and response bodies of the REST API, shared by server and app. */

export const signInBodySchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter a valid e-mail address'),
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

export const idParamsSchema = z.object({ id: z.coerce.number().int().positive() });

export const personCreateSchema = z.object({
  email: z.string().trim().toLowerCase().email(),
  name: z.string().trim().min(1).max(120),
  role: roleSchema,
  password: z.string().min(10, 'At least 10 characters').max(200),
});
export const personUpdateSchema = z
  .object({ name: z.string().trim().min(1).max(120), role: roleSchema, active: z.boolean() })
  .partial()
  .refine((v) => Object.keys(v).length > 0, 'Nothing to change');

export type ApiError = { error: { code: string; message: string; details?: unknown } };
