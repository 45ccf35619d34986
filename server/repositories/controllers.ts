import type { Knex } from 'knex';

import { retryOnDeadlock } from '@/server/db/deadlock';
import { isDbUnavailable } from '@/server/errors';

export type CounterUpdate = {
  id: number;
  accepted: number;
  rejected: number;
  conflicts: number;
  firstAt: Date | null;
  lastAt: Date | null;
  online?: boolean;
  boot?: string;
  skewS?: number;
};

export type ControllerRow = {
  id: number;
  serial: string;
  site_id: number;
  antenna_id: number | null;
  kind: string;
  interval_s: number;
  forward_scale: number;
  reflected_scale: number;
  line_loss_db: number;
  password_hash: string;
  decommissioned: number | boolean;
  first_seen_at: Date | null;
  last_seen_at: Date | null;
  accepted: number | string;
  rejected: number | string;
  online: number | boolean;
  created_at: Date;
  boot: string | null;
  clock_skew_s: number | null;
  conflicts: number | string;
};

export function controllersRepository(db: Knex) {
  return {
    async insert(
      row: Omit<
        ControllerRow,
        | 'id'
        | 'first_seen_at'
        | 'last_seen_at'
        | 'accepted'
        | 'rejected'
        | 'online'
        | 'created_at'
        | 'decommissioned'
        | 'boot'
        | 'clock_skew_s'
        | 'conflicts'
      >,
      trx?: Knex.Transaction,
    ): Promise<number> {
      const write = async (t: Knex.Transaction) => {
        const [id] = await t('controllers').insert(row);
        // placements record where a controller was; a move closes one and opens the next
        await t('controller_placements').insert({
          controller_id: id,
          site_id: row.site_id,
          antenna_id: row.antenna_id,
          from_at: null,
        });
        return id as number;
      };
      return trx ? write(trx) : db.transaction(write);
    },
    /** Closes the current placement now and opens the next one; the controller's row follows. */
    async move(
      id: number,
      to: { siteId: number; antennaId: number | null },
      personId: number,
      at: Date,
      trx: Knex.Transaction,
    ) {
      await trx('controller_placements').where({ controller_id: id }).whereNull('to_at').update({ to_at: at });
      await trx('controller_placements').insert({
        controller_id: id,
        site_id: to.siteId,
        antenna_id: to.antennaId,
        from_at: at,
        moved_by: personId,
      });
      await trx('controllers').where({ id }).update({ site_id: to.siteId, antenna_id: to.antennaId });
    },
    byId: (id: number) => db<ControllerRow>('controllers').where({ id }).first(),
    /** exact serial: the column's collation ignores case, serials do not */
    bySerial: (serial: string) =>
      db<ControllerRow>('controllers').where({ serial }).andWhereRaw('serial = BINARY ?', [serial]).first(),
    async bySerials(serials: string[]) {
      const wanted = new Set(serials);
      return (await db<ControllerRow>('controllers').whereIn('serial', serials)).filter((r) => wanted.has(r.serial));
    },
    list: (filter: { siteIds?: number[] } = {}) => {
      const q = db<ControllerRow>('controllers').orderBy('serial');
      if (filter.siteIds) q.whereIn('site_id', filter.siteIds);
      return q;
    },
    update: (id: number, patch: Partial<ControllerRow>) => db('controllers').where({ id }).update(patch),
    async lastRejects(id: number, n = 10) {
      return db('controller_rejects')
        .where({ controller_id: id })
        .orderBy('id', 'desc')
        .limit(n)
        .select('at', 'reason', 'payload');
    },
    async recordRejects(rows: { controller_id: number; at: Date; reason: string; payload: string }[]) {
      if (rows.length) await db('controller_rejects').insert(rows);
    },
    /**
     * Adds counts and moves the seen-at range; one statement per controller in one
     * transaction. Should that fail for another reason than the database being away,
     * each controller is written alone, so one bad row never stops another's.
     */
    async applyCounters(items: CounterUpdate[]): Promise<{ failed: number[] }> {
      if (!items.length) return { failed: [] };
      // rows locked in one order (by id) everywhere this runs; a deadlock victim is rolled back whole and runs again
      const ordered = [...items].sort((a, b) => a.id - b.id);
      const update = (q: Knex | Knex.Transaction, c: CounterUpdate) => {
        const patch: Record<string, unknown> = {
          accepted: q.raw('accepted + ?', [c.accepted]),
          rejected: q.raw('rejected + ?', [c.rejected]),
          conflicts: q.raw('conflicts + ?', [c.conflicts]),
        };
        if (c.firstAt) patch.first_seen_at = q.raw('COALESCE(first_seen_at, ?)', [c.firstAt]);
        if (c.lastAt) patch.last_seen_at = q.raw('GREATEST(COALESCE(last_seen_at, ?), ?)', [c.lastAt, c.lastAt]);
        if (c.online !== undefined) patch.online = c.online;
        if (c.boot !== undefined) patch.boot = c.boot;
        if (c.skewS !== undefined) patch.clock_skew_s = Math.max(-1e9, Math.min(1e9, c.skewS));
        return q('controllers').where({ id: c.id }).update(patch);
      };
      try {
        await retryOnDeadlock(() =>
          db.transaction(async (trx) => {
            for (const c of ordered) await update(trx, c);
          }),
        );
        return { failed: [] };
      } catch (err) {
        if (isDbUnavailable(err)) throw err;
        const failed: number[] = [];
        for (const c of ordered) await retryOnDeadlock(() => update(db, c)).catch(() => failed.push(c.id));
        return { failed };
      }
    },
    /** True when its alarms are out of service (the silent source carries the flag for every kind). */
    async outOfService(id: number): Promise<boolean> {
      const r = await db('alarm_sources').where('source', `silent:${id}`).first('machine');
      const m = r ? (typeof r.machine === 'string' ? JSON.parse(r.machine) : r.machine) : null;
      return Boolean(m?.outOfService);
    },
    /** Highest stored sequence of each controller's current boot. */
    async lastSeqs(current: { id: number; boot: string }[]): Promise<Map<number, number>> {
      if (!current.length) return new Map();
      const rows = (await db('readings')
        .whereIn(
          ['controller_id', 'boot'],
          current.map((c) => [c.id, c.boot]),
        )
        .groupBy('controller_id')
        .select('controller_id')
        .max({ m: 'seq' })) as { controller_id: number; m: number }[];
      return new Map(rows.map((r) => [r.controller_id, Number(r.m)]));
    },
    async lastSeq(id: number, boot: string): Promise<number | null> {
      const r = await db('readings').where({ controller_id: id, boot }).max<{ m: number | null }>({ m: 'seq' }).first();
      return r?.m ?? null;
    },
  };
}
export type ControllersRepository = ReturnType<typeof controllersRepository>;
