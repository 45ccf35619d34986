/**
 * Export benchmark: 2 million one-second readings (about 23 days of one controller)
 * streamed as CSV over HTTP; prints throughput and the server's peak memory while
 * it streams. Loopback only.
 *   npx tsx test/bench/export.ts [--rows 2000000]
 */
import http from 'node:http';
import { parseArgs } from 'node:util';

import pino from 'pino';
import supertest from 'supertest';

import { startServer } from '@/server/main';
import { sessionFromSetCookie } from '@/test/helpers/cookies';

import { runBench } from './bench-db';

const { values } = parseArgs({ options: { rows: { type: 'string', default: '2000000' } } });
const total = Number(values.rows);

void runBench('export', async ({ config, db }) => {
  const c = await db('controllers').where({ serial: 'KTP-1' }).first();
  const start = Date.parse('2026-11-01T00:00:00.000Z');
  const t0 = Date.now();
  // pre-built multi-row statements keep the load step short
  const cols =
    '(controller_id, boot, seq, ts, air_temp_c, humidity_pct, moisture, forward_w, reflected_w, vswr, return_loss_db, heater_mode, heater_on, heater_current_a, supply_volts, battery_pct, flame_proven)';
  for (let i = 0; i < total; i += 5000) {
    const vals: string[] = [];
    for (let j = i; j < Math.min(total, i + 5000); j++) {
      const ts = new Date(start + j * 1000).toISOString().slice(0, 23).replace('T', ' ');
      vals.push(
        `(${c.id},'',${j},'${ts}',${(-3 + (j % 600) / 100).toFixed(2)},95,${j % 3 === 0 ? 1 : 0},10000,${(40 + (j % 50)).toFixed(1)},1.14,16.9,'auto',${j % 2},41.6,240,NULL,NULL)`,
      );
    }
    await db.raw(`INSERT INTO readings ${cols} VALUES ${vals.join(',')}`);
  }
  console.log(`loaded ${total} readings in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
  const server = await startServer(config, db, pino({ level: 'warn' }));
  const login = await supertest(server.server)
    .post('/api/auth/sign-in')
    .send({ email: 'engineer@demo.thawline.test', password: 'thawline-demo' });
  global.gc?.();
  const baseRss = process.memoryUsage().rss;
  let peakRss = baseRss;
  let peakLive = 0;
  let ticks = 0;
  // with --expose-gc, collect now and then so that live memory, not garbage not yet collected, is measured
  const sampler = setInterval(() => {
    peakRss = Math.max(peakRss, process.memoryUsage().rss);
    if (global.gc && ++ticks % 10 === 0) {
      global.gc();
      peakLive = Math.max(peakLive, process.memoryUsage().heapUsed + process.memoryUsage().external);
    }
  }, 50);
  const url = new URL(`${server.url}/api/reports/readings.csv`);
  url.searchParams.set('controller', String(c.id));
  url.searchParams.set('from', new Date(start).toISOString());
  url.searchParams.set('to', new Date(start + total * 1000).toISOString());
  const s0 = Date.now();
  const { bytes, lines } = await new Promise<{ bytes: number; lines: number }>((resolve, reject) => {
    http
      .get(
        url.toString(),
        { headers: { Cookie: `thawline_session=${sessionFromSetCookie(login.headers['set-cookie'])}` } },
        (res) => {
          let bytes = 0;
          let lines = 0;
          res.on('data', (d: Buffer) => {
            bytes += d.length;
            for (const b of d) if (b === 10) lines++;
          });
          res.on('end', () => resolve({ bytes, lines }));
          res.on('error', reject);
        },
      )
      .on('error', reject);
  });
  const secs = (Date.now() - s0) / 1000;
  clearInterval(sampler);
  console.log(
    `streamed ${lines - 1} rows (${(bytes / 1e6).toFixed(0)} MB of CSV) in ${secs.toFixed(1)} s: ${((lines - 1) / secs).toFixed(0)} rows/s`,
  );
  console.log(
    `process memory: ${(baseRss / 1e6).toFixed(0)} MB before, peak RSS ${(peakRss / 1e6).toFixed(0)} MB while streaming (+${((peakRss - baseRss) / 1e6).toFixed(0)} MB for ${(bytes / 1e6).toFixed(0)} MB sent)`,
  );
  if (global.gc) console.log(`peak live heap after collection while streaming: ${(peakLive / 1e6).toFixed(0)} MB`);
  else console.log('run with NODE_OPTIONS=--expose-gc to also print live heap after collection');
  await server.stop();
});
