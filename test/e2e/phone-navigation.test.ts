import { describe, expect, it } from 'vitest';

import { places } from '@/components/session/places';
import { insertAlarmFlood } from '@/test/helpers/alarms';
import { browserJourney, openPlace, screenshot, signIn, viewports } from '@/test/helpers/browser';
import { until } from '@/test/helpers/wait';

const env = browserJourney({
  setup: async (t) => {
    await insertAlarmFlood(t.db, [2], 3);
  },
});

describe('on a phone', () => {
  it('every place is reached through the tab bar or its "More" sheet, and Alarms carries its count', async () => {
    const { t, b } = env;
    const ctx = await b.browser.newContext({ viewport: viewports.phone, isMobile: true, hasTouch: true });
    const page = await ctx.newPage();
    page.setDefaultTimeout(15_000);
    await signIn(page, t.url, 'admin@demo.thawline.test');
    const nav = page.getByRole('navigation', { name: 'Places' });
    await nav.getByRole('link', { name: 'Alarms, 3 waiting' }).waitFor();
    await screenshot(page, 'phone-tab-bar');
    for (const place of places) {
      await openPlace(page, place.label);
      await until(() => {
        const at = new URL(page.url()).pathname;
        return place.href === '/' ? at === '/' : at.startsWith(place.href);
      }, `${place.label} opened`);
      expect(await page.getByRole('menu', { name: 'More places' }).count(), `${place.label}: sheet closed`).toBe(0);
      // the bar stays in view, at the bottom of the screen
      const box = (await nav.boundingBox())!;
      expect(box.y + box.height, place.label).toBeGreaterThan(viewports.phone.height - 4);
      expect(box.y + box.height, place.label).toBeLessThanOrEqual(viewports.phone.height + 1);
    }
    await nav.getByRole('button', { name: 'More places and Sign out' }).click();
    await screenshot(page, 'phone-more-sheet');
    await page.getByRole('menu').getByRole('button', { name: 'Sign out' }).click();
    await until(() => new URL(page.url()).pathname.startsWith('/sign-in'), 'signed out');
    await ctx.close();
  });
});
