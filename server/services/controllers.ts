import crypto from 'node:crypto';
import { parse } from 'csv-parse/sync';
import { z } from 'zod';
import { controllerCreateSchema, type Controller, type ControllerCreate, type ControllerCredentials, type Calibration, type Person } from '../../telemetry/api';
import { topics } from '../../telemetry/wire';
import { AppError, notFound } from '../errors';
import type { ControllerRow, ControllersRepository } from '../repositories/controllers';
import type { auditRepository } from '../repositories/people';
import type { sitesRepository } from '../repositories/sites';
import type { DeviceSecrets } from '../broker/device-secret';
import type { ScopeGuard } from './scope';

/** Missed reporting intervals after which a controller counts as silent. */
export const silentAfterIntervals = 3;

export function controllerStatus(row: ControllerRow, nowMs: number): Controller['status'] {
  if (row.decommissioned) return 'decommissioned';
  if (!row.last_seen_at) return 'waiting';
  const fresh = nowMs - row.last_seen_at.getTime() <= row.interval_s * 1000 * silentAfterIntervals;
  return fresh ? 'online' : 'silent';
}

export function toController(row: ControllerRow, nowMs = Date.now()): Controller {
  return {
    id: row.id, serial: row.serial, siteId: row.site_id, antennaId: row.antenna_id, kind: row.kind as Controller['kind'],
    intervalS: row.interval_s,
    calibration: { forwardScale: row.forward_scale, reflectedScale: row.reflected_scale, lineLossDb: row.line_loss_db },
    status: controllerStatus(row, nowMs),
    firstSeenAt: row.first_seen_at?.toISOString() ?? null,
    lastSeenAt: row.last_seen_at?.toISOString() ?? null,
    accepted: Number(row.accepted), rejected: Number(row.rejected), conflicts: Number(row.conflicts ?? 0),
    boot: row.boot ?? null, clockSkewS: row.clock_skew_s ?? null,
  };
}

const newPassword = () => crypto.randomBytes(18).toString('base64url');

export function controllersService(deps: {
  controllers: ControllersRepository;
  sites: ReturnType<typeof sitesRepository>;
  audit: ReturnType<typeof auditRepository>;
  secrets: DeviceSecrets;
  guard: ScopeGuard;
  /** read at each enrolment: the broker's port is known only once it listens */
  mqttUrl: () => string;
  /** told when a controller's credentials or details change (broker, ingest caches) */
  changed: (serial: string) => void;
  /** closes a decommissioned controller's alarms (out of service, with a history line) */
  retire: (controllerId: number, personId: number) => Promise<void>;
}) {
  const credentials = (id: number, serial: string, password: string): ControllerCredentials => ({
    id, serial, mqtt: { url: deps.mqttUrl(), username: serial, password, topics: topics(serial) },
  });

  async function checkPlace(siteId: number, antennaId: number | null) {
    const site = await deps.sites.byId(siteId);
    if (!site) throw new AppError('bad_request', 'No such site', [{ path: 'siteId', message: 'No such site' }]);
    if (antennaId != null && !site.antennas.some((a) => a.id === antennaId)) {
      throw new AppError('bad_request', 'That antenna is not at that site', [{ path: 'antennaId', message: 'Not at that site' }]);
    }
  }

  async function byIdOr404(id: number) {
    const row = await deps.controllers.byId(id);
    if (!row) throw notFound('Controller');
    return row;
  }

  const service = {
    async enrol(actor: Person, body: ControllerCreate): Promise<ControllerCredentials> {
      await checkPlace(body.siteId, body.antennaId);
      if (await deps.controllers.bySerial(body.serial)) throw new AppError('conflict', `Serial ${body.serial} is already enrolled`);
      const password = newPassword();
      const id = await deps.controllers.insert({
        serial: body.serial, site_id: body.siteId, antenna_id: body.antennaId, kind: body.kind, interval_s: body.intervalS,
        forward_scale: body.calibration.forwardScale, reflected_scale: body.calibration.reflectedScale, line_loss_db: body.calibration.lineLossDb,
        password_hash: deps.secrets.hash(password),
      });
      await deps.audit.record({ personId: actor.id, action: 'controller.enrol', subject: `controller:${id}`, after: { ...body } });
      return credentials(id, body.serial, password);
    },

    async list(actor: Person, siteId?: number): Promise<Controller[]> {
      const now = Date.now();
      const sites = await deps.guard.siteFilter(actor, siteId);
      return (await deps.controllers.list({ siteIds: sites ?? undefined })).map((r) => toController(r, now));
    },

    async detail(actor: Person, id: number) {
      await deps.guard.controller(actor, id);
      const row = await byIdOr404(id);
      const rejects = await deps.controllers.lastRejects(id);
      const outOfService = await deps.controllers.outOfService(id);
      return { ...toController(row), outOfService, lastRejects: rejects.map((r) => ({ at: new Date(r.at).toISOString(), reason: r.reason, payload: r.payload })) };
    },

    async rotatePassword(actor: Person, id: number): Promise<ControllerCredentials> {
      const row = await byIdOr404(id);
      if (row.decommissioned) throw new AppError('conflict', 'A decommissioned controller gets no new password');
      const password = newPassword();
      await deps.controllers.update(id, { password_hash: deps.secrets.hash(password) });
      await deps.audit.record({ personId: actor.id, action: 'controller.rotate-password', subject: `controller:${id}` });
      deps.changed(row.serial);
      return credentials(id, row.serial, password);
    },

    async decommission(actor: Person, id: number) {
      const row = await byIdOr404(id);
      await deps.controllers.update(id, { decommissioned: true, online: false });
      await deps.retire(id, actor.id);
      await deps.audit.record({ personId: actor.id, action: 'controller.decommission', subject: `controller:${id}` });
      deps.changed(row.serial);
      return toController((await deps.controllers.byId(id))!);
    },

    async calibrate(actor: Person, id: number, cal: Calibration) {
      const row = await byIdOr404(id);
      const before = toController(row).calibration;
      await deps.controllers.update(id, { forward_scale: cal.forwardScale, reflected_scale: cal.reflectedScale, line_loss_db: cal.lineLossDb });
      await deps.audit.record({ personId: actor.id, action: 'controller.calibrate', subject: `controller:${id}`, before, after: cal });
      deps.changed(row.serial);
      return toController((await deps.controllers.byId(id))!);
    },

    /** CSV with a header: serial,site,antenna,kind,intervalS,forwardScale,reflectedScale,lineLossDb (site by code, antenna by name). */
    async enrolCsv(actor: Person, csv: string) {
      let records: Record<string, string>[];
      try {
        records = parse(csv, { columns: (h: string[]) => h.map((c) => c.trim()), skip_empty_lines: true, trim: true, bom: true });
      } catch (e) {
        throw new AppError('bad_request', `The file is not valid CSV: ${(e as Error).message}`);
      }
      if (records.length > 500) throw new AppError('bad_request', 'At most 500 rows per file');
      const sites = await deps.sites.list();
      const results: ({ row: number; serial: string; ok: true; credentials: ControllerCredentials } | { row: number; serial: string; ok: false; error: string })[] = [];
      for (const [i, rec] of records.entries()) {
        const serial = rec.serial ?? '';
        const site = sites.find((s) => s.code.toLowerCase() === (rec.site ?? '').toLowerCase());
        const antenna = site?.antennas.find((a) => a.name.toLowerCase() === (rec.antenna ?? '').toLowerCase());
        const num = (v: string | undefined, d: number) => (v == null || v === '' ? d : Number(v));
        const parsed = controllerCreateSchema.safeParse({
          serial, siteId: site?.id ?? 0, antennaId: rec.antenna ? (antenna?.id ?? -1) : null, kind: rec.kind,
          intervalS: num(rec.intervalS, 10),
          calibration: { forwardScale: num(rec.forwardScale, 1), reflectedScale: num(rec.reflectedScale, 1), lineLossDb: num(rec.lineLossDb, 0) },
        });
        if (!site) { results.push({ row: i + 2, serial, ok: false, error: `unknown site "${rec.site ?? ''}"` }); continue; }
        if (rec.antenna && !antenna) { results.push({ row: i + 2, serial, ok: false, error: `no antenna "${rec.antenna}" at ${site.code}` }); continue; }
        if (!parsed.success) { results.push({ row: i + 2, serial, ok: false, error: z.prettifyError(parsed.error).replace(/\n/g, ' ') }); continue; }
        try {
          results.push({ row: i + 2, serial, ok: true, credentials: await service.enrol(actor, parsed.data) });
        } catch (e) {
          results.push({ row: i + 2, serial, ok: false, error: e instanceof AppError ? e.message : 'could not enrol' });
        }
      }
      return { results, enrolled: results.filter((r) => r.ok).length, failed: results.filter((r) => !r.ok).length };
    },
  };
  return service;
}
export type ControllersService = ReturnType<typeof controllersService>;
