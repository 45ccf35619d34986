import { describe, expect, it } from 'vitest';

import { browserJourney, screenshot, signIn, viewports } from '@/test/helpers/browser';
import { until } from '@/test/helpers/wait';

const env = browserJourney();

describe('admin manages people', () => {
  it('invites by e-mail, the invitee sets a password, and the admin changes roles and on-call order', async () => {
    const page = await env.b.browser.newPage({ viewport: viewports.wide });
    page.setDefaultTimeout(15_000);
    await signIn(page, env.t.url, 'admin@demo.thawline.test');
    await page.getByRole('link', { name: 'People' }).click();
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await page.getByText('Enter a name').waitFor();
    await page.getByLabel('Name').fill('Oskar Fenwright');
    await page.getByLabel('E-mail').fill('oskar@demo.thawline.test');
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await page.getByText('Invitation sent').waitFor();
    const mail = await until(
      () => env.t.mail.messages.find((m) => m.to.includes('oskar@demo.thawline.test')),
      'invitation e-mail',
    );
    const token = /welcome\?token=([A-Za-z0-9_-]+)/.exec(mail.raw.replace(/=\r?\n/g, ''))![1];

    const person = page.getByRole('listitem', { name: 'Person Mina Calloway' });
    await person.getByRole('radio', { name: 'Engineer' }).click();
    await until(
      async () =>
        (await env.t.db('people').where({ email: 'operator@demo.thawline.test' }).first()).role === 'engineer',
      'role changed',
    );
    await person.getByRole('button', { name: 'Deactivate' }).click();
    await person.getByText('Deactivated').waitFor();

    // twelve sites and more: the picker finds one by a few letters

    await page.getByLabel('Find a site').fill('sable');

    await page.getByRole('radio', { name: 'Sable Fen' }).click();
    await page.getByRole('button', { name: 'Move Ravi Osterholt up' }).click();
    await page.getByRole('button', { name: 'Save on-call order' }).click();
    await page.getByText('On-call order saved').waitFor();
    const order = await env.t
      .db('site_on_call as o')
      .join('people as p', 'p.id', 'o.person_id')
      .join('sites as s', 's.id', 'o.site_id')
      .where('s.code', 'SBF')
      .orderBy('o.position')
      .pluck('p.email');
    expect(order).toEqual(['engineer@demo.thawline.test', 'tech@demo.thawline.test']);
    await screenshot(page, 'people-wide');

    const welcome = await env.b.browser.newPage({ viewport: viewports.phone });
    welcome.setDefaultTimeout(15_000);
    await welcome.goto(`${env.t.url}/welcome?token=${token}`);
    await welcome.getByLabel('New password').fill('oskars-own-password');
    await welcome.getByRole('button', { name: 'Set password' }).click();
    await welcome.getByText('Your password is set').waitFor();
    await signIn(welcome, env.t.url, 'oskar@demo.thawline.test', 'oskars-own-password');
    await welcome.getByRole('heading', { name: 'Board' }).waitFor();
    await welcome.close();
    await page.close();
  });
});
