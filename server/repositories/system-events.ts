import type { Knex } from 'knex';

export type SystemEventKind = 'start' | 'crash-restart' | 'database-outage' | 'stop';

/** Events of the system itself, recorded once each (never one alarm per controller). */
export function systemEventsRepository(db: Knex) {
  return {
    async record(
      kind: SystemEventKind,
      message: string,
      details: Record<string, unknown> | null = null,
      at = new Date(),
    ) {
      await db('system_events').insert({
        at,
        kind,
        message: message.slice(0, 500),
        details: details ? JSON.stringify(details) : null,
      });
    },
    async recent(limit = 20) {
      const rows = await db('system_events')
        .orderBy('id', 'desc')
        .limit(limit)
        .select('at', 'kind', 'message', 'details');
      return rows.map((r) => ({
        at: new Date(r.at).toISOString(),
        kind: r.kind as SystemEventKind,
        message: r.message as string,
        details:
          typeof r.details === 'string' ? (JSON.parse(r.details) as Record<string, unknown>) : (r.details ?? null),
      }));
    },
  };
}
export type SystemEventsRepository = ReturnType<typeof systemEventsRepository>;
