import { simpleParser } from 'mailparser';
import { describe, expect, it } from 'vitest';

import { browserJourney, screenshot, signIn, viewports } from '@/test/helpers/browser';
import { tinyPng } from '@/test/helpers/images';
import { demoController, reading } from '@/test/helpers/server';
import { until } from '@/test/helpers/wait';

const png = tinyPng();

const env = browserJourney({
  server: { ingest: { flushMs: 50 } },
  setup: async (t) => {
    const rules = (await t.request().get('/api/rules').set(t.as('engineer'))).body.rules;
    const warn = rules.find((r: { kind: string }) => r.kind === 'vswr-warning');
    await t.request().put(`/api/rules/${warn.id}`).set(t.as('engineer')).send({
      enabled: true,
      priority: 'high',
      params: warn.params,
      onDelayS: 0,
      offDelayS: 30,
      deadband: 0.05,
      guidance: 'Check the top bay for rime before climbing; ice may fall.',
    });
  },
});

describe('technician acknowledges from a phone, operator sees it at once', () => {
  it('from the e-mailed link, with a note and a photo', async () => {
    const { t, b } = env;
    const operator = await b.browser.newContext({ viewport: viewports.wide });
    const board = await operator.newPage();
    board.setDefaultTimeout(15_000);
    await signIn(board, t.url, 'operator@demo.thawline.test');
    await board.getByText('Live', { exact: true }).waitFor();

    const c = await demoController(t, 'KTP-1');
    await c.publishAsync(
      'thawline/v1/KTP-1/telemetry',
      JSON.stringify(reading({ seq: 0, forwardW: 1000, reflectedW: 60 })),
      { qos: 1 },
    );
    const tile = board.getByLabel('Site Kettle Pike');
    await tile.getByText('Unacknowledged').waitFor();
    await tile.getByText('VSWR high').waitFor();
    await screenshot(board, 'board-alarm-wide');

    const mail = await until(() => t.mail.messages.find((m) => /\/alarms\/\d+/.test(m.raw)), 'alarm e-mail');
    // read as a mail program would: a long line may be soft-wrapped in the raw message
    const text = (await simpleParser(mail.raw)).text ?? '';
    const link = /(http:\/\/[^\s]+\/alarms\/\d+)/.exec(text)![1].replace(/^http:\/\/[^/]+/, t.url);

    const tech = await b.browser.newContext({ viewport: viewports.phone, isMobile: true, hasTouch: true });
    const phone = await tech.newPage();
    phone.setDefaultTimeout(15_000);
    await phone.goto(link);
    await phone.waitForURL(/\/sign-in\?next=/);
    await phone.getByLabel('E-mail').fill('tech@demo.thawline.test');
    await phone.getByLabel('Password').fill('thawline-demo');
    await phone.getByRole('button', { name: 'Sign in' }).click();
    await phone.getByRole('heading', { name: 'Acknowledge' }).waitFor();
    // what the engineer wrote for this rule, the limits in force and the way to the site
    await phone.getByText('Check the top bay for rime before climbing; ice may fall.').waitFor();
    await phone
      .getByLabel('Value now')
      .getByText(/limit 1\.50:1 · trip 2\.00:1/)
      .waitFor();
    await phone.getByRole('link', { name: /Open Kettle Pike and its chart/ }).waitFor();
    await phone.getByLabel('Note').fill('Rime on the top bay, heading up');
    const [chooser] = await Promise.all([
      phone.waitForEvent('filechooser'),
      phone.getByRole('button', { name: 'Add a photo' }).click(),
    ]);
    await chooser.setFiles({ name: 'mast.png', mimeType: 'image/png', buffer: png });
    await phone.getByRole('button', { name: 'Change photo' }).waitFor();
    await screenshot(phone, 'alarm-ack-phone');
    await phone.getByRole('button', { name: 'Acknowledge', exact: true }).click();
    await phone.getByText(/acknowledged by Jonah Pell/).waitFor();
    await phone
      .getByRole('status')
      .getByText(/^✓ Acknowledged .* by Jonah Pell; everyone watching sees it now\.$/)
      .waitFor();
    await phone.getByRole('img', { name: 'Photo from the acknowledgement' }).waitFor();
    await screenshot(phone, 'alarm-acked-phone');

    // the operator's screen counts it acknowledged at once (the tile shows the site's worst, which may be another by now)
    await board.getByRole('link', { name: /^Alarms: .*1 acknowledged/ }).waitFor();
    const detail = await t.db('alarms').where({ kind: 'vswr-warning' }).orderBy('id', 'desc').first();
    expect(detail.ack_note).toBe('Rime on the top bay, heading up');
    expect(await t.db('attachments').where({ alarm_id: detail.id })).toHaveLength(1);
    await c.endAsync();
    await operator.close();
    await tech.close();
  });
});
