import { EventEmitter } from 'node:events';
import type { Logger } from 'pino';
import { commandResultSchema, parseTelemetry, parseTopic, statusSchema, topics, type Reading } from '../../telemetry/wire';
import type { ControllerRow, ControllersRepository } from '../repositories/controllers';
import type { ReadingRow, ReadingsRepository } from '../repositories/readings';
import { safeJson, toRow } from './rows';
import type { MessageSource } from './source';

/**
 * MQTT → MariaDB. Validates every message with the shared schema, derives VSWR and
 * return loss at the antenna, writes multi-row batches (500 rows or 250 ms),
 * idempotent on (controller, boot, seq), asks for a replay when a sequence gap
 * shows, and holds rows in a bounded buffer while the database is away.
 */
export type IngestOptions = { batchRows?: number; flushMs?: number; maxBuffered?: number; countersMs?: number };

type Known = { row: ControllerRow; lastSeq: Map<string, number> };
type Counter = { accepted: number; rejected: number; firstAt: Date | null; lastAt: Date | null; online?: boolean };

export type IngestStats = { accepted: number; written: number; duplicates: number; rejected: number; droppedOverflow: number; unknown: number; replaysRequested: number; dbFailures: number };

/** A reading as accepted, with the calibrated watts and derived figures. */
export type LiveReading = { controllerId: number; siteId: number; serial: string; reading: Reading; vswr: number | null; returnLossDb: number | null; forwardW: number; reflectedW: number };

export class Ingest extends EventEmitter {
  readonly stats: IngestStats = { accepted: 0, written: 0, duplicates: 0, rejected: 0, droppedOverflow: 0, unknown: 0, replaysRequested: 0, dbFailures: 0 };
  private queue: { row: ReadingRow; fresh: boolean }[] = [];
  private known = new Map<string, Promise<Known | null>>();
  private counters = new Map<number, Counter>();
  private rejects: { controller_id: number; at: Date; reason: string; payload: string }[] = [];
  private flushing: Promise<void> | null = null;
  private inFlight = 0;
  private timer: NodeJS.Timeout | null = null;
  private countersTimer: NodeJS.Timeout | null = null;
  private readonly batchRows: number;
  private readonly flushMs: number;
  private readonly maxBuffered: number;
  private closed = false;

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
    this.countersTimer = setInterval(() => void this.writeCounters(), opts.countersMs ?? 1000);
  }

  async start() {
    await this.source.start((topic, payload) => this.onMessage(topic, payload));
    this.timer = setInterval(() => void this.flush(), this.flushMs);
    this.log.info({ source: this.source.name }, 'ingest started');
  }

  /** Forget cached controller details (after calibration, decommissioning). */
  invalidate(serial: string) {
    this.known.delete(serial);
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
      p.catch(() => this.known.delete(serial));
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
      const seqs = await this.controllers.lastSeqs(rows.map((r) => r.id)).catch(() => new Map<number, number>());
      const bySerial = new Map(rows.map((r) => [r.serial, r]));
      for (const [serial, w] of waiting) {
        const row = bySerial.get(serial);
        // the usual boot is loaded up front so that messages keep their order
        w.resolve(row ? { row, lastSeq: new Map([['', seqs.get(row.id) ?? -1]]) } : null);
      }
    } catch (err) {
      for (const w of waiting.values()) w.reject(err);
    }
  }

  /** -1 when unknown; a database outage must not lose the reading, only the gap check */
  private async storedLastSeq(id: number, boot: string): Promise<number> {
    try {
      return (await this.controllers.lastSeq(id, boot)) ?? -1;
    } catch {
      return -1;
    }
  }

  private counter(id: number): Counter {
    let c = this.counters.get(id);
    if (!c) this.counters.set(id, (c = { accepted: 0, rejected: 0, firstAt: null, lastAt: null }));
    return c;
  }

  onMessage(topic: string, payload: Buffer) {
    const t = parseTopic(topic);
    if (!t) return;
    void this.lookup(t.serial).then((k) => {
      if (!k) {
        this.stats.unknown++;
        return;
      }
      if (t.channel === 'telemetry') return this.onTelemetry(k, payload);
      if (t.channel === 'status') {
        const s = statusSchema.safeParse(safeJson(payload));
        if (s.success) {
          this.counter(k.row.id).online = s.data.state === 'online';
          this.emit('status', { controllerId: k.row.id, siteId: k.row.site_id, online: s.data.state === 'online' });
        }
      }
      if (t.channel === 'result') {
        const r = commandResultSchema.safeParse(safeJson(payload));
        if (r.success) this.emit('command-result', { controllerId: k.row.id, ...r.data });
      }
    }, (err) => this.log.error({ err }, 'controller lookup failed'));
  }

  private async onTelemetry(k: Known, payload: Buffer) {
    const id = k.row.id;
    const parsed = parseTelemetry(payload);
    const now = new Date();
    const c = this.counter(id);
    if (!parsed.ok) {
      this.stats.rejected++;
      c.rejected++;
      if (this.rejects.length < 1000) this.rejects.push({ controller_id: id, at: now, reason: parsed.reason.slice(0, 500), payload: payload.toString('utf8').slice(0, 2000) });
      this.emit('reject', { controllerId: id, reason: parsed.reason });
      return;
    }
    for (const r of parsed.readings) {
      const boot = r.boot ?? '';
      if (!k.lastSeq.has(boot)) {
        const stored = await this.storedLastSeq(id, boot);
        if (!k.lastSeq.has(boot)) k.lastSeq.set(boot, stored);
      }
      const last = k.lastSeq.get(boot)!;
      const fresh = r.seq > last;
      if (fresh && last >= 0 && r.seq > last + 1) void this.requestReplay(k.row.serial, last + 1, r.seq - 1);
      if (fresh) k.lastSeq.set(boot, r.seq);
      const row = toRow(k.row, r, boot);
      if (this.queue.length >= this.maxBuffered) {
        this.stats.droppedOverflow++;
        if (this.stats.droppedOverflow % 1000 === 1) this.log.warn({ bound: this.maxBuffered, dropped: this.stats.droppedOverflow }, 'ingest buffer full: dropping readings (replay recovers them)');
        continue;
      }
      this.queue.push({ row, fresh });
      this.stats.accepted++;
      c.accepted++;
      const ts = new Date(r.ts);
      c.firstAt ??= ts;
      c.lastAt = !c.lastAt || ts > c.lastAt ? ts : c.lastAt;
      this.emit('reading', { controllerId: id, siteId: k.row.site_id, serial: k.row.serial, reading: r, vswr: row.vswr, returnLossDb: row.return_loss_db, forwardW: row.forward_w, reflectedW: row.reflected_w } satisfies LiveReading);
    }
    if (this.queue.length >= this.batchRows) void this.flush();
  }

  private async requestReplay(serial: string, fromSeq: number, toSeq: number) {
    this.stats.replaysRequested++;
    const cmd = { v: 1, id: `replay-${Date.now()}-${fromSeq}`, type: 'replay', fromSeq, toSeq };
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
      } catch (err) {
        this.stats.dbFailures++;
        if (this.stats.dbFailures % 20 === 1) this.log.error({ err: (err as Error).message, buffered: this.queue.length }, 'database write failed; holding readings');
      } finally {
        this.inFlight = 0;
        this.flushing = null;
      }
    })();
    return this.flushing;
  }

  /** rows waiting to be written, including those of the flush under way */
  get buffered() {
    return this.queue.length + this.inFlight;
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
    try {
      await this.controllers.applyCounters(items);
      await this.controllers.recordRejects(rejects);
    } catch (err) {
      this.log.warn({ err: (err as Error).message }, 'controller counters not written; will retry');
      for (const it of items) {
        const c = this.counter(it.id);
        c.accepted += it.accepted;
        c.rejected += it.rejected;
        c.firstAt ??= it.firstAt;
        c.lastAt = it.lastAt;
        if (it.online !== undefined && c.online === undefined) c.online = it.online;
      }
    }
  }

  async close() {
    if (this.closed) return;
    this.closed = true;
    if (this.timer) clearInterval(this.timer);
    if (this.countersTimer) clearInterval(this.countersTimer);
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
