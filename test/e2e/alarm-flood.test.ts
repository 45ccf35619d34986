import { describe, expect, it } from 'vitest';

import { insertAlarmFlood } from '@/test/helpers/alarms';
import { browserJourney, screenshot, signIn, viewports } from '@/test/helpers/browser';

let critical = 0;
const env = browserJourney({
  setup: async (t) => {
    ({ critical } = await insertAlarmFlood(t.db, [3, 4, 5]));
  },
});

describe('a flood of 30 alarms on a technician’s phone', () => {
  it('lists the critical alarm first, narrows by search, and acknowledges many with one note', async () => {
    const { t, b } = env;
    const ctx = await b.browser.newContext({ viewport: viewports.phone, isMobile: true, hasTouch: true });
    const page = await ctx.newPage();
    page.setDefaultTimeout(15_000);
    await signIn(page, t.url, 'tech@demo.thawline.test');
    await page.goto(`${t.url}/alarms`);
    const list = page.getByRole('list').last();
    const first = list.getByRole('listitem').first();
    await first.getByText('VSWR trip level').waitFor();
    expect(await first.getByRole('link').getAttribute('href')).toBe(`/alarms/${critical}`);
    await screenshot(page, 'alarm-flood-phone');

    // the search narrows the list and says how many it hides
    await page.getByLabel('Search').fill('trip');
    await page.getByText('1 of 30 open alarms shown · 29 hidden by the filter').waitFor();
    await page.getByRole('button', { name: 'Show all' }).click();
    await page.getByText('30 of 30 open alarms shown').waitFor();

    // the low ones, all at once with one note
    const lows = (await t.db('alarms').where({ priority: 'low', state: 'unacknowledged' })).length;
    await page.getByRole('button', { name: 'Filters' }).click();
    await page.getByRole('radiogroup', { name: 'Priority' }).getByRole('radio', { name: 'Low' }).click();
    await page.getByRole('button', { name: 'Select to acknowledge' }).click();
    await page.getByRole('button', { name: `Select all ${lows} shown` }).click();
    await page.getByLabel('Note for all of them').fill('Ridge storm, crew on the way');
    await screenshot(page, 'alarm-flood-select-phone');
    await page.getByRole('button', { name: `Acknowledge ${lows} alarms` }).click();
    await page.getByRole('status').getByText(`Acknowledged ${lows} alarms.`).waitFor();
    const acked = await t.db('alarms').where({ state: 'acknowledged', ack_note: 'Ridge storm, crew on the way' });
    expect(acked).toHaveLength(lows);
    expect(new Set(acked.map((a) => a.priority))).toEqual(new Set(['low']));
    await ctx.close();

    // the same list on a control-room screen
    const wide = await b.browser.newPage({ viewport: viewports.wide });
    wide.setDefaultTimeout(15_000);
    await signIn(wide, t.url, 'operator@demo.thawline.test');
    await wide.goto(`${t.url}/alarms`);
    await wide.getByRole('list').last().getByRole('listitem').first().getByText('VSWR trip level').waitFor();
    await screenshot(wide, 'alarm-flood-wide');
    await wide.close();
  });
});
