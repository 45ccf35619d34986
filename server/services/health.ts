import type { Knex } from 'knex';

import { durationWords, type HealthPart, overallState, type SystemHealth } from '@/telemetry/health';

/** What the running server knows of itself; absent in an app built without them (API tests). */
export type HealthProbes = {
  broker: () => { ok: boolean; message: string };
  ingest: () => {
    buffered: number;
    dbDownSince: Date | null;
    droppedOverflow: number;
    lastAcceptedAt: Date | null;
    maxBuffered: number;
  };
  engineRunning: () => boolean;
};

const withTimeout = <T>(p: Promise<T>, ms: number) =>
  Promise.race([
    p,
    new Promise<never>((_, reject) => setTimeout(() => reject(new Error(`no answer within ${ms} ms`)), ms).unref()),
  ]);

/**
 * One health picture: each part ok, degraded or down with words an operator can
 * act on. The database is asked with a short timeout so health answers during an
 * outage instead of waiting for it.
 */
export function healthService(db: Knex, probes: () => HealthProbes | null) {
  return {
    async check(now = new Date()): Promise<SystemHealth> {
      const parts: HealthPart[] = [];
      const p = probes();
      const ingest = p?.ingest();
      // one question to the database: the mail backlog, whose answer also shows it answers
      // (a second round trip doubled health's wait while long reads kept MariaDB busy)
      const outbox = await withTimeout(
        db('outbox').where('status', 'queued').first(db.raw('COUNT(*) AS n'), db.raw('MIN(created_at) AS oldest')),
        2000,
      ).then(
        (row) => (row ?? {}) as { n?: number; oldest?: Date | null },
        () => null,
      );
      const dbOk = outbox !== null;
      const downFor = ingest?.dbDownSince ? durationWords(now.getTime() - ingest.dbDownSince.getTime()) : null;
      parts.push(
        dbOk
          ? { part: 'database', state: 'ok', message: 'answering' }
          : { part: 'database', state: 'down', message: `Database unreachable${downFor ? ` for ${downFor}` : ''}` },
      );
      if (p && ingest) {
        const b = p.broker();
        parts.push({ part: 'broker', state: b.ok ? 'ok' : 'down', message: b.message });
        const held = `${ingest.buffered.toLocaleString('en-GB')} readings buffered`;
        const full = ingest.buffered > ingest.maxBuffered * 0.8;
        parts.push({
          part: 'ingest',
          state: ingest.dbDownSince || full || ingest.buffered > 5000 ? 'degraded' : 'ok',
          message: ingest.dbDownSince
            ? `writes waiting for the database: ${held}`
            : `${held}${ingest.droppedOverflow ? `; ${ingest.droppedOverflow} dropped past the buffer (replay recovers them)` : ''}`,
        });
        parts.push({
          part: 'alarm-engine',
          state: p.engineRunning() ? 'ok' : 'down',
          message: p.engineRunning() ? 'evaluating' : 'not running',
        });
        const age = ingest.lastAcceptedAt ? now.getTime() - ingest.lastAcceptedAt.getTime() : null;
        parts.push({
          part: 'telemetry',
          state: age != null && age > 5 * 60_000 ? 'degraded' : 'ok',
          message: age == null ? 'no reading since start' : `newest reading ${durationWords(age)} ago`,
        });
      }
      if (outbox) {
        const n = Number(outbox.n ?? 0);
        const oldest = outbox.oldest;
        const late = oldest ? now.getTime() - new Date(oldest).getTime() > 10 * 60_000 : false;
        parts.push({
          part: 'mail',
          state: late ? 'degraded' : 'ok',
          message: n ? `${n} e-mails waiting${late ? ', oldest over 10 min' : ''}` : 'nothing waiting',
        });
      }
      return { status: overallState(parts), checkedAt: now.toISOString(), parts };
    },
  };
}
export type HealthService = ReturnType<typeof healthService>;
