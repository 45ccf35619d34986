import type { Knex } from 'knex';
import type { Person } from '../../telemetry/api';

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
