import fs from 'node:fs';
import path from 'node:path';

import { type Browser, chromium, type Page } from 'playwright-core';
import { afterAll, beforeAll } from 'vitest';

import { type TestServer, testServer } from './server';

/** Debian's chromium, headless, with a fresh profile; nothing downloaded. */
export async function launchBrowser(): Promise<{ browser: Browser; close: () => Promise<void> }> {
  const browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
    // playwright gives each launch a fresh, temporary profile of its own
  });
  return {
    browser,
    async close() {
      await browser.close();
    },
  };
}

export const viewports = { phone: { width: 390, height: 844 }, wide: { width: 1920, height: 1080 } } as const;

export async function screenshot(page: Page, name: string) {
  const dir = path.resolve(__dirname, '../../test-output/screenshots');
  fs.mkdirSync(dir, { recursive: true });
  await page.screenshot({ path: path.join(dir, `${name}.png`), fullPage: false });
}

export async function signIn(page: Page, base: string, email: string, password = 'thawline-demo') {
  await page.goto(`${base}/sign-in`);
  // a fresh browser context loads the whole bundle first: on a loaded 2-core machine that can take a while
  await page.getByLabel('E-mail').waitFor({ timeout: 45_000 });
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  // signed in once the app has left the sign-in page (the session cookie is set by then)
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
}

/** Opens a place from the navigation: the bar on wide screens, the tab bar or its "More" sheet on a phone. */
export async function openPlace(page: Page, label: string) {
  const link = page.getByRole('navigation').getByRole('link', { name: new RegExp(`^${label}(,|$)`) });
  if ((await link.count()) === 0) await page.getByRole('button', { name: 'More places and Sign out' }).click();
  await link.click();
}

/**
 * A whole server on a fresh database plus Debian's chromium for one test file,
 * started before its tests and stopped after them. `setup` runs once both are up.
 */
export function browserJourney(
  opts: { server?: Parameters<typeof testServer>[0]; setup?: (t: TestServer) => Promise<void> } = {},
) {
  const env = {} as { t: TestServer; b: Awaited<ReturnType<typeof launchBrowser>> };
  beforeAll(async () => {
    env.t = await testServer(opts.server);
    env.b = await launchBrowser();
    await opts.setup?.(env.t);
  });
  afterAll(async () => {
    await env.b?.close();
    await env.t?.close();
  });
  return env;
}
