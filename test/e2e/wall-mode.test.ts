import { describe, expect, it } from 'vitest';

import { browserJourney, screenshot, signIn } from '@/test/helpers/browser';
import { demoController, reading } from '@/test/helpers/server';

const env = browserJourney({ server: { ingest: { flushMs: 50 } } });

describe('wall mode', () => {
  it('has no chrome, shows the clock, data age and alarm counts, who is on site, and a lost link as one banner', async () => {
    const { t, b } = env;
    // a technician checks in at Kettle Pike for an hour
    const tech = await t
      .request()
      .post('/api/visits/site/1')
      .set(t.as('technician'))
      .send({ checklist: { hardHat: true, plan: true, cover: true, told: true }, stayMinutes: 60 });
    expect(tech.status, JSON.stringify(tech.body)).toBe(201);

    const ctx = await b.browser.newContext({ viewport: { width: 3840, height: 2160 } });
    const page = await ctx.newPage();
    page.setDefaultTimeout(15_000);
    await signIn(page, t.url, 'wall@demo.thawline.test');
    // the wall account lands in wall mode
    await page.waitForURL(/\/wall$/);
    const tile = page.getByLabel('Site Kettle Pike');
    await tile.getByText(/^On site: .+ until \d\d:\d\d /).waitFor();
    expect(await page.getByRole('navigation').count()).toBe(0);
    expect(await page.getByText('Sign out').count()).toBe(0);
    await page.getByText('No open alarms').waitFor();
    expect(await page.getByLabel('Local time').textContent()).toMatch(/^\d\d:\d\d:\d\d /);
    // type grows with the screen: the clock is twice its 1920-wide size at 3840
    const clockPx = await page
      .getByLabel('Local time')
      .evaluate((el) => Number.parseFloat(getComputedStyle(el).fontSize));
    expect(clockPx).toBeGreaterThanOrEqual(80);

    const c = await demoController(t, 'KTP-1');
    await c.publishAsync('thawline/v1/KTP-1/telemetry', JSON.stringify(reading({ seq: 0 })), { qos: 1 });
    await page
      .getByLabel('Data age')
      .getByText(/^Newest reading \d+ s ago$/)
      .waitFor();
    await screenshot(page, 'wall-mode-4k');

    // the browser's own link lost: one banner, values greyed with their time, no tile blames its controller
    await ctx.setOffline(true);
    t.live.disconnectAll();
    await page
      .getByRole('alert')
      .getByText(/Link to Thawline lost/)
      .waitFor({ timeout: 30_000 });
    expect(await page.getByText('Silent', { exact: true }).count()).toBe(0);
    await screenshot(page, 'wall-mode-link-lost-4k');
    await ctx.setOffline(false);
    await c.endAsync();
    await ctx.close();
  });

  it('a multi-antenna tile shows each antenna its own value, and a heater on that draws nothing against its rating', async () => {
    const { t, b } = env;
    const page = await b.browser.newPage({ viewport: { width: 1920, height: 1080 } });
    page.setDefaultTimeout(15_000);
    await signIn(page, t.url, 'operator@demo.thawline.test');
    const connect = (serial: string) => demoController(t, serial);
    const [fm, tv] = await Promise.all([connect('KTP-1'), connect('KTP-2')]);
    // the FM array's heater is switched on but draws 0 A; the TV radome's sensor sees high VSWR
    await fm.publishAsync(
      'thawline/v1/KTP-1/telemetry',
      JSON.stringify(
        reading({
          seq: 100,
          reflectedW: 2,
          heater: { mode: 'auto', on: true, currentA: 0 },
          supply: { volts: 240, batteryPct: null },
        }),
      ),
      { qos: 1 },
    );
    await tv.publishAsync(
      'thawline/v1/KTP-2/telemetry',
      JSON.stringify(reading({ seq: 0, boot: 'tv-boot', reflectedW: 120 })),
      { qos: 1 },
    );
    const tile = page.getByLabel('Site Kettle Pike');
    const fmRow = tile.getByLabel('Antenna FM main array');
    const tvRow = tile.getByLabel('Antenna TV panel stack');
    // 12 kW single-phase on 240 V is rated 50 A (P = V·I)
    await fmRow.getByText('⚑ Heater on · 0.0 A of 50.0 A rated — not heating').waitFor();
    const fmVswr = await fmRow.getByLabel(/^VSWR /).getAttribute('aria-label');
    const tvVswr = await tvRow.getByLabel(/^VSWR /).getAttribute('aria-label');
    expect(Number(fmVswr!.slice(5))).toBeLessThan(1.3);
    expect(Number(tvVswr!.slice(5))).toBeGreaterThan(1.5);
    // the worse antenna is listed first
    expect(
      await tile
        .getByLabel(/^Antenna /)
        .first()
        .getAttribute('aria-label'),
    ).toBe('Antenna TV panel stack');
    await screenshot(page, 'tile-two-antennas-wide');
    await Promise.all([fm.endAsync(), tv.endAsync()]);
    await page.close();
  });
});
