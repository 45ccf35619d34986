import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';

import { browserJourney, screenshot, signIn, viewports } from '@/test/helpers/browser';
import { demoController, reading } from '@/test/helpers/server';

const screens = [
  ['board', '/'],
  ['alarms', '/alarms'],
  ['alarm', '/alarms/:alarm'],
  ['site', '/sites/1'],
  ['rules', '/rules'],
  ['controllers', '/controllers'],
  ['controller', '/controllers/1'],
  ['controller-new', '/controllers/new'],
  ['reports', '/reports'],
  ['visits', '/visits'],
  ['calculators', '/calculators'],
  ['people', '/people'],
  ['sites', '/sites'],
  ['site-new', '/sites/new'],
  ['sites-import', '/sites/import'],
  ['controllers-import', '/controllers/import'],
  ['board-map', '/?view=map'],
  ['reference', '/reference'],
  ['outbox', '/outbox'],
  ['wall', '/wall'],
] as const;

/** Every screen at a phone, a desktop and a 4K wall screen; the kept screenshots are in test-output/screenshots. */
const sizes = { ...viewports, wall: { width: 3840, height: 2160 } } as const;

let alarmId = 0;

const env = browserJourney({
  server: { ingest: { flushMs: 50 } },
  setup: async (t) => {
    const c = await demoController(t, 'KTP-1');
    const start = Date.now() - 5 * 60_000;
    await c.publishAsync(
      'thawline/v1/KTP-1/telemetry',
      JSON.stringify(
        Array.from({ length: 60 }, (_, i) => reading({ seq: i, ts: new Date(start + i * 5000).toISOString() })),
      ),
      { qos: 1 },
    );
    await c.endAsync();
    // one alarm for its own page
    const ktp = await t.db('controllers').where({ serial: 'KTP-1' }).first();
    [alarmId] = await t.db('alarms').insert({
      source: 'vswr-warning:tour',
      kind: 'vswr-warning',
      controller_id: ktp.id,
      site_id: ktp.site_id,
      priority: 'high',
      state: 'unacknowledged',
      message: 'VSWR 1.62:1 at the antenna (limit 1.5:1)',
      machine: JSON.stringify({}),
      raised_at: new Date(Date.now() - 4 * 60_000),
    });
  },
});

/** Text under 14 px, inputs without an accessible name and sideways scrolling, on the page as rendered. */
const audit = (page: Page) =>
  page.evaluate(`(() => {
  const small = [];
  const walker = document.createTreeWalker(document.body, NodeFilter.SHOW_TEXT);
  for (let n = walker.nextNode(); n; n = walker.nextNode()) {
    const el = n.parentElement;
    if (!el || !n.textContent.trim() || el.closest('[aria-hidden="true"]')) continue;
    const r = el.getBoundingClientRect();
    if (r.width === 0 || r.height === 0) continue;
    const px = parseFloat(getComputedStyle(el).fontSize);
    if (px < 14) small.push(n.textContent.trim().slice(0, 40) + ' @' + px);
  }
  const unlabelled = [...document.querySelectorAll('input, textarea, select')].filter((i) => i.type !== 'file' && !i.getAttribute('aria-label') && !(i.labels && i.labels.length)).map((i) => i.outerHTML.slice(0, 80));
  const sideways = document.documentElement.scrollWidth - window.innerWidth;
  return { small, unlabelled, sideways };
})()`) as Promise<{ small: string[]; unlabelled: string[]; sideways: number }>;

describe('every screen at phone and wide sizes', () => {
  for (const [size, viewport] of Object.entries(sizes)) {
    it(`renders, keeps text at 14 px or more and labels every input (${size})`, async () => {
      const { t, b } = env;
      const page = await b.browser.newPage({ viewport });
      page.setDefaultTimeout(15_000);
      const errors: string[] = [];
      page.on('pageerror', (e) => errors.push(e.message));
      await signIn(page, t.url, 'admin@demo.thawline.test');
      await page.getByRole('heading', { name: 'Board' }).waitFor();
      for (const [name, path] of screens) {
        await page.goto(`${t.url}${path.replace(':alarm', String(alarmId))}`);
        // wall mode has no title, by design: its clock says it is drawn
        if (name === 'wall') await page.getByLabel('Local time').waitFor();
        else await page.getByRole('heading', { level: 1 }).first().waitFor();
        await page.waitForTimeout(400);
        await screenshot(page, `tour-${name}-${size}`);
        const a = await audit(page);
        if (size === 'phone') expect(a.small, `${name}: text under 14 px`).toEqual([]);
        expect(a.unlabelled, `${name}: inputs without a label`).toEqual([]);
        expect(a.sideways, `${name}: page wider than the screen by`).toBeLessThanOrEqual(0);
      }
      expect(errors).toEqual([]);
      await page.close();
    }, 240_000); // twenty screens in one browser page, at 4K too: on a loaded machine this takes a while
  }

  it('the Board fills a 3840×2160 wall screen for the view-only wall sign-in', async () => {
    const { t, b } = env;
    const page = await b.browser.newPage({ viewport: { width: 3840, height: 2160 } });
    await signIn(page, t.url, 'wall@demo.thawline.test');
    await page.getByLabel('Site Kettle Pike').waitFor();
    await screenshot(page, 'tour-board-wall-4k');
    // view only: the navigation offers nothing to change
    expect(await page.getByRole('link', { name: 'Controllers' }).count()).toBe(0);
    expect(await page.getByRole('link', { name: 'People' }).count()).toBe(0);
    await page.close();
  });
});
