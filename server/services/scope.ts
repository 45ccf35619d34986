import type { Knex } from 'knex';

import { notFound } from '@/server/errors';
import type { Person } from '@/telemetry/api';

/**
 * Which sites a person sees: technicians the sites they are on call for, everyone
 * else every site (null). One rule for the REST API and the live hub.
 */
export function siteScope(db: Knex) {
  return async (person: Person): Promise<Set<number> | null> => {
    if (person.role !== 'technician') return null;
    return new Set((await db('site_on_call').where({ person_id: person.id }).pluck('site_id')) as number[]);
  };
}
export type SiteScope = ReturnType<typeof siteScope>;

/**
 * The one scope check for every lookup by id: the thing's site must be in the
 * person's scope, or it does not exist for them (404, so that ids outside the
 * scope reveal nothing). No query at all for people who see every site.
 */
export function scopeGuard(db: Knex, scopeOf: SiteScope) {
  const siteOf = (table: string, id: number, column = 'site_id') =>
    db(table)
      .where({ id })
      .first(column)
      .then((r) => (r ? (r[column] as number) : null));
  const inScope = async (person: Person, what: string, site: () => Promise<number | null>) => {
    const scope = await scopeOf(person);
    if (!scope) return;
    const siteId = await site();
    if (siteId == null || !scope.has(siteId)) throw notFound(what);
  };
  return {
    scopeOf,
    site: (p: Person, siteId: number) => inScope(p, 'Site', async () => siteId),
    controller: (p: Person, id: number) => inScope(p, 'Controller', () => siteOf('controllers', id)),
    alarm: (p: Person, id: number) => inScope(p, 'Alarm', () => siteOf('alarms', id)),
    attachment: (p: Person, id: number) =>
      inScope(p, 'Attachment', async () => {
        const r = await db('attachments as x')
          .join('alarms as a', 'a.id', 'x.alarm_id')
          .where('x.id', id)
          .first('a.site_id');
        return r ? (r.site_id as number) : null;
      }),
    visit: (p: Person, id: number) => inScope(p, 'Visit', () => siteOf('site_visits', id)),
    /** a site filter asked for must be in scope; no filter means every site in scope */
    async siteFilter(p: Person, siteId: number | null | undefined): Promise<number[] | null> {
      const scope = await scopeOf(p);
      if (!scope) return siteId ? [siteId] : null;
      if (siteId) return scope.has(siteId) ? [siteId] : [];
      return [...scope];
    },
  };
}
export type ScopeGuard = ReturnType<typeof scopeGuard>;
