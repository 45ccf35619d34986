import type { Knex } from 'knex';

import {
  type HeaterEnergy,
  heaterEnergy,
  heaterEnergyFromBuckets,
  type HeaterSpec,
  type PowerBucket,
  type PowerSample,
} from '@/telemetry/math/energy';
import { localDay } from '@/telemetry/time';

/** Up to this wide a window is integrated from the raw samples; wider ones from the minute rollups. */
export const rawEnergyWindowMs = 48 * 3_600_000;

type Heater = { id: number; intervalS: number; spec: HeaterSpec };

const sqlBucket = (db: Knex, bucketS: number) => [
  db.raw('FLOOR(UNIX_TIMESTAMP(r.minute) / ?) AS bucket', [bucketS]),
  db.raw('COUNT(*) AS minutes'),
  db.raw('SUM(r.heater_on_n / r.n) * 60 AS on_s'),
  db.raw('SUM(CASE WHEN r.vi_n > 0 THEN r.vi_sum / r.vi_n * 60 ELSE 0 END) AS vi_ws'),
  db.raw('SUM(CASE WHEN r.vi_n = 0 THEN r.heater_on_n / r.n * 60 ELSE 0 END) AS unmeasured_on_s'),
];
const toBucket = (row: Record<string, unknown>, bucketS: number): PowerBucket => ({
  startMs: Number(row.bucket) * bucketS * 1000,
  minutes: Number(row.minutes),
  onS: Number(row.on_s),
  viWs: Number(row.vi_ws),
  unmeasuredOnS: Number(row.unmeasured_on_s),
});

/**
 * Heater energy for the Site screen, the storm report and the Energy report alike:
 * one arithmetic (telemetry/math/energy.ts), measured where volts and amps were
 * reported, nameplate × time on where not, labelled by its basis.
 */
export function energyService(db: Knex) {
  async function heaters(controllerIds: number[]): Promise<Map<number, Heater>> {
    if (!controllerIds.length) return new Map();
    const rows = await db('controllers as c')
      .leftJoin('antennas as a', 'a.id', 'c.antenna_id')
      .whereIn('c.id', controllerIds)
      .select('c.id', 'c.interval_s', 'c.kind', 'a.heater_kw', 'a.heater_phases');
    return new Map(
      rows
        .filter((r) => r.kind !== 'radome-sensor')
        .map((r) => [
          r.id as number,
          {
            id: r.id as number,
            intervalS: r.interval_s as number,
            spec: { ratedKw: r.heater_kw ?? null, phases: r.heater_phases === 3 ? 3 : 1 } as HeaterSpec,
          },
        ]),
    );
  }

  async function samples(ids: number[], from: Date, to: Date): Promise<Map<number, PowerSample[]>> {
    const out = new Map<number, PowerSample[]>(ids.map((id) => [id, []]));
    if (!ids.length) return out;
    const rows = await db('readings')
      .whereIn('controller_id', ids)
      .andWhere('ts', '>=', from)
      .andWhere('ts', '<', to)
      .orderBy(['controller_id', 'ts'])
      .select('controller_id', 'ts', 'heater_on', 'heater_current_a', 'supply_volts');
    for (const r of rows) {
      out.get(r.controller_id)!.push({
        tMs: new Date(r.ts).getTime(),
        on: Boolean(r.heater_on),
        currentA: r.heater_current_a,
        volts: r.supply_volts,
      });
    }
    return out;
  }

  /** Energy of each heater controller over one window (sensor-only controllers have none). */
  async function windows(controllerIds: number[], from: Date, to: Date): Promise<Map<number, HeaterEnergy>> {
    const hs = await heaters(controllerIds);
    const ids = [...hs.keys()];
    const out = new Map<number, HeaterEnergy>();
    if (to.getTime() - from.getTime() <= rawEnergyWindowMs) {
      const s = await samples(ids, from, to);
      for (const h of hs.values()) out.set(h.id, heaterEnergy(s.get(h.id) ?? [], h.spec, { intervalS: h.intervalS }));
      return out;
    }
    const bucketS = 3600;
    const rows = ids.length
      ? await db('rollups_minute as r')
          .whereIn('r.controller_id', ids)
          .andWhere('r.minute', '>=', from)
          .andWhere('r.minute', '<', to)
          .groupBy('r.controller_id', 'bucket')
          .orderBy(['r.controller_id', 'bucket'])
          .select('r.controller_id', ...sqlBucket(db, bucketS))
      : [];
    for (const h of hs.values()) {
      out.set(
        h.id,
        heaterEnergyFromBuckets(
          rows.filter((r) => r.controller_id === h.id).map((r) => toBucket(r, bucketS)),
          h.spec,
          bucketS,
        ),
      );
    }
    return out;
  }

  return {
    window: async (controllerId: number, from: Date, to: Date) =>
      (await windows([controllerId], from, to)).get(controllerId) ?? null,
    windows,
    /**
     * Per heater, site and site-local day: from samples for windows up to 48 h (an
     * interval crossing midnight counts on the day it began), from rollups beyond.
     * A moved controller's time counts at the site where it was (its placements).
     */
    async daily(from: Date, to: Date) {
      const placements = await db('controller_placements as p')
        .join('sites as s', 's.id', 'p.site_id')
        .join('controllers as c', 'c.id', 'p.controller_id')
        .leftJoin('antennas as a', 'a.id', 'p.antenna_id')
        .whereNot('c.kind', 'radome-sensor')
        .whereRaw('(p.to_at IS NULL OR p.to_at > ?)', [from])
        .whereRaw('(p.from_at IS NULL OR p.from_at < ?)', [to])
        .select(
          'p.controller_id',
          'p.site_id',
          's.name',
          's.time_zone',
          'p.from_at',
          'p.to_at',
          'c.interval_s',
          'a.heater_kw',
          'a.heater_phases',
        );
      const out: {
        controllerId: number;
        siteId: number;
        site: string;
        timeZone: string;
        day: string;
        energy: HeaterEnergy;
      }[] = [];
      const ids = [...new Set(placements.map((p) => p.controller_id as number))];
      const raw = to.getTime() - from.getTime() <= rawEnergyWindowMs;
      const bucketS = 900;
      const s = raw ? await samples(ids, from, to) : new Map<number, PowerSample[]>();
      const rows =
        raw || !ids.length
          ? []
          : await db('rollups_minute as r')
              .whereIn('r.controller_id', ids)
              .andWhere('r.minute', '>=', from)
              .andWhere('r.minute', '<', to)
              .groupBy('r.controller_id', 'bucket')
              .orderBy(['r.controller_id', 'bucket'])
              .select('r.controller_id', ...sqlBucket(db, bucketS));
      for (const p of placements) {
        const start = p.from_at ? new Date(p.from_at).getTime() : -Infinity;
        const end = p.to_at ? new Date(p.to_at).getTime() : Infinity;
        const spec: HeaterSpec = { ratedKw: p.heater_kw ?? null, phases: p.heater_phases === 3 ? 3 : 1 };
        const zone = p.time_zone as string;
        const byDay = new Map<string, { samples: PowerSample[]; buckets: PowerBucket[] }>();
        const dayOf = (t: number) => {
          const d = localDay(t, zone);
          let v = byDay.get(d);
          if (!v) byDay.set(d, (v = { samples: [], buckets: [] }));
          return v;
        };
        if (raw) {
          const mine = (s.get(p.controller_id) ?? []).filter((x) => x.tMs >= start && x.tMs < end);
          mine.forEach((x, i) => {
            const day = dayOf(x.tMs);
            day.samples.push(x);
            // the interval that crosses into the next day is closed with the next day's first sample
            const next = mine[i + 1];
            if (next && localDay(next.tMs, zone) !== localDay(x.tMs, zone)) day.samples.push(next);
          });
        } else {
          for (const r of rows) {
            if (r.controller_id !== p.controller_id) continue;
            const b = toBucket(r, bucketS);
            if (b.startMs >= start && b.startMs < end) dayOf(b.startMs).buckets.push(b);
          }
        }
        for (const [day, v] of byDay) {
          const energy = raw
            ? heaterEnergy(v.samples, spec, { intervalS: p.interval_s })
            : heaterEnergyFromBuckets(v.buckets, spec, bucketS);
          out.push({ controllerId: p.controller_id, siteId: p.site_id, site: p.name, timeZone: zone, day, energy });
        }
      }
      return out;
    },
  };
}
export type EnergyService = ReturnType<typeof energyService>;
