import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { hasSessionCookie, openBrowser, screenshot, waitForHydration, type BrowserSession } from '../support/browser';
import { account } from '../support/fixtures';

let browser: BrowserSession;
let page: Page;
let signInCalls: number;

beforeAll(async () => {
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
});

beforeEach(async () => {
  await browser.context.clearCookies();
  page = await browser.context.newPage();
  signInCalls = 0;
  page.on('request', (request) => {
    if (new URL(request.url()).pathname === '/api/auth/sign-in/email') signInCalls++;
  });
  await page.goto('/sign-in');
  await waitForHydration(page, 'form');
  return () => page.close();
});

async function currentSession(): Promise<unknown> {
  const response = await page.request.get('/api/auth/get-session');
  expect(response.status()).toBe(200);
  return response.json();
}

describe('the sign-in form', () => {
  it('shows a field error for an empty e-mail address and sends nothing', async () => {
    await page.getByLabel('Password').fill('some-password-or-other');
    await page.getByRole('button', { name: 'Sign in' }).click();
    const error = page.locator('#email-error');
    await error.waitFor();
    expect(await error.textContent()).toContain('Enter your e-mail address.');
    expect(await page.getByLabel('E-mail address').getAttribute('aria-invalid')).toBe('true');
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    expect(signInCalls).toBe(0);
    expect(await hasSessionCookie(browser.context)).toBe(false);
    await screenshot(page, 'sign-in-empty-email');
  });

  it('says plainly that a wrong password does not match, and opens no session', async () => {
    await page.getByLabel('E-mail address').fill(account('plant').email);
    await page.getByLabel('Password').fill('definitely-not-the-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    const alert = page.getByRole('alert').filter({ hasText: 'do not match' });
    await alert.waitFor();
    expect(await alert.textContent()).toContain('That e-mail address and password do not match an account.');
    expect(signInCalls).toBe(1);
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    expect(await hasSessionCookie(browser.context)).toBe(false);
    expect(await currentSession()).toBeNull();
    await screenshot(page, 'sign-in-wrong-password');
  });
});
