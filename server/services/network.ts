import type { Knex } from 'knex';

import { AppError, notFound } from '@/server/errors';
import type { auditRepository } from '@/server/repositories/people';
import type { SitesRepository } from '@/server/repositories/sites';
import type { AntennaInput, Person, Site, SiteInput } from '@/telemetry/api';

import type { ScopeGuard } from './scope';

const fieldError = (path: string, message: string) => new AppError('bad_request', message, [{ path, message }]);
const isDuplicate = (e: unknown) => (e as { code?: string }).code === 'ER_DUP_ENTRY';

/**
 * Sites, antennas and regions as engineers manage them. Every change is audited and
 * announced (`changed`), so every open list fetches again. Something with history
 * (readings, alarms, visits) is archived, never deleted.
 */
export function networkService(deps: {
  db: Knex;
  sites: SitesRepository;
  audit: ReturnType<typeof auditRepository>;
  guard: ScopeGuard;
  changed: () => void;
}) {
  const { db, sites, audit } = deps;

  async function siteOr404(actor: Person, id: number, q: Knex | Knex.Transaction = db): Promise<Site> {
    await deps.guard.site(actor, id);
    const site = await sites.byId(id, q);
    if (!site) throw notFound('Site');
    return site;
  }
  async function antennaOr404(actor: Person, siteId: number, antennaId: number, q: Knex | Knex.Transaction = db) {
    const site = await siteOr404(actor, siteId, q);
    const antenna = site.antennas.find((a) => a.id === antennaId);
    if (!antenna) throw notFound('Antenna');
    return { site, antenna };
  }
  const codeTaken = (code: string) => fieldError('code', `Site code ${code} is already used`);
  async function done<T>(result: T): Promise<T> {
    deps.changed();
    return result;
  }

  return {
    async list(actor: Person, opts: { archived: boolean }) {
      const scope = await deps.guard.scopeOf(actor);
      return (await sites.list(opts)).filter((s) => !scope || scope.has(s.id));
    },
    detail: (actor: Person, id: number) => siteOr404(actor, id),

    async createSite(actor: Person, v: SiteInput & { antennas?: AntennaInput[] }): Promise<Site> {
      const id = await db.transaction(async (trx) => {
        if (await sites.byCode(v.code, trx)) throw codeTaken(v.code);
        const id = await sites.insert(v, trx).catch((e) => {
          throw isDuplicate(e) ? codeTaken(v.code) : e;
        });
        for (const a of v.antennas ?? []) await sites.insertAntenna(id, a, trx);
        await audit.record({ personId: actor.id, action: 'site.create', subject: `site:${id}`, after: v }, trx);
        return id;
      });
      return done((await sites.byId(id))!);
    },

    async updateSite(actor: Person, id: number, patch: Partial<SiteInput>): Promise<Site> {
      await db.transaction(async (trx) => {
        const before = await siteOr404(actor, id, trx);
        if (patch.code && patch.code !== before.code && (await sites.byCode(patch.code, trx)))
          throw codeTaken(patch.code);
        const tallest = Math.max(0, ...before.antennas.filter((a) => !a.archivedAt).map((a) => a.heightM ?? 0));
        if (patch.towerHeightM !== undefined && patch.towerHeightM < tallest) {
          throw fieldError('towerHeightM', `An antenna is mounted at ${tallest} m; the tower cannot be lower`);
        }
        await sites.update(id, patch, trx).catch((e) => {
          throw isDuplicate(e) ? codeTaken(patch.code ?? '') : e;
        });
        const { antennas: _a, ...was } = before;
        await audit.record(
          {
            personId: actor.id,
            action: 'site.update',
            subject: `site:${id}`,
            before: pick(was, Object.keys(patch)),
            after: patch,
          },
          trx,
        );
      });
      return done((await sites.byId(id))!);
    },

    /** A site still watched by live controllers cannot go: move or decommission them first. */
    async archiveSite(actor: Person, id: number, reason: string): Promise<Site> {
      await db.transaction(async (trx) => {
        const site = await siteOr404(actor, id, trx);
        if (site.archivedAt) throw new AppError('conflict', 'The site is already archived');
        const use = await sites.usage({ siteId: id }, trx);
        if (use.liveControllers > 0) {
          throw new AppError(
            'conflict',
            `${use.liveControllers} controller(s) still report from this site: move or decommission them first`,
          );
        }
        await sites.setArchived(id, new Date(), trx);
        await audit.record(
          { personId: actor.id, action: 'site.archive', subject: `site:${id}`, after: { reason } },
          trx,
        );
      });
      return done((await sites.byId(id))!);
    },
    async restoreSite(actor: Person, id: number): Promise<Site> {
      await db.transaction(async (trx) => {
        const site = await siteOr404(actor, id, trx);
        if (!site.archivedAt) throw new AppError('conflict', 'The site is not archived');
        await sites.setArchived(id, null, trx);
        await audit.record({ personId: actor.id, action: 'site.restore', subject: `site:${id}` }, trx);
      });
      return done((await sites.byId(id))!);
    },
    /** Only a site nothing ever hung on (a mistyped entry) is deleted; anything else is archived. */
    async deleteSite(actor: Person, id: number): Promise<void> {
      await db.transaction(async (trx) => {
        const site = await siteOr404(actor, id, trx);
        const use = await sites.usage({ siteId: id }, trx);
        if (use.history > 0)
          throw new AppError(
            'conflict',
            'This site has readings, alarms or visits: archive it instead, so its history stays',
          );
        await trx('antennas').where({ site_id: id }).delete();
        await trx('site_on_call').where({ site_id: id }).delete();
        await sites.remove(id, trx);
        const { antennas: _a, ...was } = site;
        await audit.record({ personId: actor.id, action: 'site.delete', subject: `site:${id}`, before: was }, trx);
      });
      deps.changed();
    },

    async addAntenna(actor: Person, siteId: number, v: AntennaInput) {
      const id = await db.transaction(async (trx) => {
        const site = await siteOr404(actor, siteId, trx);
        if (site.archivedAt) throw new AppError('conflict', 'The site is archived: restore it first');
        if (v.heightM != null && v.heightM > site.towerHeightM)
          throw fieldError('heightM', `Higher than the ${site.towerHeightM} m tower`);
        const id = await sites.insertAntenna(siteId, v, trx);
        await audit.record(
          { personId: actor.id, action: 'antenna.create', subject: `antenna:${id}`, after: { siteId, ...v } },
          trx,
        );
        return id;
      });
      return done((await sites.antennaById(id))!);
    },
    async updateAntenna(actor: Person, siteId: number, antennaId: number, patch: Partial<AntennaInput>) {
      await db.transaction(async (trx) => {
        const { site, antenna } = await antennaOr404(actor, siteId, antennaId, trx);
        const next = { ...antenna, ...patch };
        if (next.heightM != null && next.heightM > site.towerHeightM)
          throw fieldError('heightM', `Higher than the ${site.towerHeightM} m tower`);
        const rated = next.protection === 'heater' || next.protection === 'blanket';
        if (rated && next.heaterKw == null) throw fieldError('heaterKw', 'Give the heater rating in kW');
        if (!rated && next.heaterKw != null) {
          if (patch.heaterKw !== undefined)
            throw fieldError('heaterKw', `A ${next.protection} has no electric rating here`);
          patch = { ...patch, heaterKw: null };
        }
        await sites.updateAntenna(antennaId, patch, trx);
        await audit.record(
          {
            personId: actor.id,
            action: 'antenna.update',
            subject: `antenna:${antennaId}`,
            before: pick(antenna, Object.keys(patch)),
            after: patch,
          },
          trx,
        );
      });
      return done((await sites.antennaById(antennaId))!);
    },
    async archiveAntenna(actor: Person, siteId: number, antennaId: number, reason: string) {
      await db.transaction(async (trx) => {
        const { antenna } = await antennaOr404(actor, siteId, antennaId, trx);
        if (antenna.archivedAt) throw new AppError('conflict', 'The antenna is already archived');
        const use = await sites.usage({ antennaId }, trx);
        if (use.liveControllers > 0)
          throw new AppError(
            'conflict',
            `${use.liveControllers} controller(s) still watch this antenna: move or decommission them first`,
          );
        await sites.setAntennaArchived(antennaId, new Date(), trx);
        await audit.record(
          { personId: actor.id, action: 'antenna.archive', subject: `antenna:${antennaId}`, after: { reason } },
          trx,
        );
      });
      return done((await sites.antennaById(antennaId))!);
    },
    async deleteAntenna(actor: Person, siteId: number, antennaId: number) {
      await db.transaction(async (trx) => {
        const { antenna } = await antennaOr404(actor, siteId, antennaId, trx);
        const use = await sites.usage({ antennaId }, trx);
        if (use.history > 0)
          throw new AppError(
            'conflict',
            'A controller has watched this antenna: archive it instead, so its history stays',
          );
        await sites.removeAntenna(antennaId, trx);
        await audit.record(
          { personId: actor.id, action: 'antenna.delete', subject: `antenna:${antennaId}`, before: antenna },
          trx,
        );
      });
      deps.changed();
    },

    /** regions of the sites the person sees, with how many of them each has */
    async regions(actor: Person) {
      const scope = await deps.guard.scopeOf(actor);
      return sites.regions(scope ? [...scope] : null);
    },
    async renameRegion(actor: Person, from: string, to: string) {
      const n = await db.transaction(async (trx) => {
        const n = await sites.renameRegion(from, to, trx);
        if (!n) throw notFound('Region');
        await audit.record(
          {
            personId: actor.id,
            action: 'region.rename',
            subject: `region:${from}`,
            before: { name: from },
            after: { name: to },
          },
          trx,
        );
        return n;
      });
      return done({ name: to, sites: n });
    },
  };
}
export type NetworkService = ReturnType<typeof networkService>;

function pick<T extends object>(o: T, keys: string[]): Partial<T> {
  return Object.fromEntries(
    keys.filter((k) => k in o).map((k) => [k, (o as Record<string, unknown>)[k]]),
  ) as Partial<T>;
}
