/**
 * Restart benchmark: N virtual controllers (default 1,000, one reading every 5 s,
 * each with a buffer that answers replay requests) report to a server in its own
 * process; the server is killed (kill -9, or --mode term) and started again. Prints
 * the time until all are online again, until every gap is replayed, and readings
 * lost, duplicated, and alarms raised by the restart. Loopback only.
 *   npx tsx test/bench/restart.ts [--controllers 1000] [--interval 5] [--mode kill|term]
 */
import crypto from 'node:crypto';
import { parseArgs } from 'node:util';

import { deviceSecrets } from '@/server/broker/device-secret';

import { forkServer, runBench, serverEnv, stopServer } from './bench-db';
import { virtualDevices } from './devices';

const { values } = parseArgs({
  options: {
    controllers: { type: 'string', default: '1000' },
    interval: { type: 'string', default: '5' },
    mode: { type: 'string', default: 'kill' },
  },
});
const n = Number(values.controllers);
const intervalMs = Number(values.interval) * 1000;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

void runBench(
  'restart',
  async ({ config, db }) => {
    const key = crypto.randomBytes(32).toString('hex');
    const password = 'bench-controller-pw';
    const hash = deviceSecrets(Buffer.from(key, 'hex')).hash(password);
    const serials = Array.from({ length: n }, (_, i) => `RST-${i}`);
    for (let i = 0; i < n; i += 500) {
      await db('controllers').insert(
        serials.slice(i, i + 500).map((serial, j) => ({
          serial,
          site_id: ((i + j) % 12) + 1,
          kind: 'heater',
          interval_s: intervalMs / 1000,
          password_hash: hash,
        })),
      );
    }
    const env = await serverEnv({ ...config, DEVICE_KEY: key });
    const mqttPort = Number(env.MQTT_PORT);
    let server = await forkServer(env);

    // the devices: each samples every interval whether connected or not, and keeps what it sampled
    const fleet = virtualDevices(
      `mqtt://127.0.0.1:${mqttPort}`,
      serials.map((serial) => ({ serial, password })),
      intervalMs,
    );
    const devices = fleet.devices;
    await fleet.allConnected();
    console.log(`${n} controllers online; running ${(intervalMs * 3) / 1000} s before the restart`);
    await sleep(intervalMs * 3);

    const alarmsBefore = Number((await db('alarms').count({ n: '*' }).first())!.n);
    const restartAt = Date.now();
    const sampledBefore = devices.reduce((a, d) => a + d.seq, 0);
    await stopServer(server, values.mode === 'term' ? 'SIGTERM' : 'SIGKILL');
    server = await forkServer(env);
    const upAt = Date.now();
    while (devices.some((d) => !d.client.connected || d.connectedAt < restartAt)) {
      if (Date.now() > upAt + 120_000)
        throw new Error(`only ${devices.filter((d) => d.connectedAt > restartAt).length} of ${n} back within 120 s`);
      await sleep(100);
    }
    const allOnlineS = (Date.now() - restartAt) / 1000;
    // every reading sampled before the restart stored: the gaps are replayed
    let replayedS: number | null = null;
    while (Date.now() < restartAt + 180_000) {
      const stored = Number(
        (await db('readings')
          .whereIn(
            'boot',
            devices.map((d) => d.boot),
          )
          .andWhere('ts', '<=', new Date(restartAt))
          .count({ n: '*' })
          .first())!.n,
      );
      if (stored >= sampledBefore) {
        replayedS = (Date.now() - restartAt) / 1000;
        break;
      }
      await sleep(500);
    }
    await sleep(intervalMs * 2);
    fleet.stopSampling();
    const stopAt = Date.now();
    await sleep(3000);
    // readings of the last interval may still be arriving; wait for them to settle
    const sent = devices.reduce((a, d) => a + d.seq, 0);
    let stored = 0;
    for (let i = 0; i < 60; i++) {
      stored = Number((await db('readings').count({ n: '*' }).first())!.n);
      if (stored >= sent) break;
      await sleep(500);
    }
    const dupRow = await db.raw(
      'SELECT COUNT(*) AS n FROM (SELECT controller_id, ts FROM readings GROUP BY controller_id, ts HAVING COUNT(*) > 1) d',
    );
    // alarms raised by the restart, not by the devices stopping at the end of the run
    const alarms = await db('alarms')
      .where('raised_at', '>=', new Date(restartAt))
      .andWhere('raised_at', '<', new Date(stopAt))
      .select('kind');
    // which readings are missing, to tell where they were lost
    const have = await db('readings')
      .whereIn(
        'boot',
        devices.map((d) => d.boot),
      )
      .select('boot', 'seq');
    const haveSet = new Set(have.map((h) => `${h.boot}:${h.seq}`));
    const missing = devices.flatMap((d) =>
      d.buffer
        .map((r, seq) => ({ serial: d.serial, seq, ts: (r as { ts: string }).ts }))
        .filter((x) => !haveSet.has(`${d.boot}:${x.seq}`)),
    );
    console.log(
      `restart by ${values.mode === 'term' ? 'SIGTERM' : 'kill -9'} with ${n} controllers at one reading per ${intervalMs / 1000} s`,
    );
    console.log(
      `all online again after ${allOnlineS.toFixed(1)} s (server process up after ${((upAt - restartAt) / 1000).toFixed(1)} s)`,
    );
    console.log(
      replayedS == null ? 'gaps NOT all replayed within 180 s' : `all gaps replayed after ${replayedS.toFixed(1)} s`,
    );
    console.log(
      `sent ${sent}, stored ${stored}, lost ${Math.max(0, sent - stored)}, duplicates ${Number(dupRow[0][0].n)}`,
    );
    if (missing.length)
      console.log(
        `missing (first 8): ${missing
          .slice(0, 8)
          .map((m) => `${m.serial}#${m.seq} at ${((Date.parse(m.ts) - restartAt) / 1000).toFixed(1)} s`)
          .join(', ')}`,
      );
    console.log(
      `alarms raised since the restart: ${alarms.length}${alarms.length ? ` (${[...new Set(alarms.map((a) => a.kind))].join(', ')})` : ''}; alarms before: ${alarmsBefore}`,
    );
    await fleet.close();
    await stopServer(server);
  },
  15 * 60_000,
);
