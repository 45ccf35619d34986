import type { Knex } from 'knex';

import { hourColumns, hoursFromMinutes } from '@/migrations/20261203050000_hourly_rollups';
import { retryOnDeadlock } from '@/server/db/deadlock';

export type ReadingRow = {
  controller_id: number;
  boot: string;
  seq: number;
  ts: Date;
  received_at: Date;
  air_temp_c: number;
  humidity_pct: number | null;
  moisture: boolean | null;
  forward_w: number;
  reflected_w: number;
  vswr: number | null;
  return_loss_db: number | null;
  heater_mode: string;
  heater_on: boolean;
  heater_current_a: number | null;
  supply_volts: number | null;
  battery_pct: number | null;
  flame_proven: boolean | null;
};

/** The stored columns of a reading, in the order the prepared INSERT binds them. */
export const readingColumns = [
  'controller_id',
  'boot',
  'seq',
  'ts',
  'received_at',
  'air_temp_c',
  'humidity_pct',
  'moisture',
  'forward_w',
  'reflected_w',
  'vswr',
  'return_loss_db',
  'heater_mode',
  'heater_on',
  'heater_current_a',
  'supply_volts',
  'battery_pct',
  'flame_proven',
] as const satisfies readonly (keyof ReadingRow)[];

/**
 * Row counts a prepared INSERT is made for: a batch goes as the fewest statements of
 * these sizes, so a connection keeps a handful of prepared statements, not one per count.
 */
const statementSizes = [500, 100, 20, 5, 1] as const;
const insertSql = new Map<number, string>();
function preparedInsert(n: number): string {
  let sql = insertSql.get(n);
  if (!sql) {
    const one = `(${readingColumns.map(() => '?').join(',')})`;
    sql = `INSERT IGNORE INTO readings (${readingColumns.join(',')}) VALUES ${Array(n).fill(one).join(',')}`;
    insertSql.set(n, sql);
  }
  return sql;
}

type PreparedConnection = {
  execute(sql: string, values: unknown[], cb: (err: Error | null, res: { affectedRows: number }) => void): void;
};

const measures = ['vswr', 'forward_w', 'reflected_w', 'air_temp_c', 'humidity_pct'] as const;
/** each measure's rollup column names, built once */
const columns = measures.map((m) => ({ min: `${m}_min`, max: `${m}_max`, sum: `${m}_sum`, n: `${m}_n` }));

/** Adds one rollup's sums, counts and extremes into another's. */
function foldRollup(into: Record<string, number | null>, from: Record<string, number | null>) {
  for (const k of ['n', 'heater_on_n', 'moisture_n', 'vi_sum', 'vi_n']) into[k] = into[k]! + from[k]!;
  for (const m of measures) {
    const lo = from[`${m}_min`];
    const hi = from[`${m}_max`];
    if (lo != null) into[`${m}_min`] = into[`${m}_min`] == null ? lo : Math.min(into[`${m}_min`]!, lo);
    if (hi != null) into[`${m}_max`] = into[`${m}_max`] == null ? hi : Math.max(into[`${m}_max`]!, hi);
    into[`${m}_sum`] = into[`${m}_sum`]! + from[`${m}_sum`]!;
    into[`${m}_n`] = into[`${m}_n`]! + from[`${m}_n`]!;
  }
}

export type RollupGrain = 'minute' | 'hour';

export function readingsRepository(db: Knex) {
  /** One prepared statement on a pooled connection; the answer's affected rows. */
  async function execute(sql: string, values: unknown[]): Promise<number> {
    const conn = (await db.client.acquireConnection()) as PreparedConnection;
    try {
      return await new Promise<number>((resolve, reject) =>
        conn.execute(sql, values, (err, res) => (err ? reject(err) : resolve(res.affectedRows))),
      );
    } finally {
      await db.client.releaseConnection(conn);
    }
  }

  return {
    /**
     * Multi-row INSERT IGNORE: idempotent on (controller, boot, seq). Returns rows written.
     * Sent as prepared statements (binary protocol): the values are not escaped into SQL
     * text, and the statement text is built once per size, not per batch.
     */
    async insertBatch(rows: ReadingRow[]): Promise<number> {
      if (!rows.length) return 0;
      let written = 0;
      let at = 0;
      for (const size of statementSizes) {
        while (rows.length - at >= size) {
          const chunk = rows.slice(at, at + size);
          at += size;
          const values: unknown[] = new Array(size * readingColumns.length);
          let i = 0;
          for (const r of chunk) for (const c of readingColumns) values[i++] = r[c] ?? null;
          // batches written side by side, and the counters, can deadlock on shared keys
          written += await retryOnDeadlock(() => execute(preparedInsert(size), values));
        }
      }
      return written;
    },

    /**
     * Of rows that were not inserted (their key was taken), those whose stored row
     * differs: same controller, boot and seq, another time or forward power.
     */
    async conflicting(rows: ReadingRow[]): Promise<{ row: ReadingRow; storedTs: Date }[]> {
      if (!rows.length) return [];
      const stored = (await db('readings')
        .whereIn(
          ['controller_id', 'boot', 'seq'],
          rows.map((r) => [r.controller_id, r.boot, r.seq]),
        )
        .select('controller_id', 'boot', 'seq', 'ts', 'forward_w', 'received_at')) as Pick<
        ReadingRow,
        'controller_id' | 'boot' | 'seq' | 'ts' | 'forward_w' | 'received_at'
      >[];
      const byKey = new Map(stored.map((s) => [`${s.controller_id}|${s.boot}|${s.seq}`, s]));
      const out: { row: ReadingRow; storedTs: Date }[] = [];
      for (const r of rows) {
        const s = byKey.get(`${r.controller_id}|${r.boot}|${r.seq}`);
        if (!s) continue;
        // FLOAT columns hold about 7 significant digits
        const sameFwd = Math.abs(s.forward_w - r.forward_w) <= 1e-5 * Math.max(1, Math.abs(r.forward_w));
        if (s.ts.getTime() !== r.ts.getTime() || !sameFwd) out.push({ row: r, storedTs: s.ts });
      }
      return out;
    },

    /** Adds fresh rows to the minute rollups (rows known to be new). */
    async addToRollups(rows: ReadingRow[]) {
      // per controller-minute, one slot per measure in plain arrays: this runs for every
      // reading written, so no column name is built and no object grows key by key here
      type Acc = {
        controller_id: number;
        minute: Date;
        n: number;
        heaterOn: number;
        moisture: number;
        viSum: number;
        viN: number;
        min: (number | null)[];
        max: (number | null)[];
        sum: number[];
        cnt: number[];
      };
      const acc = new Map<number, Map<number, Acc>>();
      const k = measures.length;
      for (const r of rows) {
        const minuteMs = Math.floor(r.ts.getTime() / 60_000) * 60_000;
        let byMinute = acc.get(r.controller_id);
        if (!byMinute) acc.set(r.controller_id, (byMinute = new Map()));
        let a = byMinute.get(minuteMs);
        if (!a) {
          a = {
            controller_id: r.controller_id,
            minute: new Date(minuteMs),
            n: 0,
            heaterOn: 0,
            moisture: 0,
            viSum: 0,
            viN: 0,
            min: new Array<number | null>(k).fill(null),
            max: new Array<number | null>(k).fill(null),
            sum: new Array<number>(k).fill(0),
            cnt: new Array<number>(k).fill(0),
          };
          byMinute.set(minuteMs, a);
        }
        a.n++;
        if (r.heater_on) a.heaterOn++;
        if (r.moisture) a.moisture++;
        if (r.supply_volts != null && r.heater_current_a != null) {
          a.viSum += r.supply_volts * r.heater_current_a;
          a.viN++;
        }
        for (let i = 0; i < k; i++) {
          const x = r[measures[i]];
          if (x == null) continue;
          const lo = a.min[i];
          const hi = a.max[i];
          a.min[i] = lo == null || x < lo ? x : lo;
          a.max[i] = hi == null || x > hi ? x : hi;
          a.sum[i] += x;
          a.cnt[i]++;
        }
      }
      const out: { controller_id: number; minute: Date; v: Record<string, number | null> }[] = [];
      for (const byMinute of acc.values())
        for (const a of byMinute.values()) {
          const v: Record<string, number | null> = {
            n: a.n,
            heater_on_n: a.heaterOn,
            moisture_n: a.moisture,
            vi_sum: a.viSum,
            vi_n: a.viN,
          };
          for (let i = 0; i < k; i++) {
            const c = columns[i];
            v[c.min] = a.min[i];
            v[c.max] = a.max[i];
            v[c.sum] = a.sum[i];
            v[c.n] = a.cnt[i];
          }
          out.push({ controller_id: a.controller_id, minute: a.minute, v });
        }
      if (!out.length) return;
      const merge: Record<string, Knex.Raw> = {
        n: db.raw('n + VALUES(n)'),
        heater_on_n: db.raw('heater_on_n + VALUES(heater_on_n)'),
        moisture_n: db.raw('moisture_n + VALUES(moisture_n)'),
        vi_sum: db.raw('vi_sum + VALUES(vi_sum)'),
        vi_n: db.raw('vi_n + VALUES(vi_n)'),
      };
      for (const m of measures) {
        merge[`${m}_min`] = db.raw(`LEAST(COALESCE(${m}_min, VALUES(${m}_min)), COALESCE(VALUES(${m}_min), ${m}_min))`);
        merge[`${m}_max`] = db.raw(
          `GREATEST(COALESCE(${m}_max, VALUES(${m}_max)), COALESCE(VALUES(${m}_max), ${m}_max))`,
        );
        merge[`${m}_sum`] = db.raw(`${m}_sum + VALUES(${m}_sum)`);
        merge[`${m}_n`] = db.raw(`${m}_n + VALUES(${m}_n)`);
      }
      // the hours these minutes fall in, folded the way the database merges them
      const hours = new Map<string, (typeof out)[number]>();
      for (const a of out) {
        const hour = new Date(Math.floor(a.minute.getTime() / 3_600_000) * 3_600_000);
        const key = `${a.controller_id}:${hour.getTime()}`;
        const h = hours.get(key);
        if (!h) hours.set(key, { controller_id: a.controller_id, minute: hour, v: { ...a.v } });
        else foldRollup(h.v, a.v);
      }
      // in key order: two flushes at once then lock the rows they share in the same order, and
      // cannot deadlock on each other (batches in arrival order did, under load)
      const byKey = (a: { controller_id: number; minute: Date }, b: { controller_id: number; minute: Date }) =>
        a.controller_id - b.controller_id || a.minute.getTime() - b.minute.getTime();
      const minutes = out.sort(byKey).map((a) => ({ controller_id: a.controller_id, minute: a.minute, ...a.v }));
      const hourRows = [...hours.values()]
        .sort(byKey)
        .map((a) => ({ controller_id: a.controller_id, hour: a.minute, ...a.v }));
      // statement by statement: a retried one was rolled back whole, so nothing is counted twice
      for (const [table, key, all] of [
        ['rollups_minute', 'minute', minutes],
        ['rollups_hour', 'hour', hourRows],
      ] as const) {
        for (let i = 0; i < all.length; i += 500) {
          await retryOnDeadlock(async () =>
            db(table)
              .insert(all.slice(i, i + 500))
              .onConflict(['controller_id', key])
              .merge(merge),
          );
        }
      }
    },

    /** Recomputes the rollups of given minutes from the stored rows (after a backfill). */
    async recomputeRollups(controllerId: number, fromMinute: Date, toMinute: Date) {
      const cols = measures.flatMap((m) => [
        `MIN(${m}) AS ${m}_min`,
        `MAX(${m}) AS ${m}_max`,
        `COALESCE(SUM(${m}),0) AS ${m}_sum`,
        `COUNT(${m}) AS ${m}_n`,
      ]);
      // a minute row has the columns of an hour row, keyed by its minute
      const names = hourColumns.map((c) => (c === 'hour' ? 'minute' : c));
      await retryOnDeadlock(async () =>
        db.raw(
          `INSERT INTO rollups_minute (${names.join(', ')})
         SELECT controller_id, FROM_UNIXTIME(FLOOR(UNIX_TIMESTAMP(ts) / 60) * 60) AS minute, COUNT(*) AS n, ${cols.join(', ')},
                SUM(heater_on) AS heater_on_n, COALESCE(SUM(moisture), 0) AS moisture_n,
                COALESCE(SUM(supply_volts * heater_current_a), 0) AS vi_sum, COUNT(supply_volts * heater_current_a) AS vi_n
         FROM readings WHERE controller_id = ? AND ts >= ? AND ts < ?
         GROUP BY controller_id, minute
         ON DUPLICATE KEY UPDATE ${names
           .slice(2)
           .map((c) => `${c} = VALUES(${c})`)
           .join(', ')}`,
          [controllerId, fromMinute, new Date(toMinute.getTime() + 60_000)],
        ),
      );
      // then the hours those minutes belong to, from all of each hour's minutes
      const fromHour = new Date(Math.floor(fromMinute.getTime() / 3_600_000) * 3_600_000);
      const toHour = new Date(Math.floor(toMinute.getTime() / 3_600_000) * 3_600_000 + 3_600_000);
      await retryOnDeadlock(async () =>
        db.raw(
          `INSERT INTO rollups_hour (${hourColumns.join(', ')})
           ${hoursFromMinutes('controller_id = ? AND minute >= ? AND minute < ?')}
           ON DUPLICATE KEY UPDATE ${hourColumns
             .slice(2)
             .map((c) => `${c} = VALUES(${c})`)
             .join(', ')}`,
          [controllerId, fromHour, toHour],
        ),
      );
    },

    /** Raw readings bucketed in SQL so that at most `buckets` rows come back; spikes kept by min/max. */
    async rawBuckets(controllerId: number, from: Date, to: Date, bucketS: number) {
      return db('readings')
        .where('controller_id', controllerId)
        .andWhere('ts', '>=', from)
        .andWhere('ts', '<', to)
        .groupByRaw('b')
        .orderBy('b')
        .select(
          db.raw('FLOOR(UNIX_TIMESTAMP(ts) / ?) AS b', [bucketS]),
          db.raw('MIN(ts) AS ts'),
          db.raw('COUNT(*) AS n'),
          db.raw('AVG(vswr) AS vswr'),
          db.raw('MIN(vswr) AS vswr_min'),
          db.raw('MAX(vswr) AS vswr_max'),
          db.raw('AVG(forward_w) AS forward_w'),
          db.raw('AVG(reflected_w) AS reflected_w'),
          db.raw('MAX(reflected_w) AS reflected_max'),
          db.raw('AVG(air_temp_c) AS air_temp_c'),
          db.raw('AVG(humidity_pct) AS humidity_pct'),
          db.raw('MAX(moisture) AS moisture'),
          db.raw('AVG(heater_on) AS heater_duty'),
          db.raw('AVG(heater_current_a) AS heater_current_a'),
          db.raw('AVG(battery_pct) AS battery_pct'),
        );
    },

    /** stored readings of one boot with seq in [from, to] */
    countSeqRange: async (controllerId: number, boot: string, from: number, to: number) =>
      Number(
        (
          await db('readings')
            .where({ controller_id: controllerId, boot })
            .andWhereBetween('seq', [from, to])
            .count<{ n: number }[]>({ n: '*' })
            .first()
        )?.n ?? 0,
      ),

    countRaw: async (controllerId: number, from: Date, to: Date) =>
      Number(
        (
          await db('readings')
            .where('controller_id', controllerId)
            .andWhere('ts', '>=', from)
            .andWhere('ts', '<', to)
            .count<{ n: number }[]>({ n: '*' })
            .first()
        )?.n ?? 0,
      ),

    raw: (controllerId: number, from: Date, to: Date) =>
      db<ReadingRow>('readings')
        .where('controller_id', controllerId)
        .andWhere('ts', '>=', from)
        .andWhere('ts', '<', to)
        .orderBy('ts'),

    /** Rollup buckets of one controller, or of several at once (each row names its controller). */
    async rollupBuckets(
      controllerId: number | number[],
      from: Date,
      to: Date,
      bucketS: number,
      grain: RollupGrain = 'minute',
    ) {
      const table = grain === 'hour' ? 'rollups_hour' : 'rollups_minute';
      return db(table)
        .whereIn('controller_id', Array.isArray(controllerId) ? controllerId : [controllerId])
        .andWhere(grain, '>=', from)
        .andWhere(grain, '<', to)
        .groupBy('controller_id', 'b')
        .orderBy(['controller_id', 'b'])
        .select(
          'controller_id',
          db.raw(`FLOOR(UNIX_TIMESTAMP(${grain}) / ?) AS b`, [bucketS]),
          db.raw(`MIN(${grain}) AS ts`),
          db.raw('SUM(n) AS n'),
          db.raw('SUM(vswr_sum) / NULLIF(SUM(vswr_n), 0) AS vswr'),
          db.raw('MIN(vswr_min) AS vswr_min'),
          db.raw('MAX(vswr_max) AS vswr_max'),
          db.raw('SUM(forward_w_sum) / NULLIF(SUM(forward_w_n), 0) AS forward_w'),
          db.raw('SUM(reflected_w_sum) / NULLIF(SUM(reflected_w_n), 0) AS reflected_w'),
          db.raw('MAX(reflected_w_max) AS reflected_max'),
          db.raw('SUM(air_temp_c_sum) / NULLIF(SUM(air_temp_c_n), 0) AS air_temp_c'),
          db.raw('SUM(humidity_pct_sum) / NULLIF(SUM(humidity_pct_n), 0) AS humidity_pct'),
          db.raw('SUM(moisture_n) > 0 AS moisture'),
          db.raw('SUM(heater_on_n) / SUM(n) AS heater_duty'),
          db.raw('NULL AS heater_current_a'),
          db.raw('NULL AS battery_pct'),
        );
    },

    async deleteOlderThan(cutoff: Date, chunk = 10_000): Promise<number> {
      let total = 0;
      for (;;) {
        const n = await db('readings').where('ts', '<', cutoff).limit(chunk).delete();
        total += n;
        if (n < chunk) return total;
      }
    },
  };
}
export type ReadingsRepository = ReturnType<typeof readingsRepository>;

/** The newest reading and a short VSWR trend per controller, for the Board. */
export function boardQueries(db: Knex) {
  return {
    /** The newest reading of each controller, in one query (MAX(ts) per controller reads the (controller_id, ts) index). */
    async latest(controllerIds: number[]): Promise<Map<number, ReadingRow>> {
      if (!controllerIds.length) return new Map();
      const newest = db('readings')
        .whereIn('controller_id', controllerIds)
        .groupBy('controller_id')
        .select('controller_id', db.raw('MAX(ts) AS ts'));
      const rows = await db<ReadingRow & { id: number }>('readings as r')
        .join(newest.as('m'), function on() {
          this.on('m.controller_id', 'r.controller_id').andOn('m.ts', 'r.ts');
        })
        .orderBy('r.id')
        .select('r.*');
      // two readings with the same time: the one stored last
      return new Map(rows.map((r) => [r.controller_id, r]));
    },
    /** VSWR peaks per bucket since a time for every controller, in one query. */
    async trend(
      controllerIds: number[],
      since: Date,
      bucketS: number,
    ): Promise<Map<number, { ts: Date; vswr: number | null }[]>> {
      const out = new Map<number, { ts: Date; vswr: number | null }[]>(controllerIds.map((id) => [id, []]));
      if (!controllerIds.length) return out;
      const rows = await db('readings')
        .whereIn('controller_id', controllerIds)
        .andWhere('ts', '>=', since)
        .groupBy('controller_id', 'b')
        .orderBy(['controller_id', 'b'])
        .select(
          'controller_id',
          db.raw('FLOOR(UNIX_TIMESTAMP(ts) / ?) AS b', [bucketS]),
          db.raw('MIN(ts) AS ts'),
          db.raw('MAX(vswr) AS vswr'),
        );
      for (const r of rows) out.get(r.controller_id)?.push({ ts: r.ts, vswr: r.vswr });
      return out;
    },
  };
}
