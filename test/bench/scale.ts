/**
 * Scale-out benchmark on the parts `npm run cluster` uses (3-node Galera,
 * mosquitto with dynamic security): readings/s end to end with 1, 2 and 3
 * Thawline instances on this machine, beside the raw 500-row INSERT ceiling
 * through the same Galera node in the same run, then the takeover time after
 * kill -9 of one instance. Loopback only.
 *   npx tsx test/bench/scale.ts [--controllers 60] [--seconds 15] [--batch 20]
 */
import fs from 'node:fs';
import path from 'node:path';
import { parseArgs } from 'node:util';

import mqtt from 'mqtt';

import { dynsecAdmin } from '@/server/broker/dynsec';
import { startLocalCluster } from '@/server/cluster/local';
import { freePort } from '@/test/helpers/ports';

import { rawInsertCeiling, reading } from './bench-reading';

const { values } = parseArgs({
  options: {
    controllers: { type: 'string', default: '60' },
    seconds: { type: 'string', default: '15' },
    batch: { type: 'string', default: '20' },
  },
});
const nCtl = Number(values.controllers);
const seconds = Math.min(60, Number(values.seconds));
const batch = Number(values.batch);
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function main() {
  const root = path.resolve(__dirname, '../..');
  const dir = path.join(root, '.data', 'bench-scale');
  fs.rmSync(dir, { recursive: true, force: true });
  const base = 21_000 + Math.floor(Math.random() * 20) * 100;
  const cluster = await startLocalCluster({
    root,
    dir,
    instances: 1,
    httpPort: base,
    dbPort: base + 10,
    mqttPort: await freePort(),
    smtpPort: await freePort(),
    log: () => {},
  });
  const db = cluster.db;
  try {
    // the bench's controllers: rows here, accounts at the broker
    const password = 'bench-controller-pw';
    const site = (await db('sites').orderBy('id').first('id')) as { id: number };
    const serials = Array.from({ length: nCtl }, (_, i) => `SCALE-${i}`);
    await db('controllers').insert(
      serials.map((serial) => ({ serial, site_id: site.id, kind: 'heater', interval_s: 1, password_hash: 'broker' })),
    );
    const admin = await dynsecAdmin(cluster.mqttUrl, 'admin', cluster.adminPassword);
    for (const s of serials) await admin.controllerAdded(s, password);
    await admin.close();
    const clients = await Promise.all(
      serials.map((serial) =>
        mqtt.connectAsync(cluster.mqttUrl, { username: serial, password, reconnectPeriod: 1000, protocolVersion: 4 }),
      ),
    );
    const seqs = serials.map(() => 0);
    const owned = async () =>
      Number(
        (
          await db('controller_leases')
            .whereIn('controller_id', db('controllers').whereIn('serial', serials).select('id'))
            .whereNotNull('holder')
            .andWhere('expires_at', '>', db.fn.now(3))
            .countDistinct<{ n: number }[]>({ n: 'holder' })
        )[0].n,
      );
    const count = async () => Number((await db('readings').count<{ n: number }[]>({ n: '*' }))[0].n);

    /**
     * Publishes as fast as the broker acknowledges (4 messages in flight per
     * controller) for `seconds`, pausing while more than 10,000 published readings
     * are not yet in MariaDB: the figure is what is written, not what is offered.
     */
    const run = async () => {
      const start = await count();
      const t0 = Date.now();
      const end = t0 + seconds * 1000;
      let published = 0;
      let backlog = 0;
      const poll = setInterval(() => {
        void count().then(
          (n) => (backlog = published - (n - start)),
          () => {},
        );
      }, 250);
      await Promise.all(
        clients.map(async (c, i) => {
          while (Date.now() < end) {
            while (backlog > 10_000 && Date.now() < end) await sleep(50);
            const inflight: Promise<unknown>[] = [];
            for (let k = 0; k < 4; k++) {
              const now = Date.now();
              const payload = JSON.stringify(
                Array.from({ length: batch }, (_, j) => reading(seqs[i] + j, now, 'scale')),
              );
              seqs[i] += batch;
              published += batch;
              inflight.push(c.publishAsync(`thawline/v1/${serials[i]}/telemetry`, payload, { qos: 1 }));
            }
            await Promise.all(inflight);
          }
        }),
      );
      clearInterval(poll);
      // what was acknowledged by the broker, written
      const drain = Date.now() + 60_000;
      while ((await count()) - start < published && Date.now() < drain) await sleep(250);
      const written = (await count()) - start;
      return { written, rate: written / ((Date.now() - t0) / 1000), published };
    };

    const results: { instances: number; rate: number; written: number; published: number }[] = [];
    for (let n = 1; n <= 3; n++) {
      if (n > 1) await cluster.startInstance(n - 1);
      const t = Date.now();
      while ((await owned()) < n && Date.now() - t < 30_000) await sleep(250);
      await sleep(3000);
      const r = await run();
      results.push({ instances: n, ...r });
      console.log(`${n} instance(s): ${r.rate.toFixed(0)} readings/s (${r.written} of ${r.published} written)`);
    }

    // raw ceiling through the same node, same row shape
    const ctl = (await db('controllers').where({ serial: serials[0] }).first('id')) as { id: number };
    const rawRate = await rawInsertCeiling(db, ctl.id);

    // takeover: kill -9 instance 1, time until its controllers have another owner
    const victim = 'thawline-1';
    const held = (await db('controller_leases').where({ holder: victim }).pluck('controller_id')) as number[];
    const killedAt = Date.now();
    await cluster.kill(0);
    let takeoverS = NaN;
    while (Date.now() - killedAt < 30_000) {
      const still = Number(
        (await db('controller_leases').whereIn('controller_id', held).andWhere({ holder: victim }).count({ n: '*' }))[0]
          .n,
      );
      if (still === 0) {
        takeoverS = (Date.now() - killedAt) / 1000;
        break;
      }
      await sleep(100);
    }
    await Promise.all(clients.map((c) => c.endAsync(true)));

    console.log(`\n${nCtl} controllers, ${batch} readings per message, ${seconds} s per step, all on this machine:`);
    console.log('instances   readings/s   share of the raw INSERT ceiling');
    for (const r of results)
      console.log(`${String(r.instances).padEnd(12)}${r.rate.toFixed(0).padEnd(13)}${(r.rate / rawRate).toFixed(2)}`);
    console.log(`raw 500-row INSERT ceiling through the same Galera node: ${rawRate.toFixed(0)} rows/s`);
    console.log(
      `takeover after kill -9 of one instance (${held.length} controllers): ${takeoverS.toFixed(1)} s (goal ≤ 15 s)`,
    );
  } finally {
    await cluster.stop();
  }
}

main().catch((err: unknown) => {
  console.error(err);
  process.exit(1);
});
