import mqtt from 'mqtt';
import { describe, expect, it } from 'vitest';

import { browserJourney, screenshot, signIn, viewports } from '@/test/helpers/browser';
import { reading } from '@/test/helpers/server';
import { until } from '@/test/helpers/wait';

const env = browserJourney();

describe('an engineer puts a new site into the network from a phone', () => {
  it('adds a site and an antenna, an integrator enrols a controller on it, and the map and the Board show it', async () => {
    const { t, b } = env;
    const phone = await b.browser.newPage({ viewport: viewports.phone });
    phone.setDefaultTimeout(15_000);
    await signIn(phone, t.url, 'engineer@demo.thawline.test');
    await phone.goto(`${t.url}/sites`);
    await phone.getByRole('button', { name: 'Add a site' }).click();
    // a bad entry is named at its field, and nothing is sent
    await phone.getByLabel('Code').fill('WHR');
    await phone.getByLabel('Name').fill('Whinmoor Rigg');
    await phone.getByLabel('Region').fill('Eastern Moors');
    await phone.getByLabel('Latitude (°, north +)').fill('95');
    await phone.getByLabel('Longitude (°, east +)').fill('15.3');
    await phone.getByLabel('Ground elevation (m)').fill('610');
    await phone.getByLabel('Tower height (m)').fill('130');
    await phone.getByRole('radio', { name: 'Mains' }).click();
    await phone.getByLabel('Time zone').fill('Europe/Stockholm');
    await phone.getByRole('button', { name: 'Add site' }).click();
    await phone.getByText('Between −90 and 90').waitFor();
    await phone.getByLabel('Latitude (°, north +)').fill('60.45');
    await phone.getByRole('button', { name: 'Add site' }).click();
    await phone.getByRole('heading', { name: 'Whinmoor Rigg' }).waitFor();
    await phone.getByRole('button', { name: 'Add an antenna' }).click();
    await phone.getByLabel('Antenna name').fill('FM main array');
    await phone.getByRole('radio', { name: 'FM' }).click();
    await phone.getByRole('radio', { name: 'Heater', exact: true }).click();
    await phone.getByLabel('Heater rating (kW)').fill('11');
    await phone.getByLabel('Height on the tower (m)').fill('118');
    await phone.getByRole('button', { name: 'Add antenna' }).click();
    await phone.getByText(/FM main array.*11 kW · at 118 m/).waitFor();
    await screenshot(phone, 'site-new-phone');
    const site = await t.db('sites').where({ code: 'WHR' }).first();
    expect(site).toMatchObject({ name: 'Whinmoor Rigg', time_zone: 'Europe/Stockholm', tower_height_m: 130 });
    expect(
      await t
        .db('audit_log')
        .where({ subject: `site:${site.id}` })
        .pluck('action'),
    ).toEqual(['site.create']);

    // the integrator, on a wide screen, enrols a controller on the new antenna
    const wide = await b.browser.newPage({ viewport: viewports.wide });
    wide.setDefaultTimeout(15_000);
    await signIn(wide, t.url, 'integrator@demo.thawline.test');
    await wide.goto(`${t.url}/controllers/new`);
    await wide.getByLabel('Serial').fill('WHR-1');
    // twelve sites and more: the picker finds one by a few letters
    await wide.getByLabel('Find a site').fill('whr');
    await wide.getByRole('radio', { name: 'Whinmoor Rigg (WHR)' }).click();
    await wide.getByRole('radio', { name: 'FM main array' }).click();
    await wide.getByRole('radio', { name: 'Heater controller', exact: true }).click();
    await wide.getByLabel('Reporting interval (s)').fill('2');
    await wide.getByRole('button', { name: 'Enrol controller' }).click();
    await wide.getByText('shown only this once').waitFor();
    const password = (await wide.getByLabel('Password', { exact: true }).textContent())!.trim();

    // the controller reports VSWR past the trip level: its mark on the map fills with colour
    const c = await mqtt.connectAsync(`mqtt://127.0.0.1:${t.broker!.port}`, {
      username: 'WHR-1',
      password,
      reconnectPeriod: 0,
    });
    await c.publishAsync(
      'thawline/v1/WHR-1/telemetry',
      JSON.stringify(reading({ seq: 0, boot: 'w1', reflectedW: 200 })),
      { qos: 1 },
    );
    await until(
      async () =>
        (await t
          .db('readings as r')
          .join('controllers as c', 'c.id', 'r.controller_id')
          .where('c.serial', 'WHR-1')
          .first()) ?? null,
      'the reading stored',
    );
    await wide.goto(`${t.url}/?view=map`);
    const mark = wide.getByLabel('Whinmoor Rigg, needs attention');
    await mark.waitFor({ timeout: 20_000 });
    await screenshot(wide, 'board-map-wide');
    // the calm demo sites are grey rings: labelled without "needs attention"
    expect(await wide.getByLabel('Kettle Pike', { exact: true }).count()).toBe(1);
    await wide.goto(`${t.url}/`);
    await wide.getByLabel('Region Eastern Moors').getByLabel('Site Whinmoor Rigg').waitFor();
    await c.endAsync();

    // the phone's Sites screen picked the new site up, on the map and in the list
    await phone.goto(`${t.url}/sites`);
    await phone.getByLabel('Map of the sites').waitFor();
    await phone.getByRole('link', { name: 'Site Whinmoor Rigg' }).waitFor();
    await screenshot(phone, 'sites-map-phone');
    const width = await phone.evaluate(() => document.documentElement.scrollWidth);
    expect(width).toBeLessThanOrEqual(viewports.phone.width);
  });
});

describe('an integrator works through the controllers on a wide screen', () => {
  it('sees them as a table that sorts by any column and narrows by a search', async () => {
    const { t, b } = env;
    const page = await b.browser.newPage({ viewport: viewports.wide });
    page.setDefaultTimeout(15_000);
    await signIn(page, t.url, 'integrator@demo.thawline.test');
    await page.goto(`${t.url}/controllers`);
    const table = page.getByRole('table', { name: 'Controllers' });
    await table.waitFor();
    const serials = async () =>
      (await table.getByRole('row').allTextContents()).slice(1).map((r) => /^[A-Z]+-\d+/.exec(r)?.[0] ?? r);
    const all = await serials();
    expect(all.length).toBeGreaterThanOrEqual(12);
    await table.getByRole('button', { name: 'Sort by Serial' }).click();
    const asc = await serials();
    expect(asc).toEqual([...all].sort((a, b) => a.localeCompare(b)));
    await table.getByRole('button', { name: 'Sort by Serial' }).click();
    expect(await serials()).toEqual([...asc].reverse());
    expect(await table.getByRole('columnheader', { name: /Serial/ }).getAttribute('aria-sort')).toBe('descending');
    await page.getByLabel('Find a controller').fill('kettle');
    await until(async () => (await serials()).every((x) => x.startsWith('KTP-')), 'only Kettle Pike left');
    await page.getByText(/^\d+ of \d+ match$/).waitFor();
    await screenshot(page, 'controllers-table-wide');
    await page.close();
  });
});

describe('an integrator reads the contracts in the product', () => {
  it('opens the API and MQTT reference from the Controllers screen', async () => {
    const { t, b } = env;
    const page = await b.browser.newPage({ viewport: viewports.wide });
    page.setDefaultTimeout(15_000);
    await signIn(page, t.url, 'integrator@demo.thawline.test');
    await page.goto(`${t.url}/controllers`);
    await page.getByRole('button', { name: 'API and MQTT reference' }).click();
    await page.getByLabel('POST /sites', { exact: true }).waitFor();
    await page.getByText('Permission `sites.write`: admin, engineer.').first().waitFor();
    await page.getByRole('radio', { name: 'Controllers over MQTT (AsyncAPI 3)' }).click();
    await page.getByText('thawline/v1/{serial}/telemetry').waitFor();
    await page
      .getByText(/boot: string/)
      .first()
      .waitFor();
    await screenshot(page, 'reference-wide');
  });
});

describe('an engineer imports sites from a file', () => {
  it('checks the file, sees a bad row by line and column, corrects it and applies', async () => {
    const { t, b } = env;
    const page = await b.browser.newPage({ viewport: viewports.wide });
    page.setDefaultTimeout(15_000);
    await signIn(page, t.url, 'engineer@demo.thawline.test');
    await page.goto(`${t.url}/sites/import`);
    const header =
      'record,code,name,region,latitude,longitude,elevation_m,tower_height_m,power_source,battery_kwh,pv_kwp,time_zone,site,service,protection,heater_kw,heater_phases,height_m,feed_loss_db';
    const bad = [
      header,
      'site,FLT1,Flintmere,Eastern Moors,60.1,15.9,300,90,utility,,,Europe/Stockholm,,,,,,,',
      'antenna,,Panel,,,,,,,,,,FLT1,tv,heater,,1,70,1',
    ].join('\n');
    await page.getByLabel('Or paste the CSV here').fill(bad);
    await page.getByRole('button', { name: 'Check the file' }).click();
    await page.getByText('Line 3, column heater_kw: Give the heater rating in kW').waitFor();
    expect(await page.getByRole('button', { name: 'Apply' }).isDisabled()).toBe(true);
    await page.getByLabel('Or paste the CSV here').fill(bad.replace('tv,heater,,1,70', 'tv,heater,7.5,1,70'));
    await page.getByRole('button', { name: 'Check the file' }).click();
    await page.getByText('Dry run: 2 new · 0 changed · 0 unchanged · 0 with errors').waitFor();
    await page.getByRole('button', { name: 'Apply' }).click();
    await page.getByText('Applied: 2 new').waitFor();
    await screenshot(page, 'sites-import-applied-wide');
    const site = await t.db('sites').where({ code: 'FLT1' }).first();
    expect((await t.db('antennas').where({ site_id: site.id }).first()).heater_kw).toBe(7.5);
  });
});
