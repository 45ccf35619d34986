import { describe, expect, it } from 'vitest';
import { browserJourney, screenshot, signIn, viewports } from '../helpers/browser';

const env = browserJourney();

describe('Calculators', () => {
  it('a technician works out VSWR, sees bad input explained, and gets the falling-ice cautions', async () => {
    const page = await env.b.browser.newPage({ viewport: viewports.phone });
    page.setDefaultTimeout(10_000);
    await signIn(page, env.t.url, 'tech@demo.thawline');
    await page.getByRole('heading', { name: 'Board' }).waitFor();
    await page.getByRole('link', { name: 'Calculators' }).click();
    await page.getByRole('heading', { name: 'VSWR and return loss' }).waitFor();
    await page.getByLabel('Forward power (W)').fill('1000');
    await page.getByLabel('Reflected power (W)').fill('40');
    // 4 % reflected is VSWR 1.5:1, return loss 14.0 dB (standing-wave table)
    await page.getByText('1.50 : 1').waitFor();
    await page.getByText('14.0 dB').waitFor();
    await page.getByLabel('Reflected power (W)').fill('abc');
    await page.getByText('Enter a number').waitFor();
    expect(await page.getByText('1.50 : 1').count()).toBe(0);
    await page.getByText(/a vehicle roof is not enough/).waitFor();
    await screenshot(page, 'calculators-phone');
    await page.close();
  });
});
