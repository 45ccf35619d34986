import { describe, expect, it } from 'vitest';

import { browserJourney, screenshot, signIn, viewports } from '@/test/helpers/browser';
import { demoController, reading } from '@/test/helpers/server';
import { until } from '@/test/helpers/wait';

const env = browserJourney({
  server: { ingest: { flushMs: 50 } },
  setup: async (t) => {
    // the warning rule at once, so one high reading raises its alarm
    const rules = (await t.request().get('/api/rules').set(t.as('engineer'))).body.rules;
    const warn = rules.find((r: { kind: string; scope: string }) => r.kind === 'vswr-warning' && r.scope === 'global');
    await t
      .request()
      .put(`/api/rules/${warn.id}`)
      .set(t.as('engineer'))
      .send({ enabled: true, priority: 'high', params: warn.params, onDelayS: 0, offDelayS: 0, deadband: 0.05 });
  },
});

describe('the alarm banner and the order of the Board', () => {
  it('counts a waiting alarm by priority on every screen, keeps a shelved one counted, and puts its region first on a phone', async () => {
    const { t, b } = env;
    const c = await demoController(t, 'PEW-1');
    // Pellow Height (Saltmarsh Coast, last by name): 1000 W forward, 60 W reflected is past the 1.5:1 warning
    await c.publishAsync(
      'thawline/v1/PEW-1/telemetry',
      JSON.stringify(reading({ seq: 0, boot: 'banner', forwardW: 1000, reflectedW: 60 })),
      { qos: 1 },
    );
    const alarm = await until(
      async () =>
        (await t.request().get('/api/alarms').query({ open: '1' }).set(t.as('operator'))).body.alarms[0] ?? null,
      'the alarm',
    );

    const phone = await b.browser.newPage({ viewport: viewports.phone });
    phone.setDefaultTimeout(15_000);
    await signIn(phone, t.url, 'operator@demo.thawline.test');
    const banner = phone.getByRole('link', { name: /^Alarms: / });
    await banner.getByText('1 ▲ high').waitFor();
    // attention first on a phone: the region with the waiting alarm heads the Board
    await phone.getByLabel('Region Saltmarsh Coast').waitFor();
    const regions = await phone.getByRole('heading', { level: 2 }).allTextContents();
    expect(regions[0]).toBe('Saltmarsh Coast');
    await screenshot(phone, 'banner-board-phone');
    // the banner is on other screens too
    await phone.goto(`${t.url}/calculators`);
    await phone.getByRole('link', { name: /^Alarms: 1 ▲ high/ }).waitFor();

    // shelved, it is still counted, not gone
    const until8h = new Date(Date.now() + 8 * 3_600_000).toISOString();
    expect(
      (
        await t
          .request()
          .post(`/api/alarms/${alarm.id}/shelve`)
          .set(t.as('operator'))
          .send({ reason: 'mast crew on site', until: until8h })
      ).status,
    ).toBe(200);
    await phone.goto(`${t.url}/`);
    await phone.getByRole('link', { name: 'Alarms: 1 shelved' }).waitFor();

    // on the wall, positions do not move: regions stay in name order whatever needs attention
    const wall = await b.browser.newPage({ viewport: { width: 3840, height: 2160 } });
    wall.setDefaultTimeout(15_000);
    await signIn(wall, t.url, 'wall@demo.thawline.test');
    await wall.getByLabel('Region Saltmarsh Coast').waitFor();
    expect(await wall.getByRole('heading', { level: 2 }).allTextContents()).toEqual([
      'Lakelands',
      'Northern Uplands',
      'Saltmarsh Coast',
    ]);
    await c.endAsync();
  });
});
