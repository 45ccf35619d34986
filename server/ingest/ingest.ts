import { EventEmitter } from 'node:events';

import type { Logger } from 'pino';

import type { ControllerRow, ControllersRepository } from '@/server/repositories/controllers';
import type { ReadingRow, ReadingsRepository } from '@/server/repositories/readings';
import type { LiveReading } from '@/telemetry/live';
import {
  commandResultSchema,
  parseTelemetry,
  parseTopic,
  type Reading,
  readingTimeProblem,
  statusSchema,
  topics,
} from '@/telemetry/wire';

import { safeJson, toRow } from './rows';
import type { MessageSource } from './source';

/**
 * MQTT → MariaDB. Validates every message with the shared schema, derives VSWR and
 * return loss at the antenna, writes multi-row batches (500 rows or 250 ms),
 * idempotent on (controller, boot, seq), asks for a replay when a sequence gap
 * shows, and holds rows in a bounded buffer while the database is away.
 */
export type IngestOptions = {
  batchRows?: number;
  flushMs?: number;
  maxBuffered?: number;
  countersMs?: number;
  maxAgeMs?: number;
  gapCheckMs?: number;
  /**
   * Among several instances: whether this one owns a controller. Only the owner
   * stores its readings, asks for replays and evaluates its alarms; the others
   * check its readings and pass them to their browsers (`observed`). Default: all.
   */
  owns?: (controllerId: number) => boolean;
};

/** A controller as ingest knows it: its row, the last seq per boot, and its current boot (the one of the newest reading). */
type Known = {
  row: ControllerRow;
  lastSeq: Map<string, number | null>;
  /** a boot's last stored seq being read: every reading of that boot waits for the one query */
  seqLookups?: Map<string, Promise<number | null>>;
  current: { boot: string; tsMs: number } | null;
};
type Counter = {
  accepted: number;
  rejected: number;
  conflicts: number;
  firstAt: Date | null;
  lastAt: Date | null;
  online?: boolean;
  boot?: string;
  skewS?: number;
};

export type IngestStats = {
  accepted: number;
  written: number;
  duplicates: number;
  conflicts: number;
  rejected: number;
  rejectedClock: number;
  droppedOverflow: number;
  unknown: number;
  replaysRequested: number;
  replaysAbandoned: number;
  dbFailures: number;
};

/** A reading as accepted by ingest, with the calibrated watts and derived figures. */
export type AcceptedReading = {
  controllerId: number;
  siteId: number;
  serial: string;
  reading: Reading;
  vswr: number | null;
  returnLossDb: number | null;
  forwardW: number;
  reflectedW: number;
};

/** What ingest tells the rest of the server, each event with its arguments. */
export type IngestEvents = {
  reading: [AcceptedReading];
  /** a valid reading of a controller another instance owns: for this instance's browsers only */
  observed: [AcceptedReading];
  status: [{ controllerId: number; siteId: number; online: boolean }];
  'command-result': [{ controllerId: number; v: 1; id: string; ok: boolean; message: string }];
  reject: [{ controllerId: number; reason: string }];
  written: [rows: number];
  /** the database went away (up: false) or came back (up: true) after being away since `since` */
  db: [{ up: boolean; since: Date }];
};

/**
 * The one mapper from an accepted reading to what browsers get on /live (the same
 * shape the Board snapshot gives from stored rows): calibrated watts, VSWR at the antenna.
 */
export function toLiveReading(a: AcceptedReading): LiveReading {
  return {
    controllerId: a.controllerId,
    siteId: a.siteId,
    ts: a.reading.ts,
    vswr: a.vswr,
    forwardW: a.forwardW,
    reflectedW: a.reflectedW,
    airTempC: a.reading.airTempC,
    humidityPct: a.reading.humidityPct,
    moisture: a.reading.moisture,
    heaterOn: a.reading.heater.on,
    heaterMode: a.reading.heater.mode,
    heaterCurrentA: a.reading.heater.currentA,
    supplyVolts: a.reading.supply.volts,
    batteryPct: a.reading.supply.batteryPct,
  };
}

/** What listeners hear of a valid reading: the controller, the reading, and the calibrated figures of its row. */
const accepted = (k: Known, r: AcceptedReading['reading'], row: ReadingRow): AcceptedReading => ({
  controllerId: k.row.id,
  siteId: k.row.site_id,
  serial: k.row.serial,
  reading: r,
  vswr: row.vswr,
  returnLossDb: row.return_loss_db,
  forwardW: row.forward_w,
  reflectedW: row.reflected_w,
});

export class Ingest extends EventEmitter<IngestEvents> {
  readonly stats: IngestStats = {
    accepted: 0,
    written: 0,
    duplicates: 0,
    conflicts: 0,
    rejected: 0,
    rejectedClock: 0,
    droppedOverflow: 0,
    unknown: 0,
    replaysRequested: 0,
    replaysAbandoned: 0,
    dbFailures: 0,
  };
  private queue: { row: ReadingRow; fresh: boolean }[] = [];
  private known = new Map<string, Promise<Known | null>>();
  /** the controllers whose lookup has landed: their messages are handled at once, with no promise in between */
  private ready = new Map<string, Known>();
  private counters = new Map<number, Counter>();
  private rejects: { controller_id: number; at: Date; reason: string; payload: string }[] = [];
  private flushing: Promise<void> | null = null;
  private inFlight = 0;
  private timer: NodeJS.Timeout | null = null;
  private countersTimer: NodeJS.Timeout | null = null;
  private parkedTimer: NodeJS.Timeout | null = null;
  private readonly batchRows: number;
  private readonly flushMs: number;
  readonly maxBuffered: number;
  private readonly maxAgeMs: number;
  private readonly gapCheckMs: number;
  private readonly owns: (controllerId: number) => boolean;
  lastAcceptedAt: Date | null = null;
  private closed = false;
  /** when the last write failed and the first since then, for health */
  dbDownSince: Date | null = null;

  constructor(
    private source: MessageSource,
    private controllers: ControllersRepository,
    private readings: ReadingsRepository,
    private log: Logger,
    opts: IngestOptions = {},
  ) {
    super();
    this.batchRows = opts.batchRows ?? 500;
    this.flushMs = opts.flushMs ?? 250;
    this.maxBuffered = opts.maxBuffered ?? 200_000;
    this.maxAgeMs = opts.maxAgeMs ?? 90 * 86_400_000;
    this.gapCheckMs = opts.gapCheckMs ?? 10_000;
    this.owns = opts.owns ?? (() => true);
    this.countersTimer = setInterval(() => void this.writeCounters(), opts.countersMs ?? 1000);
  }

  async start() {
    await this.source.start((topic, payload) => this.onMessage(topic, payload));
    this.timer = setInterval(() => void this.flush(), this.flushMs);
    this.gapTimer = setInterval(() => void this.checkGaps(), Math.max(500, this.gapCheckMs / 2));
    this.parkedTimer = setInterval(() => this.retryParked(), 1000);
    this.log.info({ source: this.source.name }, 'ingest started');
  }

  /** Forget cached controller details (after calibration, decommissioning). */
  invalidate(serial: string) {
    this.known.delete(serial);
    this.ready.delete(serial);
  }

  /**
   * Ownership changed (another instance joined or left): forget every controller's
   * last stored seq, so that the next reading of one just taken over is compared with
   * what is stored and the readings missed meanwhile are asked for again; gaps of
   * controllers no longer owned are the new owner's to ask for.
   */
  ownershipChanged(lost: number[] = []) {
    this.known.clear();
    this.ready.clear();
    const gone = new Set(lost);
    for (const [key, g] of this.gaps) if (gone.has(g.controllerId)) this.gaps.delete(key);
  }

  /**
   * The controller behind a serial, with its last stored sequence. Lookups asked for
   * in the same turn go to the database together (two queries for any number), so a
   * fleet reconnecting at once does not queue hundreds of queries ahead of the writes.
   */
  private lookup(serial: string): Promise<Known | null> {
    let p = this.known.get(serial);
    if (!p) {
      p = new Promise<Known | null>((resolve, reject) => {
        this.pendingLookups.set(serial, { resolve, reject });
        if (this.pendingLookups.size === 1) setImmediate(() => void this.runLookups());
      });
      const asked = p;
      // registered first, so it runs before the messages that waited on the lookup
      p.then(
        (k) => {
          if (k && this.known.get(serial) === asked) this.ready.set(serial, k);
        },
        () => this.known.delete(serial),
      );
      this.known.set(serial, p);
    }
    return p;
  }

  private pendingLookups = new Map<string, { resolve: (k: Known | null) => void; reject: (err: unknown) => void }>();

  private async runLookups() {
    const waiting = this.pendingLookups;
    this.pendingLookups = new Map();
    try {
      const rows = (await this.controllers.bySerials([...waiting.keys()])).filter((r) => !r.decommissioned);
      // a database outage must not lose readings, only the gap check: -1 is "unknown"
      // a database outage must not lose readings, only the gap check: null is "unknown"
      const seqs = await this.controllers
        .lastSeqs(rows.map((r) => ({ id: r.id, boot: r.boot ?? '' })))
        .catch(() => null);
      const bySerial = new Map(rows.map((r) => [r.serial, r]));
      for (const [serial, w] of waiting) {
        const row = bySerial.get(serial);
        // the current boot is loaded up front so that messages keep their order
        w.resolve(
          row
            ? { row, lastSeq: new Map([[row.boot ?? '', seqs ? (seqs.get(row.id) ?? -1) : null]]), current: null }
            : null,
        );
      }
    } catch (err) {
      for (const w of waiting.values()) w.reject(err);
    }
  }

  /** -1 when none is stored (a boot starts at seq 0, so earlier ones are a gap); null when unknown */
  private async storedLastSeq(id: number, boot: string): Promise<number | null> {
    try {
      return (await this.controllers.lastSeq(id, boot)) ?? -1;
    } catch {
      return null;
    }
  }

  private counter(id: number): Counter {
    let c = this.counters.get(id);
    if (!c) this.counters.set(id, (c = { accepted: 0, rejected: 0, conflicts: 0, firstAt: null, lastAt: null }));
    return c;
  }

  onMessage(topic: string, payload: Buffer) {
    const t = parseTopic(topic);
    if (!t) return;
    const ready = this.ready.get(t.serial);
    if (ready) return this.handle(ready, t.channel, payload);
    void this.lookup(t.serial).then(
      (k) => {
        if (k) this.handle(k, t.channel, payload);
        else this.stats.unknown++;
      },
      (err) => {
        // the database is away and this controller is not known yet: hold the message and try again, never drop it
        if (this.parked.length < this.maxBuffered) this.parked.push({ topic, payload });
        else this.stats.droppedOverflow++;
        if (this.parked.length % 1000 === 1)
          this.log.warn(
            { err: (err as Error).message, parked: this.parked.length },
            'controller lookup failed; holding its messages',
          );
      },
    );
  }

  /** One message of a known controller; a failure is logged, never thrown into the broker. */
  private handle(k: Known, channel: 'telemetry' | 'status' | 'command' | 'result', payload: Buffer) {
    try {
      if (channel === 'telemetry') {
        this.onTelemetry(k, payload)?.catch((err) => this.log.error({ err }, 'message handling failed'));
      } else if (channel === 'status') {
        const s = statusSchema.safeParse(safeJson(payload));
        if (s.success) {
          this.counter(k.row.id).online = s.data.state === 'online';
          this.emit('status', { controllerId: k.row.id, siteId: k.row.site_id, online: s.data.state === 'online' });
        }
      } else if (channel === 'result') {
        const r = commandResultSchema.safeParse(safeJson(payload));
        if (r.success) this.emit('command-result', { controllerId: k.row.id, ...r.data });
      }
    } catch (err) {
      this.log.error({ err }, 'message handling failed');
    }
  }

  /** messages whose controller could not be looked up (database away), in arrival order */
  private parked: { topic: string; payload: Buffer }[] = [];

  private retryParked() {
    if (!this.parked.length) return;
    const again = this.parked;
    this.parked = [];
    for (const m of again) this.onMessage(m.topic, m.payload);
  }

  private reject(id: number, at: Date, reason: string, payload: string) {
    this.stats.rejected++;
    this.counter(id).rejected++;
    if (this.rejects.length < 1000)
      this.rejects.push({ controller_id: id, at, reason: reason.slice(0, 500), payload: payload.slice(0, 2000) });
    this.emit('reject', { controllerId: id, reason });
  }

  /**
   * A telemetry message of a known controller. Handled at once when the boot of each
   * reading is known (the usual case); a new boot's last stored seq is read first.
   */
  private onTelemetry(k: Known, payload: Buffer): Promise<void> | undefined {
    const id = k.row.id;
    if (!this.owns(id)) {
      this.observe(k, payload);
      return;
    }
    const parsed = parseTelemetry(payload);
    const now = new Date();
    if (!parsed.ok) {
      this.reject(id, now, parsed.reason, payload.toString('utf8'));
      return;
    }
    const readings = parsed.readings;
    for (let i = 0; i < readings.length; i++) {
      const r = readings[i];
      if (!this.admissible(k, r, now)) continue;
      if (!k.lastSeq.has(r.boot)) return this.afterSeqLookup(k, readings.slice(i), now);
      this.take(k, r, now);
    }
    if (this.queue.length >= this.batchRows) void this.flush();
  }

  /** The rest of a message whose first reading is of a boot not seen yet: one query per new boot, then in order. */
  private async afterSeqLookup(k: Known, readings: Reading[], now: Date) {
    for (let i = 0; i < readings.length; i++) {
      const r = readings[i];
      // the first was checked by the caller
      if (i > 0 && !this.admissible(k, r, now)) continue;
      const boot = r.boot;
      if (!k.lastSeq.has(boot)) {
        // one query per new boot, however many of its readings arrive before it answers
        // (a query each would queue thousands behind the writes when a fleet reboots)
        k.seqLookups ??= new Map();
        let pending = k.seqLookups.get(boot);
        if (!pending) {
          pending = this.storedLastSeq(k.row.id, boot);
          k.seqLookups.set(boot, pending);
          void pending.then(() => k.seqLookups?.delete(boot));
        }
        const stored = await pending;
        if (!k.lastSeq.has(boot)) k.lastSeq.set(boot, stored);
      }
      this.take(k, r, now);
    }
    if (this.queue.length >= this.batchRows) void this.flush();
  }

  /** Whether a reading may be stored: its time within bounds, and room in the buffer. */
  private admissible(k: Known, r: Reading, now: Date): boolean {
    const tsMs = Date.parse(r.ts);
    // a device clock far off would store rows the columns cannot hold, or pin "latest"
    const clock = readingTimeProblem(tsMs, now.getTime(), this.maxAgeMs);
    if (clock) {
      this.stats.rejectedClock++;
      this.counter(k.row.id).skewS = (tsMs - now.getTime()) / 1000;
      this.reject(k.row.id, now, `seq ${r.seq}: ${clock}`, JSON.stringify(r));
      return false;
    }
    // past the bound a reading is dropped before its seq is counted as seen, so the next one shows the gap and asks for it again
    if (this.queue.length >= this.maxBuffered) {
      this.stats.droppedOverflow++;
      if (this.stats.droppedOverflow % 1000 === 1)
        this.log.warn(
          { bound: this.maxBuffered, dropped: this.stats.droppedOverflow },
          'ingest buffer full: dropping readings (replay recovers them)',
        );
      return false;
    }
    return true;
  }

  /** A reading whose boot's last stored seq is known: into the write queue, gaps asked for, listeners told. */
  private take(k: Known, r: Reading, now: Date) {
    const id = k.row.id;
    const boot = r.boot;
    const tsMs = Date.parse(r.ts);
    // taken after any await: the counters may have been written (and replaced) meanwhile
    const c = this.counter(id);
    const last = k.lastSeq.get(boot) ?? null;
    const fresh = last === null || r.seq > last;
    if (last !== null && r.seq > last + 1) void this.requestReplay(id, k.row.serial, boot, last + 1, r.seq - 1);
    if (fresh) {
      k.lastSeq.set(boot, r.seq);
      // messages of two boots may be handled out of order: the newest reading names the current boot
      if (!k.current || tsMs >= k.current.tsMs) {
        if (k.current?.boot !== boot) c.boot = boot;
        k.current = { boot, tsMs };
      }
      // skew from live readings only: a replayed one is late by design
      c.skewS = (tsMs - now.getTime()) / 1000;
    }
    const row = toRow(k.row, r, boot, now);
    this.queue.push({ row, fresh });
    this.stats.accepted++;
    this.lastAcceptedAt = now;
    c.accepted++;
    // seen-at is the server's clock: a device clock cannot keep a quiet controller "online"
    c.firstAt ??= now;
    c.lastAt = now;
    this.emit('reading', accepted(k, r, row));
  }

  /** Another instance owns this controller: check its readings and show them, store nothing. */
  private observe(k: Known, payload: Buffer) {
    const parsed = parseTelemetry(payload);
    if (!parsed.ok) return;
    const now = new Date();
    for (const r of parsed.readings) {
      if (readingTimeProblem(Date.parse(r.ts), now.getTime(), this.maxAgeMs)) continue;
      this.emit('observed', accepted(k, r, toRow(k.row, r, r.boot, now)));
    }
  }

  /**
   * Gaps asked for and not yet seen filled. A request or its answer can be lost (a
   * device reconnecting, QoS 1 that is no end-to-end promise here), so each is
   * checked against what is stored and asked again, a few times, then given up.
   */
  private gaps = new Map<
    string,
    { controllerId: number; serial: string; boot: string; from: number; to: number; tries: number; at: number }
  >();
  private gapTimer: NodeJS.Timeout | null = null;
  private checkingGaps = false;

  private async checkGaps() {
    // under load the writes come first: gaps are checked again once the buffer has drained
    if (this.checkingGaps || !this.gaps.size || this.buffered > this.batchRows * 4) return;
    this.checkingGaps = true;
    try {
      const due = Date.now() - this.gapCheckMs;
      let checked = 0;
      for (const [key, g] of [...this.gaps]) {
        if (g.at > due) continue;
        if (++checked > 100) break;
        const stored = await this.readings.countSeqRange(g.controllerId, g.boot, g.from, g.to);
        if (stored >= g.to - g.from + 1) this.gaps.delete(key);
        else if (g.tries >= 5) {
          this.gaps.delete(key);
          this.stats.replaysAbandoned++;
          this.log.warn(
            { serial: g.serial, boot: g.boot, from: g.from, to: g.to, missing: g.to - g.from + 1 - stored },
            'readings not replayed after 5 requests; given up',
          );
        } else await this.requestReplay(g.controllerId, g.serial, g.boot, g.from, g.to, g.tries + 1);
      }
    } catch {
      // the database is away: the next pass checks again
    } finally {
      this.checkingGaps = false;
    }
  }

  private async requestReplay(
    controllerId: number,
    serial: string,
    boot: string,
    fromSeq: number,
    toSeq: number,
    tries = 1,
  ) {
    const key = `${controllerId}|${boot}|${fromSeq}`;
    // overloaded: note the gap and ask once the buffer has drained, so replays do not add to the load
    const later = this.buffered > this.maxBuffered / 4;
    if (this.gaps.size < 50_000 || this.gaps.has(key)) {
      this.gaps.set(key, {
        controllerId,
        serial,
        boot,
        from: fromSeq,
        to: toSeq,
        tries: later ? tries - 1 : tries,
        at: later ? 0 : Date.now(),
      });
    }
    if (later) return;
    this.stats.replaysRequested++;
    const cmd = { v: 1, id: `replay-${Date.now()}-${fromSeq}`, type: 'replay', fromSeq, toSeq, boot };
    try {
      await this.source.publish(topics(serial).command, JSON.stringify(cmd));
    } catch (err) {
      this.log.warn({ err, serial }, 'replay request failed');
    }
  }

  /**
   * Writes what is queued: the queue is taken whole (O(1)), written as 500-row
   * statements two at a time, then the rollups once per flush. On failure the
   * unwritten rows go back to the front of the queue.
   */
  flush(): Promise<void> {
    if (this.flushing) return this.flushing;
    if (!this.queue.length) return Promise.resolve();
    this.flushing = (async () => {
      try {
        while (this.queue.length) {
          const taken = this.queue;
          this.queue = [];
          let done = 0;
          this.inFlight = taken.length;
          try {
            for (; done < taken.length; done += this.batchRows * 2, this.inFlight = Math.max(0, taken.length - done)) {
              const a = taken.slice(done, done + this.batchRows).map((b) => b.row);
              const b = taken.slice(done + this.batchRows, done + this.batchRows * 2).map((x) => x.row);
              const [wa, wb] = await Promise.all([this.readings.insertBatch(a), this.readings.insertBatch(b)]);
              this.stats.written += wa + wb;
              if (wa < a.length) await this.checkConflicts(a);
              if (wb < b.length) await this.checkConflicts(b);
              this.stats.duplicates += a.length + b.length - wa - wb;
              this.emit('written', wa + wb);
            }
          } catch (err) {
            this.queue = taken.slice(done).concat(this.queue);
            await this.updateRollups(taken.slice(0, done));
            throw err;
          }
          await this.updateRollups(taken);
        }
        if (this.dbDownSince) {
          this.log.info({ downForS: (Date.now() - this.dbDownSince.getTime()) / 1000 }, 'database writes resumed');
          this.emit('db', { up: true, since: this.dbDownSince });
          this.dbDownSince = null;
        }
      } catch (err) {
        this.stats.dbFailures++;
        // a deadlock that outlasted its retries is a busy database, not a lost one: the rows wait
        // for the next flush without telling every screen the database is down
        const busy = (err as { code?: string }).code === 'ER_LOCK_DEADLOCK';
        if (!this.dbDownSince && !busy) {
          this.dbDownSince = new Date();
          this.emit('db', { up: false, since: this.dbDownSince });
        }
        if (this.stats.dbFailures % 20 === 1)
          this.log.error(
            // the statement itself can be megabytes of values: its first words say enough
            {
              err: (err as Error).message.slice(0, 300),
              code: (err as { code?: string }).code,
              buffered: this.queue.length,
            },
            busy
              ? 'database write deadlocked; holding readings for the next flush'
              : 'database write failed; holding readings',
          );
      } finally {
        this.inFlight = 0;
        this.flushing = null;
      }
    })();
    return this.flushing;
  }

  /**
   * A batch wrote fewer rows than it held: the rest were already stored. Those with
   * the same key but other content are conflicts: counted and shown to the
   * integrator, the stored row kept (first written wins).
   */
  private async checkConflicts(rows: ReadingRow[]) {
    const found = await this.readings.conflicting(rows);
    const now = new Date();
    for (const { row, storedTs } of found) {
      this.stats.conflicts++;
      this.counter(row.controller_id).conflicts++;
      if (this.rejects.length < 1000) {
        this.rejects.push({
          controller_id: row.controller_id,
          at: now,
          reason: `conflict: boot ${row.boot} seq ${row.seq} is already stored with ts ${storedTs.toISOString()}; kept the stored reading`,
          payload: JSON.stringify({ boot: row.boot, seq: row.seq, ts: row.ts.toISOString(), forwardW: row.forward_w }),
        });
      }
    }
  }

  /** rows waiting to be written, including those of the flush under way */
  get buffered() {
    return this.queue.length + this.inFlight + this.parked.length;
  }

  /** minutes whose rollups could not be brought up to date; recomputed from stored rows later */
  private rollupRepairs = new Map<number, { from: number; to: number }>();

  private async updateRollups(batch: { row: ReadingRow; fresh: boolean }[]) {
    if (!batch.length) return;
    const fresh = batch.filter((b) => b.fresh).map((b) => b.row);
    for (let i = 0; i < fresh.length; i += 20_000) {
      const part = fresh.slice(i, i + 20_000);
      try {
        await this.readings.addToRollups(part);
      } catch (err) {
        // the rows are stored; their minutes are recomputed exactly once the database answers
        for (const r of part) widen(this.rollupRepairs, r);
        throw err;
      }
    }
    // backfilled or repeated rows: recompute their minutes exactly from what is stored
    for (const b of batch) if (!b.fresh) widen(this.rollupRepairs, b.row);
    await this.repairRollups();
  }

  private async repairRollups() {
    for (const [id, r] of [...this.rollupRepairs]) {
      await this.readings.recomputeRollups(id, new Date(r.from), new Date(r.to));
      this.rollupRepairs.delete(id);
    }
  }

  private async writeCounters() {
    if (!this.counters.size && !this.rejects.length) return;
    const items = [...this.counters.entries()].map(([id, c]) => ({ id, ...c }));
    const rejects = this.rejects;
    this.counters = new Map();
    this.rejects = [];
    let failed: number[];
    try {
      failed = (await this.controllers.applyCounters(items)).failed;
    } catch (err) {
      this.log.warn({ err: (err as Error).message }, 'controller counters not written; will retry');
      failed = items.map((i) => i.id);
    }
    if (failed.length < items.length) {
      try {
        await this.controllers.recordRejects(rejects);
      } catch {
        // kept for the next pass, bounded like the rest
        this.rejects = rejects.concat(this.rejects).slice(0, 1000);
      }
    } else this.rejects = rejects.concat(this.rejects).slice(0, 1000);
    if (failed.length && failed.length < items.length)
      this.log.error({ controllers: failed }, 'counters of some controllers could not be written');
    // an outage: everything comes back for the next pass; one bad row alone is not retried forever
    if (failed.length === items.length) for (const it of items) this.mergeCounter(it);
  }

  private mergeCounter(it: Counter & { id: number }) {
    const c = this.counter(it.id);
    c.accepted += it.accepted;
    c.rejected += it.rejected;
    c.conflicts += it.conflicts;
    c.firstAt ??= it.firstAt;
    if (it.lastAt && (!c.lastAt || it.lastAt > c.lastAt)) c.lastAt = it.lastAt;
    if (it.online !== undefined && c.online === undefined) c.online = it.online;
    if (it.boot !== undefined && c.boot === undefined) c.boot = it.boot;
    if (it.skewS !== undefined && c.skewS === undefined) c.skewS = it.skewS;
  }

  async close() {
    if (this.closed) return;
    this.closed = true;
    if (this.timer) clearInterval(this.timer);
    if (this.countersTimer) clearInterval(this.countersTimer);
    if (this.gapTimer) clearInterval(this.gapTimer);
    if (this.parkedTimer) clearInterval(this.parkedTimer);
    await this.source.close();
    // wait for any in-flight message lookups to land their rows
    await Promise.allSettled([...this.known.values()]);
    await this.flush();
    await this.writeCounters();
  }
}

/** Widens a controller's range of minutes to take in one row's minute. */
function widen(ranges: Map<number, { from: number; to: number }>, row: ReadingRow) {
  const m = Math.floor(row.ts.getTime() / 60_000) * 60_000;
  const r = ranges.get(row.controller_id);
  ranges.set(row.controller_id, r ? { from: Math.min(r.from, m), to: Math.max(r.to, m) } : { from: m, to: m });
}
