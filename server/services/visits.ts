import type { Knex } from 'knex';
import { safetyChecklistItems, type Person } from '../../telemetry/api';
import { classifyIcing } from '../../telemetry/math/icing';
import { hazardRadius, screeningWindMs } from '../../telemetry/math/ice-fall';
import { AppError, notFound } from '../errors';
import type { auditRepository } from '../repositories/people';
import type { ScopeGuard } from './scope';

const sheddingHours = 6;

/**
 * Site check-in and check-out. When ice is present or shedding is likely, check-in
 * needs every item of the safety checklist, and master control is told who is on site.
 */
export function visitsService(deps: { db: Knex; audit: ReturnType<typeof auditRepository>; guard: ScopeGuard; announce: (m: { siteId: number; visitId: number; person: string; state: 'on-site' | 'left' }) => void }) {
  const { db } = deps;

  async function hazard(siteId: number) {
    const site = await db('sites').where({ id: siteId }).first();
    if (!site) throw notFound('Site');
    const latest = await db('readings as r').join('controllers as c', 'c.id', 'r.controller_id').where('c.site_id', siteId).andWhere('r.ts', '>', new Date(Date.now() - 3_600_000))
      .orderBy('r.ts', 'desc').limit(20).select('r.air_temp_c', 'r.humidity_pct', 'r.moisture');
    const icing = latest.some((r) => ['active', 'likely'].includes(classifyIcing({ airTempC: r.air_temp_c, humidityPct: r.humidity_pct, moisture: r.moisture == null ? null : Boolean(r.moisture) }).state));
    const shedding = Boolean(await db('alarms').where({ site_id: siteId, kind: 'shedding-advisory' }).whereNull('closed_at').first())
      || Boolean(await db('readings as r').join('controllers as c', 'c.id', 'r.controller_id').where('c.site_id', siteId).andWhere('r.ts', '>', new Date(Date.now() - sheddingHours * 3_600_000)).andWhere('r.moisture', true).andWhere('r.air_temp_c', '<=', 0).first('r.id')
        && latest.some((r) => r.air_temp_c > 0));
    const present = icing || shedding;
    const hz = present ? hazardRadius({ heightM: site.tower_height_m, windMs: screeningWindMs }) : null;
    return { present, icing, shedding, radiusM: hz?.radiusM ?? null, towerHeightM: site.tower_height_m as number, windMs: screeningWindMs, assumptions: hz?.assumptions ?? [] };
  }

  return {
    async hazard(actor: Person, siteId: number) {
      await deps.guard.site(actor, siteId);
      return hazard(siteId);
    },
    async checkIn(actor: Person, siteId: number, body: { checklist?: Partial<Record<keyof typeof safetyChecklistItems, boolean>>; note?: string }) {
      await deps.guard.site(actor, siteId);
      const h = await hazard(siteId);
      const missing = (Object.keys(safetyChecklistItems) as (keyof typeof safetyChecklistItems)[]).filter((k) => body.checklist?.[k] !== true);
      if (h.present && missing.length) {
        throw new AppError('conflict', 'Ice may fall at this site: confirm every item of the safety checklist to check in', { hazard: h, missing });
      }
      const open = await db('site_visits').where({ site_id: siteId, person_id: actor.id }).whereNull('checked_out_at').first();
      if (open) throw new AppError('conflict', 'You are already checked in here');
      const [id] = await db('site_visits').insert({
        site_id: siteId, person_id: actor.id, checked_in_at: new Date(), hazard: h.present, hazard_radius_m: h.radiusM,
        checklist: body.checklist ? JSON.stringify(body.checklist) : null, note: body.note ?? null,
      });
      await deps.audit.record({ personId: actor.id, action: 'visit.check-in', subject: `site:${siteId}`, after: { visit: id, hazard: h.present, checklist: body.checklist ?? null } });
      deps.announce({ siteId, visitId: id, person: actor.name, state: 'on-site' });
      return { id, hazard: h };
    },
    async checkOut(actor: Person, visitId: number) {
      await deps.guard.visit(actor, visitId);
      const v = await db('site_visits').where({ id: visitId }).first();
      if (!v) throw notFound('Visit');
      if (v.person_id !== actor.id && actor.role !== 'admin' && actor.role !== 'engineer') throw new AppError('forbidden', 'Only the person on site checks out');
      if (v.checked_out_at) throw new AppError('conflict', 'Already checked out');
      await db('site_visits').where({ id: visitId }).update({ checked_out_at: new Date() });
      await deps.audit.record({ personId: actor.id, action: 'visit.check-out', subject: `site:${v.site_id}`, after: { visit: visitId } });
      deps.announce({ siteId: v.site_id, visitId, person: actor.name, state: 'left' });
    },
    async list(actor: Person, siteId: number | null, openOnly: boolean) {
      const sites = await deps.guard.siteFilter(actor, siteId);
      const q = db('site_visits as v').join('people as p', 'p.id', 'v.person_id').join('sites as s', 's.id', 'v.site_id').orderBy('v.checked_in_at', 'desc').limit(200)
        .select('v.id', 'v.site_id as siteId', 's.name as site', 'p.id as personId', 'p.name as person', 'v.checked_in_at as checkedInAt', 'v.checked_out_at as checkedOutAt', 'v.hazard', 'v.hazard_radius_m as hazardRadiusM', 'v.note');
      if (sites) q.whereIn('v.site_id', sites);
      if (openOnly) q.whereNull('v.checked_out_at');
      return (await q).map((v) => ({ ...v, hazard: Boolean(v.hazard) }));
    },
  };
}
export type VisitsService = ReturnType<typeof visitsService>;
