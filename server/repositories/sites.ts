import type { Knex } from 'knex';

import type { Antenna, AntennaInput, Placement, Site, SiteInput } from '@/telemetry/api';

type SiteRow = {
  id: number;
  code: string;
  name: string;
  region: string;
  latitude: number;
  longitude: number;
  elevation_m: number;
  tower_height_m: number;
  power_source: Site['powerSource'];
  battery_kwh: number | null;
  pv_kwp: number | null;
  time_zone: string;
  archived_at: Date | null;
};
type AntennaRow = {
  id: number;
  site_id: number;
  name: string;
  service: Antenna['service'];
  protection: Antenna['protection'];
  heater_kw: number | null;
  heater_phases: number;
  height_m: number | null;
  feed_loss_db: number | null;
  archived_at: Date | null;
};

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);

const toAntenna = (a: AntennaRow): Antenna => ({
  id: a.id,
  siteId: a.site_id,
  name: a.name,
  service: a.service,
  protection: a.protection,
  heaterKw: a.heater_kw,
  heaterPhases: a.heater_phases === 3 ? 3 : 1,
  heightM: a.height_m,
  feedLossDb: a.feed_loss_db,
  archivedAt: iso(a.archived_at),
});
const toSite = (r: SiteRow, antennas: Antenna[]): Site => ({
  id: r.id,
  code: r.code,
  name: r.name,
  region: r.region,
  latitude: r.latitude,
  longitude: r.longitude,
  elevationM: r.elevation_m,
  towerHeightM: r.tower_height_m,
  powerSource: r.power_source,
  batteryKwh: r.battery_kwh,
  pvKwp: r.pv_kwp,
  timeZone: r.time_zone,
  archivedAt: iso(r.archived_at),
  antennas,
});

/** Column names of what people enter; a patch writes only the fields it names. */
export function siteColumns(v: Partial<SiteInput>): Partial<SiteRow> {
  const out: Partial<SiteRow> = {};
  if (v.code !== undefined) out.code = v.code;
  if (v.name !== undefined) out.name = v.name;
  if (v.region !== undefined) out.region = v.region;
  if (v.latitude !== undefined) out.latitude = v.latitude;
  if (v.longitude !== undefined) out.longitude = v.longitude;
  if (v.elevationM !== undefined) out.elevation_m = v.elevationM;
  if (v.towerHeightM !== undefined) out.tower_height_m = v.towerHeightM;
  if (v.powerSource !== undefined) out.power_source = v.powerSource;
  if (v.batteryKwh !== undefined) out.battery_kwh = v.batteryKwh;
  if (v.pvKwp !== undefined) out.pv_kwp = v.pvKwp;
  if (v.timeZone !== undefined) out.time_zone = v.timeZone;
  return out;
}
export function antennaColumns(v: Partial<AntennaInput>): Partial<AntennaRow> {
  const out: Partial<AntennaRow> = {};
  if (v.name !== undefined) out.name = v.name;
  if (v.service !== undefined) out.service = v.service;
  if (v.protection !== undefined) out.protection = v.protection;
  if (v.heaterKw !== undefined) out.heater_kw = v.heaterKw;
  if (v.heaterPhases !== undefined) out.heater_phases = v.heaterPhases;
  if (v.heightM !== undefined) out.height_m = v.heightM;
  if (v.feedLossDb !== undefined) out.feed_loss_db = v.feedLossDb;
  return out;
}

export function sitesRepository(db: Knex) {
  async function antennasBySite(
    q: Knex | Knex.Transaction,
    siteIds: number[],
    archived: boolean,
  ): Promise<Map<number, Antenna[]>> {
    const query = q<AntennaRow>('antennas').whereIn('site_id', siteIds).orderBy('id');
    if (!archived) query.whereNull('archived_at');
    const rows = siteIds.length ? await query : [];
    const map = new Map<number, Antenna[]>();
    for (const a of rows) {
      const list = map.get(a.site_id) ?? [];
      list.push(toAntenna(a));
      map.set(a.site_id, list);
    }
    return map;
  }
  return {
    /** Sites in use, by region and name; archived ones only when asked for. */
    async list(opts: { archived?: boolean } = {}): Promise<Site[]> {
      const q = db<SiteRow>('sites').orderBy(['region', 'name']);
      if (!opts.archived) q.whereNull('archived_at');
      const rows = await q;
      const antennas = await antennasBySite(
        db,
        rows.map((r) => r.id),
        Boolean(opts.archived),
      );
      return rows.map((r) => toSite(r, antennas.get(r.id) ?? []));
    },
    /** One site, archived or not, with every antenna it ever had (archived ones marked). */
    async byId(id: number, q: Knex | Knex.Transaction = db): Promise<Site | null> {
      const r = await q<SiteRow>('sites').where({ id }).first();
      if (!r) return null;
      return toSite(r, (await antennasBySite(q, [id], true)).get(id) ?? []);
    },
    byCode: (code: string, q: Knex | Knex.Transaction = db) => q<SiteRow>('sites').where({ code }).first(),
    async insert(v: SiteInput, q: Knex | Knex.Transaction = db): Promise<number> {
      const [id] = await q('sites').insert(siteColumns(v));
      return id;
    },
    update: (id: number, v: Partial<SiteInput>, q: Knex | Knex.Transaction = db) =>
      q('sites').where({ id }).update(siteColumns(v)),
    setArchived: (id: number, at: Date | null, q: Knex | Knex.Transaction = db) =>
      q('sites').where({ id }).update({ archived_at: at }),
    remove: (id: number, q: Knex | Knex.Transaction = db) => q('sites').where({ id }).delete(),
    async antennaById(id: number, q: Knex | Knex.Transaction = db): Promise<Antenna | null> {
      const a = await q<AntennaRow>('antennas').where({ id }).first();
      return a ? toAntenna(a) : null;
    },
    async insertAntenna(siteId: number, v: AntennaInput, q: Knex | Knex.Transaction = db): Promise<number> {
      const [id] = await q('antennas').insert({ ...antennaColumns(v), site_id: siteId });
      return id;
    },
    updateAntenna: (id: number, v: Partial<AntennaInput>, q: Knex | Knex.Transaction = db) =>
      q('antennas').where({ id }).update(antennaColumns(v)),
    setAntennaArchived: (id: number, at: Date | null, q: Knex | Knex.Transaction = db) =>
      q('antennas').where({ id }).update({ archived_at: at }),
    removeAntenna: (id: number, q: Knex | Knex.Transaction = db) => q('antennas').where({ id }).delete(),
    /** What hangs on a site or antenna: controllers placed there now or before, alarms, visits. */
    async usage(where: { siteId?: number; antennaId?: number }, q: Knex | Knex.Transaction = db) {
      const count = async (table: string, column: string, value: number) =>
        Number((await q(table).where(column, value).count<{ n: number }[]>({ n: '*' }))[0].n);
      if (where.antennaId) {
        const id = where.antennaId;
        const live = Number(
          (
            await q('controllers').where({ antenna_id: id, decommissioned: false }).count<{ n: number }[]>({ n: '*' })
          )[0].n,
        );
        return {
          liveControllers: live,
          history:
            (await count('controller_placements', 'antenna_id', id)) + (await count('controllers', 'antenna_id', id)),
        };
      }
      const id = where.siteId!;
      const live = Number(
        (await q('controllers').where({ site_id: id, decommissioned: false }).count<{ n: number }[]>({ n: '*' }))[0].n,
      );
      const history =
        (await count('controller_placements', 'site_id', id)) +
        (await count('controllers', 'site_id', id)) +
        (await count('alarms', 'site_id', id)) +
        (await count('site_visits', 'site_id', id));
      return { liveControllers: live, history };
    },
    async regions(siteIds: number[] | null = null) {
      const q = db('sites')
        .whereNull('archived_at')
        .groupBy('region')
        .orderBy('region')
        .select('region', db.raw('COUNT(*) AS sites'));
      if (siteIds) q.whereIn('id', siteIds);
      return ((await q) as { region: string; sites: number }[]).map((r) => ({
        name: r.region,
        sites: Number(r.sites),
      }));
    },
    renameRegion: (from: string, to: string, q: Knex | Knex.Transaction = db) =>
      q('sites').where({ region: from }).update({ region: to }),
    /** Where a controller has been, newest first. */
    async placements(controllerId: number): Promise<Placement[]> {
      const rows = await db('controller_placements as p')
        .join('sites as s', 's.id', 'p.site_id')
        .leftJoin('antennas as a', 'a.id', 'p.antenna_id')
        .leftJoin('people as m', 'm.id', 'p.moved_by')
        .where('p.controller_id', controllerId)
        .orderBy('p.id', 'desc')
        .select(
          'p.site_id',
          's.name as site',
          'p.antenna_id',
          'a.name as antenna',
          'p.from_at',
          'p.to_at',
          'm.name as moved_by',
        );
      return rows.map((r) => ({
        siteId: r.site_id,
        site: r.site,
        antennaId: r.antenna_id,
        antenna: r.antenna,
        from: iso(r.from_at),
        to: iso(r.to_at),
        movedBy: r.moved_by ?? null,
      }));
    },
    /** Controllers that were at a site before and have moved on, with when they were there. */
    async formerControllers(siteId: number) {
      const rows = await db('controller_placements as p')
        .join('controllers as c', 'c.id', 'p.controller_id')
        .where('p.site_id', siteId)
        .whereNotNull('p.to_at')
        .whereNot('c.site_id', siteId)
        .orderBy('p.to_at', 'desc')
        .select('c.id', 'c.serial', 'c.kind', 'p.antenna_id', 'p.from_at', 'p.to_at');
      return rows.map((r) => ({
        id: r.id as number,
        serial: r.serial as string,
        kind: r.kind as string,
        antennaId: r.antenna_id as number | null,
        from: iso(r.from_at),
        to: iso(r.to_at),
      }));
    },
  };
}
export type SitesRepository = ReturnType<typeof sitesRepository>;
