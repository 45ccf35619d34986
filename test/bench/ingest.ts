/**
 * Ingest benchmark: N virtual controllers publish batches of readings over MQTT to
 * the embedded broker for a bounded time; prints readings/s written to MariaDB and
 * the raw multi-row INSERT ceiling measured in the same run. Loopback only.
 *   npx tsx test/bench/ingest.ts [--controllers 200] [--seconds 15] [--batch 20]
 */
import { parseArgs } from 'node:util';

import mqtt from 'mqtt';
import pino from 'pino';

import { deviceSecrets } from '@/server/broker/device-secret';
import { startServer } from '@/server/main';

import { runBench } from './bench-db';
import { rawInsertCeiling, reading } from './bench-reading';

const { values } = parseArgs({
  options: {
    controllers: { type: 'string', default: '200' },
    seconds: { type: 'string', default: '15' },
    batch: { type: 'string', default: '20' },
    via: { type: 'string', default: 'in-process' },
  },
});
const nCtl = Number(values.controllers);
const seconds = Math.min(120, Number(values.seconds));
const batch = Number(values.batch);

void runBench('ingest', async ({ config, db }) => {
  const password = 'bench-controller-pw';
  const hash = deviceSecrets(Buffer.from(config.DEVICE_KEY!, 'hex')).hash(password);
  const serials = Array.from({ length: nCtl }, (_, i) => `BENCH-${i}`);
  for (let i = 0; i < serials.length; i += 500) {
    await db('controllers').insert(
      serials
        .slice(i, i + 500)
        .map((serial) => ({ serial, site_id: 1, kind: 'heater', interval_s: 1, password_hash: hash })),
    );
  }
  const server = await startServer(config, db, pino({ level: 'warn' }), {
    ingestVia: values.via === 'mqtt' ? 'mqtt' : 'in-process',
  });
  const url = `mqtt://127.0.0.1:${server.broker!.port}`;
  const clients = await Promise.all(
    serials.map((serial) =>
      mqtt.connectAsync(url, {
        username: serial,
        password,
        reconnectPeriod: 0,
        protocolVersion: 4,
        connectTimeout: 15_000,
      }),
    ),
  );
  const seqs = new Map<string, number>(serials.map((s) => [s, 0]));
  const startWritten = server.ingest.stats.written;
  const t0 = Date.now();
  const end = t0 + seconds * 1000;
  let published = 0;
  // each client keeps at most 4 batches in flight (QoS 1)
  await Promise.all(
    clients.map(async (c, i) => {
      const serial = serials[i];
      while (Date.now() < end) {
        const inflight: Promise<unknown>[] = [];
        for (let k = 0; k < 4; k++) {
          const start = seqs.get(serial)!;
          const now = Date.now();
          const payload = JSON.stringify(Array.from({ length: batch }, (_, j) => reading(start + j, now)));
          seqs.set(serial, start + batch);
          published += batch;
          inflight.push(c.publishAsync(`thawline/v1/${serial}/telemetry`, payload, { qos: 1 }));
        }
        await Promise.all(inflight);
        // keep the ingest queue bounded: back off when it is far behind
        while (server.ingest.buffered > 50_000 && Date.now() < end) await new Promise((r) => setTimeout(r, 20));
      }
    }),
  );
  const sendS = (Date.now() - t0) / 1000;
  // every published reading was acknowledged by the broker; wait until each is written (or found a duplicate)
  const drainDeadline = Date.now() + 30_000;
  while (
    server.ingest.stats.written - startWritten + server.ingest.stats.duplicates < published &&
    Date.now() < drainDeadline
  ) {
    await server.ingest.flush();
    await new Promise((r) => setTimeout(r, 50));
  }
  const totalS = (Date.now() - t0) / 1000;
  const written = server.ingest.stats.written - startWritten;
  await Promise.all(clients.map((c) => c.endAsync()));
  await server.stop();

  // raw INSERT ceiling, same database, same row shape
  await db('readings').delete();
  const rawRate = await rawInsertCeiling(db, 1);
  const rate = written / totalS;
  console.log(`controllers ${nCtl}, batch ${batch} readings/message, ingest ${values.via}`);
  console.log(`published ${published} readings in ${sendS.toFixed(1)} s (${(published / sendS).toFixed(0)}/s offered)`);
  console.log(`written ${written} rows in ${totalS.toFixed(1)} s: ${rate.toFixed(0)} readings/s end-to-end`);
  console.log(
    `dropped past the buffer bound: ${server.ingest.stats.droppedOverflow}; rejected: ${server.ingest.stats.rejected}; duplicates ignored: ${server.ingest.stats.duplicates}; failed writes retried: ${server.ingest.stats.dbFailures}`,
  );
  console.log(
    `raw 500-row INSERT ceiling in this run: ${rawRate.toFixed(0)} rows/s; ingest reaches ${(rate / rawRate).toFixed(2)} of it`,
  );
});
