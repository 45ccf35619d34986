/**
 * History benchmark: 50 concurrent chart requests for 15 min, 24 h, 30 days and
 * 400 days of one controller's data, while a probe asks /api/health every 50 ms.
 * Prints p50/p95 per range, the source each range read, and health's latency meanwhile.
 * Data: 26 h of 1 Hz readings and 400 days of minute (and hourly) rollups per controller,
 * generated in MariaDB with its sequence engine. Loopback only.
 *   npx tsx test/bench/history.ts [--concurrency 50] [--rounds 3] [--points 1000]
 */
import { parseArgs } from 'node:util';
import { Worker } from 'node:worker_threads';

import supertest from 'supertest';

import { hourColumns, hoursFromMinutes } from '@/migrations/20261203050000_hourly_rollups';
import { sessionFromSetCookie } from '@/test/helpers/cookies';

import { forkServer, runBench, serverEnv, stopServer } from './bench-db';

const { values } = parseArgs({
  options: {
    concurrency: { type: 'string', default: '50' },
    rounds: { type: 'string', default: '3' },
    points: { type: 'string', default: '1000' },
    controllers: { type: 'string', default: '2' },
  },
});
const concurrency = Number(values.concurrency);
const rounds = Number(values.rounds);
const points = Number(values.points);
const nCtl = Number(values.controllers);
const pct = (xs: number[], q: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? s[Math.min(s.length - 1, Math.floor(q * s.length))] : NaN;
};
const ms = (x: number) => `${x.toFixed(0)} ms`;

void runBench('history', async ({ config, db }) => {
  const now = Math.floor(Date.now() / 60_000) * 60_000;
  const ids: number[] = [];
  const t0 = Date.now();
  for (let i = 0; i < nCtl; i++) {
    const [id] = await db('controllers').insert({
      serial: `BENCH-H-${i}`,
      site_id: 1,
      kind: 'heater',
      interval_s: 1,
      password_hash: 'unused',
    });
    ids.push(id);
    const rawFrom = now / 1000 - 26 * 3600;
    // 26 h of 1 Hz readings, a VSWR swell every few minutes
    await db.raw(
      `INSERT INTO readings (controller_id, boot, seq, ts, received_at, air_temp_c, humidity_pct, moisture, forward_w,
         reflected_w, vswr, return_loss_db, heater_mode, heater_on, heater_current_a, supply_volts)
       SELECT ?, 'b', seq, FROM_UNIXTIME(? + seq), FROM_UNIXTIME(? + seq), -2 + (seq MOD 600) / 300, 92, 1, 1000,
         10 + (seq MOD 317), 1.2 + (seq MOD 317) / 1000, 20, 'auto', 1, 10, 240
       FROM seq_0_to_93599`,
      [id, rawFrom, rawFrom],
    );
    const minFrom = now / 1000 - 400 * 86_400;
    // 400 days of minute rollups
    await db.raw(
      `INSERT INTO rollups_minute (controller_id, minute, n, vswr_min, vswr_max, vswr_sum, vswr_n, forward_w_min,
         forward_w_max, forward_w_sum, forward_w_n, reflected_w_min, reflected_w_max, reflected_w_sum, reflected_w_n,
         air_temp_c_min, air_temp_c_max, air_temp_c_sum, air_temp_c_n, humidity_pct_min, humidity_pct_max,
         humidity_pct_sum, humidity_pct_n, heater_on_n, moisture_n, vi_sum, vi_n)
       SELECT ?, FROM_UNIXTIME(? + seq * 60), 60, 1.2, 1.2 + (seq MOD 97) / 100, 60 * 1.25, 60, 1000, 1000, 60000, 60,
         10, 30, 900, 60, -3, -1, -120, 60, 90, 95, 5520, 60, 60, 60, 60 * 2400, 60
       FROM seq_0_to_575999`,
      [id, minFrom],
    );
  }
  await db.raw(`INSERT INTO rollups_hour (${hourColumns.join(', ')}) ${hoursFromMinutes('1 = 1')}`);
  console.log(`data: ${nCtl} controllers × (93,600 readings + 576,000 minute rollups) in ${Date.now() - t0} ms`);

  // the server in a process of its own, so parsing the answers here does not slow it down
  const env = await serverEnv(config);
  const child = await forkServer(env);
  const server = { url: `http://127.0.0.1:${env.PORT}` };
  const signIn = await supertest(server.url)
    .post('/api/auth/sign-in')
    .send({ email: 'operator@demo.thawline.test', password: 'thawline-demo' });
  const cookie = `thawline_session=${sessionFromSetCookie(signIn.headers['set-cookie'])}`;

  const ranges = [
    ['15 min', 15 * 60_000],
    ['24 h', 86_400_000],
    ['30 days', 30 * 86_400_000],
    ['400 days', 400 * 86_400_000],
  ] as const;
  const get = async (path: string) => {
    const s = performance.now();
    const res = await fetch(`${server.url}${path}`, { headers: { Cookie: cookie } });
    const body = (await res.json()) as { source?: string; points?: unknown[] };
    if (!res.ok) throw new Error(`${path}: ${res.status} ${JSON.stringify(body)}`);
    return { ms: performance.now() - s, body };
  };

  // health is asked from a thread of its own: in this one, reading the 50 chart answers
  // would delay the probe's own timing and be counted against the server
  const probeHealth = () => {
    const w = new Worker(probeCode, { eval: true, workerData: { url: `${server.url}/api/health`, cookie } });
    return () =>
      new Promise<number[]>((resolve, reject) => {
        w.once('message', (times: number[]) => void w.terminate().then(() => resolve(times)));
        w.once('error', reject);
        w.postMessage('stop');
      });
  };
  const rows: string[][] = [];
  const healthAll: number[] = [];
  const stopIdle = probeHealth();
  await new Promise((r) => setTimeout(r, 2000));
  const idle = await stopIdle();
  for (const [label, span] of ranges) {
    const times: number[] = [];
    let source = '';
    let n = 0;
    const stopProbe = probeHealth();
    const query = (k: number) => {
      const to = new Date(now - (k % 7) * 60_000);
      const from = new Date(to.getTime() - span);
      return `/api/controllers/${ids[k % ids.length]}/readings?from=${from.toISOString()}&to=${to.toISOString()}&points=${points}`;
    };
    const alone: number[] = [];
    for (let k = 0; k < 7; k++) alone.push((await get(query(k))).ms);
    for (let r = 0; r < rounds; r++) {
      await Promise.all(
        Array.from({ length: concurrency }, async (_, k) => {
          const res = await get(query(k));
          times.push(res.ms);
          source = res.body.source ?? '';
          n = Math.max(n, res.body.points?.length ?? 0);
        }),
      );
    }
    const health = await stopProbe();
    healthAll.push(...health);
    rows.push([
      label,
      source,
      String(n),
      ms(pct(alone, 0.5)),
      ms(pct(times, 0.5)),
      ms(pct(times, 0.95)),
      ms(pct(health, 0.5)),
      ms(pct(health, 0.95)),
      ms(Math.max(...health)),
    ]);
  }
  await stopServer(child);

  console.log(`\n${concurrency} concurrent requests × ${rounds} rounds per range, at most ${points} points each`);
  const head = ['range', 'source', 'points', 'alone', 'p50', 'p95', 'health p50', 'health p95', 'health max'];
  const width = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)) + 2);
  const line = (r: string[]) => r.map((c, i) => c.padEnd(width[i])).join('');
  console.log(line(head));
  for (const r of rows) console.log(line(r));
  console.log(`\nhealth when idle: p50 ${ms(pct(idle, 0.5))}, p95 ${ms(pct(idle, 0.95))}`);
  console.log(`goal: history p95 ≤ 500 ms for every range; health unaffected (its p95 under load near its idle p95)`);
  const worst = Math.max(...rows.map((r) => Number.parseFloat(r[5])));
  console.log(`worst history p95: ${ms(worst)} — ${worst <= 500 ? 'meets' : 'misses'} the goal`);
});

/** The health probe's thread: asks /api/health every 50 ms until told to stop, then answers with the times. */
const probeCode = `
const { parentPort, workerData } = require('node:worker_threads');
let busy = true;
parentPort.on('message', () => (busy = false));
(async () => {
  const times = [];
  while (busy) {
    const s = performance.now();
    const res = await fetch(workerData.url, { headers: { Cookie: workerData.cookie } });
    await res.arrayBuffer();
    if (!res.ok) throw new Error('health answered ' + res.status);
    times.push(performance.now() - s);
    await new Promise((r) => setTimeout(r, 50));
  }
  parentPort.postMessage(times);
})();
`;
