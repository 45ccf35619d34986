import crypto from 'node:crypto';
import { EventEmitter } from 'node:events';

import type { Knex } from 'knex';
import type { Logger } from 'pino';

import { retryOnDeadlock } from '@/server/db/deadlock';

/** Jobs that must run on one instance at a time. */
export const jobs = ['escalation', 'mail', 'retention'] as const;
export type Job = (typeof jobs)[number];

export type MembershipOptions = {
  /** how often to heartbeat, claim and renew */
  beatMs?: number;
  /** an instance not heard from for this long is dead: its controllers are taken over */
  deadAfterMs?: number;
  /** how long a claimed or renewed lease lasts */
  leaseMs?: number;
  url?: string;
};

export type MembershipEvents = {
  /** controllers this instance now owns, with their fencing numbers */
  gained: [Map<number, number>];
  lost: [number[]];
};

/**
 * Rendezvous (highest random weight) hashing: each controller goes to the live
 * instance with the highest hash of (controller, instance). When an instance joins
 * or leaves, only the controllers it wins or held move.
 */
export function ownerOf(controllerId: number, instances: readonly string[]): string | null {
  let best: string | null = null;
  let bestW = -1;
  for (const i of instances) {
    const w = crypto.createHash('sha1').update(`${controllerId}|${i}`).digest().readUInt32BE(0);
    if (w > bestW || (w === bestW && best != null && i < best)) {
      best = i;
      bestW = w;
    }
  }
  return best;
}

/**
 * This instance's place among several on one database. Every `beatMs` it
 * heartbeats, works out which controllers are its own among the live instances,
 * releases those it should no longer hold (so a newcomer can take them), claims
 * and renews its own, and reads back what it holds. A lease changing holder
 * raises its fencing number; writes that must not come from a former owner check
 * it (`checkFence`). A lease is trusted locally only until its expiry, so an
 * instance paused longer than that stops acting before anyone else starts.
 */
export class Membership extends EventEmitter<MembershipEvents> {
  readonly id: string;
  private beatMs: number;
  private deadAfterMs: number;
  private leaseMs: number;
  private owned = new Map<number, number>();
  private jobsHeld = new Map<string, number>();
  /** local clock time until which the leases read last are valid */
  private validUntil = 0;
  private timer: NodeJS.Timeout | null = null;
  private beating: Promise<void> | null = null;
  live: string[] = [];
  readonly stats = { beats: 0, failures: 0, gained: 0, lost: 0 };

  constructor(
    private db: Knex,
    private log: Logger,
    id?: string,
    private opts: MembershipOptions = {},
  ) {
    super();
    this.id = id ?? `${process.pid}-${crypto.randomBytes(4).toString('hex')}`;
    this.beatMs = opts.beatMs ?? 2000;
    this.deadAfterMs = opts.deadAfterMs ?? 6000;
    this.leaseMs = opts.leaseMs ?? 8000;
  }

  /** Whether this instance owns a controller now (and its lease has not run out locally). */
  owns(controllerId: number): boolean {
    return Date.now() < this.validUntil && this.owned.has(controllerId);
  }

  fenceOf(controllerId: number): number | undefined {
    return this.owned.get(controllerId);
  }

  ownedIds(): number[] {
    return Date.now() < this.validUntil ? [...this.owned.keys()] : [];
  }

  holdsJob(name: Job): boolean {
    return Date.now() < this.validUntil && this.jobsHeld.has(name);
  }

  async start() {
    await this.beat();
    this.timer = setInterval(() => void this.beat(), this.beatMs);
  }

  /** One round: heartbeat, release, claim and renew, read back. Never two at once. */
  beat(): Promise<void> {
    this.beating ??= this.round()
      .catch((err) => {
        this.stats.failures++;
        this.log.warn({ err: (err as Error).message }, 'cluster heartbeat failed');
      })
      .finally(() => {
        this.beating = null;
      });
    return this.beating;
  }

  private async round() {
    const db = this.db;
    const started = Date.now();
    await db('instances')
      .insert({
        id: this.id,
        started_at: new Date(),
        heartbeat_at: db.fn.now(3),
        url: this.opts.url ?? null,
        pid: process.pid,
      })
      .onConflict('id')
      .merge({ heartbeat_at: db.fn.now(3), owned: this.owned.size });
    const live = (
      (await db('instances')
        .where('heartbeat_at', '>', db.raw('NOW(3) - INTERVAL ? MICROSECOND', [this.deadAfterMs * 1000]))
        .orderBy('id')
        .pluck('id')) as string[]
    ).filter(Boolean);
    if (!live.includes(this.id)) live.push(this.id);
    this.live = live;
    // every controller has a lease row (new ones included)
    await retryOnDeadlock(() =>
      db.raw(
        `INSERT IGNORE INTO controller_leases (controller_id)
         SELECT id FROM controllers WHERE decommissioned = 0`,
      ),
    );
    const ids = (await db('controllers').where({ decommissioned: false }).pluck('id')) as number[];
    const mine = ids.filter((id) => ownerOf(id, live) === this.id);
    const notMine = [...this.owned.keys()].filter((id) => ownerOf(id, live) !== this.id);
    const leaseUs = this.leaseMs * 1000;
    // hand back what another live instance should hold, so it can take it at its next beat
    for (let i = 0; i < notMine.length; i += 500)
      await retryOnDeadlock(() =>
        db('controller_leases')
          .whereIn('controller_id', notMine.slice(i, i + 500))
          .andWhere('holder', this.id)
          .update({ holder: null, expires_at: null }),
      );
    // claim or renew mine: free, expired, held by a dead instance, or already mine; a new holder raises the fence
    for (let i = 0; i < mine.length; i += 500)
      await retryOnDeadlock(() =>
        db.raw(
          `UPDATE controller_leases
             SET fence = IF(holder <=> ?, fence, fence + 1), holder = ?, expires_at = NOW(3) + INTERVAL ? MICROSECOND
           WHERE controller_id IN (${mine
             .slice(i, i + 500)
             .map(() => '?')
             .join(',')})
             AND (holder IS NULL OR holder = ? OR expires_at < NOW(3) OR holder NOT IN (${live.map(() => '?').join(',')}))`,
          [this.id, this.id, leaseUs, ...mine.slice(i, i + 500), this.id, ...live],
        ),
      );
    // jobs: whoever comes first among the live, renewed while alive
    for (const name of jobs) {
      await db('job_leases').insert({ name }).onConflict('name').ignore();
      await retryOnDeadlock(() =>
        db.raw(
          `UPDATE job_leases
             SET fence = IF(holder <=> ?, fence, fence + 1), holder = ?, expires_at = NOW(3) + INTERVAL ? MICROSECOND
           WHERE name = ? AND (holder IS NULL OR holder = ? OR expires_at < NOW(3) OR holder NOT IN (${live.map(() => '?').join(',')}))`,
          [this.id, this.id, leaseUs, name, this.id, ...live],
        ),
      );
    }
    const held = (await db('controller_leases')
      .where({ holder: this.id })
      .andWhere('expires_at', '>', db.fn.now(3))
      .select('controller_id', 'fence')) as { controller_id: number; fence: number | string }[];
    const jobsHeld = (await db('job_leases')
      .where({ holder: this.id })
      .andWhere('expires_at', '>', db.fn.now(3))
      .select('name', 'fence')) as { name: string; fence: number | string }[];
    // valid from when this round began, less a margin for clock rates
    this.validUntil = started + this.leaseMs - this.beatMs / 2;
    const next = new Map(held.map((h) => [h.controller_id, Number(h.fence)]));
    const gained = new Map([...next].filter(([id, fence]) => this.owned.get(id) !== fence));
    const lost = [...this.owned.keys()].filter((id) => !next.has(id));
    this.owned = next;
    this.jobsHeld = new Map(jobsHeld.map((j) => [j.name, Number(j.fence)]));
    this.stats.beats++;
    if (lost.length) {
      this.stats.lost += lost.length;
      this.emit('lost', lost);
    }
    if (gained.size) {
      this.stats.gained += gained.size;
      this.emit('gained', gained);
    }
    // forget instances gone for an hour
    if (this.stats.beats % 30 === 1)
      await db('instances').where('heartbeat_at', '<', db.raw('NOW(3) - INTERVAL 1 HOUR')).delete();
  }

  /**
   * Inside a transaction: throws `LeaseLost` unless this instance still holds the
   * controller's lease with the fencing number it was given. The row is locked
   * for the rest of the transaction, so no takeover commits in between.
   */
  async checkFence(trx: Knex.Transaction, controllerId: number) {
    const fence = this.owned.get(controllerId);
    const row = await trx('controller_leases')
      .where({ controller_id: controllerId })
      .forUpdate()
      .first('holder', 'fence');
    if (fence == null || !row || row.holder !== this.id || Number(row.fence) !== fence)
      throw new LeaseLost(controllerId);
  }

  /** Stops heartbeating and hands every lease back at once, so the others take over without waiting. */
  async stop(release = true) {
    if (this.timer) clearInterval(this.timer);
    await this.beating;
    this.validUntil = 0;
    if (!release) return;
    await this.db('controller_leases').where({ holder: this.id }).update({ holder: null, expires_at: null });
    await this.db('job_leases').where({ holder: this.id }).update({ holder: null, expires_at: null });
    await this.db('instances').where({ id: this.id }).delete();
  }
}

export class LeaseLost extends Error {
  constructor(readonly controllerId: number) {
    super(`this instance no longer owns controller ${controllerId}`);
  }
}
