import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBrowser, hasSessionCookie, screenshot, waitForHydration, type BrowserSession } from '../support/browser';
import { account, fixtures } from '../support/fixtures';

let browser: BrowserSession;

beforeAll(async () => {
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
});

describe('signing in through the form', () => {
  for (const key of ['admin', 'plant', 'lab', 'arbiter', 'supplier', 'supplier2']) {
    it(`takes ${key}@ to a desk with their name`, async () => {
      const { email, name } = account(key);
      await browser.context.clearCookies();
      const page = await browser.context.newPage();
      try {
        await page.goto('/sign-in');
        await waitForHydration(page, 'form');
        await page.getByLabel('E-mail address').fill(email);
        await page.getByLabel('Password').fill(fixtures().password);
        await page.getByRole('button', { name: 'Sign in' }).click();
        await page.waitForURL((url) => url.pathname === '/desk');

        const heading = page.getByRole('heading', { level: 1 });
        await heading.waitFor();
        expect(await heading.textContent()).toBe(`Desk of ${name}`);
        expect(await hasSessionCookie(browser.context)).toBe(true);
        // The credentials travelled in the request body, never in an address.
        expect(page.url()).not.toContain('password');
        await screenshot(page, `desk-${key}`);
      } finally {
        await page.close();
      }
    });
  }
});
