import type { Knex } from 'knex';

import { alarmsRepository } from '@/server/repositories/alarms';
import type { ControllersRepository } from '@/server/repositories/controllers';
import { boardQueries, type ReadingRow } from '@/server/repositories/readings';
import { effectiveRule } from '@/telemetry/alarms/rules';
import type { BoardSite } from '@/telemetry/board';
import type { LiveReading } from '@/telemetry/live';

import { controllerStatus } from './controllers';

export const trendMinutes = 15;

export function toLive(r: ReadingRow, siteId: number): LiveReading {
  return {
    controllerId: r.controller_id,
    siteId,
    ts: new Date(r.ts).toISOString(),
    vswr: r.vswr,
    forwardW: r.forward_w,
    reflectedW: r.reflected_w,
    airTempC: r.air_temp_c,
    humidityPct: r.humidity_pct,
    moisture: r.moisture == null ? null : Boolean(r.moisture),
    heaterOn: Boolean(r.heater_on),
    heaterMode: r.heater_mode,
    heaterCurrentA: r.heater_current_a,
    supplyVolts: r.supply_volts,
    batteryPct: r.battery_pct,
  };
}

/** Everything a Board tile needs at first paint; /live keeps it current after. */
export function boardService(db: Knex, controllers: ControllersRepository) {
  const q = boardQueries(db);
  const alarms = alarmsRepository(db);
  return {
    async snapshot(): Promise<BoardSite[]> {
      const now = Date.now();
      const [rows, rules] = await Promise.all([controllers.list(), alarms.rules()]);
      const bySite = new Map<number, BoardSite>();
      const live = rows.filter((c) => !c.decommissioned);
      const ids = live.map((c) => c.id);
      // two queries for the whole Board, however many controllers
      const [latestOf, trendOf] = await Promise.all([
        q.latest(ids),
        q.trend(ids, new Date(now - trendMinutes * 60_000), 20),
      ]);
      for (const c of live) {
        const latest = latestOf.get(c.id);
        const trend = trendOf.get(c.id) ?? [];
        const site = bySite.get(c.site_id) ?? { siteId: c.site_id, controllers: [] };
        const place = { controllerId: c.id, antennaId: c.antenna_id, siteId: c.site_id };
        site.controllers.push({
          limits: {
            warning: effectiveRule(rules, 'vswr-warning', place)?.params.limit ?? null,
            trip: effectiveRule(rules, 'vswr-trip', place)?.params.limit ?? null,
          },
          id: c.id,
          serial: c.serial,
          kind: c.kind,
          intervalS: c.interval_s,
          antennaId: c.antenna_id,
          status: controllerStatus(c, now),
          latest: latest ? toLive(latest, c.site_id) : null,
          trend: trend.map((t) => ({ t: new Date(t.ts).getTime(), v: t.vswr == null ? null : Number(t.vswr) })),
        });
        bySite.set(c.site_id, site);
      }
      for (const s of bySite.values()) s.controllers.sort((a, b) => a.serial.localeCompare(b.serial));
      return [...bySite.values()];
    },
  };
}
