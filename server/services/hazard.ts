import type { Knex } from 'knex';

import { notFound } from '@/server/errors';
import { hazardRadius, screeningWindMs } from '@/telemetry/math/ice-fall';
import { classifyIcing } from '@/telemetry/math/icing';

/** Hours after freezing wet weather during which warming means ice may shed. */
const sheddingHours = 6;

/**
 * The one falling-ice computation: whether ice is present or may shed at a site
 * now, in which words, and the screening radius. The Site screen, the check-in and
 * the wall all show this, so they say the same thing with the same radius.
 */
export function hazardService(db: Knex) {
  return {
    async forSite(siteId: number) {
      const site = await db('sites').where({ id: siteId }).first();
      if (!site) throw notFound('Site');
      const latest = await db('readings as r')
        .join('controllers as c', 'c.id', 'r.controller_id')
        .where('c.site_id', siteId)
        .andWhere('r.ts', '>', new Date(Date.now() - 3_600_000))
        .orderBy('r.ts', 'desc')
        .limit(20)
        .select('r.air_temp_c', 'r.humidity_pct', 'r.moisture');
      const icing = latest.some((r) =>
        ['active', 'likely'].includes(
          classifyIcing({
            airTempC: r.air_temp_c,
            humidityPct: r.humidity_pct,
            moisture: r.moisture == null ? null : Boolean(r.moisture),
          }).state,
        ),
      );
      const shedding =
        !icing &&
        (Boolean(
          await db('alarms').where({ site_id: siteId, kind: 'shedding-advisory' }).whereNull('closed_at').first(),
        ) ||
          (Boolean(
            await db('readings as r')
              .join('controllers as c', 'c.id', 'r.controller_id')
              .where('c.site_id', siteId)
              .andWhere('r.ts', '>', new Date(Date.now() - sheddingHours * 3_600_000))
              .andWhere('r.moisture', true)
              .andWhere('r.air_temp_c', '<=', 0)
              .first('r.id'),
          ) &&
            latest.some((r) => r.air_temp_c > 0)));
      const present = icing || shedding;
      const hz = present ? hazardRadius({ heightM: site.tower_height_m, windMs: screeningWindMs }) : null;
      return {
        present,
        icing,
        shedding,
        reason: icing
          ? 'Icing conditions now: ice is building on the tower'
          : shedding
            ? 'The site is warming after icing: ice may shed'
            : 'No icing now and none in the last few hours',
        radiusM: hz?.radiusM ?? null,
        towerHeightM: site.tower_height_m as number,
        windMs: screeningWindMs,
        assumptions: hz?.assumptions ?? [],
      };
    },
  };
}
export type HazardService = ReturnType<typeof hazardService>;
export type Hazard = Awaited<ReturnType<HazardService['forSite']>>;
