import { describe, expect, it } from 'vitest';

import { clearSkyPeakSunHours } from '@/telemetry/math/sun';
import { browserJourney, openPlace, screenshot, signIn, viewports } from '@/test/helpers/browser';

const env = browserJourney();

describe('Calculators', () => {
  it('a technician works out VSWR, sees bad input explained, and gets the falling-ice cautions', async () => {
    const page = await env.b.browser.newPage({ viewport: viewports.phone });
    page.setDefaultTimeout(10_000);
    await signIn(page, env.t.url, 'tech@demo.thawline.test');
    await page.getByRole('heading', { name: 'Board' }).waitFor();
    await openPlace(page, 'Calculators');
    await page.getByRole('heading', { name: 'VSWR and return loss' }).waitFor();
    await page.getByLabel('Forward power at the coupler (W)').fill('1000');
    await page.getByLabel('Reflected power at the coupler (W)').fill('40');
    await page.getByLabel('Line loss, coupler to antenna (dB)').fill('1');
    // 4 % reflected is VSWR 1.5:1, return loss 14.0 dB (standing-wave table)
    await page.getByText('VSWR at the transmitter: 1.50 : 1').waitFor();
    await page.getByText('Return loss at the transmitter: 14.0 dB').waitFor();
    // through 1 dB of line the antenna's return loss is 2 dB less (line loss counts twice, there and back)
    await page.getByText('Return loss at the antenna: 12.0 dB').waitFor();
    await page.getByLabel('Reflected power at the coupler (W)').fill('abc');
    await page.getByText('Enter a number').waitFor();
    expect(await page.getByText('1.50 : 1').count()).toBe(0);
    await page.getByText(/a vehicle roof is not enough/).waitFor();
    // a 10 cm plate 2 cm thick of glaze ice: 900 kg/m³ × 0.1 × 0.1 × 0.02 m³ = 0.180 kg
    await page.getByLabel('Thickness (plates only) (cm)').fill('2');
    await page.getByText('Mass of the chunk: 0.180 kg', { exact: true }).waitFor();
    await page.getByText('Impact speed with the wind').waitFor();
    // December sun at 61.2° N, taken into the budget as an estimate the engineer can change
    await page.getByLabel('Site latitude (°)').fill('61.2');
    await page.getByLabel('Month (1–12)').fill('12');
    await page.getByRole('button', { name: 'Use this estimate in the budget' }).click();
    const expected = clearSkyPeakSunHours(61.2, new Date(Date.UTC(new Date().getUTCFullYear(), 11, 15))).toFixed(2);
    expect(await page.getByLabel('Peak sun hours in a storm day (h)').inputValue()).toBe(expected);
    await screenshot(page, 'calculators-phone');
    await page.close();
  });
});
