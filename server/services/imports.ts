import { parse } from 'csv-parse/sync';
import type { Knex } from 'knex';
import type { z } from 'zod';

import { AppError } from '@/server/errors';
import type { auditRepository } from '@/server/repositories/people';
import { antennaColumns, siteColumns, type SitesRepository } from '@/server/repositories/sites';
import {
  type AntennaInput,
  antennaInputSchema,
  type ControllerCreate,
  controllerCreateSchema,
  type ControllerCredentials,
  type Person,
  type SiteInput,
  siteInputSchema,
} from '@/telemetry/api';

/** One problem in an uploaded file, placed where a spreadsheet shows it. */
export type ImportIssue = { line: number; column: string | null; message: string };
export type ImportRow = {
  line: number;
  record: string;
  key: string;
  action: 'create' | 'update' | 'unchanged' | 'error';
  changes?: Record<string, { from: unknown; to: unknown }>;
  errors: ImportIssue[];
};
export type ImportPlan = { applied: boolean; rows: ImportRow[]; counts: Record<ImportRow['action'], number> };

export const maxImportRows = 2000;

type CsvRecord = { line: number; cells: Record<string, string> };

/** Parses a CSV with a header row; each record keeps the line it started on. */
export function readCsv(text: string, columns: readonly string[]): CsvRecord[] {
  let raw: { record: Record<string, string>; info: { lines: number } }[];
  try {
    raw = parse(text, {
      columns: (h: string[]) => h.map((c) => c.trim()),
      skip_empty_lines: true,
      trim: true,
      bom: true,
      info: true,
      relax_column_count: false,
    });
  } catch (e) {
    throw new AppError('bad_request', `The file is not valid CSV: ${(e as Error).message}`);
  }
  if (raw.length > maxImportRows) throw new AppError('bad_request', `At most ${maxImportRows} rows per file`);
  const header = raw.length ? Object.keys(raw[0].record) : [];
  const unknown = header.filter((h) => !columns.includes(h));
  if (unknown.length) {
    throw new AppError(
      'bad_request',
      `Unknown column(s): ${unknown.join(', ')}. The columns are: ${columns.join(', ')}`,
      unknown.map((c) => ({ line: 1, column: c, message: 'Unknown column' })),
    );
  }
  // info.lines is the line the record ended on; a quoted cell may span lines, so count back from the end
  return raw.map((r) => ({ line: r.info.lines, cells: r.record }));
}

const num = (v: string | undefined) => (v == null || v === '' ? null : Number(v.replace(',', '.')));

function issuesOf(err: z.ZodError, line: number, columnOf: Record<string, string>): ImportIssue[] {
  return err.issues.map((i) => ({ line, column: columnOf[String(i.path[0] ?? '')] ?? null, message: i.message }));
}

function diff(before: Record<string, unknown>, after: Record<string, unknown>) {
  const out: Record<string, { from: unknown; to: unknown }> = {};
  for (const [k, v] of Object.entries(after))
    if (v !== undefined && before[k] !== v) out[k] = { from: before[k] ?? null, to: v };
  return out;
}

function summarise(rows: ImportRow[], applied: boolean): ImportPlan {
  const counts = { create: 0, update: 0, unchanged: 0, error: 0 };
  for (const r of rows) counts[r.action]++;
  return { applied, rows, counts };
}

/* ---------- sites and antennas ---------- */

export const networkColumns = [
  'record',
  'code',
  'name',
  'region',
  'latitude',
  'longitude',
  'elevation_m',
  'tower_height_m',
  'power_source',
  'battery_kwh',
  'pv_kwp',
  'time_zone',
  'site',
  'service',
  'protection',
  'heater_kw',
  'heater_phases',
  'height_m',
  'feed_loss_db',
] as const;
const siteColumnOf: Record<string, string> = {
  code: 'code',
  name: 'name',
  region: 'region',
  latitude: 'latitude',
  longitude: 'longitude',
  elevationM: 'elevation_m',
  towerHeightM: 'tower_height_m',
  powerSource: 'power_source',
  batteryKwh: 'battery_kwh',
  pvKwp: 'pv_kwp',
  timeZone: 'time_zone',
};
const antennaColumnOf: Record<string, string> = {
  name: 'name',
  service: 'service',
  protection: 'protection',
  heaterKw: 'heater_kw',
  heaterPhases: 'heater_phases',
  heightM: 'height_m',
  feedLossDb: 'feed_loss_db',
};

export const networkTemplate =
  [
    networkColumns.join(','),
    'site,NEW1,Example Ridge,Example Region,62.10,10.50,850,150,utility,,,Europe/Oslo,,,,,,,',
    'antenna,,FM main array,,,,,,,,,,NEW1,fm,heater,12,3,130,1.2',
    'antenna,,Link dish north,,,,,,,,,,NEW1,microwave,radome,,,60,0.4',
  ].join('\n') + '\n';

export const controllerColumns = [
  'serial',
  'site',
  'antenna',
  'kind',
  'interval_s',
  'forward_scale',
  'reflected_scale',
  'line_loss_db',
] as const;
const controllerColumnOf: Record<string, string> = {
  serial: 'serial',
  siteId: 'site',
  antennaId: 'antenna',
  kind: 'kind',
  intervalS: 'interval_s',
  calibration: 'line_loss_db',
};
export const controllerTemplate =
  [
    controllerColumns.join(','),
    'EXAMPLE-001,NEW1,FM main array,heater,10,1,1,0.5',
    'EXAMPLE-002,NEW1,Link dish north,radome-sensor,30,1,1,0',
  ].join('\n') + '\n';

export function importsService(deps: {
  db: Knex;
  sites: SitesRepository;
  audit: ReturnType<typeof auditRepository>;
  changed: () => void;
  /** enrols one controller inside the import's transaction */
  enrol: (actor: Person, body: ControllerCreate, trx: Knex.Transaction) => Promise<ControllerCredentials>;
}) {
  const { db, sites, audit } = deps;

  /**
   * Plans (and with `apply`, carries out in one transaction) a file of sites and
   * antennas: a site row by its code, an antenna row by its site's code and its name.
   */
  async function network(actor: Person, csv: string, apply: boolean): Promise<ImportPlan> {
    const records = readCsv(csv, networkColumns);
    return db
      .transaction(async (trx) => {
        const existing = new Map((await sites.list({ archived: true })).map((s) => [s.code, s]));
        const planned = new Map<string, { line: number; input: SiteInput }>();
        const rows: ImportRow[] = [];
        const work: ((trx: Knex.Transaction) => Promise<void>)[] = [];
        const siteIds = new Map<string, number>([...existing.values()].map((s) => [s.code, s.id]));
        /** A row that matches an existing site or antenna: changed fields written and audited on apply, or unchanged. */
        const planUpdate = (
          line: number,
          record: 'site' | 'antenna',
          key: string,
          subject: string,
          changes: Record<string, { from: unknown; to: unknown }>,
          after: object,
          write: (t: Knex.Transaction) => Promise<unknown>,
        ) => {
          const changed = Object.keys(changes).length > 0;
          rows.push({ line, record, key, action: changed ? 'update' : 'unchanged', changes, errors: [] });
          if (!changed) return;
          work.push(async (t) => {
            await write(t);
            const before = Object.fromEntries(Object.entries(changes).map(([k, c]) => [k, c.from]));
            await audit.record(
              { personId: actor.id, action: `${record}.update`, subject, before, after: { ...after, via: 'import' } },
              t,
            );
          });
        };

        for (const { line, cells } of records) {
          const kind = (cells.record ?? '').toLowerCase();
          if (kind === 'site') {
            const parsed = siteInputSchema.safeParse({
              code: cells.code ?? '',
              name: cells.name ?? '',
              region: cells.region ?? '',
              latitude: num(cells.latitude),
              longitude: num(cells.longitude),
              elevationM: num(cells.elevation_m),
              towerHeightM: num(cells.tower_height_m),
              powerSource: cells.power_source,
              batteryKwh: num(cells.battery_kwh),
              pvKwp: num(cells.pv_kwp),
              timeZone: cells.time_zone || 'UTC',
            });
            const key = (cells.code ?? '').toUpperCase();
            if (!parsed.success) {
              rows.push({
                line,
                record: 'site',
                key,
                action: 'error',
                errors: issuesOf(parsed.error, line, siteColumnOf),
              });
              continue;
            }
            const v = parsed.data;
            if (planned.has(v.code)) {
              rows.push({
                line,
                record: 'site',
                key,
                action: 'error',
                errors: [
                  { line, column: 'code', message: `Site ${v.code} is already on line ${planned.get(v.code)!.line}` },
                ],
              });
              continue;
            }
            planned.set(v.code, { line, input: v });
            const was = existing.get(v.code);
            if (!was) {
              rows.push({ line, record: 'site', key, action: 'create', errors: [] });
              work.push(async (t) => {
                const id = await sites.insert(v, t);
                siteIds.set(v.code, id);
                await audit.record(
                  { personId: actor.id, action: 'site.create', subject: `site:${id}`, after: { ...v, via: 'import' } },
                  t,
                );
              });
            } else {
              planUpdate(line, 'site', key, `site:${was.id}`, diff(siteColumns(was), siteColumns(v)), v, (t) =>
                sites.update(was.id, v, t),
              );
            }
          } else if (kind === 'antenna') {
            const code = (cells.site ?? '').toUpperCase();
            const key = `${code} / ${cells.name ?? ''}`;
            const parsed = antennaInputSchema.safeParse({
              name: cells.name ?? '',
              service: cells.service,
              protection: cells.protection,
              heaterKw: num(cells.heater_kw),
              heaterPhases: num(cells.heater_phases) ?? 1,
              heightM: num(cells.height_m),
              feedLossDb: num(cells.feed_loss_db),
            });
            const errors: ImportIssue[] = parsed.success ? [] : issuesOf(parsed.error, line, antennaColumnOf);
            const site = existing.get(code);
            const plannedSite = planned.get(code)?.input;
            if (!code) errors.push({ line, column: 'site', message: 'Name the site by its code' });
            else if (!site && !plannedSite)
              errors.push({ line, column: 'site', message: `No site ${code}, here or earlier in the file` });
            const tower = plannedSite?.towerHeightM ?? site?.towerHeightM;
            if (parsed.success && parsed.data.heightM != null && tower != null && parsed.data.heightM > tower) {
              errors.push({ line, column: 'height_m', message: `Higher than the ${tower} m tower` });
            }
            if (errors.length || !parsed.success) {
              rows.push({ line, record: 'antenna', key, action: 'error', errors });
              continue;
            }
            const v: AntennaInput = parsed.data;
            const was = site?.antennas.find((a) => a.name.toLowerCase() === v.name.toLowerCase() && !a.archivedAt);
            if (!was) {
              rows.push({ line, record: 'antenna', key, action: 'create', errors: [] });
              work.push(async (t) => {
                const id = await sites.insertAntenna(siteIds.get(code)!, v, t);
                await audit.record(
                  {
                    personId: actor.id,
                    action: 'antenna.create',
                    subject: `antenna:${id}`,
                    after: { ...v, site: code, via: 'import' },
                  },
                  t,
                );
              });
            } else {
              planUpdate(
                line,
                'antenna',
                key,
                `antenna:${was.id}`,
                diff(antennaColumns(was), antennaColumns(v)),
                v,
                (t) => sites.updateAntenna(was.id, v, t),
              );
            }
          } else {
            rows.push({
              line,
              record: kind || '?',
              key: '',
              action: 'error',
              errors: [{ line, column: 'record', message: 'Write "site" or "antenna"' }],
            });
          }
        }
        const plan = summarise(rows, false);
        if (!apply || plan.counts.error > 0) return plan;
        for (const w of work) await w(trx);
        return { ...plan, applied: true };
      })
      .then((plan) => {
        if (plan.applied) deps.changed();
        return plan;
      });
  }

  /** The same for controllers: every row valid, or nothing is enrolled. Passwords appear once, in the applied result. */
  async function controllers(actor: Person, csv: string, apply: boolean) {
    const records = readCsv(csv, controllerColumns);
    const all = await sites.list();
    const taken = new Set((await db('controllers').select('serial')).map((r) => r.serial as string));
    const seen = new Map<string, number>();
    const rows: ImportRow[] = [];
    const bodies: ControllerCreate[] = [];
    for (const { line, cells } of records) {
      const site = all.find((s) => s.code === (cells.site ?? '').toUpperCase());
      const antenna = site?.antennas.find((a) => a.name.toLowerCase() === (cells.antenna ?? '').toLowerCase());
      const n = (v: string | undefined, d: number) => num(v) ?? d;
      const parsed = controllerCreateSchema.safeParse({
        serial: cells.serial ?? '',
        siteId: site?.id ?? 1,
        antennaId: cells.antenna ? (antenna?.id ?? 1) : null,
        kind: cells.kind,
        intervalS: n(cells.interval_s, 10),
        calibration: {
          forwardScale: n(cells.forward_scale, 1),
          reflectedScale: n(cells.reflected_scale, 1),
          lineLossDb: n(cells.line_loss_db, 0),
        },
      });
      const errors = parsed.success ? [] : issuesOf(parsed.error, line, controllerColumnOf);
      if (!site) errors.push({ line, column: 'site', message: `No site "${cells.site ?? ''}"` });
      else if (cells.antenna && !antenna)
        errors.push({ line, column: 'antenna', message: `No antenna "${cells.antenna}" at ${site.code}` });
      const serial = parsed.success ? parsed.data.serial : (cells.serial ?? '').toUpperCase();
      if (parsed.success && taken.has(serial))
        errors.push({ line, column: 'serial', message: `${serial} is already enrolled` });
      if (seen.has(serial))
        errors.push({ line, column: 'serial', message: `${serial} is already on line ${seen.get(serial)}` });
      seen.set(serial, line);
      if (errors.length || !parsed.success) {
        rows.push({ line, record: 'controller', key: serial, action: 'error', errors });
        continue;
      }
      rows.push({ line, record: 'controller', key: serial, action: 'create', errors: [] });
      bodies.push(parsed.data);
    }
    const plan = summarise(rows, false);
    if (!apply || plan.counts.error > 0) return { ...plan, credentials: [] as ControllerCredentials[] };
    const credentials = await db.transaction(async (trx) => {
      const out: ControllerCredentials[] = [];
      for (const b of bodies) out.push(await deps.enrol(actor, b, trx));
      return out;
    });
    deps.changed();
    return { ...plan, applied: true, credentials };
  }

  return { network, controllers };
}
export type ImportsService = ReturnType<typeof importsService>;
