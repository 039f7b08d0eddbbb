import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { fixtures } from './fixtures';

const CHROMIUM = process.env.CHROMIUM_PATH || '/usr/bin/chromium';
const ARGS = ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run', '--disable-quic'];

export type BrowserSession = { context: BrowserContext; close: () => Promise<void> };

/** Debian's chromium with a profile of its own, thrown away at close. */
export async function openBrowser(): Promise<BrowserSession> {
  const userDataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'countersample-chromium-'));
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: CHROMIUM,
    headless: true,
    args: ARGS,
    baseURL: fixtures().baseUrl,
    viewport: { width: 1280, height: 900 },
    locale: 'en-GB',
    timezoneId: 'Europe/London',
  });
  context.setDefaultTimeout(20_000);
  context.setDefaultNavigationTimeout(30_000);
  return {
    context,
    close: async () => {
      await context.close();
      fs.rmSync(userDataDir, { recursive: true, force: true });
    },
  };
}

export async function screenshot(page: Page, name: string): Promise<string> {
  const file = path.join(fixtures().artifactsDir, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

/** Whether the browser holds a better-auth session cookie with a value. */
export async function hasSessionCookie(context: BrowserContext): Promise<boolean> {
  return (await context.cookies()).some((c) => c.name.endsWith('session_token') && c.value !== '');
}

/** Waits until React has hydrated the element: a click before that would submit the bare HTML form. */
export async function waitForHydration(page: Page, selector: string): Promise<void> {
  await page.waitForFunction(
    (css) => {
      const element = document.querySelector(css);
      return !!element && Object.keys(element).some((key) => key.startsWith('__reactProps$'));
    },
    selector,
  );
}

/** Puts a session cookie header ("name=value; …") into the browser for the app's origin. */
export async function useSession(context: BrowserContext, cookieHeader: string): Promise<void> {
  const url = fixtures().baseUrl;
  await context.clearCookies();
  await context.addCookies(
    cookieHeader.split('; ').map((pair) => {
      const at = pair.indexOf('=');
      return { name: pair.slice(0, at), value: pair.slice(at + 1), url, httpOnly: true, sameSite: 'Lax' as const };
    }),
  );
}
