import { describe, expect, it } from 'vitest';

import { browserJourney, screenshot, signIn, viewports } from '@/test/helpers/browser';
import { demoController, reading } from '@/test/helpers/server';
import { until } from '@/test/helpers/wait';

const env = browserJourney({
  server: { ingest: { flushMs: 50 } },
  setup: async (t) => {
    const c = await demoController(t, 'KTP-1');
    const start = Date.now() - 10 * 60_000;
    // ten minutes of readings, one excursion to VSWR ≈ 1.45 at the antenna in the middle
    const batch = Array.from({ length: 120 }, (_, i) =>
      reading({
        seq: i,
        ts: new Date(start + i * 5000).toISOString(),
        forwardW: 1000,
        reflectedW: i >= 50 && i < 60 ? 30 : 4,
      }),
    );
    await c.publishAsync('thawline/v1/KTP-1/telemetry', JSON.stringify(batch), { qos: 1 });
    await until(
      async () => Number((await t.db('readings').count<{ n: number }[]>({ n: '*' }))[0].n) === 120,
      'history stored',
    );
    await c.endAsync();
  },
});

describe('engineer tunes a threshold from the Site page', () => {
  it('previews the change against stored readings, saves it for the site, and sees the new line', async () => {
    const { t, b } = env;
    const page = await b.browser.newPage({ viewport: viewports.wide });
    page.setDefaultTimeout(15_000);
    await signIn(page, t.url, 'engineer@demo.thawline.test');
    await page.getByLabel('Site Kettle Pike').click();
    await page.getByText(/Lines: warning 1\.50:1 \(global rule\)/).waitFor();
    await screenshot(page, 'site-before-wide');
    await page.getByRole('link', { name: 'Tune thresholds' }).click();
    const card = page.getByRole('group', { name: 'Rule VSWR warning level' });
    await card.getByLabel('Limit (:1)').fill('1.4');
    await card.getByRole('radio', { name: '1 day' }).click();
    await card.getByRole('button', { name: 'Preview' }).click();
    const status = card.getByRole('status');
    await status.waitFor();
    // the stored excursion stays under 1.5 but crosses 1.4: none now, one with the new limit
    expect(await status.textContent()).toMatch(/would have raised 0 alarms; these settings 1/);
    // the replay drawn: the trace with both levels, a strip per setting, and the would-be alarm in a table
    await card.getByLabel('Replayed trace').locator('svg').first().waitFor();
    await card.getByLabel('In force: 0 alarms').waitFor();
    await card.getByLabel('Proposed: 1 alarm').waitFor();
    const table = card.getByRole('table', { name: 'Would-be alarms' });
    expect(await table.getByRole('row').count()).toBe(2); // the header and the one alarm
    const row = table.getByRole('row').nth(1);
    expect(await row.textContent()).toMatch(/^Proposed\s*\d{4}-\d\d-\d\d \d\d:\d\d:\d\d/);
    // its worst VSWR lies between the proposed 1.4 and the limit in force, 1.5
    const worst = Number(/(\d\.\d\d):1\s*$/.exec((await row.textContent()) ?? '')?.[1]);
    expect(worst).toBeGreaterThan(1.4);
    expect(worst).toBeLessThan(1.5);
    await table.getByRole('button', { name: 'Sort by Worst' }).click();
    expect(await table.getByRole('columnheader', { name: /Worst/ }).getAttribute('aria-sort')).toBe('ascending');
    await screenshot(page, 'rules-preview-trace-wide');
    // a change of the settings clears the result that no longer describes them; bad input is said in words
    await card.getByLabel('Limit (:1)').fill('');
    await card.getByRole('status').waitFor({ state: 'detached' });
    await card.getByRole('button', { name: 'Preview' }).click();
    await card.getByText('Enter a number').waitFor();
    await card.getByLabel('Off-delay (s)').fill('4000');
    await card.getByLabel('Limit (:1)').fill('1.4');
    await card.getByRole('button', { name: 'Preview' }).click();
    await card.getByText('Enter 3600 or less').waitFor();
    await card.getByLabel('Off-delay (s)').fill('30');
    await card.getByRole('button', { name: 'Preview' }).click();
    await card.getByRole('status').waitFor();
    await card.getByRole('radio', { name: 'this site' }).click();
    await card.getByRole('button', { name: 'Save rule' }).click();
    await card.getByText('Saved for this site').waitFor();
    await screenshot(page, 'rules-preview-wide');
    await page.goBack();
    await page.getByText(/Lines: warning 1\.40:1 \(site rule\)/).waitFor();
    await screenshot(page, 'site-after-wide');
    const audit = await t.db('audit_log').where({ action: 'rule.create' });
    expect(audit).toHaveLength(1);
    await page.close();
  });

  it('on a phone the Rules page is one list of collapsed rules, each saying what it does', async () => {
    const { t, b } = env;
    const page = await b.browser.newPage({ viewport: viewports.phone });
    page.setDefaultTimeout(15_000);
    await signIn(page, t.url, 'engineer@demo.thawline.test');
    // Kettle Pike's controller, which has the stored readings
    const ktp = await t.db('controllers').where({ serial: 'KTP-1' }).first();
    await page.goto(`${t.url}/rules?controller=${ktp.id}`);
    const rule = page.getByRole('button', { name: /^VSWR trip level: Limit 2:1 · .* · ▲▲ critical · on after 10 s/ });
    await rule.waitFor();
    const all = page.locator('[aria-expanded]');
    expect(await all.count()).toBeGreaterThanOrEqual(8);
    expect(await page.locator('[aria-expanded="true"]').count()).toBe(0);
    expect(await page.getByLabel('Limit (:1)').count()).toBe(0);
    await screenshot(page, 'rules-collapsed-phone');
    await rule.click();
    expect(await rule.getAttribute('aria-expanded')).toBe('true');
    await page.getByRole('group', { name: 'Rule VSWR trip level' }).getByLabel('Limit (:1)').waitFor();
    // the preview on a phone: the trace, the strips, and the would-be alarms as a list instead of a table
    await page.getByRole('button', { name: /^VSWR warning level: / }).click();
    const warning = page.getByRole('group', { name: 'Rule VSWR warning level' });
    await warning.getByRole('radio', { name: '1 day' }).click();
    await warning.getByRole('button', { name: 'Preview' }).click();
    await warning.getByLabel('Replayed trace').locator('svg').first().waitFor();
    await warning.getByRole('list', { name: 'Would-be alarms' }).getByRole('listitem').first().waitFor();
    expect(await warning.getByRole('table').count()).toBe(0);
    await warning.getByLabel('Replayed trace').scrollIntoViewIfNeeded();
    await screenshot(page, 'rules-preview-phone');
    await page.close();
  });
});
