import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBrowser, screenshot, useSession, type BrowserSession } from '../support/browser';
import { fixtures } from '../support/fixtures';

let browser: BrowserSession;

beforeAll(async () => {
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
});

describe("another supplier's case", () => {
  it('opens for the supplier whose case it is', async () => {
    const { cookies, caseOfSupplier } = fixtures();
    await useSession(browser.context, cookies.supplier);
    const page = await browser.context.newPage();
    try {
      const response = await page.goto(`/cases/${caseOfSupplier.id}`);
      expect(response?.status()).toBe(200);
      expect(await page.getByRole('heading', { level: 1 }).textContent()).toContain(caseOfSupplier.number);
    } finally {
      await page.close();
    }
  });

  it('shows supplier2 the not-found page with status 404, and nothing of the case', async () => {
    const { cookies, caseOfSupplier } = fixtures();
    await useSession(browser.context, cookies.supplier2);
    const page = await browser.context.newPage();
    try {
      const response = await page.goto(`/cases/${caseOfSupplier.id}`);
      expect(response?.status()).toBe(404);
      await page.getByRole('heading', { name: 'There is nothing here you can open' }).waitFor();
      expect(await page.content()).not.toContain(caseOfSupplier.number);
      await screenshot(page, 'not-found-supplier2');
    } finally {
      await page.close();
    }
  });
});
