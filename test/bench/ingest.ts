/**
 * Ingest benchmark: N virtual controllers publish batches of readings over MQTT to
 * the embedded broker for a bounded time; prints readings/s written to MariaDB and
 * the raw multi-row INSERT ceiling measured in the same run. Loopback only.
 *   npm run bench:ingest -- [--controllers 200] [--seconds 15] [--batch 20] [--inflight 4]
 *     [--broker embedded|mosquitto] [--client wire|mqtt.js]
 * The server runs as it ships (bundled, under plain node: test/bench/built.ts); the
 * controllers publish from a child process (test/bench/publisher.ts), each keeping
 * `inflight` QoS 1 messages unacknowledged (default 16 for single readings, 4 for batches,
 * so that what is in flight stays below the point where the publishers are paused).
 */
import { fork } from 'node:child_process';
import path from 'node:path';
import { parseArgs } from 'node:util';

import pino from 'pino';

import { deviceSecrets } from '@/server/broker/device-secret';
import { projectRoot } from '@/server/config';
import { startServer } from '@/server/main';
import { startMosquitto } from '@/test/helpers/mosquitto';

import { runBench } from './bench-db';
import { rawInsertCeiling } from './bench-reading';

const { values } = parseArgs({
  options: {
    controllers: { type: 'string', default: '200' },
    seconds: { type: 'string', default: '15' },
    batch: { type: 'string', default: '20' },
    via: { type: 'string', default: 'in-process' },
    inflight: { type: 'string' },
    broker: { type: 'string', default: 'embedded' },
    client: { type: 'string', default: 'wire' },
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
  // --broker mosquitto: Debian's mosquitto takes the controllers' connections and Thawline
  // subscribes to it, as in the external-broker and cluster set-ups (anonymous here: no device auth)
  const mosquitto = values.broker === 'mosquitto' ? await startMosquitto({ bench: { queue: 200_000 } }) : null;
  const server = await startServer(
    mosquitto ? { ...config, MQTT_URL: mosquitto.url } : config,
    db,
    pino({ level: 'warn' }),
    { ingestVia: values.via === 'mqtt' ? 'mqtt' : 'in-process' },
  );
  const url = mosquitto?.url ?? `mqtt://127.0.0.1:${server.broker!.port}`;
  // the controllers publish from a process of their own, as devices on a network would
  const pub = fork(path.join(projectRoot(), 'test/bench/publisher.ts'), [], { execArgv: ['--import', 'tsx'] });
  const said = (type: string) =>
    new Promise<Record<string, number>>((resolve) => {
      const on = (m: { type: string }) => {
        if (m.type !== type) return;
        pub.off('message', on);
        resolve(m as unknown as Record<string, number>);
      };
      pub.on('message', on);
    });
  pub.send({
    type: 'start',
    url,
    serials,
    password,
    seconds,
    batch,
    inflight: Number(values.inflight ?? (batch === 1 ? 16 : 4)),
    client: values.client,
  });
  await said('connected');
  const startWritten = server.ingest.stats.written;
  const t0 = Date.now();
  // keep the ingest queue bounded: the publishers hold off while it is far behind
  let paused = false;
  const pacer = setInterval(() => {
    const behind = server.ingest.buffered;
    if (!paused && behind > 50_000) {
      paused = true;
      pub.send({ type: 'pause' });
    } else if (paused && behind < 20_000) {
      paused = false;
      pub.send({ type: 'resume' });
    }
  }, 20);
  const { published, sendS } = await said('done');
  clearInterval(pacer);
  pub.kill();
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
  await server.stop();
  await mosquitto?.stop();

  // raw INSERT ceiling, same database, same row shape
  await db('readings').delete();
  const rawRate = await rawInsertCeiling(db, 1);
  const rate = written / totalS;
  console.log(
    `controllers ${nCtl}, batch ${batch} readings/message, broker ${values.broker}, ingest ${mosquitto ? 'an MQTT client of mosquitto' : values.via}, load from ${values.client === 'mqtt.js' ? 'the mqtt.js client' : 'MQTT packets written to sockets'}`,
  );
  console.log(`published ${published} readings in ${sendS.toFixed(1)} s (${(published / sendS).toFixed(0)}/s offered)`);
  console.log(`written ${written} rows in ${totalS.toFixed(1)} s: ${rate.toFixed(0)} readings/s end-to-end`);
  console.log(
    `dropped past the buffer bound: ${server.ingest.stats.droppedOverflow}; rejected: ${server.ingest.stats.rejected}; duplicates ignored: ${server.ingest.stats.duplicates}; failed writes retried: ${server.ingest.stats.dbFailures}`,
  );
  console.log(
    `raw 500-row INSERT ceiling in this run: ${rawRate.toFixed(0)} rows/s; ingest reaches ${(rate / rawRate).toFixed(2)} of it`,
  );
});
