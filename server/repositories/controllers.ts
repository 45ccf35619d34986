import { retryOnDeadlock } from '../db/deadlock';
import type { Knex } from 'knex';

export type ControllerRow = {
  id: number; serial: string; site_id: number; antenna_id: number | null; kind: string; interval_s: number;
  forward_scale: number; reflected_scale: number; line_loss_db: number; password_hash: string; decommissioned: number | boolean;
  first_seen_at: Date | null; last_seen_at: Date | null; accepted: number | string; rejected: number | string; online: number | boolean;
  created_at: Date;
};

export function controllersRepository(db: Knex) {
  return {
    async insert(row: Omit<ControllerRow, 'id' | 'first_seen_at' | 'last_seen_at' | 'accepted' | 'rejected' | 'online' | 'created_at' | 'decommissioned'>): Promise<number> {
      const [id] = await db('controllers').insert(row);
      return id;
    },
    byId: (id: number) => db<ControllerRow>('controllers').where({ id }).first(),
    bySerial: (serial: string) => db<ControllerRow>('controllers').where({ serial }).first(),
    bySerials: (serials: string[]) => db<ControllerRow>('controllers').whereIn('serial', serials),
    list: (filter: { siteId?: number } = {}) => {
      const q = db<ControllerRow>('controllers').orderBy('serial');
      if (filter.siteId) q.where({ site_id: filter.siteId });
      return q;
    },
    update: (id: number, patch: Partial<ControllerRow>) => db('controllers').where({ id }).update(patch),
    async lastRejects(id: number, n = 10) {
      return db('controller_rejects').where({ controller_id: id }).orderBy('id', 'desc').limit(n).select('at', 'reason', 'payload');
    },
    async recordRejects(rows: { controller_id: number; at: Date; reason: string; payload: string }[]) {
      if (rows.length) await db('controller_rejects').insert(rows);
    },
    /** Adds counts and widens the seen-at range; one statement per controller in one transaction. */
    async applyCounters(items: { id: number; accepted: number; rejected: number; firstAt: Date | null; lastAt: Date | null; online?: boolean }[]) {
      if (!items.length) return;
      // rows locked in one order (by id) everywhere this runs; a deadlock victim is rolled back whole and runs again
      const ordered = [...items].sort((a, b) => a.id - b.id);
      await retryOnDeadlock(() => db.transaction(async (trx) => {
        for (const c of ordered) {
          const patch: Record<string, unknown> = {
            accepted: trx.raw('accepted + ?', [c.accepted]),
            rejected: trx.raw('rejected + ?', [c.rejected]),
          };
          if (c.firstAt) patch.first_seen_at = trx.raw('COALESCE(first_seen_at, ?)', [c.firstAt]);
          if (c.lastAt) patch.last_seen_at = trx.raw('GREATEST(COALESCE(last_seen_at, ?), ?)', [c.lastAt, c.lastAt]);
          if (c.online !== undefined) patch.online = c.online;
          await trx('controllers').where({ id: c.id }).update(patch);
        }
      }));
    },
    /** True when its alarms are out of service (the silent source carries the flag for every kind). */
    async outOfService(id: number): Promise<boolean> {
      const r = await db('alarm_sources').where('source', `silent:${id}`).first('machine');
      const m = r ? (typeof r.machine === 'string' ? JSON.parse(r.machine) : r.machine) : null;
      return Boolean(m?.outOfService);
    },
    /** Highest stored sequence of the usual boot ('') for each of several controllers. */
    async lastSeqs(ids: number[]): Promise<Map<number, number>> {
      if (!ids.length) return new Map();
      const rows = (await db('readings').whereIn('controller_id', ids).andWhere('boot', '').groupBy('controller_id')
        .select('controller_id').max({ m: 'seq' })) as { controller_id: number; m: number }[];
      return new Map(rows.map((r) => [r.controller_id, Number(r.m)]));
    },
    async lastSeq(id: number, boot: string): Promise<number | null> {
      const r = await db('readings').where({ controller_id: id, boot }).max<{ m: number | null }>({ m: 'seq' }).first();
      return r?.m ?? null;
    },
  };
}
export type ControllersRepository = ReturnType<typeof controllersRepository>;
