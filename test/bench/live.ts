/**
 * Live benchmark: N controllers publish over MQTT to the embedded broker, M
 * browser-like WebSocket clients signed in on /live receive. Each reading carries
 * its publish time, so every client measures publish → message received. Prints
 * p50/p95/p99/max, and what the hub sent and coalesced. Loopback only.
 *   npx tsx test/bench/live.ts [--controllers 40] [--rate 2] [--clients 200] [--seconds 20]
 * (40 controllers × 2 readings/s is the 80 readings/s; --controllers 500 --rate 2 gives 1,000/s)
 */
import { parseArgs } from 'node:util';

import mqtt from 'mqtt';
import pino from 'pino';
import supertest from 'supertest';
import WebSocket from 'ws';

import { deviceSecrets } from '@/server/broker/device-secret';
import { startServer } from '@/server/main';
import { sessionFromSetCookie } from '@/test/helpers/cookies';

import { runBench } from './bench-db';
import { reading } from './bench-reading';

const { values } = parseArgs({
  options: {
    controllers: { type: 'string', default: '40' },
    rate: { type: 'string', default: '2' },
    clients: { type: 'string', default: '200' },
    seconds: { type: 'string', default: '20' },
  },
});
const nCtl = Number(values.controllers);
const rate = Number(values.rate);
const nClients = Number(values.clients);
const seconds = Math.min(120, Number(values.seconds));
const pct = (xs: number[], q: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? s[Math.min(s.length - 1, Math.floor(q * s.length))] : NaN;
};

void runBench('live', async ({ config, db }) => {
  const password = 'bench-controller-pw';
  const hash = deviceSecrets(Buffer.from(config.DEVICE_KEY!, 'hex')).hash(password);
  const serials = Array.from({ length: nCtl }, (_, i) => `LIVE-${i}`);
  for (let i = 0; i < serials.length; i += 500) {
    await db('controllers').insert(
      serials.slice(i, i + 500).map((serial, j) => ({
        serial,
        site_id: ((i + j) % 12) + 1,
        kind: 'heater',
        interval_s: 1,
        password_hash: hash,
      })),
    );
  }
  const server = await startServer(config, db, pino({ level: 'warn' }));
  const signIn = await supertest(server.server)
    .post('/api/auth/sign-in')
    .send({ email: 'operator@demo.thawline.test', password: 'thawline-demo' });
  const cookie = `thawline_session=${sessionFromSetCookie(signIn.headers['set-cookie'])}`;
  const latencies: number[] = [];
  let measuring = false;
  const sockets = await Promise.all(
    Array.from(
      { length: nClients },
      () =>
        new Promise<WebSocket>((resolve, reject) => {
          const ws = new WebSocket(`${server.url.replace('http', 'ws')}/live`, {
            headers: { Cookie: cookie, Origin: server.url },
          });
          ws.on('open', () => resolve(ws));
          ws.on('error', reject);
          ws.on('message', (data) => {
            if (!measuring) return;
            const now = Date.now();
            const m = JSON.parse(data.toString()) as { type: string; items?: { ts: string }[] };
            if (m.type === 'readings') for (const i of m.items!) latencies.push(now - Date.parse(i.ts));
          });
        }),
    ),
  );
  const clients = await Promise.all(
    serials.map((u) =>
      mqtt.connectAsync(`mqtt://127.0.0.1:${server.broker!.port}`, { username: u, password, reconnectPeriod: 0 }),
    ),
  );
  // each controller publishes `rate` readings a second, spread evenly over the second
  const seqs = new Array<number>(nCtl).fill(0);
  const timers = clients.map((c, i) =>
    setTimeout(
      () => {
        const t = setInterval(() => {
          void c.publishAsync(`thawline/v1/${serials[i]}/telemetry`, JSON.stringify(reading(seqs[i]++, Date.now())), {
            qos: 0,
          });
        }, 1000 / rate);
        timers[i] = t;
      },
      (i * 1000) / rate / nCtl,
    ),
  );
  await new Promise((r) => setTimeout(r, 3000));
  const before = server.live.stats();
  measuring = true;
  await new Promise((r) => setTimeout(r, seconds * 1000));
  measuring = false;
  const after = server.live.stats();
  for (const t of timers) clearInterval(t);
  console.log(
    `${nCtl} controllers × ${rate} readings/s = ${nCtl * rate} readings/s to ${nClients} /live clients, ${seconds} s measured`,
  );
  console.log(
    `publish → received: p50 ${pct(latencies, 0.5)} ms, p95 ${pct(latencies, 0.95)} ms, p99 ${pct(latencies, 0.99)} ms, max ${latencies.reduce((m, x) => (x > m ? x : m), 0)} ms (${latencies.length} deliveries)`,
  );
  console.log(
    `hub: ${after.messages - before.messages} messages carrying ${after.readings - before.readings} readings; ${after.coalesced - before.coalesced} coalesced (a newer reading of the same controller in the same turn)`,
  );
  console.log('goal (issue 17): p99 ≤ 50 ms at 1,000 readings/s with 200 clients');
  for (const ws of sockets) ws.terminate();
  await Promise.all(clients.map((c) => c.endAsync()));
  await server.stop();
});
