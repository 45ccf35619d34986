import { describe, expect, it } from 'vitest';

import { formatTime } from '@/telemetry/time';
import { browserJourney, screenshot, signIn, viewports } from '@/test/helpers/browser';
import { demoController, reading } from '@/test/helpers/server';
import { until } from '@/test/helpers/wait';

const env = browserJourney({
  server: { ingest: { flushMs: 50 } },
  setup: async (t) => {
    const c = await demoController(t, 'SBF-1');
    // freezing rain at Sable Fen now
    await c.publishAsync(
      'thawline/v1/SBF-1/telemetry',
      JSON.stringify(reading({ seq: 0, airTempC: -2, moisture: true })),
      { qos: 1 },
    );
    await until(
      async () => Number((await t.db('readings').count<{ n: number }[]>({ n: '*' }))[0].n) === 1,
      'icing reading',
    );
    // the storm's last 50 minutes, one reading a minute, with a spike half-way, and the alarm it raised
    const now = Date.now();
    await c.publishAsync(
      'thawline/v1/SBF-1/telemetry',
      JSON.stringify(
        Array.from({ length: 50 }, (_, i) =>
          reading({
            seq: i + 1,
            ts: new Date(now - (50 - i) * 60_000).toISOString(),
            airTempC: -2,
            moisture: true,
            reflectedW: i === 25 ? 400 : 40,
          }),
        ),
      ),
      { qos: 1 },
    );
    await until(
      async () => Number((await t.db('readings').count<{ n: number }[]>({ n: '*' }))[0].n) === 51,
      'the storm’s readings',
    );
    const sbf = await t.db('controllers').where({ serial: 'SBF-1' }).first();
    await t.db('alarms').insert({
      source: 'vswr-trip:storm-check',
      kind: 'vswr-trip',
      controller_id: sbf.id,
      site_id: sbf.site_id,
      priority: 'critical',
      state: 'normal',
      message: 'SBF-1: VSWR past the trip level',
      machine: JSON.stringify({}),
      raised_at: new Date(now - 25 * 60_000),
      closed_at: new Date(now - 20 * 60_000),
    });
    // half an hour ago an engineer lowered Sable Fen's warning level to 1.4:1 (made through the API; its
    // audit entry is moved back to then, as the storm report reads the rules' history from the audit log)
    const made = await t
      .request()
      .post('/api/rules')
      .set(t.as('engineer'))
      .send({
        kind: 'vswr-warning',
        scope: 'site',
        scopeId: sbf.site_id,
        enabled: true,
        priority: 'high',
        params: { limit: 1.4, forwardFloorW: 1 },
        onDelayS: 10,
        offDelayS: 30,
        deadband: 0.05,
      });
    expect(made.status).toBe(201);
    await t
      .db('audit_log')
      .where({ action: 'rule.create', subject: `rule:${made.body.rule.id}` })
      .update({ at: new Date(now - 30 * 60_000) });
    await c.endAsync();
  },
});

describe('site visit during icing, seen by master control; reports', () => {
  it('the technician must confirm the checklist; the operator sees who is on site', async () => {
    const { t, b } = env;
    const phone = await b.browser.newPage({ viewport: viewports.phone });
    phone.setDefaultTimeout(15_000);
    await signIn(phone, t.url, 'tech@demo.thawline.test');
    await phone.getByRole('heading', { name: 'Board' }).waitFor();
    await phone.goto(`${t.url}/visits`);
    // twelve sites and more: the picker finds one by a few letters
    await phone.getByLabel('Find a site').fill('sable fen');
    await phone.getByRole('radio', { name: 'Sable Fen' }).click();
    await phone.getByText('Ice may fall at Sable Fen').waitFor();
    await phone.getByText(/a vehicle roof is not enough/).waitFor();
    const button = phone.getByRole('button', { name: 'Check in' });
    expect(await button.isDisabled()).toBe(true);
    for (const name of [/hard hat/, /where to stand/, /take cover/, /Master control knows/])
      await phone.getByRole('checkbox', { name }).click();
    await screenshot(phone, 'check-in-phone');
    expect(await button.isDisabled()).toBe(false);
    await button.click();
    await phone.getByText('You are at Sable Fen').waitFor();

    const wide = await b.browser.newPage({ viewport: viewports.wide });
    wide.setDefaultTimeout(15_000);
    await signIn(wide, t.url, 'operator@demo.thawline.test');
    // stays 2 h unless they choose otherwise: master control sees when they are due out
    await wide
      .getByLabel('Site Sable Fen')
      .getByText(/^On site: Jonah Pell until \d\d:\d\d /)
      .waitFor();
    await wide.getByText('Live', { exact: true }).waitFor();
    await phone.getByRole('button', { name: 'Check out' }).click();
    await wide
      .getByLabel('Site Sable Fen')
      .getByText(/^On site: Jonah Pell/)
      .waitFor({ state: 'detached' });
    const visit = await t.db('site_visits').first();
    expect(Boolean(visit.hazard)).toBe(true);
    expect(new Date(visit.expected_out_at).getTime() - new Date(visit.checked_in_at).getTime()).toBe(120 * 60_000);
    expect(visit.checked_out_at).not.toBeNull();

    await wide.getByRole('link', { name: 'Reports' }).click();
    // twelve sites and more: the picker finds one by a few letters
    await wide.getByLabel('Find a site').fill('sable');
    await wide.getByRole('radio', { name: 'Sable Fen' }).click();
    await wide.getByText(/Sable Fen: /).waitFor();
    await wide.getByText('Download CSV').waitFor();
    // the chart spans the storm, with its limits and the alarm marked on the trace
    const chart = wide.getByLabel('VSWR during the storm at SBF-1');
    // the one written here, and those the spike itself raised
    await chart.getByText(/Markers: alarms raised \([1-9]\d*\)/).waitFor();
    await chart.getByText(/trip 2\.00:1\. Markers/).waitFor();
    // the limits as they stood at each moment: 1.5 until the engineer's change half an hour ago, 1.4 since
    const changed = await t.db('audit_log').where({ action: 'rule.create' }).orderBy('id', 'desc').first();
    const sites = (await t.request().get('/api/sites').set(t.as('admin'))).body.sites as {
      code: string;
      timeZone: string;
    }[];
    const changedAt = formatTime(changed.at, { timeZone: sites.find((x) => x.code === 'SBF')!.timeZone, date: false });
    await chart.getByText(`warning 1.50:1, then from ${changedAt} 1.40:1`, { exact: false }).waitFor();
    await screenshot(wide, 'storm-report-wide');
    // printed, the report drops the navigation and the buttons
    await wide.emulateMedia({ media: 'print' });
    expect(await wide.getByRole('navigation').isVisible()).toBe(false);
    expect(await wide.getByText(/Sable Fen: /).isVisible()).toBe(true);
    await wide.emulateMedia({ media: 'screen' });
    await wide.getByRole('radio', { name: 'Alarm health' }).click();
    await wide.getByRole('heading', { name: 'Alarm rate' }).waitFor();
    await wide.getByRole('radio', { name: 'Energy' }).click();
    await wide.getByRole('heading', { name: 'Off-grid sites' }).waitFor();
    await screenshot(wide, 'energy-wide');

    // a flood at one site folds into one summary, but never hides its critical alarm, which leads the list
    const ctl = await t.db('controllers').where({ serial: 'OXS-1' }).first();
    await t.db('alarms').insert(
      Array.from({ length: 7 }, (_, i) => ({
        source: `test-${i}`,
        kind: 'vswr-warning',
        controller_id: ctl.id,
        site_id: ctl.site_id,
        priority: i === 6 ? 'critical' : 'low',
        state: 'unacknowledged',
        message: 'OXS-1: test',
        machine: '{}',
        raised_at: new Date(Date.now() - (i + 1) * 30_000),
        open_source: `test-${i}`,
      })),
    );
    // written straight to the table, so no live frame announces them: open the page afresh
    await wide.goto(`${t.url}/alarms`);
    const summary = wide.getByRole('listitem', { name: 'Storm summary Oxlow Summit' });
    await summary.getByText('6 more alarms', { exact: false }).waitFor();
    await summary.getByText('6 low').waitFor();
    const first = wide.getByRole('list').first().getByRole('listitem').first();
    expect(await first.getByText('▲▲ critical', { exact: true }).count()).toBe(1);
    await summary.getByRole('button', { name: 'Show each alarm' }).click();
    expect(await wide.getByRole('link', { name: /^Alarm VSWR warning level at Oxlow Summit/ }).count()).toBe(7);
    await phone.close();
    await wide.close();
  });
});
