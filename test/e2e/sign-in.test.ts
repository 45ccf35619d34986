import { describe, expect, it } from 'vitest';

import { browserJourney, screenshot, signIn, viewports } from '@/test/helpers/browser';

const env = browserJourney();

describe('signing in and seeing the Board', () => {
  for (const [size, viewport] of Object.entries(viewports)) {
    it(`at ${size} size`, async () => {
      const page = await env.b.browser.newPage({ viewport });
      await page.goto(`${env.t.url}/`);
      await page.waitForURL(/\/sign-in/);
      await signIn(page, env.t.url, 'operator@demo.thawline.test');
      await page.getByRole('heading', { name: 'Board' }).waitFor();
      await page.getByLabel('Site Kettle Pike').waitFor();
      expect(await page.getByLabel(/^Site /).count()).toBe(12);
      expect(await page.getByRole('heading', { name: 'Saltmarsh Coast' }).isVisible()).toBe(true);
      await screenshot(page, `board-${size}`);
      await page.close();
    });
  }

  it('a deep link survives sign-in and a wrong password is explained', async () => {
    const page = await env.b.browser.newPage({ viewport: viewports.phone });
    page.setDefaultTimeout(8000);
    await page.goto(`${env.t.url}/people`);
    await page.waitForURL(/\/sign-in\?next=%2Fpeople/);
    await page.getByLabel('E-mail').fill('admin@demo.thawline.test');
    await page.getByLabel('Password').fill('wrong-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('alert').waitFor();
    expect(await page.getByRole('alert').textContent()).toContain('not right');
    await page.getByLabel('Password').fill('thawline-demo');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('heading', { name: 'People' }).waitFor();
    expect(new URL(page.url()).pathname).toBe('/people');
    await page.close();
  });
});
