import { type ChildProcess, spawn } from 'node:child_process';
import path from 'node:path';

import { afterAll, describe, expect, it } from 'vitest';

import { formatClock } from '@/telemetry/time';
import { browserJourney, screenshot, signIn, viewports } from '@/test/helpers/browser';
import { demoController, reading } from '@/test/helpers/server';
import { until } from '@/test/helpers/wait';

let sim: ChildProcess | null = null;
const root = path.resolve(__dirname, '../..');

const env = browserJourney();
afterAll(async () => {
  sim?.kill('SIGTERM');
});

/** The simulator as a field device, in one node process with the tsx loader (the tsx CLI would start two). */
function startSimulator(password: string, port: number) {
  const child = spawn(
    process.execPath,
    [
      '--import',
      'tsx',
      path.join(root, 'simulator/main.ts'),
      '--serial',
      'E2E-OXS-9',
      '--password',
      password,
      '--url',
      `mqtt://127.0.0.1:${port}`,
      '--interval',
      '2',
      '--dropout',
      '0',
    ],
    { cwd: root, stdio: ['ignore', 'pipe', 'pipe'] },
  );
  let output = '';
  let exit: number | null = null;
  child.stdout!.on('data', (d: Buffer) => (output += d.toString()));
  child.stderr!.on('data', (d: Buffer) => (output += d.toString()));
  child.on('exit', (code) => (exit = code));
  return {
    child,
    exit: () => exit,
    // printable text, each line marked, so that a report keeps whatever the process wrote
    output: () =>
      output
        .replace(/[^\x20-\x7e\n]/g, '?')
        .slice(-2000)
        .split('\n')
        .map((l) => `| ${l}`)
        .join('\n'),
  };
}

describe('integrator enrols a controller and watches it come online', () => {
  it('through the form, with the credentials shown once and the simulator connecting', async () => {
    const { t, b } = env;
    const page = await b.browser.newPage({ viewport: viewports.wide });
    page.setDefaultTimeout(15_000);
    await signIn(page, t.url, 'integrator@demo.thawline.test');
    await page.getByRole('link', { name: 'Controllers' }).click();
    await page.getByRole('button', { name: 'Enrol a controller' }).click();
    await page.getByRole('button', { name: 'Enrol controller' }).click();
    await page.getByText('Choose a site').waitFor();
    await page.getByLabel('Serial').fill('E2E-OXS-9');
    // twelve sites and more: the picker finds one by a few letters
    await page.getByLabel('Find a site').fill('oxlow');
    await page.getByRole('radio', { name: 'Oxlow Summit (OXS)' }).click();
    await page.getByRole('radio', { name: 'FM standby array' }).click();
    await page.getByRole('radio', { name: 'Heater controller', exact: true }).click();
    await page.getByLabel('Reporting interval (s)').fill('2');
    await page.getByRole('button', { name: 'Enrol controller' }).click();
    await page.getByText('shown only this once').waitFor();
    const password = (await page.getByLabel('Password', { exact: true }).textContent())!.trim();
    expect(password.length).toBeGreaterThanOrEqual(20);
    await page.getByText('Waiting for first message').waitFor();
    await screenshot(page, 'enrol-waiting-wide');
    const { body } = await t.request().get('/api/controllers').set(t.as('integrator'));
    const id = (body.controllers as { id: number; serial: string }[]).find((c) => c.serial === 'E2E-OXS-9')!.id;
    const online = async () =>
      (await t.request().get(`/api/controllers/${id}`).set(t.as('integrator'))).body.controller.status === 'online';
    // A device that dies is restarted by its supervisor: one restart is allowed, and what the
    // first run printed goes to the log, so a flaky start shows without failing the journey.
    for (let attempt = 1; ; attempt++) {
      const run = startSimulator(password, t.broker!.port);
      sim = run.child;
      try {
        await until(online, 'the server to count the simulated controller online', 30_000);
        break;
      } catch (err) {
        const { stats } = t.ingest;
        const report = `${(err as Error).message}; simulator ${run.exit() == null ? 'still running' : `exited with ${run.exit()}`}; ingest accepted ${stats.accepted}, unknown ${stats.unknown}; output:\n${run.output()}`;
        sim.kill('SIGTERM');
        if (attempt === 2) throw new Error(report);
        console.warn(`enrolment journey, first simulator run: ${report}`);
      }
    }
    await page.getByText('Online', { exact: true }).waitFor({ timeout: 15_000 });
    await screenshot(page, 'enrol-online-wide');
    await page.close();
  }, 90_000); // the simulator may take long to start on a loaded machine
});

describe('operator Board updates live', () => {
  it('a reading published by a controller changes its tile without a reload', async () => {
    const { t, b } = env;
    const page = await b.browser.newPage({ viewport: viewports.wide });
    page.setDefaultTimeout(15_000);
    await signIn(page, t.url, 'operator@demo.thawline.test');
    await page.getByRole('heading', { name: 'Board' }).waitFor();
    await page.getByText('Live', { exact: true }).waitFor();
    const c = await demoController(t, 'CVB-1');
    // 25 % reflected is VSWR 3:1 at the coupler; the seeded 0.5 dB line makes it worse at the antenna
    await c.publishAsync(
      'thawline/v1/CVB-1/telemetry',
      JSON.stringify(reading({ seq: 0, forwardW: 1000, reflectedW: 250 })),
      { qos: 1 },
    );
    const tile = page.getByLabel('Site Corvid Bluff');
    await tile.getByText('VSWR trip level').waitFor();
    const figure = await tile.getByLabel(/^VSWR \d/).textContent();
    expect(Number.parseFloat(figure ?? '')).toBeGreaterThan(3);
    await screenshot(page, 'board-live-trip-wide');
    await c.endAsync();
    await page.close();
  });
});

describe('a technician watches a Site chart fill live and zooms into it', () => {
  it('new readings arrive over /live without polling, a drag zooms, the bands follow, and the axis has one format', async () => {
    const { t, b } = env;
    const { body } = await t.request().get('/api/sites').set(t.as('admin'));
    const site = (body.sites as { id: number; code: string; timeZone: string }[]).find((s) => s.code === 'TMK')!;
    const c = await demoController(t, 'TMK-1');
    // ten minutes at one reading each 20 s; wet and heating for the second half
    const start = Date.now() - 10 * 60_000;
    await c.publishAsync(
      'thawline/v1/TMK-1/telemetry',
      JSON.stringify(
        Array.from({ length: 30 }, (_, i) =>
          reading({
            seq: 1000 + i,
            ts: new Date(start + i * 20_000).toISOString(),
            moisture: i >= 15,
            heater: { mode: 'auto', on: i >= 15, currentA: i >= 15 ? 16.5 : 0 },
          }),
        ),
      ),
      { qos: 1 },
    );
    const page = await b.browser.newPage({ viewport: viewports.wide });
    page.setDefaultTimeout(15_000);
    const requests: string[] = [];
    page.on('request', (r) => r.url().includes('/readings?') && requests.push(r.url()));
    await signIn(page, t.url, 'tech@demo.thawline.test');
    await page.goto(`${t.url}/sites/${site.id}`);
    const chart = page.getByLabel('VSWR chart');
    const caption = page.getByText(/ points, newest /);
    await caption.filter({ hasText: /\b3\d points/ }).waitFor();
    // the technician sees the limits in force
    await page.getByText(/Lines: warning 1\.50:1 \(global rule\), trip 2\.00:1/).waitFor();
    const fetched = requests.length;

    const ts = new Date().toISOString();
    await c.publishAsync('thawline/v1/TMK-1/telemetry', JSON.stringify(reading({ seq: 1100, ts })), { qos: 1 });
    // appended to the chart: its time, to the second in site time, is the newest drawn
    await caption
      .filter({ hasText: `newest ${formatClock(ts, { timeZone: site.timeZone, seconds: true })}` })
      .waitFor();
    // 15-minute charts are not polled: the reading came over /live
    expect(requests.length).toBe(fetched);

    // one 24-hour format on the axis, in site time
    const ticks = await chart.locator('svg text').allTextContents();
    const clock = ticks.filter((x) => /^\d\d:\d\d$/.test(x));
    expect(clock.length).toBeGreaterThanOrEqual(3);
    expect(ticks.filter((x) => /AM|PM|^:\d\d/.test(x))).toEqual([]);

    // drag across the dry first half of the data (minutes 5–10 of the 15): the chart zooms there and the bands follow it
    const box = (await chart.locator('svg').first().boundingBox())!;
    const y = box.y + box.height / 2;
    await page.mouse.move(box.x + box.width * 0.42, y);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.6, y, { steps: 8 });
    await page.mouse.up();
    await page.getByText(/^Zoomed to /).waitFor();
    await caption.filter({ hasText: /\b[1-9]\d? points/ }).waitFor();
    await page.getByLabel(/^Moisture: 0 % of the time/).waitFor();
    await page.getByLabel(/^Heater on: 0 % of the time/).waitFor();
    await screenshot(page, 'site-chart-zoomed-wide');
    await page.getByRole('button', { name: 'Whole range' }).click();
    await until(async () => (await page.getByText(/^Zoomed to /).count()) === 0, 'zoom cleared');
    await page.getByLabel(/^Moisture: [1-9]\d* % of the time/).waitFor();
    await c.endAsync();
    await page.close();
  });
});
