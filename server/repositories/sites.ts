import type { Knex } from 'knex';
import type { Antenna, Site } from '../../telemetry/api';

type SiteRow = {
  id: number; code: string; name: string; region: string; latitude: number; longitude: number;
  elevation_m: number; tower_height_m: number; power_source: Site['powerSource']; battery_kwh: number | null;
};

export function sitesRepository(db: Knex) {
  async function antennasBySite(siteIds: number[]): Promise<Map<number, Antenna[]>> {
    const rows = siteIds.length ? await db('antennas').whereIn('site_id', siteIds).orderBy('id') : [];
    const map = new Map<number, Antenna[]>();
    for (const a of rows) {
      const list = map.get(a.site_id) ?? [];
      list.push({ id: a.id, siteId: a.site_id, name: a.name, service: a.service, protection: a.protection, heaterKw: a.heater_kw });
      map.set(a.site_id, list);
    }
    return map;
  }
  const toSite = (r: SiteRow, antennas: Antenna[]): Site => ({
    id: r.id, code: r.code, name: r.name, region: r.region, latitude: r.latitude, longitude: r.longitude,
    elevationM: r.elevation_m, towerHeightM: r.tower_height_m, powerSource: r.power_source,
    batteryKwh: r.battery_kwh, antennas,
  });
  return {
    async list(): Promise<Site[]> {
      const rows = await db<SiteRow>('sites').orderBy(['region', 'name']);
      const antennas = await antennasBySite(rows.map((r) => r.id));
      return rows.map((r) => toSite(r, antennas.get(r.id) ?? []));
    },
    async byId(id: number): Promise<Site | null> {
      const r = await db<SiteRow>('sites').where({ id }).first();
      if (!r) return null;
      return toSite(r, (await antennasBySite([id])).get(id) ?? []);
    },
  };
}
