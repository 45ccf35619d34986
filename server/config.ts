import fs from 'node:fs';
import path from 'node:path';

import { z } from 'zod';

const port = z.coerce.number().int().min(1).max(65535);
const bool = z.enum(['0', '1', 'true', 'false']).transform((v) => v === '1' || v === 'true');

const schema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(0).max(65535).default(8080),
  PUBLIC_URL: z.string().url().optional(),
  DATA_DIR: z.string().default('.data'),
  DB_HOST: z.string().default('127.0.0.1'),
  DB_PORT: port.default(3307),
  DB_NAME: z
    .string()
    .regex(/^[A-Za-z0-9_]+$/, 'letters, digits and _ only')
    .default('thawline'),
  DB_USER: z
    .string()
    .regex(/^[A-Za-z0-9_]+$/)
    .default('thawline'),
  DB_PASSWORD: z.string().min(8).default('thawline-local-dev'),
  /** Start a private MariaDB from DATA_DIR; 0 to use an existing server. */
  DB_MANAGED: bool.default(true),
  MQTT_PORT: z.coerce.number().int().min(0).max(65535).default(1883),
  /** An external broker; when unset the embedded broker is used. */
  MQTT_URL: z.string().url().optional(),
  /** the server's own credentials on an external broker */
  MQTT_USERNAME: z.string().optional(),
  MQTT_PASSWORD: z.string().optional(),
  /** key for controller secrets (hex or base64, ≥ 32 bytes); kept in DATA_DIR/device-key when unset */
  DEVICE_KEY: z.string().optional(),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: port.default(2525),
  SMTP_FROM: z.string().default('Thawline <alarms@thawline.local>'),
  /** Start the local SMTP catcher (development); 0 in production. */
  SMTP_CATCHER: bool.default(true),
  /** the reverse proxy whose X-Forwarded-For/-Proto are believed: 'loopback', an address, or a hop count; unset: none */
  TRUST_PROXY: z
    .string()
    .regex(/^[0-9A-Za-z.:/, -]+$/)
    .optional()
    .transform((v) => (v && /^\d+$/.test(v) ? Number(v) : v)),
  SESSION_DAYS: z.coerce.number().min(1).max(90).default(14),
  RAW_RETENTION_DAYS: z.coerce.number().min(1).max(3650).default(90),
  SIMULATOR: bool.default(true),
  /** energy price for the Reports, per kWh, in the local currency */
  TARIFF_PER_KWH: z.coerce.number().min(0).max(100).default(0.25),
  /** the tariff's currency, an ISO 4217 code, shown beside every cost */
  CURRENCY: z
    .string()
    .regex(/^[A-Z]{3}$/, 'an ISO 4217 code such as EUR')
    .default('EUR'),
  /**
   * Run as one of several instances on one database and one external broker
   * (MQTT_URL): controllers are shared out by leases, timed jobs run on one.
   */
  CLUSTER: bool.default(false),
  /** this instance's name among several (default: pid and a random suffix) */
  INSTANCE_ID: z
    .string()
    .regex(/^[A-Za-z0-9_.-]{1,64}$/, 'letters, digits, _ . - only, at most 64')
    .optional(),
  /**
   * MQTT_URL is mosquitto with its dynamic security plugin: Thawline keeps each
   * controller's account and role there (and its own, MQTT_USERNAME/MQTT_PASSWORD)
   * through the plugin's admin account MQTT_ADMIN_USERNAME/MQTT_ADMIN_PASSWORD.
   */
  MQTT_DYNSEC: bool.default(false),
  MQTT_ADMIN_USERNAME: z.string().optional(),
  MQTT_ADMIN_PASSWORD: z.string().optional(),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
});

/** `mailDir`: where the development SMTP catcher leaves each message it catches */
export type Config = z.infer<typeof schema> & { root: string; webDir: string; uploadsDir: string; mailDir: string };

export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = schema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Configuration is not valid:\n${lines.join('\n')}`);
  }
  if (parsed.data.CLUSTER && !parsed.data.MQTT_URL)
    throw new Error(
      'Configuration is not valid:\n  CLUSTER: several instances share one external broker: set MQTT_URL',
    );
  const d = parsed.data;
  if (
    d.MQTT_DYNSEC &&
    !(d.MQTT_URL && d.MQTT_USERNAME && d.MQTT_PASSWORD && d.MQTT_ADMIN_USERNAME && d.MQTT_ADMIN_PASSWORD)
  )
    throw new Error(
      'Configuration is not valid:\n  MQTT_DYNSEC: needs MQTT_URL, MQTT_USERNAME, MQTT_PASSWORD, MQTT_ADMIN_USERNAME and MQTT_ADMIN_PASSWORD',
    );
  const root = projectRoot();
  const dataDir = path.resolve(root, parsed.data.DATA_DIR);
  return {
    ...parsed.data,
    DATA_DIR: dataDir,
    root,
    webDir: path.join(root, 'dist'),
    uploadsDir: path.join(dataDir, 'uploads'),
    mailDir: path.join(dataDir, 'mail'),
  };
}

export function publicUrl(config: Config): string {
  return config.PUBLIC_URL ?? `http://${config.HOST}:${config.PORT}`;
}

/** The broker address given to controllers at enrolment. */
export function mqttPublicUrl(config: Config): string {
  return config.MQTT_URL ?? `mqtt://${config.HOST}:${config.MQTT_PORT}`;
}

/**
 * The project folder: the nearest one above this module holding package.json. The
 * same from the sources (server/) and from a bundle (build/, build/bench/).
 */
export function projectRoot(from = __dirname): string {
  for (let dir = from; ; dir = path.dirname(dir)) {
    if (fs.existsSync(path.join(dir, 'package.json'))) return dir;
    if (path.dirname(dir) === dir) throw new Error(`no package.json above ${from}`);
  }
}
