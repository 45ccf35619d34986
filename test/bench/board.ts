/**
 * Board benchmark: N sites, each controller sending one reading a second over MQTT,
 * rendered live in headless Chromium at 1920×1080. Prints main-thread work per
 * live frame and per second, frame intervals and long tasks. Loopback only.
 *   npx tsx test/bench/board.ts [--sites 50] [--seconds 30]
 */
import { parseArgs } from 'node:util';

import argon2 from 'argon2';
import mqtt from 'mqtt';
import pino from 'pino';
import { chromium } from 'playwright-core';

import { startServer } from '@/server/main';
import { buildWebExport, webExportIsStale } from '@/server/web-build';

import { runBench } from './bench-db';

const { values } = parseArgs({
  options: { sites: { type: 'string', default: '50' }, seconds: { type: 'string', default: '30' } },
});
const nSites = Number(values.sites);
const seconds = Math.min(120, Number(values.seconds));

const pct = (xs: number[], q: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? s[Math.min(s.length - 1, Math.floor(q * s.length))] : 0;
};

void runBench('board', async ({ config, db, root }) => {
  if (webExportIsStale(root)) await buildWebExport(root);
  const password = 'bench-controller-pw';
  const hash = await argon2.hash(password);
  const serials: string[] = [];
  for (let i = 0; i < nSites; i++) {
    const [siteId] = await db('sites').insert({
      code: `B${i}`,
      name: `Bench site ${i}`,
      region: `Bench region ${i % 4}`,
      latitude: 60,
      longitude: 15,
      elevation_m: 100,
      tower_height_m: 100,
      power_source: 'utility',
    });
    const [antennaId] = await db('antennas').insert({
      site_id: siteId,
      name: 'FM',
      service: 'fm',
      protection: 'heater',
      heater_kw: 8,
    });
    await db('controllers').insert({
      serial: `BENCH-${i}`,
      site_id: siteId,
      antenna_id: antennaId,
      kind: 'heater',
      interval_s: 1,
      password_hash: hash,
    });
    serials.push(`BENCH-${i}`);
  }
  const server = await startServer(config, db, pino({ level: 'warn' }));
  const clients = await Promise.all(
    serials.map((u) =>
      mqtt.connectAsync(`mqtt://127.0.0.1:${server.broker!.port}`, { username: u, password, reconnectPeriod: 0 }),
    ),
  );
  const browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
  const page = await browser.newPage({ viewport: { width: 1920, height: 1080 } });
  await page.goto(`${server.url}/sign-in`);
  await page.getByLabel('E-mail').fill('operator@demo.thawline.test');
  await page.getByLabel('Password').fill('thawline-demo');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByText('Live', { exact: true }).waitFor({ timeout: 30_000 });
  // plain script text: tsx would add helper calls to a compiled closure that the page does not have
  await page.evaluate(`(() => {
      window.__bench = { frames: [], long: [] };
      new PerformanceObserver((l) => l.getEntries().forEach((e) => window.__bench.long.push(e.duration))).observe({ type: 'longtask', buffered: false });
      let last = performance.now();
      const tick = (t) => { window.__bench.frames.push(t - last); last = t; requestAnimationFrame(tick); };
      requestAnimationFrame(tick);
    })()`);
  const cdp = await page.context().newCDPSession(page);
  await cdp.send('Performance.enable');
  const metric = async () =>
    Object.fromEntries(
      ((await cdp.send('Performance.getMetrics')) as { metrics: { name: string; value: number }[] }).metrics.map(
        (m) => [m.name, m.value],
      ),
    );
  let seq = 0;
  const publish = setInterval(() => {
    const now = new Date().toISOString();
    seq++;
    clients.forEach((c, i) => {
      const vswr = 1.1 + 0.3 * Math.abs(Math.sin((seq + i) / 7));
      const g = (vswr - 1) / (vswr + 1);
      void c.publishAsync(
        `thawline/v1/${serials[i]}/telemetry`,
        JSON.stringify({
          v: 1,
          seq,
          ts: now,
          airTempC: -1,
          humidityPct: 95,
          moisture: true,
          forwardW: 10_000,
          reflectedW: 10_000 * g * g,
          heater: { mode: 'auto', on: true, currentA: 33 },
          supply: { volts: 240, batteryPct: null },
          flameProven: null,
        }),
        { qos: 0 },
      );
    });
  }, 1000);
  await new Promise((r) => setTimeout(r, 3000));
  const m0 = await metric();
  await page.evaluate('window.__bench.frames = []; window.__bench.long = [];');
  await new Promise((r) => setTimeout(r, seconds * 1000));
  const m1 = await metric();
  const res = (await page.evaluate('window.__bench')) as { frames: number[]; long: number[] };
  clearInterval(publish);
  const busyMs = (m1.TaskDuration - m0.TaskDuration) * 1000;
  const scriptMs = (m1.ScriptDuration - m0.ScriptDuration) * 1000;
  const layoutMs = (m1.LayoutDuration - m0.LayoutDuration + (m1.RecalcStyleDuration - m0.RecalcStyleDuration)) * 1000;
  const updates = nSites * seconds;
  const frames = res.frames;
  console.log(`sites ${nSites}, one reading per site per second, ${seconds} s measured, 1920×1080`);
  console.log(
    `main thread busy ${(busyMs / seconds).toFixed(1)} ms per second (script ${(scriptMs / seconds).toFixed(1)}, style+layout ${(layoutMs / seconds).toFixed(1)})`,
  );
  console.log(
    `work per site update ${(busyMs / updates).toFixed(2)} ms; per 1 s of all sites updating ${(busyMs / seconds).toFixed(1)} ms`,
  );
  console.log(
    `frames ${frames.length}, interval p50 ${pct(frames, 0.5).toFixed(1)} ms, p95 ${pct(frames, 0.95).toFixed(1)} ms, over 33 ms: ${frames.filter((f) => f > 33).length}`,
  );
  console.log(
    `long tasks (> 50 ms): ${res.long.length}${res.long.length ? `, longest ${Math.max(...res.long).toFixed(0)} ms` : ''}`,
  );
  await browser.close();
  await Promise.all(clients.map((c) => c.endAsync()));
  await server.stop();
});
