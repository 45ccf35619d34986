import crypto from 'node:crypto';

import type { IncrementResponse, Options, Store } from 'express-rate-limit';
import type { Knex } from 'knex';

/**
 * express-rate-limit's counts kept in MariaDB, so that several instances behind one
 * address count the same failed sign-ins (in memory each would allow its own share).
 * One upsert per counted request: a window that has run out starts again at 1.
 */
export class MariaDbRateStore implements Store {
  localKeys = false;
  private windowMs = 60_000;

  constructor(
    private db: Knex,
    readonly prefix: string,
  ) {}

  init(options: Options) {
    this.windowMs = options.windowMs;
  }

  private key(key: string) {
    const k = `${this.prefix}:${key}`;
    return k.length <= 190 ? k : `${this.prefix}:${crypto.createHash('sha256').update(key).digest('hex')}`;
  }

  async increment(key: string): Promise<IncrementResponse> {
    const k = this.key(key);
    // hits is assigned before reset_at, so both compare against the window as it stood
    await this.db.raw(
      `INSERT INTO rate_limits (\`key\`, hits, reset_at) VALUES (?, 1, NOW(3) + INTERVAL ? MICROSECOND)
       ON DUPLICATE KEY UPDATE hits = IF(reset_at <= NOW(3), 1, hits + 1),
                               reset_at = IF(reset_at <= NOW(3), VALUES(reset_at), reset_at)`,
      [k, this.windowMs * 1000],
    );
    const row = await this.db('rate_limits').where({ key: k }).first('hits', 'reset_at');
    return { totalHits: Number(row?.hits ?? 1), resetTime: row ? new Date(row.reset_at) : undefined };
  }

  async decrement(key: string) {
    await this.db('rate_limits')
      .where({ key: this.key(key) })
      .update({ hits: this.db.raw('GREATEST(hits, 1) - 1') });
  }

  async resetKey(key: string) {
    await this.db('rate_limits')
      .where({ key: this.key(key) })
      .delete();
  }
}
