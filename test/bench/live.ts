/**
 * Live benchmark: N controllers publish over MQTT to the embedded broker, M
 * browser-like WebSocket clients signed in on /live receive. Each reading carries
 * its publish time, so every client measures publish → message received. Prints
 * p50/p95/p99/max, and what the hub sent and coalesced. Loopback only.
 *   npx tsx test/bench/live.ts [--controllers 40] [--rate 2] [--clients 200] [--seconds 20] [--receivers 2]
 * The controllers publish from one child process and the clients are shared among
 * `--receivers` others (test/bench/live-peers.ts), as they would be on a network.
 * (40 controllers × 2 readings/s is the 80 readings/s; --controllers 500 --rate 2 gives 1,000/s)
 */
import { fork } from 'node:child_process';
import path from 'node:path';
import { parseArgs } from 'node:util';

import pino from 'pino';
import { chromium } from 'playwright-core';
import supertest from 'supertest';

import { deviceSecrets } from '@/server/broker/device-secret';
import { projectRoot } from '@/server/config';
import { startServer } from '@/server/main';
import { buildWebExport, webExportIsStale } from '@/server/web-build';
import { sessionFromSetCookie } from '@/test/helpers/cookies';

import { runBench } from './bench-db';

const { values } = parseArgs({
  options: {
    controllers: { type: 'string', default: '40' },
    rate: { type: 'string', default: '2' },
    clients: { type: 'string', default: '200' },
    seconds: { type: 'string', default: '20' },
    receivers: { type: 'string', default: '2' },
    browser: { type: 'string', default: '1' },
  },
});
const nCtl = Number(values.controllers);
const rate = Number(values.rate);
const nClients = Number(values.clients);
const seconds = Math.min(120, Number(values.seconds));
const nReceivers = Math.max(1, Number(values.receivers));
// a real Chromium page on the Board as well; it takes about a core, so on a small machine run with and without
const withBrowser = values.browser !== '0';
const pct = (xs: number[], q: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? s[Math.min(s.length - 1, Math.floor(q * s.length))] : NaN;
};

void runBench('live', async ({ config, db, root }) => {
  if (webExportIsStale(root)) await buildWebExport(root);
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
  // the controllers and the browsers run in processes of their own, as on a network: the
  // server's event loop is then the server's, and each receiver's parsing is its own
  const peer = (start: object) => {
    const child = fork(path.join(projectRoot(), 'test/bench/live-peers.ts'), [], { execArgv: ['--import', 'tsx'] });
    const said = (type: string) =>
      new Promise<{ latencies?: number[] }>((resolve) => {
        const on = (m: { type: string; latencies?: number[] }) => {
          if (m.type !== type) return;
          child.off('message', on);
          resolve(m);
        };
        child.on('message', on);
      });
    const ready = said('ready');
    child.send({ type: 'start', start });
    return { child, said, ready };
  };
  const receivers = Array.from({ length: nReceivers }, (_, k) =>
    peer({
      role: 'receive',
      url: server.url,
      cookie,
      clients: Math.floor(nClients / nReceivers) + (k < nClients % nReceivers ? 1 : 0),
    }),
  );
  await Promise.all(receivers.map((r) => r.ready));
  const publisher = peer({
    role: 'publish',
    brokerUrl: `mqtt://127.0.0.1:${server.broker!.port}`,
    serials,
    password,
    rate,
  });
  await publisher.ready;
  // one real browser on the Board: publish → message received in the page, and → the
  // next animation frame after it (the store applies readings there; paint follows it)
  const openBoard = async () => {
    const browser = await chromium.launch({
      executablePath: '/usr/bin/chromium',
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking'],
    });
    const page = await browser.newPage({ viewport: { width: 1920, height: 1080 } });
    // plain script text, before the app opens its socket: every /live message is timed on arrival and at the next frame
    await page.addInitScript(`(() => {
      window.__live = { on: false, received: [], frame: [] };
      const Native = window.WebSocket;
      window.WebSocket = function (url, protocols) {
        const ws = protocols === undefined ? new Native(url) : new Native(url, protocols);
        ws.addEventListener('message', (e) => {
          if (!window.__live.on || typeof e.data !== 'string' || e.data.indexOf('"readings"') < 0) return;
          const at = performance.timeOrigin + performance.now();
          const ts = JSON.parse(e.data).items.map((i) => Date.parse(i.ts));
          for (const t of ts) window.__live.received.push(at - t);
          requestAnimationFrame(() => {
            const painted = performance.timeOrigin + performance.now();
            for (const t of ts) window.__live.frame.push(painted - t);
          });
        });
        return ws;
      };
      window.WebSocket.prototype = Native.prototype;
      Object.assign(window.WebSocket, { CONNECTING: 0, OPEN: 1, CLOSING: 2, CLOSED: 3 });
    })()`);
    await page.goto(`${server.url}/sign-in`);
    await page.getByLabel('E-mail').fill('operator@demo.thawline.test');
    await page.getByLabel('Password').fill('thawline-demo');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByText('Live', { exact: true }).waitFor({ timeout: 30_000 });
    return { browser, page };
  };
  const board = withBrowser ? await openBoard() : null;
  await new Promise((r) => setTimeout(r, 3000));
  const before = server.live.stats();
  for (const r of receivers) r.child.send({ type: 'measure' });
  await board?.page.evaluate('window.__live.on = true');
  await new Promise((r) => setTimeout(r, seconds * 1000));
  const reports = await Promise.all(
    receivers.map((r) => {
      const done = r.said('done');
      r.child.send({ type: 'stop' });
      return done;
    }),
  );
  const after = server.live.stats();
  const latencies = reports.flatMap((x) => x.latencies ?? []);
  const inPage = (board ? await board.page.evaluate('window.__live.on = false, window.__live') : null) as {
    received: number[];
    frame: number[];
  } | null;
  await board?.browser.close();
  const pubDone = publisher.said('done');
  publisher.child.send({ type: 'stop' });
  await pubDone;
  for (const p of [publisher, ...receivers]) p.child.kill();
  console.log(
    `${nCtl} controllers × ${rate} readings/s = ${nCtl * rate} readings/s to ${nClients} /live clients, ${seconds} s measured`,
  );
  console.log(
    `publish → received: p50 ${pct(latencies, 0.5)} ms, p95 ${pct(latencies, 0.95)} ms, p99 ${pct(latencies, 0.99)} ms, max ${latencies.reduce((m, x) => (x > m ? x : m), 0)} ms (${latencies.length} deliveries)`,
  );
  console.log(
    `hub: ${after.messages - before.messages} messages carrying ${after.readings - before.readings} readings; ${after.coalesced - before.coalesced} coalesced (a newer reading of the same controller in the same turn)`,
  );
  const row = (xs: number[]) =>
    `p50 ${pct(xs, 0.5).toFixed(0)} ms, p95 ${pct(xs, 0.95).toFixed(0)} ms, p99 ${pct(xs, 0.99).toFixed(0)} ms, max ${xs.reduce((m, x) => (x > m ? x : m), 0).toFixed(0)} ms (${xs.length})`;
  if (inPage) {
    console.log(`Chromium on the Board, publish → message received: ${row(inPage.received)}`);
    console.log(`Chromium on the Board, publish → next frame after it: ${row(inPage.frame)}`);
  }
  console.log('goal (issue 17): p99 ≤ 50 ms at 1,000 readings/s with 200 clients');
  await server.stop();
});
