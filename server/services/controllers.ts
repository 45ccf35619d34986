import crypto from 'node:crypto';

import type { Knex } from 'knex';

import type { DeviceSecrets } from '@/server/broker/device-secret';
import { AppError, notFound } from '@/server/errors';
import type { ControllerRow, ControllersRepository } from '@/server/repositories/controllers';
import type { auditRepository } from '@/server/repositories/people';
import type { SitesRepository } from '@/server/repositories/sites';
import {
  type Calibration,
  type Controller,
  type ControllerCreate,
  type ControllerCredentials,
  type Person,
} from '@/telemetry/api';
import { topics } from '@/telemetry/wire';

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
    id: row.id,
    serial: row.serial,
    siteId: row.site_id,
    antennaId: row.antenna_id,
    kind: row.kind as Controller['kind'],
    intervalS: row.interval_s,
    calibration: { forwardScale: row.forward_scale, reflectedScale: row.reflected_scale, lineLossDb: row.line_loss_db },
    status: controllerStatus(row, nowMs),
    firstSeenAt: row.first_seen_at?.toISOString() ?? null,
    lastSeenAt: row.last_seen_at?.toISOString() ?? null,
    accepted: Number(row.accepted),
    rejected: Number(row.rejected),
    conflicts: Number(row.conflicts ?? 0),
    boot: row.boot ?? null,
    clockSkewS: row.clock_skew_s ?? null,
  };
}

/**
 * A controller's password: 18 random bytes as 24 URL-safe characters, never starting
 * with '-' (it is pasted into command lines and device settings, where a leading dash
 * reads as an option: the simulator refused one).
 */
export function newControllerPassword(): string {
  for (;;) {
    const password = crypto.randomBytes(18).toString('base64url');
    if (!password.startsWith('-')) return password;
  }
}

/** Controllers' accounts on an external broker that keeps its own (mosquitto's dynamic security). */
export type BrokerAccounts = {
  controllerAdded: (serial: string, password: string) => Promise<void>;
  passwordChanged: (serial: string, password: string) => Promise<void>;
  controllerRemoved: (serial: string) => Promise<void>;
};

/** A change the broker refused or did not answer is the broker's outage: 503, nothing half-done kept. */
async function atBroker(what: string, work: () => Promise<void>) {
  try {
    await work();
  } catch (err) {
    throw new AppError('unavailable', `The MQTT broker did not take the ${what}: ${(err as Error).message}`);
  }
}

export function controllersService(deps: {
  db: Knex;
  controllers: ControllersRepository;
  sites: SitesRepository;
  audit: ReturnType<typeof auditRepository>;
  secrets: DeviceSecrets;
  guard: ScopeGuard;
  /** read at each enrolment: the broker's port is known only once it listens */
  mqttUrl: () => string;
  /** told when a controller's credentials or details change (broker, ingest caches) */
  changed: (serial: string) => void;
  /** closes a decommissioned controller's alarms (out of service, with a history line) */
  retire: (controllerId: number, personId: number) => Promise<void>;
  /** told after a controller moved, so lists of sites and controllers fetch again */
  moved: () => void;
  /** an external broker's accounts, when it keeps its own */
  accounts?: () => BrokerAccounts | null;
}) {
  const credentials = (id: number, serial: string, password: string): ControllerCredentials => ({
    id,
    serial,
    mqtt: { url: deps.mqttUrl(), username: serial, password, topics: topics(serial) },
  });

  async function checkPlace(siteId: number, antennaId: number | null, q?: Knex.Transaction) {
    const site = await deps.sites.byId(siteId, q);
    if (!site) throw new AppError('bad_request', 'No such site', [{ path: 'siteId', message: 'No such site' }]);
    if (site.archivedAt)
      throw new AppError('bad_request', `${site.name} is archived`, [
        { path: 'siteId', message: 'Archived: restore the site first' },
      ]);
    const antenna = antennaId == null ? null : site.antennas.find((a) => a.id === antennaId);
    if (antennaId != null && !antenna) {
      throw new AppError('bad_request', 'That antenna is not at that site', [
        { path: 'antennaId', message: 'Not at that site' },
      ]);
    }
    if (antenna?.archivedAt)
      throw new AppError('bad_request', `${antenna.name} is archived`, [
        { path: 'antennaId', message: 'Archived antenna' },
      ]);
    return site;
  }

  async function byIdOr404(id: number) {
    const row = await deps.controllers.byId(id);
    if (!row) throw notFound('Controller');
    return row;
  }

  const service = {
    async enrol(actor: Person, body: ControllerCreate, trx?: Knex.Transaction): Promise<ControllerCredentials> {
      await checkPlace(body.siteId, body.antennaId, trx);
      if (await deps.controllers.bySerial(body.serial))
        throw new AppError('conflict', `Serial ${body.serial} is already enrolled`);
      const password = newControllerPassword();
      // the broker first: a controller enrolled here must be able to sign in there
      const accounts = deps.accounts?.() ?? null;
      if (accounts) await atBroker('new controller', () => accounts.controllerAdded(body.serial, password));
      const undo = () => accounts?.controllerRemoved(body.serial).catch(() => {});
      // an enrolment inside a larger transaction (an import) that is rolled back leaves no account behind
      if (trx && accounts) trx.executionPromise.catch(undo);
      const id = await deps.controllers
        .insert(
          {
            serial: body.serial,
            site_id: body.siteId,
            antenna_id: body.antennaId,
            kind: body.kind,
            interval_s: body.intervalS,
            forward_scale: body.calibration.forwardScale,
            reflected_scale: body.calibration.reflectedScale,
            line_loss_db: body.calibration.lineLossDb,
            password_hash: deps.secrets.hash(password),
          },
          trx,
        )
        .catch(async (err: unknown) => {
          await undo();
          throw err;
        });
      await deps.audit.record(
        { personId: actor.id, action: 'controller.enrol', subject: `controller:${id}`, after: { ...body } },
        trx,
      );
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
      return {
        ...toController(row),
        outOfService,
        lastRejects: rejects.map((r) => ({ at: new Date(r.at).toISOString(), reason: r.reason, payload: r.payload })),
      };
    },

    async rotatePassword(actor: Person, id: number): Promise<ControllerCredentials> {
      const row = await byIdOr404(id);
      if (row.decommissioned) throw new AppError('conflict', 'A decommissioned controller gets no new password');
      const password = newControllerPassword();
      const accounts = deps.accounts?.() ?? null;
      if (accounts) await atBroker('new password', () => accounts.passwordChanged(row.serial, password));
      await deps.controllers.update(id, { password_hash: deps.secrets.hash(password) });
      await deps.audit.record({
        personId: actor.id,
        action: 'controller.rotate-password',
        subject: `controller:${id}`,
      });
      deps.changed(row.serial);
      return credentials(id, row.serial, password);
    },

    async decommission(actor: Person, id: number) {
      const row = await byIdOr404(id);
      const accounts = deps.accounts?.() ?? null;
      if (accounts) await atBroker('removal of the controller', () => accounts.controllerRemoved(row.serial));
      await deps.controllers.update(id, { decommissioned: true, online: false });
      await deps.retire(id, actor.id);
      await deps.audit.record({ personId: actor.id, action: 'controller.decommission', subject: `controller:${id}` });
      deps.changed(row.serial);
      return toController((await deps.controllers.byId(id))!);
    },

    async calibrate(actor: Person, id: number, cal: Calibration) {
      const row = await byIdOr404(id);
      const before = toController(row).calibration;
      await deps.controllers.update(id, {
        forward_scale: cal.forwardScale,
        reflected_scale: cal.reflectedScale,
        line_loss_db: cal.lineLossDb,
      });
      await deps.audit.record({
        personId: actor.id,
        action: 'controller.calibrate',
        subject: `controller:${id}`,
        before,
        after: cal,
      });
      deps.changed(row.serial);
      return toController((await deps.controllers.byId(id))!);
    },

    /** Moves a controller to another antenna or site; its readings stay its own and the old placement is kept. */
    async move(actor: Person, id: number, to: { siteId: number; antennaId: number | null; note?: string }) {
      await deps.guard.controller(actor, id);
      const row = await byIdOr404(id);
      if (row.decommissioned) throw new AppError('conflict', 'A decommissioned controller stays where it was');
      if (row.site_id === to.siteId && row.antenna_id === to.antennaId)
        throw new AppError('conflict', 'The controller is already there');
      await deps.db.transaction(async (trx) => {
        await checkPlace(to.siteId, to.antennaId, trx);
        await deps.controllers.move(id, to, actor.id, new Date(), trx);
        await deps.audit.record(
          {
            personId: actor.id,
            action: 'controller.move',
            subject: `controller:${id}`,
            before: { siteId: row.site_id, antennaId: row.antenna_id },
            after: to,
          },
          trx,
        );
      });
      deps.changed(row.serial);
      deps.moved();
      return toController((await deps.controllers.byId(id))!);
    },
    placements: async (actor: Person, id: number) => {
      await deps.guard.controller(actor, id);
      await byIdOr404(id);
      return deps.sites.placements(id);
    },
  };
  return service;
}
export type ControllersService = ReturnType<typeof controllersService>;
