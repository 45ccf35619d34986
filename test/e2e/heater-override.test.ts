import mqtt from 'mqtt';
import { afterAll, describe, expect, it } from 'vitest';

import { browserJourney, screenshot, signIn, viewports } from '@/test/helpers/browser';
import { demoController, reading } from '@/test/helpers/server';
import { until } from '@/test/helpers/wait';

let device: mqtt.MqttClient;
const env = browserJourney({
  server: { ingest: { flushMs: 50 } },
  setup: async (t) => {
    device = await demoController(t, 'MRW-1');
    await device.subscribeAsync('thawline/v1/MRW-1/command', { qos: 1 });
    // the device answers every heater command, as the simulator does
    device.on('message', (_topic, p) => {
      const cmd = JSON.parse(p.toString());
      void device.publishAsync(
        'thawline/v1/MRW-1/command/result',
        JSON.stringify({ v: 1, id: cmd.id, ok: true, message: `heater ${cmd.mode}` }),
        { qos: 1 },
      );
    });
    await device.publishAsync(
      'thawline/v1/MRW-1/telemetry',
      JSON.stringify(reading({ seq: 0, airTempC: -3, moisture: true })),
      { qos: 1 },
    );
    await until(
      async () => Number((await t.db('readings').count<{ n: number }[]>({ n: '*' }))[0].n) === 1,
      'icing reading stored',
    );
  },
});
afterAll(async () => {
  await device?.endAsync();
});

describe('engineer overrides a heater', () => {
  it('forcing it off during icing asks again, then the controller’s answer shows', async () => {
    const { t, b } = env;
    const page = await b.browser.newPage({ viewport: viewports.phone });
    page.setDefaultTimeout(15_000);
    await signIn(page, t.url, 'engineer@demo.thawline.test');
    await page.getByRole('heading', { name: 'Board' }).waitFor();
    const id = (await t.db('controllers').where({ serial: 'MRW-1' }).first()).id;
    await page.goto(`${t.url}/controllers/${id}`);
    await page.getByRole('radio', { name: 'Forced off' }).click();
    await page.getByRole('button', { name: 'Send to the controller' }).click();
    await page.getByText('Give a reason').waitFor();
    await page.getByLabel('Reason', { exact: true }).first().fill('crew on the tower');
    await page.getByRole('button', { name: 'Send to the controller' }).click();
    await page.getByText(/Icing is active at this controller/).waitFor();
    await page.getByRole('button', { name: 'Force off anyway' }).click();
    await page.getByText(/forced-off by Ravi Osterholt: crew on the tower · done/).waitFor();
    await screenshot(page, 'heater-override-phone');
    const alarm = await until(() => t.db('alarms').where({ kind: 'heater-forced-off' }).first(), 'medium alarm raised');
    expect(alarm.priority).toBe('medium');
    await page.close();
  });
});
