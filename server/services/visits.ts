import type { Knex } from 'knex';

import { AppError, notFound } from '@/server/errors';
import type { auditRepository } from '@/server/repositories/people';
import { type Person, safetyChecklistItems } from '@/telemetry/api';

import type { HazardService } from './hazard';
import type { ScopeGuard } from './scope';

/**
 * Site check-in and check-out. When ice is present or shedding is likely, check-in
 * needs every item of the safety checklist, and master control is told who is on site.
 */
export function visitsService(deps: {
  db: Knex;
  audit: ReturnType<typeof auditRepository>;
  guard: ScopeGuard;
  hazard: HazardService;
  announce: (m: { siteId: number; visitId: number; person: string; state: 'on-site' | 'left' }) => void;
}) {
  const { db } = deps;

  const hazard = (siteId: number) => deps.hazard.forSite(siteId);

  return {
    async checkIn(
      actor: Person,
      siteId: number,
      body: {
        checklist?: Partial<Record<keyof typeof safetyChecklistItems, boolean>>;
        note?: string;
        stayMinutes?: number;
      },
    ) {
      await deps.guard.site(actor, siteId);
      const h = await hazard(siteId);
      const missing = (Object.keys(safetyChecklistItems) as (keyof typeof safetyChecklistItems)[]).filter(
        (k) => body.checklist?.[k] !== true,
      );
      if (h.present && missing.length) {
        throw new AppError(
          'conflict',
          'Ice may fall at this site: confirm every item of the safety checklist to check in',
          { hazard: h, missing },
        );
      }
      const open = await db('site_visits')
        .where({ site_id: siteId, person_id: actor.id })
        .whereNull('checked_out_at')
        .first();
      if (open) throw new AppError('conflict', 'You are already checked in here');
      const now = new Date();
      const [id] = await db('site_visits').insert({
        site_id: siteId,
        person_id: actor.id,
        checked_in_at: now,
        expected_out_at: body.stayMinutes ? new Date(now.getTime() + body.stayMinutes * 60_000) : null,
        hazard: h.present,
        hazard_radius_m: h.radiusM,
        checklist: body.checklist ? JSON.stringify(body.checklist) : null,
        note: body.note ?? null,
      });
      await deps.audit.record({
        personId: actor.id,
        action: 'visit.check-in',
        subject: `site:${siteId}`,
        after: { visit: id, hazard: h.present, checklist: body.checklist ?? null },
      });
      deps.announce({ siteId, visitId: id, person: actor.name, state: 'on-site' });
      return { id, hazard: h };
    },
    async checkOut(actor: Person, visitId: number) {
      await deps.guard.visit(actor, visitId);
      const v = await db('site_visits').where({ id: visitId }).first();
      if (!v) throw notFound('Visit');
      if (v.person_id !== actor.id && actor.role !== 'admin' && actor.role !== 'engineer')
        throw new AppError('forbidden', 'Only the person on site checks out');
      if (v.checked_out_at) throw new AppError('conflict', 'Already checked out');
      await db('site_visits').where({ id: visitId }).update({ checked_out_at: new Date() });
      await deps.audit.record({
        personId: actor.id,
        action: 'visit.check-out',
        subject: `site:${v.site_id}`,
        after: { visit: visitId },
      });
      deps.announce({ siteId: v.site_id, visitId, person: actor.name, state: 'left' });
    },
    async list(actor: Person, siteId: number | null, openOnly: boolean) {
      const sites = await deps.guard.siteFilter(actor, siteId);
      const q = db('site_visits as v')
        .join('people as p', 'p.id', 'v.person_id')
        .join('sites as s', 's.id', 'v.site_id')
        .orderBy('v.checked_in_at', 'desc')
        .limit(200)
        .select(
          'v.id',
          'v.site_id as siteId',
          's.name as site',
          'p.id as personId',
          'p.name as person',
          'v.checked_in_at as checkedInAt',
          'v.checked_out_at as checkedOutAt',
          'v.expected_out_at as expectedOutAt',
          'v.hazard',
          'v.hazard_radius_m as hazardRadiusM',
          'v.note',
        );
      if (sites) q.whereIn('v.site_id', sites);
      if (openOnly) q.whereNull('v.checked_out_at');
      return (await q).map((v) => ({ ...v, hazard: Boolean(v.hazard) }));
    },
  };
}
export type VisitsService = ReturnType<typeof visitsService>;
